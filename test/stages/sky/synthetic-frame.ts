/**
 * A small calibrated frame built in the test with a known wavelength map (tilted lines), a sky of
 * continuum and lines, and a galaxy of continuum and H-alpha + [N II] emission with a known
 * rotation; noise drawn from the variance. Lines are integrated over pixels (as the simulator
 * renders them). Truth is returned for checking.
 */
import type { CalibratedFrame } from '../../../src/products/frame.js';
import type { WavelengthSolution } from '../../../src/products/wavelength.js';
import { SPEED_OF_LIGHT_KMS } from '../../../src/physics/constants.js';
import { addPixelGaussian } from '../../../src/sim/erf.js';
import { Rng } from '../../../src/kernels/random.js';
import { noisyFrame } from '../arc/noisy-frame.js';

export interface SyntheticOptions {
  width?: number;
  height?: number;
  seed?: number;
  /** Wavelength of pixel 0 in the central row, Angstrom. */
  lambda0?: number;
  /** Angstrom per pixel. */
  dispersion?: number;
  /** Shift of the wavelength scale from the bottom to the top row, pixels (line tilt). */
  tiltPx?: number;
  /** Instrumental sigma, pixels. */
  lsfPx?: number;
  /** Galaxy: centre row, continuum peak (e/px), continuum scale length (rows), systemic velocity, rotation amplitude and turnover (rows). */
  centreRow?: number;
  continuumPeak?: number;
  continuumScaleRows?: number;
  vSysKms?: number;
  vRotKms?: number;
  turnoverRows?: number;
  /** H-alpha flux at the centre row (e), exponential scale (rows), and [N II] 6583 / H-alpha. */
  halphaFlux?: number;
  emissionScaleRows?: number;
  niiRatio?: number;
  /** Intrinsic gas dispersion, km/s. */
  gasSigmaKms?: number;
  /** Sky continuum (e/px) and sky lines (air Angstrom, flux in e per row). */
  skyLevel?: number;
  skyLines?: { wavelength: number; flux: number }[];
  /** Slit factor of the sky: 1 + skyGradient * (y - H/2) / H. */
  skyGradient?: number;
  readNoise?: number;
  /** Emission only within this many rows of the centre (default: everywhere). */
  emissionHalfRows?: number;
}

export interface SyntheticFrame {
  frame: CalibratedFrame;
  solution: WavelengthSolution;
  /** True sky (e) per pixel and true galaxy (e) per pixel. */
  sky: Float32Array;
  galaxy: Float32Array;
  /** Per row: true line-of-sight velocity (optical, km/s) of the gas, and its H-alpha flux (e). */
  vLos: Float64Array;
  halphaFlux: Float64Array;
  options: Required<Omit<SyntheticOptions, 'skyLines'>> & { skyLines: { wavelength: number; flux: number }[] };
}

const REST = { Halpha: 6562.8, NII6583: 6583.454, NII6548: 6548.05 }; // air, config/lines/galaxy.txt

export function makeSyntheticFrame(opts: SyntheticOptions = {}): SyntheticFrame {
  const o = {
    width: 400, height: 120, seed: 1, lambda0: 6480, dispersion: 0.9, tiltPx: 1.5, lsfPx: 1.3,
    centreRow: 60, continuumPeak: 40, continuumScaleRows: 8, vSysKms: 3000, vRotKms: 180, turnoverRows: 10,
    halphaFlux: 3000, emissionScaleRows: 14, niiRatio: 0.35, gasSigmaKms: 25, skyLevel: 30,
    skyLines: [{ wavelength: 6498.7, flux: 2500 }, { wavelength: 6533.0, flux: 1500 }, { wavelength: 6553.6, flux: 4000 }, { wavelength: 6604.1, flux: 3000 }, { wavelength: 6663.5, flux: 5000 }, { wavelength: 6700.0, flux: 1200 }],
    skyGradient: 0.04, readNoise: 4, emissionHalfRows: 32,
    ...opts,
  };
  const { width: W, height: H } = o;
  const shift = (y: number): number => (o.tiltPx * (y - H / 2)) / H;
  const lambdaAt = (x: number, y: number): number => o.lambda0 + o.dispersion * (x + shift(y));
  const pixelOf = (lambda: number, y: number): number => (lambda - o.lambda0) / o.dispersion - shift(y);
  const wave = new Float64Array(W * H);
  for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) wave[y * W + x] = lambdaAt(x, y);

  const sky = new Float32Array(W * H);
  const galaxy = new Float32Array(W * H);
  const vLos = new Float64Array(H);
  const halphaFlux = new Float64Array(H);
  for (let y = 0; y < H; y++) {
    const g = 1 + (o.skyGradient * (y - H / 2)) / H;
    const row = y * W;
    for (let x = 0; x < W; x++) sky[row + x] = o.skyLevel * g;
    const skyRow = new Float32Array(W);
    for (const l of o.skyLines) addPixelGaussian(skyRow, 0, W, pixelOf(l.wavelength, y), o.lsfPx, l.flux);
    for (let x = 0; x < W; x++) sky[row + x] += skyRow[x]! * g;

    const dy = y - o.centreRow;
    const cont = o.continuumPeak * Math.exp(-Math.abs(dy) / o.continuumScaleRows);
    for (let x = 0; x < W; x++) galaxy[row + x] = cont;
    const v = o.vSysKms + o.vRotKms * Math.tanh(dy / o.turnoverRows);
    vLos[y] = v;
    if (Math.abs(dy) > o.emissionHalfRows) continue;
    const fHa = o.halphaFlux * Math.exp(-Math.abs(dy) / o.emissionScaleRows);
    halphaFlux[y] = fHa;
    const lines: [number, number][] = [[REST.Halpha, fHa], [REST.NII6583, fHa * o.niiRatio], [REST.NII6548, (fHa * o.niiRatio) / 3]];
    const galRow = new Float32Array(W);
    for (const [rest, flux] of lines) {
      const lambda = rest * (1 + v / SPEED_OF_LIGHT_KMS);
      const sigmaPx = Math.hypot(o.lsfPx, (lambda * o.gasSigmaKms) / SPEED_OF_LIGHT_KMS / o.dispersion);
      addPixelGaussian(galRow, 0, W, pixelOf(lambda, y), sigmaPx, flux);
    }
    for (let x = 0; x < W; x++) galaxy[row + x] += galRow[x]!;
  }

  const expected = Float32Array.from(sky, (s, i) => s + galaxy[i]!);
  const frame = noisyFrame(expected, W, H, new Rng(o.seed), { readNoiseE: o.readNoise, exptimeS: 1200 });
  const solution: WavelengthSolution = {
    width: W, height: H, wave,
    model: { kind: 'legendre2d', xOrder: 1, yOrder: 1, xMin: 0, xMax: W - 1, yMin: 0, yMax: H - 1, coeffs: [lambdaAt((W - 1) / 2, (H - 1) / 2), (o.dispersion * (W - 1)) / 2, (o.dispersion * o.tiltPx * (H - 1)) / (2 * H), 0] },
    // What an arc fit with a point-sampled Gaussian measures for a pixel-integrated line: sigma^2 + 1/12 px^2.
    lsfSigmaPx: { kind: 'legendre2d', xOrder: 0, yOrder: 0, xMin: 0, xMax: W - 1, yMin: 0, yMax: H - 1, coeffs: [Math.sqrt(o.lsfPx ** 2 + 1 / 12)] },
    flipX: false, lines: [], rmsAngstrom: 0, rmsPx: 0, rmsKms: 0, identifiedRange: [wave[0]!, wave[W - 1]!], flexure: null,
  };
  return { frame, solution, sky, galaxy, vLos, halphaFlux, options: o };
}
