/**
 * The wavelength solution of an arc frame: lines detected in row bands, identified in the central
 * band, traced along the slit, and a tensor-product Legendre lambda(x, y) fitted to all of them
 * with clipping; the line widths give the instrumental sigma(x, y).
 */
import { DiagnosticLog } from '../../diagnostics.js';
import { StageError } from '../../errors.js';
import { evalLegendre2D, evalLegendre2DGrid, legendre2DStepX } from '../../kernels/legendre.js';
import { fitLegendre2D } from '../../kernels/legendre-fit.js';
import { median } from '../../kernels/robust.js';
import { SPEED_OF_LIGHT_KMS } from '../../physics/constants.js';
import type { LampLine } from '../../physics/catalogues.js';
import type { CalibratedFrame, StageResult } from '../../products/frame.js';
import type { ArcLineMeasurement, WavelengthSolution } from '../../products/wavelength.js';
import { extractBands } from './band-spectra.js';
import { measureBandPeaks } from './band-peaks.js';
import { isClean } from './centroids.js';
import { identifyLines } from './identify.js';
import { CENTROID_FLOOR_PX, fitMatches, matchPeaks } from './match.js';
import { chooseOrder1D, chooseOrderY } from './order-choice.js';
import { checkArcSettings, type ArcSettings } from './settings.js';
import { traceLines, type TracePeak } from './trace.js';
import { reportExtrapolation } from './extrapolation.js';

/** Highest x order tried while identifying when the order is 'auto' (the BIC then picks the final one). */
const IDENTIFY_ORDER = 5;

/** The arc's name for messages: the first exposure's path, else FILENAME, else 'arc'. */
function arcName(arc: CalibratedFrame): string {
  return arc.exposures[0]?.path ?? arc.header.getString('FILENAME') ?? 'arc';
}

export function solveWavelengths(arc: CalibratedFrame, lampLines: LampLine[], settings: ArcSettings): StageResult<WavelengthSolution> {
  checkArcSettings(settings);
  const name = arcName(arc);
  try {
    return solve(arc, lampLines, settings, name);
  } catch (e) {
    // the kernels refuse degenerate systems (too few or collinear points) with RangeError
    if (e instanceof RangeError) throw new StageError('arc', 'arc.degenerate-fit', `the arc ${name}: the lines found do not constrain the solution (${e.message}); set lower xOrder/yOrder or check the lamps`);
    throw e;
  }
}

function solve(arc: CalibratedFrame, lampLines: LampLine[], settings: ArcSettings, name: string): StageResult<WavelengthSolution> {
  const log = new DiagnosticLog('arc');
  const { width, height } = arc;
  const bands = extractBands(arc, settings.rowBand);
  const bandPeaks = measureBandPeaks(bands, settings.detectSigma, settings.blendSigma);
  const centralBand = Math.floor(bands.nBands / 2);
  const central = bandPeaks[centralBand]!;
  const clean = central.filter(isClean);
  const nSaturated = central.filter((p) => p.saturated).length;
  const nBlended = central.filter((p) => !p.saturated && p.blended).length;
  const lineSigmaPx = clean.length > 0 ? median(clean.map((p) => p.sigma)) : 1.5;

  const idOrder = settings.xOrder === 'auto' ? Math.min(IDENTIFY_ORDER, settings.maxXOrder) : settings.xOrder;
  const id = identifyLines({ peaks: clean, width, lineSigmaPx, arcName: name }, lampLines, settings, idOrder);
  const wavelengths = Float64Array.from(id.lines, (l) => l.wavelength);
  let matches = id.matches;
  let xOrder = idOrder;
  if (settings.xOrder === 'auto') {
    const kept = matches.peak.filter((_, i) => matches.fit.used[i]);
    const keptLines = matches.line.filter((_, i) => matches.fit.used[i]);
    const x = Float64Array.from(kept, (k) => id.peaks[k]!.x);
    const lam = Float64Array.from(keptLines, (j) => wavelengths[j]!);
    const w = Float64Array.from(kept, (k) => 1 / (Math.hypot(id.peaks[k]!.xErr, CENTROID_FLOOR_PX) * id.guess.dispersion) ** 2);
    xOrder = chooseOrder1D(x, lam, w, settings.maxXOrder, { min: 0, max: width - 1 }, settings.clipSigma);
  }
  // one more match with the chosen order, at a tolerance set by the scatter
  matches = fitMatches(id.peaks, wavelengths, matches, Math.min(xOrder, Math.floor(matches.peak.length / 3)), width, id.guess.dispersion, settings.clipSigma);
  const pairs = matchPeaks(id.peaks, wavelengths, matches.fit.model, (width - 1) / 2, width, Math.max(1, 5 * matches.rmsPx));
  matches = fitMatches(id.peaks, wavelengths, pairs, Math.min(xOrder, Math.floor(pairs.peak.length / 3)), width, id.guess.dispersion, settings.clipSigma);
  xOrder = matches.fit.model.coeffs.length - 1;

  // trace the identified lines through the bands, in the oriented frame
  const orient = (x: number): number => (id.flipped ? width - 1 - x : x);
  const oriented: TracePeak[][] = bandPeaks.map((list) => list.filter(isClean).map((p) => ({ x: orient(p.x), xErr: p.xErr, sigma: p.sigma })).sort((a, b) => a.x - b.x));
  const startIdx = matches.peak.filter((_, i) => matches.fit.used[i]);
  const startLines = matches.line.filter((_, i) => matches.fit.used[i]).map((j) => id.lines[j]!);
  const start = startIdx.map((k) => {
    const p = clean[k]!;
    return { x: orient(p.x), xErr: p.xErr, sigma: p.sigma };
  });
  const points = traceLines(oriented, centralBand, start, settings.traceTolerancePx);
  const n = points.length;
  const px = Float64Array.from(points, (p) => p.x);
  const py = Float64Array.from(points, (p) => bands.yCentre[p.band]!);
  const pz = Float64Array.from(points, (p) => startLines[p.line]!.wavelength);
  const pw = Float64Array.from(points, (p) => 1 / (Math.hypot(p.xErr, CENTROID_FLOOR_PX) * id.guess.dispersion) ** 2);
  const range = { xMin: 0, xMax: width - 1, yMin: 0, yMax: Math.max(height - 1, 1) };
  const bandsWithLines = new Set(points.map((p) => p.band)).size;
  const maxY = Math.min(settings.maxYOrder, bandsWithLines - 1);
  const yOrder = settings.yOrder === 'auto' ? chooseOrderY(px, py, pz, pw, xOrder, maxY, range, settings.clipSigma) : Math.min(settings.yOrder, maxY);
  if (n < (xOrder + 1) * (yOrder + 1) + 2) {
    throw new StageError('arc', 'arc.too-few-points', `the arc ${name}: only ${n} line positions traced along the slit for a ${xOrder}x${yOrder} solution; lower the orders or raise rowBand`);
  }
  const fit = fitLegendre2D(px, py, pz, pw, xOrder, yOrder, range, { clipSigma: settings.clipSigma });
  const model = fit.model;

  const lines: ArcLineMeasurement[] = [];
  let sumA = 0;
  let sumPx = 0;
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    const residualAngstrom = -fit.residuals[i]!;
    const used = fit.used[i] === 1;
    const line = startLines[points[i]!.line]!;
    lines.push({ wavelength: line.wavelength, element: line.element, x: px[i]!, y: py[i]!, sigmaPx: points[i]!.sigma, residualAngstrom, used });
    if (!used) continue;
    sumA += residualAngstrom * residualAngstrom;
    const rp = residualAngstrom / legendre2DStepX(model, px[i]!, py[i]!);
    sumPx += rp * rp;
    lo = Math.min(lo, line.wavelength);
    hi = Math.max(hi, line.wavelength);
  }
  const rmsAngstrom = Math.sqrt(sumA / fit.nUsed);
  const rmsPx = Math.sqrt(sumPx / fit.nUsed);
  const yMid = (height - 1) / 2;
  const lambdaMid = evalLegendre2D(model, (width - 1) / 2, yMid);
  const rmsKms = (rmsAngstrom / lambdaMid) * SPEED_OF_LIGHT_KMS;

  const usedX = Float64Array.from(lines.filter((l) => l.used), (l) => l.x);
  const usedY = Float64Array.from(lines.filter((l) => l.used), (l) => l.y);
  const usedS = Float64Array.from(lines.filter((l) => l.used), (l) => l.sigmaPx);
  const lsfFit = fitLegendre2D(usedX, usedY, usedS, null, Math.min(2, Math.floor(usedX.length / 6)), Math.min(1, yOrder), range, { clipSigma: settings.clipSigma });

  const wave = evalLegendre2DGrid(model, width, height, new Float64Array(width * height));
  const nLines = new Set(points.filter((_, i) => fit.used[i]).map((p) => p.line)).size;
  log.info('solution', `${nLines} lines identified (${fit.nUsed} positions in ${bandsWithLines} bands, ${n - fit.nUsed} rejected by ${settings.clipSigma}-sigma clipping); Legendre order ${xOrder} x ${yOrder}; RMS ${rmsAngstrom.toFixed(4)} A = ${rmsPx.toFixed(3)} px = ${rmsKms.toFixed(2)} km/s`, { place: { file: name } });
  if (id.flipped) log.info('flipped', 'wavelength decreases with x in this setup: the frames are flipped so that it increases', { place: { file: name } });
  if (nSaturated + nBlended > 0) log.info('rejected-peaks', `central band: ${nSaturated} saturated and ${nBlended} blended peaks left out`, { place: { file: name, row: Math.round(bands.yCentre[centralBand]!) } });
  if (rmsPx > 0.2) log.warn('high-rms', `solution RMS ${rmsPx.toFixed(3)} px is above 0.2 px: check the identification (common practice)`, { place: { file: name }, expected: '<= 0.2 px', actual: `${rmsPx.toFixed(3)} px` });
  reportExtrapolation(log, model, width, yMid, [lo, hi], name);
  for (let x = 0; x < width - 1; x += 16) {
    if (!(legendre2DStepX(model, x, yMid) > 0)) {
      log.warn('not-monotonic', `the solution is not increasing at x = ${x} of the central row: the order may be too high for the lines found`, { place: { file: name } });
      break;
    }
  }
  return {
    product: { width, height, wave, model, lsfSigmaPx: lsfFit.model, flipX: id.flipped, lines, rmsAngstrom, rmsPx, rmsKms, identifiedRange: [lo, hi], flexure: null },
    diagnostics: log.items,
  };
}
