/**
 * Stage sky: find the galaxy along the slit, fit sky(lambda, y) = g(y) B(lambda) to the
 * galaxy-free rows at each pixel's own wavelength (following the tilt of the sky lines without
 * resampling the data), subtract it everywhere and add the model's own variance to the frame's.
 */
import { DiagnosticLog } from '../../diagnostics.js';
import { InputError, StageError } from '../../errors.js';
import { median } from '../../kernels/robust.js';
import { MASK_BITS, type CalibratedFrame, type StageResult } from '../../products/frame.js';
import type { SkyModel } from '../../products/lines.js';
import type { WavelengthSolution } from '../../products/wavelength.js';
import { requireSameGrid } from '../arc/same-grid.js';
import { emissionScore, galaxyRun, MEDIAN_STRIDE, rowMedians, rowsAbove } from './galaxy-rows.js';
import type { SkySettings } from './settings.js';
import { maskCoherentEmission } from './emission-mask.js';
import { evaluateRow, fitSkySpline, refitWithout, subtractModel, subtractModelWithVariance, type SkySpline } from './sky-spline.js';

/** Least emission score of a galaxy row: about one line with a 5-sigma peak three pixels wide (common practice for a detection floor). */
const EMISSION_FLOOR = 3;
/** For unit normal z: E[max(0, z - 3)] and E[max(0, z - 3)^2] (from the normal density and tail at 3). */
const EXCESS_MEAN = 3.82e-4;
const EXCESS_SQUARE = 2.03e-4;
/** Rows either side of a row in its emission block (9 rows: faint outer emission gains a factor 3 in S/N). */
const EMISSION_HALF_ROWS = 4;
/**
 * Rows of the first sky fit: every second, or fewer while at least FIRST_MIN_ROWS remain, so that
 * the first model's own variance stays below ~3% of the noise of a block of 2 * EMISSION_HALF_ROWS
 * + 1 rows, which the emission score compares it with.
 */
const FIRST_MIN_ROWS = 300;
const FIRST_MAX_STEP = 4;
/** Rounds of masking faint emission in the sky rows and refitting. */
const EMISSION_ROUNDS = 2;

/** Mask bits that keep a pixel out of the sky fit and, after it, out of the line fits (every bit: all of them spoil a spectrum). */
export const BAD_PIXEL_BITS = MASK_BITS.saturated | MASK_BITS.badColumn | MASK_BITS.cosmicRay | MASK_BITS.zeroFlat | MASK_BITS.outsideData;

/**
 * `spareVariance`, when given, is a full-size buffer the caller no longer needs (the input frame's
 * own variance when the caller drops that frame): the output variance is written into it, which
 * saves the fresh pages of a new 32 MB array. Each pixel is read before it is overwritten, so it
 * may be frame.var itself; it must not be any other array of the input.
 */
export function subtractSky(frame: CalibratedFrame, solution: WavelengthSolution, settings: SkySettings, spareVariance?: Float32Array): StageResult<{ frame: CalibratedFrame; sky: SkyModel }> {
  // The pixel loops are functions of their own: each is compiled once, small, where a loop in
  // this long function would have the whole function compiled again on the fly at each loop.
  const { width, height } = frame;
  const inSci = frame.sci;
  const inVar = frame.var;
  const wave = solution.wave;
  requireSameGrid(frame, solution);
  checkSettings(settings);
  if (spareVariance !== undefined) checkSpare(frame, spareVariance);
  const log = new DiagnosticLog('sky');
  const { good, rowUsable } = goodPixels(frame);
  const scratch = new Float64Array(width);

  // 1. Continuum profile and a first guess at the sky rows.
  const continuum = rowMedians(width, height, inSci, good, scratch, MEDIAN_STRIDE);
  const contRows = rowsAbove(continuum, settings.detectSigma, rowUsable);
  const firstSky = selectRows(height, rowUsable, contRows, settings.edgeRows);
  // The first sky only has to reveal line emission: one clipping round, on a few hundred rows.
  const first = fit(frame, solution, good, firstSky, 0, { ...settings, clipIterations: 1 }, firstRowStep(firstSky));
  if (first === null) throw new StageError('sky', 'no-sky', 'no usable sky rows: the galaxy or masked pixels fill the slit; name rows of clean sky (sky_rows in the manifest, regions in the sky settings)');

  // 2. Line emission over the first sky model, then the galaxy region.
  const residual = new Float32Array(width * height);
  subtractModel(first, wave, inSci, width, null, residual);
  const emission = emissionScore(width, height, residual, inVar, good, EMISSION_HALF_ROWS, scratch);
  const emRows = emissionRows(emission, rowUsable, width, settings.detectSigma);
  const flagged = new Uint8Array(height);
  for (let y = 0; y < height; y++) flagged[y] = contRows[y]! | emRows[y]!;
  // The peak is sought on continuum excess (e/px) plus emission score: whichever the galaxy shows dominates.
  const strength = new Float64Array(height);
  const contLevel = median(continuum);
  for (let y = 0; y < height; y++) strength[y] = (continuum[y]! - contLevel) + emission[y]!;
  const found = galaxyRun(flagged, strength, settings.gapRows);
  if (found === null) log.warn('no-galaxy', 'no galaxy light found along the slit; sky fitted from all rows', { expected: 'a row with continuum or emission above the sky' });
  const galaxyRegion: [number, number] = found ?? [Math.floor(height / 2), Math.floor(height / 2)];

  // 3. Sky rows: the user's, or those away from the galaxy and any other light.
  let skyRows: Uint8Array;
  if (settings.regions !== undefined) skyRows = userRows(settings.regions, height);
  else {
    const blocked = Uint8Array.from(flagged);
    if (found !== null) for (let y = Math.max(0, galaxyRegion[0] - settings.marginRows); y <= Math.min(height - 1, galaxyRegion[1] + settings.marginRows); y++) blocked[y] = 1;
    skyRows = selectRows(height, rowUsable, blocked, settings.edgeRows);
  }
  const nSky = skyRows.reduce((s, v) => s + v, 0);
  if (nSky < settings.minSkyRows) {
    log.warn('little-sky', `only ${nSky} rows of sky to fit the sky model from`, { expected: `at least ${settings.minSkyRows}`, actual: nSky });
  }
  const below = skyRows.subarray(0, galaxyRegion[0]).some((v) => v === 1);
  const above = skyRows.subarray(galaxyRegion[1] + 1).some((v) => v === 1);
  if (settings.order > 0 && nSky > 0 && !(below && above)) {
    log.warn('one-sided-sky', `sky rows lie on one side of the galaxy only: the slit factor (order ${settings.order}) is extrapolated across it`, { place: { row: galaxyRegion[0], rowEnd: galaxyRegion[1] } });
  }
  const use = new Uint8Array(good.length);
  let model = fit(frame, solution, good, skyRows, settings.order, settings, 1, use);
  if (model === null) throw new StageError('sky', 'no-sky', `too few good sky pixels to fit the sky (${nSky} sky rows); name more rows of clean sky (sky_rows in the manifest, regions in the sky settings)`);
  // Faint emission coherent along the slit in the sky rows: masked, and the sky fitted again
  // without it. The model took up part of that emission, so the residual understates it: a few
  // rounds. The slit factor is held: a row's median ratio hardly moves when a few of its
  // thousands of pixels go.
  let masked = 0;
  const emissionPixels = new Uint8Array(good.length);
  const input = { width, height, sci: inSci, var: inVar, wave, use };
  for (let round = 1; round <= EMISSION_ROUNDS; round++) {
    subtractModel(model, wave, inSci, width, skyRows, residual);
    const more = maskCoherentEmission(width, height, residual, inVar, use, emissionPixels, skyRows, EMISSION_HALF_ROWS, round);
    if (more === 0) break;
    masked += more;
    const refit = refitWithout(model, input, skyRows, emissionPixels, round);
    if (refit === null) break;
    model = refit;
  }
  if (masked > 0) log.info('sky-emission', `${masked} sky-row pixels with faint line emission left out of the sky fit`, { actual: masked });

  // 4. Subtract; variance grows by the model's own. The residual image is done with: its array
  // takes the result (one full-size allocation fewer). inVar is not read after this.
  const sci = residual;
  const variance = spareVariance ?? new Float32Array(width * height);
  subtractModelWithVariance(model, wave, inSci, inVar, width, sci, variance);
  const residualNormRms = normalisedResidual(width, height, sci, variance, good, emissionPixels, skyRows);
  const centreRow = Math.round((galaxyRegion[0] + galaxyRegion[1]) / 2);
  const value = new Float64Array(width);
  evaluateRow(model, wave, centreRow * width, width, centreRow, value, null);
  const skySpectrum = Float32Array.from(value);
  const rms = median(residualNormRms);
  if (rms > 1.5) log.warn('high-residual', `sky rows scatter ${rms.toFixed(2)} times their noise after subtraction`, { expected: 'about 1', actual: Number(rms.toFixed(3)) });
  log.info('fitted', `sky from ${nSky} rows (${model.used} pixels), galaxy in rows ${galaxyRegion[0]}-${galaxyRegion[1]}`, { place: { row: galaxyRegion[0], rowEnd: galaxyRegion[1] } });

  const sky: SkyModel = {
    skyRegions: ranges(skyRows),
    galaxyRegion,
    skySpectrum,
    residualNormRms,
    slitFactor: Float32Array.from(model.slit),
    emissionProfile: emission,
  };
  return { product: { frame: { ...frame, sci, var: variance }, sky }, diagnostics: log.items };
}

/** Pixels the sky fit and the profiles may use, and the rows with at least half of them. */
function goodPixels(frame: CalibratedFrame): { good: Uint8Array; rowUsable: Uint8Array } {
  const { width, height, mask, sci } = frame;
  const variance = frame.var;
  const good = new Uint8Array(width * height);
  const rowUsable = new Uint8Array(height);
  for (let y = 0; y < height; y++) {
    let n = 0;
    for (let x = 0, i = y * width; x < width; x++, i++) {
      const ok = (mask[i]! & BAD_PIXEL_BITS) === 0 && variance[i]! > 0 && Number.isFinite(sci[i]!) ? 1 : 0;
      good[i] = ok;
      n += ok;
    }
    rowUsable[y] = n >= width / 2 ? 1 : 0;
  }
  return { good, rowUsable };
}

/** A spare buffer of the wrong size, or one of the input's other arrays, is a programming error. */
function checkSpare(frame: CalibratedFrame, spare: Float32Array): void {
  if (spare.length !== frame.width * frame.height) throw new RangeError(`subtractSky: spare variance has ${spare.length} values for a ${frame.width}x${frame.height} frame`);
  if (spare.buffer === frame.sci.buffer || spare.buffer === frame.mask.buffer) throw new RangeError('subtractSky: the spare variance shares memory with the frame\'s SCI or MASK');
}

function checkSettings(s: SkySettings): void {
  const bad = (key: string, expected: string, actual: unknown): never => {
    throw new InputError('sky.bad-setting', `invalid sky setting ${key}`, { key: `sky.${key}` }, { expected, actual: JSON.stringify(actual) });
  };
  if (!Number.isInteger(s.order) || s.order < 0 || s.order > 5) bad('order', 'an integer from 0 to 5', s.order);
  if (!(s.knotSpacingPx >= 0.25 && s.knotSpacingPx <= 10)) bad('knotSpacingPx', 'a spacing from 0.25 to 10 pixels', s.knotSpacingPx);
  if (!(s.clipSigma > 0)) bad('clipSigma', 'a positive number of sigmas', s.clipSigma);
  if (!(s.detectSigma > 0)) bad('detectSigma', 'a positive number of sigmas', s.detectSigma);
  for (const key of ['edgeRows', 'marginRows', 'gapRows', 'clipIterations', 'minSkyRows'] as const) {
    if (!Number.isInteger(s[key]) || s[key] < 0) bad(key, 'an integer >= 0', s[key]);
  }
}

/** Fit the sky to the good pixels of `rows`; `use` (filled here) ends as the pixels the fit kept. */
function fit(frame: CalibratedFrame, solution: WavelengthSolution, good: Uint8Array, rows: Uint8Array, order: number, settings: SkySettings, rowStep = 1, use = new Uint8Array(good.length)): SkySpline | null {
  const { width, height } = frame;
  for (let y = 0; y < height; y++) if (rows[y]) use.set(good.subarray(y * width, (y + 1) * width), y * width);
  return fitSkySpline({ width: frame.width, height: frame.height, sci: frame.sci, var: frame.var, wave: solution.wave, use }, order, settings.knotSpacingPx, settings.clipSigma, settings.clipIterations, rowStep);
}

/**
 * Rows with line emission: a score above the lower quartile of all rows (sky rows, and whatever
 * sky-model residual every row shares) by detectSigma times the spread noise alone gives a row
 * of `width` columns, and by at least EMISSION_FLOOR.
 */
function emissionRows(score: Float64Array, usable: Uint8Array, width: number, detectSigma: number): Uint8Array {
  const values: number[] = [];
  score.forEach((v, y) => {
    if (usable[y]) values.push(v);
  });
  values.sort((a, b) => a - b);
  const base = values.length > 0 ? values[Math.floor(values.length / 4)]! : 0;
  const threshold = base + Math.max(EMISSION_FLOOR, detectSigma * Math.sqrt(width * EXCESS_SQUARE) + width * EXCESS_MEAN);
  return Uint8Array.from(score, (v, y) => (usable[y] && v > threshold ? 1 : 0));
}

function firstRowStep(rows: Uint8Array): number {
  let n = 0;
  for (let y = 0; y < rows.length; y++) n += rows[y]!;
  return Math.min(FIRST_MAX_STEP, Math.max(2, Math.floor(n / FIRST_MIN_ROWS)));
}

function selectRows(height: number, usable: Uint8Array, blocked: Uint8Array, edgeRows: number): Uint8Array {
  const out = new Uint8Array(height);
  for (let y = edgeRows; y < height - edgeRows; y++) out[y] = usable[y]! && !blocked[y] ? 1 : 0;
  return out;
}

function userRows(regions: [number, number][], height: number): Uint8Array {
  const out = new Uint8Array(height);
  regions.forEach(([a, b], k) => {
    if (!Number.isInteger(a) || !Number.isInteger(b) || a < 0 || b >= height || a > b) {
      throw new InputError('sky.bad-region', `sky region ${k} is [${a}, ${b}]`, { key: `sky.regions[${k}]` }, { expected: `integer rows with 0 <= first <= last <= ${height - 1}`, actual: `[${a}, ${b}]` });
    }
    out.fill(1, a, b + 1);
  });
  return out;
}

/** Inclusive ranges of the set rows. */
function ranges(rows: Uint8Array): [number, number][] {
  const out: [number, number][] = [];
  for (let y = 0; y < rows.length; y++) {
    if (!rows[y]) continue;
    const start = y;
    while (y + 1 < rows.length && rows[y + 1]) y++;
    out.push([start, y]);
  }
  return out;
}

/** Per column: RMS of residual / sqrt(variance) over the good sky pixels, galaxy emission found in the sky rows left out. */
function normalisedResidual(width: number, height: number, sci: Float32Array, variance: Float32Array, good: Uint8Array, emission: Uint8Array, skyRows: Uint8Array): Float32Array {
  const sum = new Float64Array(width);
  const count = new Uint32Array(width);
  for (let y = 0; y < height; y++) {
    if (!skyRows[y]) continue;
    for (let x = 0; x < width; x++) {
      const i = y * width + x;
      if (!good[i] || emission[i]) continue;
      sum[x] += (sci[i]! * sci[i]!) / variance[i]!;
      count[x]++;
    }
  }
  return Float32Array.from(sum, (s, x) => (count[x]! > 0 ? Math.sqrt(s / count[x]!) : NaN));
}
