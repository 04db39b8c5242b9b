/** Raw frames for the stages, named as the manifest names them (relative to its folder). */
import { DiagnosticLog } from '../../diagnostics.js';
import { loadRawFrame } from '../../fits/raw-frame.js';
import type { RawFrame, StageResult } from '../../products/frame.js';
import { manifestRelative } from '../manifest/resolve.js';

/**
 * Load each file (absolute paths from the resolved manifest). `path` of each frame is made
 * relative to `baseDir` when inside it, so that products and diagnostics do not depend on where
 * the run folder sits. The reader's soft warnings (odd but readable cards) become diagnostics.
 */
export function loadFrames(paths: readonly string[], baseDir: string): StageResult<RawFrame[]> {
  const log = new DiagnosticLog('run');
  const product = paths.map((p) => {
    const warnings: string[] = [];
    const frame = { ...loadRawFrame(p, warnings), path: manifestRelative(baseDir, p) };
    for (const w of warnings) log.warn('fits-warning', w, { place: { file: frame.path } });
    return frame;
  });
  return { product, diagnostics: log.items };
}
