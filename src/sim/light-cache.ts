/** Expected light of each frame, rendering once what several frames share. */
import type { UniformLine } from './light.js';
import { renderArc, renderFlat, renderGas, renderSky, renderStars } from './render.js';
import type { FramePlan } from './schedule.js';
import type { RunTruth, SetupTruth, TargetTruth } from './truth.js';

/**
 * The expected electrons of each frame in internal orientation, response applied. What is the
 * same for several frames (a lamp, the sky and stellar continuum of a target) is rendered once.
 */
export class LightCache {
  private readonly cache = new Map<string, Float32Array>();
  constructor(
    private readonly size: RunTruth['size'],
    private readonly response: Float32Array,
    private readonly arcLines: Map<string, UniformLine[]>,
  ) {}

  frame(plan: FramePlan, setup: SetupTruth, target: TargetTruth | undefined, scale: number): Float32Array {
    const n = this.response.length;
    const out = new Float32Array(n);
    if (plan.kind === 'bias') return out;
    const key = `${plan.kind}:${setup.name}:${target?.name ?? ''}:${plan.exptimeS}`;
    let base = this.cache.get(key);
    if (!base) {
      base = new Float32Array(n);
      if (plan.kind === 'flat') renderFlat(setup, base);
      else if (plan.kind === 'arc') renderArc(setup, this.arcLines.get(setup.name)!, base);
      else if (target) {
        renderSky(setup, this.size, plan.exptimeS, base);
        renderStars(setup, this.size, target, plan.exptimeS, base);
      }
      this.cache.set(key, base);
    }
    if (plan.kind === 'science' && target) {
      renderGas(setup, target, target.exposures.find((e) => e.frame === plan.name)!, out);
      for (let i = 0; i < n; i++) out[i] = (out[i]! + base[i]!) * this.response[i]!;
    } else {
      for (let i = 0; i < n; i++) out[i] = scale * base[i]! * this.response[i]!;
    }
    return out;
  }
}
