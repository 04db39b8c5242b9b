/**
 * The 1-D solution of the central band: identification, the x order chosen by the data (or set),
 * and a last match at a tolerance set by the scatter.
 */
import { legendre1DStep } from '../../kernels/legendre.js';
import type { LampLine } from '../../physics/catalogues.js';
import type { ArcPeak } from './centroids.js';
import { identifyLines, type Identification } from './identify.js';
import { CENTROID_FLOOR_PX, fitMatches, matchPeaks, type LineMatches } from './match.js';
import { chooseOrder1D } from './order-choice.js';
import type { ArcSettings } from './settings.js';

/** Highest x order of the identification, whatever the final order (the BIC or the setting picks that). */
const IDENTIFY_ORDER = 5;

export interface CentralSolution {
  id: Identification;
  /** Final matches of the central band (indexes into id.peaks and id.lines). */
  matches: LineMatches;
  xOrder: number;
}

export function solveCentralBand(clean: ArcPeak[], width: number, lineSigmaPx: number, arcName: string, lampLines: LampLine[], settings: ArcSettings): CentralSolution {
  const id = identifyLines({ peaks: clean, width, lineSigmaPx, arcName }, lampLines, settings, Math.min(IDENTIFY_ORDER, settings.maxXOrder));
  const wavelengths = Float64Array.from(id.lines, (l) => l.wavelength);
  const first = id.matches;
  const xOrder = settings.xOrder === 'auto' ? chooseOrder(id, wavelengths, width, settings) : settings.xOrder;
  const refit = fitMatches(id.peaks, wavelengths, first, Math.min(xOrder, Math.floor(first.peak.length / 3)), width, first.fit.model, settings.clipSigma);
  const pairs = matchPeaks(id.peaks, wavelengths, refit.fit.model, (width - 1) / 2, width, Math.max(1, 5 * refit.rmsPx));
  const matches = fitMatches(id.peaks, wavelengths, pairs, Math.min(xOrder, Math.floor(pairs.peak.length / 3)), width, refit.fit.model, settings.clipSigma);
  return { id, matches, xOrder: matches.fit.model.coeffs.length - 1 };
}

/** The BIC's x order on the kept matches of the identification (order-choice.ts). */
function chooseOrder(id: Identification, wavelengths: Float64Array, width: number, settings: ArcSettings): number {
  const m = id.matches;
  const kept = m.peak.filter((_, i) => m.fit.used[i]);
  const x = Float64Array.from(kept, (k) => id.peaks[k]!.x);
  const lam = Float64Array.from(m.line.filter((_, i) => m.fit.used[i]), (j) => wavelengths[j]!);
  const w = Float64Array.from(kept, (k) => 1 / (Math.hypot(id.peaks[k]!.xErr, CENTROID_FLOOR_PX) * legendre1DStep(m.fit.model, id.peaks[k]!.x)) ** 2);
  return chooseOrder1D(x, lam, w, settings.maxXOrder, { min: 0, max: width - 1 }, settings.clipSigma);
}
