/**
 * Unattended identification of the lines of one band: first guesses by cross-correlation, each
 * confirmed by pattern matching; the guess that matches the most lines with an acceptable scatter
 * wins. Fails with a StageError that says what was found and what to change.
 */
import { StageError } from '../../errors.js';
import { evalLegendre1D } from '../../kernels/legendre.js';
import type { LampLine } from '../../physics/catalogues.js';
import { linearGuesses, type LinearGuess } from './first-guess.js';
import { refineGuess, type LineMatches, type MatchPeak } from './match.js';
import type { ArcSettings } from './settings.js';

export interface Identification {
  flipped: boolean;
  guess: LinearGuess;
  /** Peaks in the oriented frame (x flipped when `flipped`), same order as the input peaks. */
  peaks: MatchPeak[];
  matches: LineMatches;
  /** Catalogue lines the matching could use, sorted by wavelength (matches.line indexes this). */
  lines: LampLine[];
}

/** Lines inside the widest wavelength range the search allows. */
function linesInSearchRange(lines: LampLine[], width: number, settings: ArcSettings): LampLine[] {
  const half = ((width - 1) / 2) * settings.approxDispersion * (1 + settings.dispersionSearch) + settings.centreSearchAngstrom;
  return lines.filter((l) => Math.abs(l.wavelength - settings.approxWavelength) <= half).sort((a, b) => a.wavelength - b.wavelength);
}

/**
 * Lines without a comparable neighbour closer than blendSigma line sigmas: a blend moves the
 * centroid. A neighbour fainter than a tenth does not count (common practice).
 */
function unblendedLines(lines: LampLine[], blendAngstrom: number): LampLine[] {
  return lines.filter((l, i) => {
    for (const j of [i - 1, i + 1, i - 2, i + 2]) {
      const m = lines[j];
      if (m && Math.abs(m.wavelength - l.wavelength) < blendAngstrom && m.intensity > 0.1 * l.intensity) return false;
    }
    return true;
  });
}

/**
 * Whether matches are a believable identification rather than a chance alignment: enough lines,
 * a small scatter, a scale inside the searched ranges, and a large share of what could match
 * (the lines the solution puts on the detector, or the peaks if fewer) actually matched.
 */
function acceptable(m: LineMatches, nPeaks: number, lines: LampLine[], guess: LinearGuess, width: number, settings: ArcSettings): boolean {
  if (m.nUsed < settings.minLines || m.rmsPx > settings.maxRmsPx) return false;
  const lo = evalLegendre1D(m.fit.model, 0);
  const hi = evalLegendre1D(m.fit.model, width - 1);
  const centre = evalLegendre1D(m.fit.model, (width - 1) / 2);
  const dispersion = (hi - lo) / (width - 1);
  if (Math.abs(centre - settings.approxWavelength) > settings.centreSearchAngstrom + 5 * guess.dispersion) return false;
  if (Math.abs(dispersion / settings.approxDispersion - 1) > settings.dispersionSearch + 0.02) return false;
  const onDetector = lines.filter((l) => l.wavelength >= lo && l.wavelength <= hi).length;
  return m.nUsed >= settings.minMatchedFraction * Math.min(nPeaks, onDetector);
}

export interface IdentifyInputs {
  /** Clean peaks of the band (unflipped frame). */
  peaks: { x: number; xErr: number; amplitude: number }[];
  width: number;
  lineSigmaPx: number;
  /** Arc file for messages. */
  arcName: string;
}

export function identifyLines(input: IdentifyInputs, lampLines: LampLine[], settings: ArcSettings, finalOrder: number): Identification {
  const { width } = input;
  const inRange = linesInSearchRange(lampLines, width, settings);
  const usable = unblendedLines(inRange, settings.blendSigma * input.lineSigmaPx * settings.approxDispersion);
  const hint = 'check approx_wavelength and approx_dispersion in the manifest and that the lamps listed match the arc';
  if (input.peaks.length < settings.minLines || usable.length < settings.minLines) {
    throw new StageError('arc', 'arc.unidentified', `cannot identify the arc ${input.arcName}: ${input.peaks.length} clean lines found in the central band and ${usable.length} catalogue lines expected within ${settings.centreSearchAngstrom} A of the expected range (at least ${settings.minLines} of each needed); ${hint}`);
  }
  const guesses = linearGuesses(
    {
      peakX: input.peaks.map((p) => p.x),
      peakHeight: input.peaks.map((p) => p.amplitude),
      width,
      approxWavelength: settings.approxWavelength,
      approxDispersion: settings.approxDispersion,
      dispersionSearch: settings.dispersionSearch,
      centreSearchAngstrom: settings.centreSearchAngstrom,
      lineSigmaPx: input.lineSigmaPx,
    },
    inRange,
  );
  let best: Identification | null = null;
  for (const guess of guesses) {
    const peaks = input.peaks.map((p) => ({ x: guess.flipped ? width - 1 - p.x : p.x, xErr: p.xErr }));
    const matches = refineGuess(peaks, usable, guess, width, finalOrder, settings.clipSigma);
    if (!matches || !acceptable(matches, peaks.length, usable, guess, width, settings)) continue;
    if (!best || matches.nUsed > best.matches.nUsed || (matches.nUsed === best.matches.nUsed && matches.rmsPx < best.matches.rmsPx)) {
      best = { flipped: guess.flipped, guess, peaks, matches, lines: usable };
    }
  }
  if (!best) {
    throw new StageError('arc', 'arc.unidentified', `cannot identify the arc ${input.arcName}: ${input.peaks.length} clean lines found in the central band, ${usable.length} catalogue lines in the expected range, but no trial dispersion within ${Math.round(settings.dispersionSearch * 100)}% of ${settings.approxDispersion} A/px and centre within ${settings.centreSearchAngstrom} A of ${settings.approxWavelength} A matched ${settings.minLines} lines and ${Math.round(100 * settings.minMatchedFraction)}% of the lines it expects with an RMS below ${settings.maxRmsPx} px; ${hint}`);
  }
  return best;
}
