/** Detection and centroids of the peaks of every band. */
import type { BandSpectra } from './band-spectra.js';
import { measurePeaks, type ArcPeak } from './centroids.js';
import { blockBackground, detectPeaks } from './peaks.js';

/** Measured peaks per band, in the unflipped frame, sorted by x. */
export function measureBandPeaks(bands: BandSpectra, detectSigma: number, blendSigma: number): ArcPeak[][] {
  const { width } = bands;
  const background = new Float64Array(width);
  const out: ArcPeak[][] = [];
  for (let b = 0; b < bands.nBands; b++) {
    const offset = b * width;
    blockBackground(bands.flux, offset, width, background);
    const columns = detectPeaks(bands.flux, bands.variance, offset, width, background, detectSigma);
    out.push(measurePeaks(bands.flux, bands.variance, bands.saturated, offset, width, background, columns, blendSigma));
  }
  return out;
}
