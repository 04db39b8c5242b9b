/**
 * simulateRun: a complete raw observing night with its known answer. Frames are made one at a
 * time from their own random stream, in internal orientation, then mapped to the raw detector.
 */
import type { Header } from '../fits/header.js';
import { randomCosmicRays } from './cosmic.js';
import { toRaw } from '../products/orientation.js';
import { addHotColumns, digitise, makeDetectorMaps, trimmedSize } from './detector.js';
import { frameHeader } from './headers.js';
import { runManifestYaml } from './manifest.js';
import { resolveSimOptions, type SimOptions } from './options.js';
import { Rng, streamSeed } from '../kernels/random.js';
import { LightCache } from './light-cache.js';
import { arcLines, lampLineFactors } from './render.js';
import { GALAXIES, INSTRUMENT, SITE, TELESCOPE } from './scenario.js';
import { dateObsText, planNight, type FrameKind, type TargetPlan } from './schedule.js';
import { SETUP_NAMES, makeDetector, makeSetup } from './setups.js';
import { addCoreHits, addHit, sharedHitPixels } from './special-hits.js';
import { makeTarget, targetName } from './targets.js';
import type { FrameTruth, RunTruth, SetupTruth, TargetTruth } from './truth.js';

export interface SimFrame {
  /** Relative path, e.g. `raw/bias_001.fits`. */
  name: string;
  kind: FrameKind;
  /** Target name (as in run.yaml) of a science frame. */
  target?: string;
  header: Header;
  /** Whole raw frame, overscan included. */
  width: number;
  height: number;
  /** Raw counts (ADU) including overscan, row-major. */
  adu: Uint16Array;
}

export interface SimulatedRun {
  frames: SimFrame[];
  manifestYaml: string;
  truth: RunTruth;
  /**
   * With `expected`: frame name -> noiseless electrons per pixel of the trimmed data section (raw
   * orientation): light x slit illumination x pixel sensitivity, plus the hot-column excess; no
   * bias, noise or cosmic rays.
   */
  expected?: Map<string, Float32Array>;
}

/** Which galaxies are observed on which setup: the targets on the first, galaxy 0 again on each further setup. */
function targetPlans(targets: number, setups: number): TargetPlan[] {
  const plans: TargetPlan[] = [];
  for (let i = 0; i < targets; i++) plans.push({ galaxy: i, setup: SETUP_NAMES[0] });
  for (let k = 1; k < setups; k++) plans.push({ galaxy: 0, setup: SETUP_NAMES[k]! });
  return plans;
}

export function simulateRun(options?: SimOptions): SimulatedRun {
  const opts = resolveSimOptions(options);
  const detector = makeDetector(opts);
  const setups: SetupTruth[] = [];
  for (let k = 0; k < opts.setups; k++) setups.push(makeSetup(opts, k, detector));
  const setupByName = new Map(setups.map((s) => [s.name, s]));
  const plans = targetPlans(opts.targets, opts.setups);
  const frames = planNight(setups.map((s) => s.name), plans);

  const targets: TargetTruth[] = plans.map((p, i) => {
    const setup = setupByName.get(p.setup)!;
    const name = targetName(p.galaxy, SETUP_NAMES.indexOf(p.setup as (typeof SETUP_NAMES)[number]), p.setup);
    return makeTarget(opts, p, name, setup, frames.filter((f) => f.target === i));
  });

  const truth: RunTruth = {
    format: 'whorl-sim-truth',
    version: 1,
    seed: opts.seed,
    size: opts.size,
    variant: opts.variant,
    site: { ...SITE },
    telescope: TELESCOPE,
    instrument: INSTRUMENT,
    setups: Object.fromEntries(setups.map((s) => [s.name, s])),
    targets,
    frames: {},
  };

  const W = setups[0]!.internalWidth;
  const H = setups[0]!.internalHeight;
  const trimmed = trimmedSize(setups[0]!.orientation, W, H);
  const maps = makeDetectorMaps(new Rng(streamSeed(opts.seed, 'detector')), detector, W, H);
  const lampFactors = lampLineFactors(new Rng(streamSeed(opts.seed, 'lamp')));
  const arcLinesBySetup = new Map(setups.map((s) => [s.name, arcLines(s, lampFactors)]));
  const shared = new Map(targets.map((t, i) => [t.name, sharedHitPixels(new Rng(streamSeed(opts.seed, `shared-hits-${i}`)), trimmed.width, trimmed.height)]));

  const lights = new LightCache(opts.size, maps.response, arcLinesBySetup);
  const scratch = new Float32Array(trimmed.width * trimmed.height);
  const expected = opts.expected ? new Map<string, Float32Array>() : undefined;
  const simFrames: SimFrame[] = [];
  let pointing: { ra: string; dec: string } = { ra: GALAXIES[0].ra, dec: GALAXIES[0].dec };

  for (const plan of frames) {
    const setup = setupByName.get(plan.setup)!;
    const target = plan.target === undefined ? undefined : targets[plan.target];
    if (target) pointing = { ra: target.ra, dec: target.dec };
    const rng = new Rng(streamSeed(opts.seed, `frame:${plan.name}`));
    // Lamp brightness varies a little from exposure to exposure (about a percent, from memory).
    const lampScale = plan.kind === 'flat' || plan.kind === 'arc' ? 1 + 0.01 * rng.normal() : 1;
    const raw = toRaw(lights.frame(plan, setup, target, lampScale), W, H, setup.orientation).data;
    addHotColumns(detector, plan.exptimeS, trimmed.width, trimmed.height, raw);
    if (expected) expected.set(plan.name, raw);

    const cosmic = randomCosmicRays(rng, trimmed.width, trimmed.height, plan.exptimeS);
    if (target) {
      const exposureIndex = target.exposures.findIndex((e) => e.frame === plan.name);
      addCoreHits(rng, setup, target, target.exposures[exposureIndex]!, cosmic);
      if (exposureIndex < 2) for (const p of shared.get(target.name)!) addHit(cosmic, p.x, p.y, 2500 + Math.round(rng.exponential(1500)));
    }
    const biasOffsetAdu = Math.round(rng.normal() * 2 * 100) / 100;
    const adu = digitise(rng, detector, maps, raw, trimmed.width, trimmed.height, cosmic, biasOffsetAdu, scratch);

    const frameTruth: FrameTruth = { kind: plan.kind, setup: setup.name, dateObs: dateObsText(plan.startMs), exptimeS: plan.exptimeS, biasOffsetAdu, cosmicRays: cosmic };
    if (target) frameTruth.target = target.name;
    truth.frames[plan.name] = frameTruth;
    const frame: SimFrame = { name: plan.name, kind: plan.kind, header: frameHeader(plan, setup, target, pointing), width: detector.rawWidth, height: detector.rawHeight, adu };
    if (target) frame.target = target.name;
    simFrames.push(frame);
  }

  const run: SimulatedRun = { frames: simFrames, manifestYaml: runManifestYaml(truth, simFrames), truth };
  if (expected) run.expected = expected;
  return run;
}
