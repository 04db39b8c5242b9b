/**
 * A starting velocity when the manifest gives none: in the spectrum of the central rows, the
 * strongest matched-filter peak of the binning line between -1000 and +30000 km/s, confirmed by
 * the other members of its group at their predicted places (each adds its positive S/N).
 */
import { SPEED_OF_LIGHT_KMS as C } from '../../physics/constants.js';
import { quickFlux, type SpectrumView } from './quick-flux.js';

const MIN_KMS = -1000;
const MAX_KMS = 30000;
/** Candidates kept for the group check. */
const CANDIDATES = 5;
/** Least score of an accepted peak (matched-filter S/N, common practice for a detection). */
const MIN_SCORE = 5;

/** Optical velocity (km/s) of the best candidate, or null when nothing stands out. */
export function guessVelocity(s: SpectrumView, rest: number, otherRest: number[], sigmaAngstrom: number): number | null {
  const n = s.wave.length;
  const snr = new Float64Array(n).fill(-Infinity);
  const lo = rest * (1 + MIN_KMS / C);
  const hi = rest * (1 + MAX_KMS / C);
  for (let x = 0; x < n; x++) {
    const l = s.wave[x]!;
    if (l < lo || l > hi || s.bad[x]) continue;
    snr[x] = quickFlux(s, l, sigmaAngstrom).snr;
  }
  const peaks: number[] = [];
  for (let x = 1; x < n - 1; x++) if (snr[x]! > MIN_SCORE && snr[x]! >= snr[x - 1]! && snr[x]! > snr[x + 1]!) peaks.push(x);
  peaks.sort((a, b) => snr[b]! - snr[a]!);
  let best: number | null = null;
  let bestScore = -Infinity;
  for (const x of peaks.slice(0, CANDIDATES)) {
    const z = s.wave[x]! / rest;
    let score = snr[x]!;
    for (const r of otherRest) {
      const l = r * z;
      if (l > s.wave[0]! && l < s.wave[n - 1]!) score += Math.max(0, quickFlux(s, l, sigmaAngstrom).snr);
    }
    if (score > bestScore) {
      bestScore = score;
      best = C * (z - 1);
    }
  }
  return best;
}
