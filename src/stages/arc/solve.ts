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
import type { WavelengthSolution } from '../../products/wavelength.js';
import { extractBands } from './band-spectra.js';
import { measureBandPeaks } from './band-peaks.js';
import { solveCentralBand } from './central-solution.js';
import { isClean } from './centroids.js';
import { reportExtrapolation } from './extrapolation.js';
import { MISFIT_CHI2 } from './prune.js';
import { checkArcSettings, type ArcSettings } from './settings.js';
import { fitAlongSlit } from './slit-fit.js';


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
    if (e instanceof RangeError) throw new StageError('arc', 'arc.degenerate-fit', `the arc ${name}: the lines found do not constrain the solution (${e.message}); set a lower wavelength_order (dispersion, slit) in the manifest or check the lamps`);
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
  const lineSigmaPx = clean.length > 0 ? median(clean.map((p) => p.sigma)) : 1.5;
  const centralSolution = solveCentralBand(clean, width, lineSigmaPx, name, lampLines, settings);
  const slit = fitAlongSlit(bands, bandPeaks, centralBand, centralSolution, width, height, settings, name);
  const { model, lines, rmsAngstrom, rmsPx, identifiedRange } = slit;
  const flipX = centralSolution.id.flipped;
  const yMid = (height - 1) / 2;
  const rmsKms = (rmsAngstrom / evalLegendre2D(model, (width - 1) / 2, yMid)) * SPEED_OF_LIGHT_KMS;

  const used = lines.filter((l) => l.used);
  const lsf = fitLegendre2D(
    Float64Array.from(used, (l) => l.x),
    Float64Array.from(used, (l) => l.y),
    Float64Array.from(used, (l) => l.sigmaPx),
    null,
    Math.min(2, Math.floor(used.length / 6)),
    Math.min(1, model.yOrder),
    { xMin: 0, xMax: width - 1, yMin: 0, yMax: Math.max(height - 1, 1) },
    { clipSigma: settings.clipSigma, robust: true },
  );
  const wave = evalLegendre2DGrid(model, width, height, new Float64Array(width * height));

  const place = { file: name };
  log.info('solution', `${slit.linesKept} lines identified (${used.length} positions in ${slit.bandsWithLines} bands, ${lines.length - used.length} rejected by ${settings.clipSigma}-sigma clipping); Legendre order ${model.xOrder} x ${model.yOrder}; RMS ${rmsAngstrom.toFixed(4)} A = ${rmsPx.toFixed(3)} px = ${rmsKms.toFixed(2)} km/s`, { place });
  if (flipX) log.info('flipped', 'wavelength decreases with x in this setup: the frames are flipped so that it increases', { place });
  const nSaturated = central.filter((p) => p.saturated).length;
  const nBlended = central.filter((p) => !p.saturated && p.blended).length;
  if (nSaturated + nBlended > 0) log.info('rejected-peaks', `central band: ${nSaturated} saturated and ${nBlended} blended peaks left out`, { place: { ...place, row: Math.round(bands.yCentre[centralBand]!) } });
  if (rmsPx > 0.2) log.warn('high-rms', `solution RMS ${rmsPx.toFixed(3)} px is above 0.2 px: check the identification (common practice)`, { place, expected: '<= 0.2 px', actual: `${rmsPx.toFixed(3)} px` });
  if (slit.reducedChi2 > MISFIT_CHI2) {
    log.warn('misfit', `the line positions scatter ${Math.sqrt(slit.reducedChi2).toFixed(1)} times their centroid errors about the ${model.xOrder} x ${model.yOrder} solution: the order may be too low for the ${slit.linesKept} lines (at most N/3) or a line is misidentified`, { place, expected: `chi2/dof <= ${MISFIT_CHI2}`, actual: slit.reducedChi2.toFixed(1) });
  }
  reportExtrapolation(log, model, width, yMid, identifiedRange, name);
  for (let x = 0; x < width - 1; x += 16) {
    if (!(legendre2DStepX(model, x, yMid) > 0)) {
      log.warn('not-monotonic', `the solution is not increasing at x = ${x} of the central row: the order may be too high for the lines found`, { place });
      break;
    }
  }
  return {
    product: { width, height, wave, model, lsfSigmaPx: lsf.model, flipX, lines, rmsAngstrom, rmsPx, rmsKms, identifiedRange, flexure: null },
    diagnostics: log.items,
  };
}
