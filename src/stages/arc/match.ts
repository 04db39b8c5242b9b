/**
 * Confirmation of a linear guess by pattern matching: match peaks to catalogue lines, fit, and
 * re-match with a tighter tolerance, a wider part of the detector and a higher order, until the
 * matches stop changing. A wrong guess matches few lines or leaves a large scatter.
 */
import { evalLegendre1D, legendre1DStep, type Legendre1D } from '../../kernels/legendre.js';
import { fitLegendre1D, type LegendreFitResult } from '../../kernels/legendre-fit.js';
import { nearestIndex } from '../../kernels/sorted-search.js';
import type { LampLine } from '../../physics/catalogues.js';
import type { LinearGuess } from './first-guess.js';
import { pruneToErrors } from './prune.js';

/** A peak of the oriented frame (wavelength increasing with x) offered to the matching. */
export interface MatchPeak {
  x: number;
  xErr: number;
}

export interface LineMatches {
  /** Index into the peaks and into the lines, per match, in peak order. */
  peak: number[];
  line: number[];
  fit: LegendreFitResult<Legendre1D>;
  /** RMS of the kept residuals in pixels. */
  rmsPx: number;
  /** Matches kept by the clipping. */
  nUsed: number;
}

/** Centroid error floor added in quadrature (pixels): keeps the brightest line from dominating (common practice). */
export const CENTROID_FLOOR_PX = 0.02;

/**
 * One-to-one matches of the peaks within `region` pixels of the centre to lines whose predicted
 * position lies within `tolPx`; when two peaks claim a line the closer one keeps it.
 */
export function matchPeaks(peaks: MatchPeak[], wavelengths: Float64Array, model: Legendre1D, centre: number, region: number, tolPx: number): { peak: number[]; line: number[] } {
  const owner = new Map<number, { peak: number; dist: number }>();
  for (let i = 0; i < peaks.length; i++) {
    const x = peaks[i]!.x;
    if (Math.abs(x - centre) > region) continue;
    const w = evalLegendre1D(model, x);
    const j = nearestIndex(wavelengths, w);
    const dist = Math.abs(wavelengths[j]! - w) / Math.abs(legendre1DStep(model, x));
    if (!(dist <= tolPx)) continue;
    const prev = owner.get(j);
    if (prev === undefined || dist < prev.dist) owner.set(j, { peak: i, dist });
  }
  const pairs = [...owner.entries()].map(([line, o]) => ({ line, peak: o.peak })).sort((a, b) => a.peak - b.peak);
  return { peak: pairs.map((p) => p.peak), line: pairs.map((p) => p.line) };
}

/**
 * Fit lambda(x) to matched pairs with weights from the centroid errors (plus the floor), turned
 * into Angstrom by the local dispersion of `scale` (the previous model); clipped and pruned.
 */
export function fitMatches(peaks: MatchPeak[], wavelengths: Float64Array, pairs: { peak: number[]; line: number[] }, order: number, width: number, scale: Legendre1D, clipSigma: number): LineMatches {
  const n = pairs.peak.length;
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  const w = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const p = peaks[pairs.peak[i]!]!;
    x[i] = p.x;
    y[i] = wavelengths[pairs.line[i]!]!;
    const e = (Number.isFinite(p.xErr) ? Math.hypot(p.xErr, CENTROID_FLOOR_PX) : 1) * Math.abs(legendre1DStep(scale, p.x));
    w[i] = 1 / (e * e);
  }
  const fit = pruneToErrors(x, y, w, fitLegendre1D(x, y, w, order, { min: 0, max: width - 1 }, { clipSigma, robust: true }));
  let sum = 0;
  for (let i = 0; i < n; i++) {
    if (!fit.used[i]) continue;
    const r = fit.residuals[i]! / legendre1DStep(fit.model, x[i]!);
    sum += r * r;
  }
  return { peak: pairs.peak, line: pairs.line, fit, rmsPx: Math.sqrt(sum / Math.max(fit.nUsed, 1)), nUsed: fit.nUsed };
}

/** Stages of the refinement: part of the detector (fraction of the half-width), highest order, tolerance (pixels). */
const SCHEDULE: { region: number; order: number; tolPx: number }[] = [
  { region: 0.5, order: 1, tolPx: 6 },
  { region: 0.75, order: 2, tolPx: 4 },
  { region: 1, order: 3, tolPx: 3 },
  { region: 1, order: 3, tolPx: 2 },
  { region: 1, order: 4, tolPx: 1.5 },
];

/**
 * Refine a guess into matches, or null when too few lines match at some stage.
 * `lines` sorted by wavelength; `finalOrder` caps the order (N_matches / 3 caps it too).
 */
export function refineGuess(peaks: MatchPeak[], lines: LampLine[], guess: LinearGuess, width: number, finalOrder: number, clipSigma: number): LineMatches | null {
  const wavelengths = Float64Array.from(lines, (l) => l.wavelength);
  const half = (width - 1) / 2;
  let model: Legendre1D = { kind: 'legendre1d', min: 0, max: width - 1, coeffs: [guess.centreWavelength, guess.dispersion * half] };
  let result: LineMatches | null = null;
  const steps = [...SCHEDULE, { region: 1, order: finalOrder, tolPx: 1 }];
  for (let s = 0; s < steps.length + 3; s++) {
    const step = steps[Math.min(s, steps.length - 1)]!;
    const tolPx = s >= steps.length - 1 && result ? Math.max(step.tolPx, 5 * result.rmsPx) : step.tolPx;
    const pairs = matchPeaks(peaks, wavelengths, model, half, step.region * half + 1, tolPx);
    const order = Math.min(step.order, finalOrder, Math.floor(pairs.peak.length / 3));
    if (order < 1) return null;
    const next = fitMatches(peaks, wavelengths, pairs, order, width, model, clipSigma);
    const stable = result !== null && s >= steps.length && sameMatches(result, next);
    result = next;
    model = next.fit.model;
    if (stable) break;
  }
  return result;
}

function sameMatches(a: LineMatches, b: LineMatches): boolean {
  return a.peak.length === b.peak.length && a.peak.every((p, i) => p === b.peak[i] && a.line[i] === b.line[i]);
}
