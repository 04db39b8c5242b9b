/**
 * First guesses of a linear wavelength scale: the detected peaks, drawn as Gaussians, are
 * cross-correlated (FFT) with synthetic arcs drawn from the line list over a grid of trial
 * dispersions, in both directions of the x axis. Each trial gives its best shift; the strongest
 * distinct trials are returned for the pattern matching to confirm or refuse.
 */
import { Correlator, correlationPeak } from '../../kernels/cross-correlate.js';
import type { LampLine } from '../../physics/catalogues.js';

export interface LinearGuess {
  /** True when wavelength decreases with the internal x (the frame must be flipped). */
  flipped: boolean;
  /** Angstrom per pixel, > 0. */
  dispersion: number;
  /** Air wavelength (Angstrom) at the detector centre x = (width - 1) / 2, in the oriented frame. */
  centreWavelength: number;
  /** Normalised correlation, for ranking. */
  score: number;
}

export interface GuessInputs {
  /** Peak columns (unflipped frame) and heights. */
  peakX: number[];
  peakHeight: number[];
  width: number;
  approxWavelength: number;
  approxDispersion: number;
  dispersionSearch: number;
  centreSearchAngstrom: number;
  /** Typical line sigma, pixels (sets the drawing width and the dispersion step). */
  lineSigmaPx: number;
}

/** The coarse grid has at most this many samples (FFTs of 4096): hundreds of trials stay well under 0.1 s. */
const MAX_SAMPLES = 1024;
/** Guesses returned for confirmation. */
const MAX_GUESSES = 8;

function drawGaussian(out: Float64Array, centre: number, sigma: number, weight: number): void {
  const lo = Math.max(0, Math.floor(centre - 4 * sigma));
  const hi = Math.min(out.length - 1, Math.ceil(centre + 4 * sigma));
  const k = 0.5 / (sigma * sigma);
  for (let i = lo; i <= hi; i++) out[i] += weight * Math.exp(-(i - centre) * (i - centre) * k);
}

export function linearGuesses(input: GuessInputs, lines: LampLine[]): LinearGuess[] {
  const { width, approxWavelength: lambda0, approxDispersion: d0 } = input;
  const bin = Math.max(1, Math.ceil(width / MAX_SAMPLES));
  const nBins = Math.ceil(width / bin);
  const sigmaBins = Math.max(1, (1.5 * input.lineSigmaPx) / bin);
  const xc = (width - 1) / 2;
  const dMin = d0 * (1 - input.dispersionSearch);
  const dMax = d0 * (1 + input.dispersionSearch);
  const maxLag = Math.ceil(input.centreSearchAngstrom / dMin / bin) + 2;
  // the dispersion step moves the detector edges by at most one drawn sigma
  const relStep = (2 * sigmaBins * bin) / width;
  const nTrials = Math.max(1, Math.ceil((dMax / dMin - 1) / relStep) + 1);
  // compress intensity ranges: lamp ratios are not a flux model (REFERENCE.md), only a ranking
  const hMax = Math.max(...input.peakHeight, 1e-30);
  const iMax = Math.max(...lines.map((l) => l.intensity), 1e-30);
  const synthetic = new Float64Array(nBins + 2 * maxLag);
  const corr = new Float64Array(4 * maxLag + 1);
  // The synthetic arc of a trial does not depend on the direction: drawn and transformed once for both.
  const directions = [false, true].map((flipped) => {
    const observed = new Float64Array(nBins);
    input.peakX.forEach((x, i) => drawGaussian(observed, (flipped ? width - 1 - x : x) / bin, sigmaBins, Math.sqrt(Math.max(input.peakHeight[i]!, 0) / hMax)));
    return { flipped, correlator: new Correlator(observed, synthetic.length), trials: [] as LinearGuess[] };
  });
  let spectrum: number[] | undefined;
  for (let t = 0; t < nTrials; t++) {
    const d = dMin * Math.pow(1 + relStep, t);
    synthetic.fill(0);
    let norm = 0;
    for (const l of lines) {
      const pos = (xc + (l.wavelength - lambda0) / d) / bin + maxLag;
      if (pos < -4 * sigmaBins || pos > synthetic.length + 4 * sigmaBins) continue;
      drawGaussian(synthetic, pos, sigmaBins, Math.sqrt(l.intensity / iMax));
    }
    for (let i = 0; i < synthetic.length; i++) norm += synthetic[i]! * synthetic[i]!;
    if (!(norm > 0)) continue;
    spectrum = directions[0]!.correlator.transform(synthetic, spectrum);
    for (const { flipped, correlator, trials } of directions) {
      correlator.correlateTransformed(spectrum, 2 * maxLag, corr);
      // lag k of the correlation puts synthetic bin i at observed bin i + k, i.e. a shift s = k + maxLag bins
      const peak = correlationPeak(corr.subarray(0, 2 * maxLag + 1), maxLag);
      const shiftPx = peak.lag * bin;
      trials.push({ flipped, dispersion: d, centreWavelength: lambda0 - shiftPx * d, score: peak.value / Math.sqrt(norm) });
    }
  }
  // in the order of one direction after the other, so that the stable sort breaks ties as before
  const trials = directions.flatMap((dir) => dir.trials);
  trials.sort((a, b) => b.score - a.score);
  const picked: LinearGuess[] = [];
  for (const t of trials) {
    const same = picked.some((p) => p.flipped === t.flipped && Math.abs(p.dispersion / t.dispersion - 1) < 3 * relStep && Math.abs(p.centreWavelength - t.centreWavelength) < 4 * t.dispersion * input.lineSigmaPx);
    if (!same) picked.push(t);
    if (picked.length === MAX_GUESSES) break;
  }
  return picked;
}
