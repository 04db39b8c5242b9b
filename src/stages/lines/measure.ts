/**
 * Stage lines: starting from the galaxy's centre row, rows are summed into bins outward along
 * the slit until the binning line (H-alpha when asked for) reaches the S/N target; in each bin
 * every line group is fitted on the bin's native pixels, starting from the neighbouring bin's
 * velocity and width. Bins whose S/N stays below `freeWidthSnr` are refitted with the width held
 * at the median of the bins above it. Output: the measurements with flags, the row bins, the
 * fitted windows for the report and the continuum profile.
 */
import { DiagnosticLog } from '../../diagnostics.js';
import { InputError, StageError } from '../../errors.js';
import { evalLegendre2D } from '../../kernels/legendre.js';
import { median } from '../../kernels/robust.js';
import { lowerIndex } from '../../kernels/sorted-search.js';
import { SPEED_OF_LIGHT_KMS as C } from '../../physics/constants.js';
import type { CalibratedFrame, StageResult } from '../../products/frame.js';
import { LINE_FLAGS, type BinFit, type LineMeasurement, type LineTable, type RowBin, type SkyModel } from '../../products/lines.js';
import type { WavelengthSolution } from '../../products/wavelength.js';
import { requireSameGrid } from '../arc/same-grid.js';
import { BAD_PIXEL_BITS } from '../sky/subtract.js';
import { fitBinGroups, refitHeldWidth, type GroupWindow, type InstrumentalSigma, type VelocityState } from './bin-fits.js';
import { BinSpectrum } from './bin-spectrum.js';
import { continuumProfile } from './continuum.js';
import { groupSpecs } from './group-spec.js';
import { toBinFit, toMeasurements } from './measurements.js';
import { guessVelocity } from './redshift-guess.js';
import type { LineSettings } from './settings.js';
import { binRows, MIN_BIN_SNR, type BinRecord, type WalkContext } from './walk.js';

/** Starting intrinsic dispersion of the gas (km/s), common practice for disk H II regions. */
const START_DISPERSION_KMS = 20;

export function measureLines(frame: CalibratedFrame, solution: WavelengthSolution, sky: SkyModel, settings: LineSettings): StageResult<LineTable> {
  checkSettings(settings);
  const log = new DiagnosticLog('lines');
  const { width, height } = frame;
  requireSameGrid(frame, solution);
  const specs = groupSpecs(settings.lines);
  const binName = settings.lines.includes('Halpha') ? 'Halpha' : settings.lines[0]!;
  const binGroup = specs.findIndex((g) => g.members.includes(binName));
  const binMember = specs[binGroup]!.members.indexOf(binName);
  const binRest = specs[binGroup]!.rest[binMember]!;
  const wave = solution.wave;
  const instrumental: InstrumentalSigma = (x, y) => {
    const xi = Math.min(width - 2, Math.max(1, Math.round(x)));
    const yi = Math.min(height - 1, Math.max(0, Math.round(y)));
    const dispersion = 0.5 * (wave[yi * width + xi + 1]! - wave[yi * width + xi - 1]!);
    return evalLegendre2D(solution.lsfSigmaPx, x, y) * dispersion;
  };

  // Centre row: the continuum peak in the galaxy region (5-row running mean), else the emission peak.
  const allColumns = continuumProfile(frame, wave, [], BAD_PIXEL_BITS, 4);
  const centreRow = findCentreRow(allColumns, sky);

  // Starting velocity.
  const central = new BinSpectrum(frame, wave, BAD_PIXEL_BITS);
  for (let y = Math.max(0, centreRow - 2); y <= Math.min(height - 1, centreRow + 2); y++) central.addRow(y, 1);
  const startSigmaAngstrom = Math.hypot(instrumental(width / 2, centreRow), (START_DISPERSION_KMS / C) * binRest);
  let vStart = settings.redshiftGuessKms ?? null;
  if (vStart === null) {
    const others = specs[binGroup]!.rest.filter((_, k) => k !== binMember);
    vStart = guessVelocity(central, binRest, others, startSigmaAngstrom);
    if (vStart === null) throw new StageError('lines', 'no-emission', `no ${binName} emission found near the centre row ${centreRow}; check that the spectrum covers ${binName} at the galaxy's redshift (library callers may give redshiftGuessKms, km/s)`);
    log.info('velocity-guess', `starting velocity ${vStart.toFixed(1)} km/s from the strongest ${binName} peak near row ${centreRow}`, { place: { row: centreRow, line: binName } });
  }
  const start: VelocityState = { vKms: vStart, sigmaKms: (C * startSigmaAngstrom) / binRest };

  const restMin = Math.min(...specs.flatMap((g) => g.rest));
  const restMax = Math.max(...specs.flatMap((g) => g.rest));
  const midRow = wave.subarray(Math.floor(height / 2) * width, (Math.floor(height / 2) + 1) * width);
  const columns = (state: VelocityState): [number, number] => {
    // Every window: the velocity tolerance twice (the next bin may move), windowSigmas and the
    // quick-flux sidebands (8 sigma) of a width up to 1.5 times the current one beyond the outer lines,
    // and 10% for the tilt of the lines.
    const z = 1 + state.vKms / C;
    const margin = (2 * settings.velocityToleranceKms + (settings.windowSigmas + 8) * 1.5 * state.sigmaKms) / C;
    const a = lowerIndex(midRow, restMin * z * (1 - margin));
    const b = lowerIndex(midRow, restMax * z * (1 + margin));
    const slack = Math.ceil(0.1 * (b - a)) + 10;
    return [a - slack, b + slack];
  };
  const ctx: WalkContext = { frame, wave, badBits: BAD_PIXEL_BITS, settings, binRest, instrumental, fit: (bin, state) => fitBinGroups(bin, specs, state, settings, instrumental), binGroup, binMember, columns };
  const records = binRows(ctx, centreRow, start);
  if (records.length === 0) throw new StageError('lines', 'no-emission', `${binName} never reached S/N ${MIN_BIN_SNR} in any bin around row ${centreRow}, up to ${settings.maxBinRows} rows a bin: the line is too faint here, or the starting velocity ${vStart.toFixed(0)} km/s is off (library callers may raise maxBinRows or give redshiftGuessKms)`);

  // Width held where S/N is low, at the median velocity width of the bins above freeWidthSnr; a
  // group with no such bin borrows the binning group's (same gas, nearly the same instrument).
  const own = heldWidths(records, specs.length, settings.freeWidthSnr);
  const held = own.map((r) => (r === r ? r : own[binGroup]!));
  const bins: RowBin[] = [];
  const measurements: LineMeasurement[] = [];
  const fits: BinFit[] = [];
  records.sort((a, b) => a.bin.rowStart - b.bin.rowStart);
  let heldCount = 0;
  records.forEach((rec, b) => {
    bins.push(rec.bin);
    rec.groups.forEach((g, gi) => {
      if (g === null) return;
      let fit = g.fit;
      const ratio = held[gi]!;
      const hold = ratio === ratio && groupSnr(g) < settings.freeWidthSnr;
      if (hold) {
        fit = refitHeldWidth(g, ratio * g.fit.centre, settings.scaleByChi2);
        heldCount++;
      }
      measurements.push(...toMeasurements(b, g, fit, hold, sky.residualNormRms, settings));
      fits.push(toBinFit(b, g, fit));
    });
  });

  for (const [gi, spec] of specs.entries()) {
    if (own[gi] !== own[gi]) {
      const borrowed = held[gi] === held[gi];
      log.warn('width-unconstrained', `no ${spec.name} bin reached S/N ${settings.freeWidthSnr}: ${borrowed ? `width held at the ${specs[binGroup]!.name} median` : 'widths left free at every S/N'}`, { place: { line: spec.name } });
    }
    const missing = records.filter((r) => r.groups[gi] === null).length;
    if (missing > 0) log.warn('group-not-fitted', `${spec.name} could not be fitted in ${missing} of ${records.length} bins (window outside the frame or masked)`, { place: { line: spec.name } });
  }
  summarise(log, measurements, bins, heldCount);

  const zSys = 1 + vStart / C;
  const exclude = specs.flatMap((s) => s.rest.map((r): [number, number] => [r * zSys * (1 - 1000 / C), r * zSys * (1 + 1000 / C)]));
  return {
    product: { bins, measurements, fits, continuumProfile: continuumProfile(frame, wave, exclude, BAD_PIXEL_BITS, 2), sky },
    diagnostics: log.items,
  };
}

function checkSettings(s: LineSettings): void {
  const bad = (key: string, expected: string, actual: unknown): never => {
    throw new InputError('lines.bad-setting', `invalid line setting ${key}`, { key: `lines.${key}` }, { expected, actual: JSON.stringify(actual) });
  };
  if (!Array.isArray(s.lines) || s.lines.length === 0) bad('lines', 'a non-empty list of line names', s.lines);
  if (!(s.snrTarget > 0)) bad('snrTarget', 'a positive number', s.snrTarget);
  if (!Number.isInteger(s.maxBinRows) || s.maxBinRows < 1) bad('maxBinRows', 'an integer >= 1', s.maxBinRows);
  if (s.redshiftGuessKms !== undefined && !Number.isFinite(s.redshiftGuessKms)) bad('redshiftGuessKms', 'a velocity in km/s', s.redshiftGuessKms);
  if (!Number.isInteger(s.maxFailedBins) || s.maxFailedBins < 1) bad('maxFailedBins', 'an integer >= 1', s.maxFailedBins);
  if (typeof s.scaleByChi2 !== 'boolean') bad('scaleByChi2', 'true or false', s.scaleByChi2);
  for (const key of ['freeWidthSnr', 'velocityToleranceKms', 'windowSigmas', 'poorFitChi2', 'skyResidualLimit', 'maxDispersionKms'] as const) {
    if (!(s[key] > 0) || !Number.isFinite(s[key])) bad(key, 'a positive number', s[key]);
  }
}

function findCentreRow(profile: Float64Array, sky: SkyModel): number {
  const [lo, hi] = sky.galaxyRegion;
  const level = median(profile);
  let best = Math.round((lo + hi) / 2);
  let bestValue = -Infinity;
  for (let y = lo; y <= hi; y++) {
    let s = 0;
    let n = 0;
    for (let k = Math.max(0, y - 2); k <= Math.min(profile.length - 1, y + 2); k++) if (profile[k] === profile[k]) (s += profile[k]!), n++;
    const v = n > 0 ? s / n - level : -Infinity;
    if (v > bestValue) (bestValue = v), (best = y);
  }
  if (bestValue > 0) return best;
  let peak = best;
  for (let y = lo; y <= hi; y++) if (sky.emissionProfile[y]! > sky.emissionProfile[peak]!) peak = y;
  return peak;
}

/** Largest S/N among a group's lines with a free flux. */
function groupSnr(g: GroupWindow): number {
  let best = 0;
  g.spec.members.forEach((_, k) => {
    if (g.spec.fluxFactor[k] === 1 && g.fit.fluxErr[k]! > 0) best = Math.max(best, g.fit.flux[k]! / g.fit.fluxErr[k]!);
  });
  return best;
}

/** Per group: median of sigma / centre over well-fitted bins with S/N >= freeWidthSnr (NaN if none). */
function heldWidths(records: BinRecord[], nGroups: number, freeWidthSnr: number): number[] {
  const out: number[] = [];
  for (let gi = 0; gi < nGroups; gi++) {
    const ratios: number[] = [];
    for (const r of records) {
      const g = r.groups[gi];
      if (g && g.fit.converged && !g.fit.shapeAtBound && groupSnr(g) >= freeWidthSnr) ratios.push(g.fit.sigma / g.fit.centre);
    }
    out.push(ratios.length > 0 ? median(ratios) : NaN);
  }
  return out;
}

function summarise(log: DiagnosticLog, measurements: LineMeasurement[], bins: RowBin[], heldCount: number): void {
  const count = (bit: number): number => measurements.filter((m) => (m.flags & bit) !== 0).length;
  const rows = bins.reduce((s, b) => s + b.rowEnd - b.rowStart + 1, 0);
  log.info('measured', `${measurements.length} line measurements in ${bins.length} bins over ${rows} rows; ${heldCount} group fits with the width held`);
  const notConverged = count(LINE_FLAGS.notConverged);
  if (notConverged > 0) log.warn('not-converged', `${notConverged} line fits did not converge`, { actual: notConverged });
  const atBound = count(LINE_FLAGS.atBound);
  if (atBound > 0) log.warn('at-bound', `${atBound} line fits ended on a bound (centre, width or a flux at zero)`, { actual: atBound });
  const poor = count(LINE_FLAGS.poorFit);
  if (poor > 0) log.warn('poor-fit', `${poor} line fits have a reduced chi-square above the limit`, { actual: poor });
}
