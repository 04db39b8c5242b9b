/**
 * Files of the wavelength solution under calib/<setup>/: a JSON of the model, its quality and
 * the arc lines (for the report and for people who refit), and a CSV of the line residuals.
 * Pixels in these files are 1-based, in the internal orientation (dispersion along x with the
 * wavelength increasing, slit along y), as the comment lines say.
 */
import { legendre2DStepX } from '../../kernels/legendre.js';
import { SPEED_OF_LIGHT_KMS } from '../../physics/constants.js';
import type { WavelengthSolution } from '../wavelength.js';
import { csvText, fixed, jsonNumber } from './text-table.js';

/** solution.json: everything but the per-pixel wave array (which the WAVE extension holds). */
export function formatSolutionJson(s: WavelengthSolution, arcFiles: string[]): string {
  const used = s.lines.filter((l) => l.used).length;
  const doc = {
    format: 'whorl-wavelength-solution',
    version: 1,
    conventions: 'air wavelengths in Angstrom; pixels 1-based in the internal orientation (wavelength increasing with x); the model takes 0-based pixel centres',
    arcFiles,
    width: s.width,
    height: s.height,
    flipX: s.flipX,
    model: s.model,
    lsfSigmaPx: s.lsfSigmaPx,
    rms: { angstrom: jsonNumber(s.rmsAngstrom), px: jsonNumber(s.rmsPx), kms: jsonNumber(s.rmsKms) },
    identifiedRangeAngstrom: s.identifiedRange.map(jsonNumber),
    linePositions: { used, rejected: s.lines.length - used, distinctLines: new Set(s.lines.filter((l) => l.used).map((l) => l.wavelength)).size },
    flexure: s.flexure && {
      shiftAngstrom: jsonNumber(s.flexure.shiftAngstrom),
      shiftErrAngstrom: jsonNumber(s.flexure.shiftErrAngstrom),
      shiftKms: jsonNumber(s.flexure.shiftKms),
      lines: s.flexure.lines.map((l) => ({ ...l, measured: jsonNumber(l.measured), error: jsonNumber(l.error) })),
    },
    lines: s.lines.map((l) => ({ wavelength: l.wavelength, element: l.element, x: l.x + 1, y: l.y + 1, sigmaPx: jsonNumber(l.sigmaPx), residualAngstrom: jsonNumber(l.residualAngstrom), used: l.used })),
  };
  return `${JSON.stringify(doc, null, 1)}\n`;
}

/** arc-lines.csv: one row per measured line position (line x band), residual in A, px and km/s. */
export function formatArcLinesCsv(s: WavelengthSolution): string {
  const rows = s.lines;
  return csvText(
    [
      'whorl arc-line residuals: solution minus laboratory air wavelength (NIST-based lamp lists)',
      'x, y: 1-based internal pixels (wavelength increasing with x); used = 0 when rejected by clipping',
      `rms ${fixed(s.rmsAngstrom, 4)} A = ${fixed(s.rmsPx, 4)} px = ${fixed(s.rmsKms, 3)} km/s over the used positions`,
    ],
    [
      { name: 'wavelength', unit: 'Angstrom', cells: rows.map((l) => fixed(l.wavelength, 4)) },
      { name: 'element', unit: '', cells: rows.map((l) => l.element) },
      { name: 'x', unit: 'pixel', cells: rows.map((l) => fixed(l.x + 1, 4)) },
      { name: 'y', unit: 'pixel', cells: rows.map((l) => fixed(l.y + 1, 1)) },
      { name: 'sigma', unit: 'pixel', cells: rows.map((l) => fixed(l.sigmaPx, 3)) },
      { name: 'residual_A', unit: 'Angstrom', cells: rows.map((l) => fixed(l.residualAngstrom, 5)) },
      { name: 'residual_px', unit: 'pixel', cells: rows.map((l) => fixed(l.residualAngstrom / legendre2DStepX(s.model, l.x, l.y), 4)) },
      { name: 'residual_kms', unit: 'km/s', cells: rows.map((l) => fixed((l.residualAngstrom / l.wavelength) * SPEED_OF_LIGHT_KMS, 3)) },
      { name: 'used', unit: '', cells: rows.map((l) => (l.used ? '1' : '0')) },
    ],
  );
}
