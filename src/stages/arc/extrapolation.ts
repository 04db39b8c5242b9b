/** Where the solution runs beyond the outermost identified lines (extrapolation), as a diagnostic. */
import type { DiagnosticLog } from '../../diagnostics.js';
import { evalLegendre2D, type Legendre2D } from '../../kernels/legendre.js';

/** More than this fraction of the width extrapolated on one side is a warning, less an info (common practice). */
const WARN_FRACTION = 0.1;

/** Pixels of the row y beyond the identified range on each side: [blue side, red side]. */
function extrapolatedPixels(model: Legendre2D, width: number, y: number, identified: [number, number]): [number, number] {
  let blue = 0;
  let red = 0;
  for (let x = 0; x < width; x++) {
    const w = evalLegendre2D(model, x, y);
    if (w < identified[0]) blue++;
    else if (w > identified[1]) red++;
  }
  return [blue, red];
}

export function reportExtrapolation(log: DiagnosticLog, model: Legendre2D, width: number, y: number, identified: [number, number], file: string): void {
  const [blue, red] = extrapolatedPixels(model, width, y, identified);
  if (blue + red === 0) return;
  const lo = evalLegendre2D(model, 0, y);
  const hi = evalLegendre2D(model, width - 1, y);
  const message = `identified lines span ${identified[0].toFixed(2)}-${identified[1].toFixed(2)} A; the detector spans ${lo.toFixed(2)}-${hi.toFixed(2)} A at the central row: ${blue} px on the blue side and ${red} px on the red side are extrapolated`;
  const extra = { place: { file, row: Math.round(y) }, expected: `${identified[0].toFixed(2)}-${identified[1].toFixed(2)} A`, actual: `${lo.toFixed(2)}-${hi.toFixed(2)} A` };
  if (Math.max(blue, red) > WARN_FRACTION * width) log.warn('extrapolation', message, extra);
  else log.info('extrapolation', message, extra);
}
