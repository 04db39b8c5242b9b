/**
 * Science frames for the flexure tests, rendered with the simulator's optics (src/sim): the night
 * sky of config/lines/sky.txt displaced by a known shift (the flexure between arc and science),
 * a sky continuum, and a galaxy in the central rows with an emission line next to a sky line.
 */
import { skyLines } from '../../../src/physics/catalogues.js';
import type { CalibratedFrame } from '../../../src/products/frame.js';
import { addPixelGaussian } from '../../../src/sim/erf.js';
import { addUniformLines } from '../../../src/sim/light.js';
import { pixelOfWavelength } from '../../../src/sim/optics.js';
import { Rng } from '../../../src/kernels/random.js';
import { trueLsfSigmaPx, type SetupTruth } from '../../../src/sim/truth.js';
import { noisyFrame } from './noisy-frame.js';

export interface SyntheticSkyOptions {
  seed: number;
  /** Displacement of every sky line, Angstrom (the solution will measure catalogue - observed = -shift). */
  shiftAngstrom: number;
  /** Extra displacement per line (by name), to make lines disagree. */
  lineShifts?: Record<string, number>;
  /** Electrons per row of a sky line of intensity 100. Default 600 (a 20-minute exposure of the small simulator size). */
  electronsPer100?: number;
  /** Rows of the galaxy (inclusive) and its continuum level (electrons per pixel) and emission line (wavelength, electrons per row). */
  galaxy?: { rows: [number, number]; continuum: number; line?: { wavelength: number; electrons: number } };
  /** Sky lines to render (default all of config/lines/sky.txt). */
  only?: string[];
}

export function syntheticSky(setup: SetupTruth, o: SyntheticSkyOptions): CalibratedFrame {
  const W = setup.internalWidth;
  const H = setup.internalHeight;
  const rng = new Rng(o.seed);
  const per = (o.electronsPer100 ?? 600) / 100;
  const lines = skyLines()
    .filter((l) => !o.only || o.only.includes(l.name))
    .map((l) => ({ wavelength: l.wavelength + o.shiftAngstrom + (o.lineShifts?.[l.name] ?? 0), electrons: l.intensity * per }));
  const signal = new Float32Array(W * H).fill(25);
  addUniformLines(setup, lines, signal);
  if (o.galaxy) {
    const [r0, r1] = o.galaxy.rows;
    const mid = (r0 + r1) / 2;
    for (let y = r0; y <= r1; y++) {
      const profile = Math.exp(-0.5 * ((y - mid) / ((r1 - r0) / 4)) ** 2);
      for (let x = 0; x < W; x++) signal[y * W + x] += o.galaxy.continuum * profile;
      const l = o.galaxy.line;
      if (l) addPixelGaussian(signal, y * W, W, pixelOfWavelength(setup, l.wavelength, y), trueLsfSigmaPx(setup, W / 2) * 1.3, l.electrons * profile);
    }
  }
  const rn = 4;
  return noisyFrame(signal, W, H, rng, { readNoiseE: rn, exptimeS: 1200, exposure: { path: 'raw/science-test.fits', dateObs: '2019-04-13T01:00:00' } });
}
