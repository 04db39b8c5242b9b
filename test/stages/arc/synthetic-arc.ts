/**
 * Test arcs rendered with the simulator's optics (src/sim: dispersion, tilt, curvature, LSF,
 * pixel-integrated Gaussians) from the NIST-based lamp lists in config/lamps, with seeded noise,
 * and the variations of the robustness matrix: flipped direction, lines removed, spurious peaks,
 * saturated lines.
 */
import { loadLampLines, type LampLine } from '../../../src/physics/catalogues.js';
import { MASK_BITS, type CalibratedFrame } from '../../../src/products/frame.js';
import { addUniformLines } from '../../../src/sim/light.js';
import { resolveSimOptions, type SimSize } from '../../../src/sim/options.js';
import { makeDetector, makeSetup } from '../../../src/sim/setups.js';
import { lineShiftPx, type SetupTruth } from '../../../src/sim/truth.js';
import { evalLegendre1D } from '../../../src/kernels/legendre.js';
import { Rng } from '../../../src/kernels/random.js';
import { DEFAULT_ARC_SETTINGS, type ArcSettings } from '../../../src/stages/arc/index.js';
import { noisyFrame } from './noisy-frame.js';
import type { WavelengthSolution } from '../../../src/products/wavelength.js';

export interface SyntheticArcOptions {
  seed?: number;
  size?: SimSize;
  /** Setup 0 (red) or 1 (orange) of the simulator. */
  setup?: number;
  lamps?: string[];
  /** Wavelength decreasing with internal x. */
  flip?: boolean;
  /** Fraction of the catalogue lines left out of the lamp (the list still has them). */
  dropFraction?: number;
  /** Lines added at random wavelengths that are not in the list. */
  spurious?: number;
  /** Electrons per row of a line of catalogue intensity 1000. */
  electronsPer1000?: number;
  /** Number of the brightest lines clipped at a level and flagged saturated. */
  saturate?: number;
  readNoiseE?: number;
}

export interface SyntheticArc {
  frame: CalibratedFrame;
  setup: SetupTruth;
  lampLines: LampLine[];
  /** True air wavelength at oriented pixel (x, y) (wavelength increasing with x). */
  trueWave(x: number, y: number): number;
}

export function syntheticArc(o: SyntheticArcOptions = {}): SyntheticArc {
  const seed = o.seed ?? 1;
  const options = resolveSimOptions({ seed, size: o.size ?? 'small' });
  const setup = makeSetup(options, o.setup ?? 0, makeDetector(options));
  const lampLines = loadLampLines(o.lamps ?? ['Ne', 'Ar']);
  const W = setup.internalWidth;
  const H = setup.internalHeight;
  const rng = new Rng(seed * 7919 + 13);
  const rand = (): number => rng.uniform();
  const per = (o.electronsPer1000 ?? 20000) / 1000;
  const shown = lampLines.filter(() => rand() >= (o.dropFraction ?? 0));
  const lines = shown.map((l) => ({ wavelength: l.wavelength, electrons: l.intensity * per }));
  const lo = evalLegendre1D(setup.dispersion, 0);
  const hi = evalLegendre1D(setup.dispersion, W - 1);
  for (let k = 0; k < (o.spurious ?? 0); k++) lines.push({ wavelength: lo + rand() * (hi - lo), electrons: (300 + rand() * 1500) * per });
  const signal = new Float32Array(W * H);
  addUniformLines(setup, lines, signal);
  const rn = o.readNoiseE ?? 4;
  const mask = new Uint16Array(W * H);
  if (o.saturate) {
    const bright = lines.filter((l) => l.wavelength > lo && l.wavelength < hi).sort((a, b) => b.electrons - a.electrons).slice(0, o.saturate);
    const next = lines.filter((l) => l.wavelength > lo && l.wavelength < hi).sort((a, b) => b.electrons - a.electrons)[o.saturate]!;
    // between the peak pixel of the last saturated line and that of the next one (sigma about 1.3 px)
    const level = Math.sqrt(bright[o.saturate - 1]!.electrons * next.electrons) / (2.5 * 1.3);
    for (let i = 0; i < signal.length; i++) if (signal[i]! > level) {
      signal[i] = level;
      mask[i] = MASK_BITS.saturated;
    }
  }
  const frame = noisyFrame(signal, W, H, rng, { readNoiseE: rn, exptimeS: 5, exposure: { path: 'raw/arc-test.fits', dateObs: '2019-04-12T22:00:00' }, mask });
  if (o.flip) for (const a of [frame.sci, frame.var, frame.mask]) for (let y = 0; y < H; y++) a.subarray(y * W, (y + 1) * W).reverse();
  return { frame, setup, lampLines, trueWave: (x, y) => evalLegendre1D(setup.dispersion, x - lineShiftPx(setup, y)) };
}

/** The stage settings from the simulator's manifest values (a little off the truth), with overrides. */
export function settingsFor(arc: SyntheticArc, extra: Partial<ArcSettings> = {}): ArcSettings {
  return { ...DEFAULT_ARC_SETTINGS, approxWavelength: arc.setup.approxWavelength, approxDispersion: arc.setup.approxDispersion, ...extra };
}

/** RMS over every pixel centre of (solution - truth) divided by the local dispersion, pixels. */
export function pixelRmsError(arc: SyntheticArc, s: WavelengthSolution): number {
  let sum = 0;
  for (let y = 0; y < s.height; y++) {
    for (let x = 0; x < s.width; x++) {
      const t = arc.trueWave(x, y);
      const d = arc.trueWave(x + 0.5, y) - arc.trueWave(x - 0.5, y);
      const e = (s.wave[y * s.width + x]! - t) / d;
      sum += e * e;
    }
  }
  return Math.sqrt(sum / (s.width * s.height));
}

/** True mean dispersion (Angstrom per pixel) and central wavelength of the arc's setup. */
export function trueScale(arc: SyntheticArc): { dispersion: number; centre: number } {
  const W = arc.setup.internalWidth;
  return { dispersion: (evalLegendre1D(arc.setup.dispersion, W - 1) - evalLegendre1D(arc.setup.dispersion, 0)) / (W - 1), centre: evalLegendre1D(arc.setup.dispersion, (W - 1) / 2) };
}
