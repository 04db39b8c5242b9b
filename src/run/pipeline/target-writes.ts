/**
 * The product files of one target, each formatted by its pure writer and written atomically
 * under `<output>/<folder>/`. Returns the files written, relative to the output folder.
 */
import { join } from 'node:path';
import type { Diagnostic } from '../../diagnostics.js';
import { writeFits } from '../../fits/write.js';
import { spectrumFits } from '../../products/writers/spectrum.js';
import { renderTargetReport } from '../../report/target-report.js';
import { VERSION } from '../../version.js';
import { writeFileAtomic } from '../io/atomic.js';
import type { KeyNumbers } from '../summary.js';
import type { TargetJob } from '../target-job.js';
import { targetReportInput } from './report-input.js';
import type { SetupCalibration } from './setup-stages.js';
import type { TargetProducts } from './target-stages.js';

/**
 * `provenance` is the time-free part of provenance.json (inputs, settings, versions), shown in
 * the report; the report must not hold times, so that reruns give identical bytes.
 */
export function writeTargetProducts(job: TargetJob, cal: SetupCalibration, p: TargetProducts, diagnostics: Diagnostic[], provenance: Record<string, unknown>): string[] {
  const files: string[] = [];
  const put = (name: string, data: string | Uint8Array) => {
    const rel = join(job.target.folder, name);
    writeFileAtomic(join(job.outputDir, rel), data);
    files.push(rel);
  };
  const history = [
    ...cal.history,
    `whorl ${VERSION}: target ${job.target.name}: ${p.science.exposures.length} exposure(s) combined, ${p.science.exptimeS} s`,
    `sky: ${p.sky.skyRegions.map(([a, b]) => `rows ${a + 1}-${b + 1}`).join(', ')} (1-based, along the slit)`,
    `diagnostics: ${diagnostics.filter((d) => d.severity === 'warning').length} warning(s)`,
  ];
  const spectrum = spectrumFits(p.skySubtracted, p.solution, history);
  spectrum.primaryHeader.set('SKYSUB', true, 'sky model subtracted from SCI');
  put('spectrum.fits', writeFits(spectrum.hdus, { primaryHeader: spectrum.primaryHeader }));
  put('report.html', renderTargetReport(targetReportInput(job, { frame: p.skySubtracted, solution: p.solution }, diagnostics, provenance)));
  return files;
}

export function targetKeyNumbers(p: TargetProducts, cal: SetupCalibration): KeyNumbers {
  const n: KeyNumbers = { arcRmsAngstrom: cal.solution.rmsAngstrom };
  if (p.solution.flexure) n.flexureKms = p.solution.flexure.shiftKms;
  return n;
}
