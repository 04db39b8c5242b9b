/** The check every stage that lays a wavelength solution over a frame makes first. */
import { InputError } from '../../errors.js';
import type { CalibratedFrame } from '../../products/frame.js';
import type { WavelengthSolution } from '../../products/wavelength.js';

/**
 * Throws InputError unless the solution covers the frame pixel for pixel: an arc paired with a
 * science frame of another detector window or binning is a mistake in the manifest, not in the data.
 */
export function requireSameGrid(frame: CalibratedFrame, solution: WavelengthSolution): void {
  if (frame.width === solution.width && frame.height === solution.height) return;
  const file = frame.exposures[0]?.path;
  throw new InputError(
    'solution.size-mismatch',
    'the wavelength solution does not cover this frame pixel for pixel: pair it with an arc taken with the same detector window and binning',
    file ? { file } : {},
    { expected: `${solution.width} x ${solution.height} px, as the arc`, actual: `${frame.width} x ${frame.height} px` },
  );
}
