/**
 * Zero point of the wavelength scale in a science frame from night-sky lines: each usable sky
 * line is fitted (one Gaussian and a linear continuum, src/kernels/gaussian-fit.ts) to the pixels
 * of all sky rows around it, placed by the arc solution in wavelength; the shift is the
 * error-weighted mean of (catalogue - measured), and lines that disagree beyond their errors
 * inflate its error and raise a warning.
 */
import { DiagnosticLog } from '../../diagnostics.js';
import { chi2ErrorScale, chi2NoiseLimit } from '../../kernels/chi2-scale.js';
import { fitGaussianLine } from '../../kernels/gaussian-fit.js';
import { evalLegendre2D, legendre2DStepX } from '../../kernels/legendre.js';
import { lowerIndex } from '../../kernels/sorted-search.js';
import { weightedMean } from '../../kernels/weighted-mean.js';
import { SPEED_OF_LIGHT_KMS } from '../../physics/constants.js';
import type { SkyLine } from '../../physics/catalogues.js';
import type { CalibratedFrame, StageResult } from '../../products/frame.js';
import type { FlexureMeasurement, WavelengthSolution } from '../../products/wavelength.js';
import { checkFlexureSettings, type FlexureSettings } from './settings.js';
import { requireSameGrid } from './same-grid.js';
import { givenSkyRows, skyRowMask } from './sky-rows.js';

/** Sky lines closer than this many LSF sigmas to a neighbour above a tenth of their intensity are blends (common practice). */
const BLEND_SIGMAS = 4;
/** A shift beyond this many sigmas is a disagreement between sky and arc worth a warning (common practice). */
const SIGNIFICANT_SIGMAS = 3;
/** A fitted width outside this factor of the instrumental width is not a clean sky line (common practice). */
const WIDTH_FACTOR = 2;

/** Stacked pixels per wavelength bin: a tenth of a pixel wide, so the binning cannot move a centroid (common practice). */
const BINS_PER_PIXEL = 10;

interface Stack {
  /** Inverse-variance-weighted mean wavelength, value and total weight of each non-empty bin. */
  x: Float64Array;
  y: Float64Array;
  w: Float64Array;
}

/**
 * Pixels of the sky rows whose wavelength lies within `half` Angstrom of `centre` (row
 * wavelengths increase with x), stacked into narrow wavelength bins by inverse-variance weights.
 */
function stackAround(frame: CalibratedFrame, wave: Float64Array, sky: Uint8Array, centre: number, half: number, binAngstrom: number): Stack {
  const { width, height } = frame;
  const nBins = Math.max(1, Math.ceil((2 * half) / binAngstrom));
  const sw = new Float64Array(nBins);
  const swx = new Float64Array(nBins);
  const swy = new Float64Array(nBins);
  const start = centre - half;
  for (let row = 0; row < height; row++) {
    if (!sky[row]) continue;
    const base = row * width;
    for (let x = lowerIndex(wave.subarray(base, base + width), start); x < width && wave[base + x]! <= centre + half; x++) {
      const i = base + x;
      const v = frame.var[i]!;
      if (frame.mask[i] !== 0 || !(v > 0)) continue;
      const b = Math.min(nBins - 1, Math.floor((wave[i]! - start) / binAngstrom));
      const w = 1 / v;
      sw[b] += w;
      swx[b] += w * wave[i]!;
      swy[b] += w * frame.sci[i]!;
    }
  }
  return nonEmptyBins(sw, swx, swy);
}

/**
 * The stack of the non-empty bins. A function of its own: code after stackAround's long loop has
 * no type feedback when V8 compiles that loop on the fly, and would send every later call back
 * to the interpreter.
 */
function nonEmptyBins(sw: Float64Array, swx: Float64Array, swy: Float64Array): Stack {
  const nBins = sw.length;
  let n = 0;
  for (let b = 0; b < nBins; b++) if (sw[b]! > 0) n++;
  const out: Stack = { x: new Float64Array(n), y: new Float64Array(n), w: new Float64Array(n) };
  let k = 0;
  for (let b = 0; b < nBins; b++) {
    if (!(sw[b]! > 0)) continue;
    out.x[k] = swx[b]! / sw[b]!;
    out.y[k] = swy[b]! / sw[b]!;
    out.w[k] = sw[b]!;
    k++;
  }
  return out;
}

/** out[i] = arcWave[i] + shift; `out` may be arcWave itself (each value is read before it is written). */
function shiftWave(arcWave: Float64Array, shift: number, out: Float64Array): Float64Array {
  for (let i = 0; i < arcWave.length; i++) out[i] = arcWave[i]! + shift;
  return out;
}

/**
 * The solution shifted by the night-sky lines of `science`. The shifted wavelengths go into `out`,
 * a new array unless the caller passes one: `solution.wave` itself when nothing reads the
 * unshifted values any more (a fresh full-frame array costs ~70 ms of page faults at 4096 x 2048).
 */
export function measureFlexure(science: CalibratedFrame, solution: WavelengthSolution, skyLines: SkyLine[], settings: FlexureSettings, out: Float64Array = new Float64Array(solution.wave.length)): StageResult<WavelengthSolution> {
  requireSameGrid(science, solution);
  checkFlexureSettings(settings);
  const log = new DiagnosticLog('arc');
  const file = science.exposures[0]?.path;
  const place = file ? { file } : {};
  const { width, height } = science;
  const yMid = (height - 1) / 2;
  const xMid = (width - 1) / 2;
  const dispersion = legendre2DStepX(solution.model, xMid, yMid);
  const lambdaMid = evalLegendre2D(solution.model, xMid, yMid);
  const sigmaA = evalLegendre2D(solution.lsfSigmaPx, xMid, yMid) * dispersion;
  const half = settings.searchAngstrom + 4 * sigmaA;
  const lo = evalLegendre2D(solution.model, 0, yMid) + half;
  const hi = evalLegendre2D(solution.model, width - 1, yMid) - half;
  const sorted = [...skyLines].sort((a, b) => a.wavelength - b.wavelength);
  const candidates = sorted.filter((l, i) => {
    if (l.wavelength < lo || l.wavelength > hi) return false;
    return ![sorted[i - 1], sorted[i + 1]].some((m) => m && Math.abs(m.wavelength - l.wavelength) < BLEND_SIGMAS * sigmaA && m.intensity > 0.1 * l.intensity);
  });
  const sky = settings.skyRows ? givenSkyRows(settings.skyRows, height) : skyRowMask(science, settings.galaxyRowSigma);
  const nSky = sky.reduce((a, b) => a + b, 0);
  const lines: FlexureMeasurement['lines'] = [];
  for (const line of candidates) {
    const s = stackAround(science, solution.wave, sky, line.wavelength, half, Math.abs(dispersion) / BINS_PER_PIXEL);
    if (s.x.length < 8) continue;
    let base = Infinity;
    let peak = -Infinity;
    for (let i = 0; i < s.y.length; i++) {
      base = Math.min(base, s.y[i]!);
      peak = Math.max(peak, s.y[i]!);
    }
    const fit = fitGaussianLine(s.x, s.y, s.w, { amplitude: Math.max(peak - base, 1e-6), centre: line.wavelength, sigma: sigmaA, c0: base }, {
      centreRange: [line.wavelength - settings.searchAngstrom, line.wavelength + settings.searchAngstrom],
      sigmaRange: [sigmaA / WIDTH_FACTOR, sigmaA * WIDTH_FACTOR],
      scaleByChi2: true,
    });
    const snr = fit.amplitude / fit.errors.amplitude;
    const used = fit.converged && !fit.atBound && snr >= settings.minSnr && Number.isFinite(fit.errors.centre) && fit.errors.centre > 0;
    lines.push({ wavelength: line.wavelength, name: line.name, measured: fit.centre, error: fit.errors.centre, used });
  }
  const usable = lines.filter((l) => l.used);
  let shift = 0;
  let shiftErr = NaN;
  if (usable.length === 0) {
    log.warn('no-sky-lines', `no usable night-sky line (${candidates.length} in range, ${nSky} sky rows): flexure not corrected (shift 0)`, { place });
  } else {
    const { mean, err, chi2 } = weightedMean(usable.map((l) => l.wavelength - l.measured), usable.map((l) => l.error));
    shift = mean;
    shiftErr = err;
    const dof = usable.length - 1;
    const scale = chi2ErrorScale(chi2, dof);
    if (scale > 1) {
      shiftErr *= scale;
      log.warn('flexure-disagree', `the ${usable.length} sky lines disagree about the shift beyond their errors (chi2 ${chi2.toFixed(1)} for ${dof} dof); error scaled by sqrt(chi2/dof)`, { place, expected: `chi2 <= ${chi2NoiseLimit(dof).toFixed(1)}`, actual: chi2.toFixed(1) });
    }
    const summary = `sky-line shift ${shift.toFixed(4)} +- ${shiftErr.toFixed(4)} A (${((shift / lambdaMid) * SPEED_OF_LIGHT_KMS).toFixed(2)} km/s, ${(shift / dispersion).toFixed(3)} px) from ${usable.length} lines in ${nSky} sky rows; applied`;
    // the sky lines disagree with the arc beyond their errors: the correction matters, say so
    if (Math.abs(shift) > SIGNIFICANT_SIGMAS * shiftErr) log.warn('flexure', `the night-sky lines disagree with the arc solution by ${(Math.abs(shift) / shiftErr).toFixed(1)} sigma: ${summary}`, { place, expected: '0 A', actual: `${shift.toFixed(4)} +- ${shiftErr.toFixed(4)} A` });
    else log.info('flexure', summary, { place });
    if (Math.abs(shift) > 2 * Math.abs(dispersion)) log.warn('large-flexure', `the sky lines are ${(shift / dispersion).toFixed(2)} px off the arc solution: more than the usual 0.1-2 px of flexure (common practice); check that the arc belongs to this setup`, { place });
  }
  const wave = shiftWave(solution.wave, shift, out);
  const flexure: FlexureMeasurement = { shiftAngstrom: shift, shiftErrAngstrom: shiftErr, shiftKms: (shift / lambdaMid) * SPEED_OF_LIGHT_KMS, lines };
  return { product: { ...solution, wave, flexure }, diagnostics: log.items };
}
