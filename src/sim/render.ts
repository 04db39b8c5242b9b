/**
 * The expected light of each kind of frame, in electrons per internal pixel before the detector
 * response: the quartz lamp of the flats, the Ne+Ar lamp of the arcs, and the night sky plus the
 * galaxy of a science exposure.
 */
import { SPEED_OF_LIGHT_KMS } from '../physics/constants.js';
import { GALAXY_LINES, loadLampLines, skyLines } from '../physics/catalogues.js';
import { addContinuum, addMovingLines, addUniformLines, type MovingLine, type UniformLine } from './light.js';
import { rowEdgeWavelengths } from './optics.js';
import type { Rng } from '../kernels/random.js';
import { SIZES } from './scenario.js';
import type { SimSize } from './options.js';
import { continuumRate, halphaRate } from './targets.js';
import { trueLsfSigmaPx, type ExposureTruth, type SetupTruth, type TargetTruth } from './truth.js';
import { erf } from './erf.js';

/** Peak of a flat, electrons per pixel (~30000 ADU at gain 1.4). */
const FLAT_PEAK_E = 42000;
/** Quartz lamp colour temperature, K, and the grating's efficiency peak and width (Angstrom). */
const LAMP_TEMPERATURE_K = 3100;
const BLAZE_ANGSTROM = 6300;
const BLAZE_WIDTH_ANGSTROM = 1600;
/** The brightest arc line peaks at this fraction of the electrons that saturate the converter. */
const ARC_BRIGHTEST_PEAK_FRACTION = 0.85;
/** Arc line flux ~ (catalogue intensity)^ARC_INTENSITY_POWER: the catalogue ranks, a lamp spreads wider. */
const ARC_INTENSITY_POWER = 2.2;

/** Quartz lamp x grating efficiency, relative (Planck's law in wavelength; Gaussian efficiency). */
function flatShape(lambda: number): number {
  const hcOverK = 1.438777e8; // h c / k in Angstrom K (CODATA, from memory)
  const planck = 1 / (lambda ** 5 * (Math.exp(hcOverK / (lambda * LAMP_TEMPERATURE_K)) - 1));
  return planck * Math.exp(-0.5 * ((lambda - BLAZE_ANGSTROM) / BLAZE_WIDTH_ANGSTROM) ** 2);
}

export function renderFlat(setup: SetupTruth, out: Float32Array): void {
  const W = setup.internalWidth;
  const edges = rowEdgeWavelengths(setup, setup.lineShift.refRow, new Float64Array(W + 1));
  let peak = 0;
  for (let d = 0; d < W; d++) peak = Math.max(peak, flatShape(0.5 * (edges[d]! + edges[d + 1]!)) * (edges[d + 1]! - edges[d]!));
  const rows = new Float64Array(setup.internalHeight).fill(FLAT_PEAK_E / peak);
  addContinuum(setup, flatShape, rows, out);
}

/** Electrons per row of each lamp line; `lineFactors` is the lamp's fixed line-to-line spread. */
export function arcLines(setup: SetupTruth, lineFactors: Map<number, number>): UniformLine[] {
  const W = setup.internalWidth;
  const lo = setup.dispersion.coeffs[0]! - setup.dispersion.coeffs[1]! * 1.1;
  const hi = setup.dispersion.coeffs[0]! + setup.dispersion.coeffs[1]! * 1.1;
  const lines = loadLampLines(['Ne', 'Ar']).filter((l) => l.wavelength > lo && l.wavelength < hi);
  const det = setup.detector;
  const satE = (det.saturationAdu - det.biasLevelAdu) * det.gainEPerAdu;
  const sigma = trueLsfSigmaPx(setup, (W - 1) / 2);
  const peakFraction = erf(0.5 / (Math.SQRT2 * sigma));
  const weights = lines.map((l) => l.intensity ** ARC_INTENSITY_POWER * (lineFactors.get(l.wavelength) ?? 1));
  const top = Math.max(...weights);
  return lines.map((l, i) => ({ wavelength: l.wavelength, electrons: (ARC_BRIGHTEST_PEAK_FRACTION * satE * weights[i]!) / (top * peakFraction) }));
}

/** A fixed random factor per lamp line (log-normal, 0.15 dex): lamps differ from the catalogue. */
export function lampLineFactors(rng: Rng): Map<number, number> {
  const factors = new Map<number, number>();
  for (const l of loadLampLines(['Ne', 'Ar'])) factors.set(l.wavelength, 10 ** (0.15 * rng.normal()));
  return factors;
}

export function renderArc(setup: SetupTruth, lines: UniformLine[], out: Float32Array): void {
  addUniformLines(setup, lines, out);
}

/** Night sky: a continuum and the emission lines of config/lines/sky.txt, the same in every row. */
export function renderSky(setup: SetupTruth, size: SimSize, exptimeS: number, out: Float32Array): void {
  const spec = SIZES[size];
  const perAngstrom = spec.skyContinuumEPerSPerPx / spec.dispersionAngstromPerPx;
  const rows = new Float64Array(setup.internalHeight).fill(exptimeS);
  addContinuum(setup, (l) => perAngstrom * (1 + 0.25 * (l - 6650) / 1000), rows, out);
  const lines = skyLines().map((l) => ({ wavelength: l.wavelength, electrons: (l.intensity / 100) * spec.skyLineEPerSPer100 * exptimeS }));
  addUniformLines(setup, lines, out);
}

/** The galaxy's stellar continuum in an exposure of `exptimeS`. */
export function renderStars(setup: SetupTruth, size: SimSize, target: TargetTruth, exptimeS: number, out: Float32Array): void {
  const H = setup.internalHeight;
  const rows = new Float64Array(H);
  for (let s = 0; s < H; s++) rows[s] = exptimeS * continuumRate(target, s);
  const perAngstrom = 1 / SIZES[size].dispersionAngstromPerPx;
  addContinuum(setup, (l) => perAngstrom * (1 - 0.15 * (l - 6650) / 1000), rows, out);
}

/**
 * The galaxy's emission lines in one exposure, each row at its true v_los. Observed wavelength:
 * (1 + z_obs) = (1 + z_bary) / (1 + v_B / c), the barycentric correction combined
 * multiplicatively (Wright & Eastman 2014, PASP 126, 838). The shift is applied to the air
 * wavelength, as the pipeline measures it; shifting in vacuum and converting back (Morton 2000)
 * differs by 0.016 km/s at cz = 2200 km/s (computed), far below any measurement error.
 */
export function renderGas(setup: SetupTruth, target: TargetTruth, exposure: ExposureTruth, out: Float32Array): void {
  const H = setup.internalHeight;
  const t = exposure.exptimeS;
  const factor = new Float64Array(H);
  const vB = exposure.barycentricCorrectionKms;
  for (let s = 0; s < H; s++) factor[s] = (1 + target.vLosKms[s]! / SPEED_OF_LIGHT_KMS) / (1 + vB / SPEED_OF_LIGHT_KMS);
  const halpha = new Float64Array(H);
  for (let s = 0; s < H; s++) halpha[s] = t * halphaRate(target, s);
  const lines: MovingLine[] = Object.entries(target.emission.ratios).map(([name, ratio]) => ({
    restAngstrom: GALAXY_LINES[name]!.air,
    electrons: halpha.map((v) => v * ratio),
  }));
  addMovingLines(setup, lines, factor, target.gasDispersionKms, out);
}
