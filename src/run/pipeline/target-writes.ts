/**
 * The product files of one target, each formatted by its pure writer and written atomically
 * under `<output>/<folder>/`. Returns the files written, relative to the output folder.
 */
import { join } from 'node:path';
import type { Diagnostic } from '../../diagnostics.js';
import { writeFits, writeFitsPieces } from '../../fits/write.js';
import { Header } from '../../fits/header.js';
import { curveCsv, curveJson, curveTableHdu } from '../../products/writers/curve.js';
import { lightCsv } from '../../products/writers/light.js';
import { modellerText } from '../../products/writers/modeller.js';
import { rowMapping, rowsCsv, rowsTableHdu } from '../../products/writers/rows.js';
import { spectrumFits } from '../../products/writers/spectrum.js';
import { VERSION } from '../../version.js';
import { writeFileAtomic } from '../io/atomic.js';
import type { CurveThumbnail } from '../io/state.js';
import type { KeyNumbers } from '../summary.js';
import type { TargetJob } from '../target-job.js';
import { targetReportInput } from './report-input.js';
import { writeTargetReport } from '../report-files.js';
import type { SetupCalibration } from './setup-stages.js';
import type { TargetProducts } from './target-stages.js';

/**
 * `provenance` is the time-free part of provenance.json (inputs, settings, versions), shown in
 * the report; the report must not hold times, so that reruns give identical bytes.
 */
export function writeTargetProducts(job: TargetJob, cal: SetupCalibration, p: TargetProducts, diagnostics: Diagnostic[], provenance: Record<string, unknown>): string[] {
  const files: string[] = [];
  const put = (name: string, data: Parameters<typeof writeFileAtomic>[1]) => {
    const rel = join(job.target.folder, name);
    writeFileAtomic(join(job.outputDir, rel), data);
    files.push(rel);
  };
  const history = [
    ...cal.history,
    `whorl ${VERSION}: target ${job.target.name}: ${p.skySubtracted.exposures.length} exposure(s) combined, ${p.skySubtracted.exptimeS} s`,
    `sky: ${p.sky.skyRegions.map(([a, b]) => `rows ${a + 1}-${b + 1}`).join(', ')} (1-based, along the slit)`,
    `diagnostics: ${diagnostics.filter((d) => d.severity === 'warning').length} warning(s)`,
  ];
  const spectrum = spectrumFits(p.skySubtracted, p.solution, history);
  spectrum.primaryHeader.set('SKYSUB', true, 'sky model subtracted from SCI');
  // In pieces: the whole file (~150 MB at full size) is never held at once.
  put('spectrum.fits', (write) => writeFitsPieces(spectrum.hdus, { primaryHeader: spectrum.primaryHeader }, write));
  const rows = rowMapping(p.skySubtracted.orientation, p.skySubtracted.width);
  put('rows.csv', rowsCsv(p.lines, p.velocities, p.curve, rows));
  put('rows.fits', writeFits([rowsTableHdu(p.lines, p.velocities, p.curve, rows)], { primaryHeader: historyHeader(history) }));
  put('curve.csv', curveCsv(p.curve));
  put('curve.json', `${JSON.stringify(curveJson(p.curve, { target: job.target.name, whorl: VERSION }), null, 1)}\n`);
  put('curve.fits', writeFits([curveTableHdu(p.curve)], { primaryHeader: historyHeader(history) }));
  put('light.csv', lightCsv(p.curve));
  put('modeller.txt', modellerText(p.curve, { target: job.target.name }));
  const report = { frame: p.skySubtracted, solution: p.solution, lines: p.lines, velocities: p.velocities, curve: p.curve };
  files.push(writeTargetReport(job.outputDir, job.target.folder, targetReportInput(job, report, diagnostics, provenance)));
  return files;
}

function historyHeader(history: readonly string[]): Header {
  const h = new Header();
  for (const line of history) h.history(line);
  return h;
}

/** Non-finite numbers are left out (JSON has no NaN). */
export function targetKeyNumbers(p: TargetProducts, cal: SetupCalibration): KeyNumbers {
  const c = p.curve;
  const all: KeyNumbers = {
    vSysKms: c.vSys,
    vSysErrKms: c.vSysErr,
    vOuterKms: c.vOuter,
    inclinationDeg: c.geometry.inclinationDeg,
    curvePoints: c.points.length,
    rMaxKpc: c.points.reduce((m, q) => Math.max(m, q.rKpc), 0),
    curveShape: c.shape,
    arcRmsAngstrom: cal.solution.rmsAngstrom,
    lineMeasurements: p.lines.measurements.length,
  };
  if (p.solution.flexure) all.flexureKms = p.solution.flexure.shiftKms;
  return Object.fromEntries(Object.entries(all).filter(([, v]) => typeof v === 'string' || Number.isFinite(v))) as KeyNumbers;
}

/** The folded curve in brief for the run index. */
export function curveThumbnail(p: TargetProducts): CurveThumbnail {
  return { rKpc: p.curve.points.map((q) => q.rKpc), vRot: p.curve.points.map((q) => q.vRot), err: p.curve.points.map((q) => q.errTotal) };
}
