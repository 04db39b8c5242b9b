/** Raw frames for the stages, named as the manifest names them (relative to its folder). */
import { loadRawFrame } from '../../fits/raw-frame.js';
import type { RawFrame } from '../../products/frame.js';
import { manifestRelative } from '../manifest/resolve.js';

/**
 * Load each file (absolute paths from the resolved manifest). `path` of each frame is made
 * relative to `baseDir` when inside it, so that products and diagnostics do not depend on where
 * the run folder sits.
 */
export function loadFrames(paths: readonly string[], baseDir: string): RawFrame[] {
  return paths.map((p) => ({ ...loadRawFrame(p), path: manifestRelative(baseDir, p) }));
}
