/**
 * The calibrations of one setup, computed once and shared by its targets: bias, flat and arc
 * frames through the CCD stage, the arc through the wavelength solution; products written under
 * `calib/<setup>/`, and the result cached on disk by the setup's key (calibration-cache.ts).
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import type { Diagnostic } from '../../diagnostics.js';
import { writeFitsPieces } from '../../fits/write.js';
import { emptyPool, giveBack } from '../../kernels/frame-pool.js';
import { loadLampLines, readLineListFile, type LampLine } from '../../physics/catalogues.js';
import type { WavelengthSolution } from '../../products/wavelength.js';
import { formatArcLinesCsv, formatSolutionJson } from '../../products/writers/wavelength.js';
import { masterBiasFits, masterFlatFits, type CalibrationFits } from '../../products/writers/calibration.js';
import { solveWavelengths } from '../../stages/arc/solve.js';
import type { ArcSettings } from '../../stages/arc/settings.js';
import { buildCalibration } from '../../stages/ccd/build-calibration.js';
import type { CcdCalibration } from '../../stages/ccd/calibration.js';
import type { CcdSettings } from '../../stages/ccd/settings.js';
import { VERSION } from '../../version.js';
import type { EventSink } from '../events.js';
import { writeFileAtomic } from '../io/atomic.js';
import { manifestRelative, type ResolvedRun, type ResolvedSetup } from '../manifest/resolve.js';
import { describeFailure } from '../failure.js';
import { BIAS_FILE, cacheCalibration, cachedCalibration, FLAT_FILE } from './calibration-cache.js';
import { loadFrames } from './frames.js';
import { arcSettingsFor, ccdSettingsFor } from './settings.js';
import { StageTimer } from './timer.js';

/** Stage names of a setup's calibration, in order (progress and cache keys). */
export const SETUP_STAGES = ['load calibrations', 'ccd calibration', 'wavelength solution', 'write calibrations'] as const;

/** What the targets need of the CCD calibration: all but the calibrated arc, dropped once solved. */
export type ScienceCcdCalibration = Omit<CcdCalibration, 'arc'>;

export interface SetupCalibration {
  ccd: ScienceCcdCalibration;
  solution: WavelengthSolution;
  diagnostics: Diagnostic[];
  settings: { ccd: CcdSettings; arc: ArcSettings };
  /** Calibration product files, relative to the output folder. */
  products: string[];
  /** HISTORY lines for the FITS products of the targets. */
  history: string[];
}

export type SetupResult =
  | {
      ok: true;
      calibration: SetupCalibration;
      /** Stage times (ms) when computed now; absent when reused. */
      ms?: Record<string, number>;
      /** The cache file being written; await before the run ends. */
      caching?: Promise<void>;
    }
  | { ok: false; code: string; reason: string };

/** Reuse the cached calibration of `key` (unless `force`) or compute and cache it; never throws. */
export function calibrateSetupCached(setup: ResolvedSetup, run: ResolvedRun, key: string, force: boolean, emit: EventSink, now: () => number): SetupResult {
  if (!force) {
    const cached = cachedCalibration(run.outputDir, setup.folder, key);
    if (cached && cached.products.every((p) => existsSync(join(run.outputDir, p)))) return { ok: true, calibration: cached };
  }
  const timer = new StageTimer({ setup: setup.name }, SETUP_STAGES.length, emit, now);
  try {
    const calibration = calibrateSetup(setup, run, timer);
    return { ok: true, calibration, ms: timer.ms, caching: cacheCalibration(run.outputDir, setup.folder, key, calibration) };
  } catch (e) {
    emptyPool(); // no target of this setup will take the frames pooled so far
    const [code, reason] = describeFailure(e);
    return { ok: false, code, reason };
  }
}

export function calibrateSetup(setup: ResolvedSetup, run: ResolvedRun, timer: StageTimer): SetupCalibration {
  const ccdSettings = ccdSettingsFor(setup);
  const arcSettings = arcSettingsFor(setup);
  const { ccd, solution } = solvedCalibration(setup, run, ccdSettings, arcSettings, timer);
  const names = (paths: readonly string[]) => paths.map((p) => manifestRelative(run.baseDir, p));
  const history = [
    `whorl ${VERSION}: setup ${setup.name}: ${setup.bias.length} bias, ${setup.flat.length} flat, ${setup.arc.length} arc frames`,
    `ccd: gain ${ccd.gain} e-/ADU, read noise ${ccd.readNoiseE} e-, ${ccd.badColumns.length} bad columns`,
    `ccd: orientation transpose=${ccd.orientation.transpose} flipX=${solution.flipX}`,
    `arc: ${solution.lines.filter((l) => l.used).length} lines, rms ${solution.rmsAngstrom.toPrecision(3)} A`,
  ];
  const dir = join('calib', setup.folder);
  const products = timer.step(SETUP_STAGES[3], () => {
    const files: [string, CalibrationFits][] = [
      [BIAS_FILE, masterBiasFits(ccd, names(setup.bias), history)],
      [FLAT_FILE, masterFlatFits(ccd, names(setup.flat), history)],
    ];
    const written = files.map(([name, fits]) => {
      writeFileAtomic(join(run.outputDir, dir, name), (write) => writeFitsPieces(fits.hdus, { primaryHeader: fits.primaryHeader }, write));
      return join(dir, name);
    });
    const texts: [string, string][] = [
      ['solution.json', formatSolutionJson(solution, names(setup.arc))],
      ['arc-lines.csv', formatArcLinesCsv(solution)],
    ];
    for (const [name, text] of texts) {
      writeFileAtomic(join(run.outputDir, dir, name), text);
      written.push(join(dir, name));
    }
    return written;
  });
  return { ccd, solution, diagnostics: timer.diagnostics, settings: { ccd: ccdSettings, arc: arcSettings }, products, history };
}

/**
 * The CCD stage and the wavelength solution in a function of their own, so that the calibrated
 * arc (tens of MB at full size) is freed when it returns: no target needs it, nor the cache.
 */
function solvedCalibration(setup: ResolvedSetup, run: ResolvedRun, ccdSettings: CcdSettings, arcSettings: ArcSettings, timer: StageTimer): { ccd: ScienceCcdCalibration; solution: WavelengthSolution } {
  const { arc, ...ccd } = ccdCalibration(setup, run, ccdSettings, timer);
  const lampLines: LampLine[] = [...loadLampLines(setup.lamps), ...setup.line_lists.flatMap((f) => readLineListFile(f))].sort((a, b) => a.wavelength - b.wavelength);
  const solution = timer.stage(SETUP_STAGES[2], () => solveWavelengths(arc, lampLines, arcSettings));
  // The calibrated arc is read by nobody now (the solution holds arrays of its own): pooled for the science.
  giveBack(arc.sci, arc.var, arc.mask);
  return { ccd, solution };
}

/** Loading and the CCD stage in a function of their own, so the raw frames are freed when it returns. */
function ccdCalibration(setup: ResolvedSetup, run: ResolvedRun, settings: CcdSettings, timer: StageTimer): CcdCalibration {
  const frames = timer.stage(SETUP_STAGES[0], () => {
    const [bias, flat, arc] = [setup.bias, setup.flat, setup.arc].map((paths) => loadFrames(paths, run.baseDir));
    return { product: { bias: bias!.product, flat: flat!.product, arc: arc!.product }, diagnostics: [bias!, flat!, arc!].flatMap((r) => r.diagnostics) };
  });
  const calibration = timer.stage(SETUP_STAGES[1], () => buildCalibration(frames, settings));
  // The products hold trimmed copies, never the raw pixels: the raw frames are dead. As many as
  // the largest target of this setup loads are pooled for its science frames (more would only hold memory).
  const wanted = Math.max(0, ...run.targets.filter((t) => t.setup === setup.name).map((t) => t.frames.length));
  for (const f of [...frames.bias, ...frames.flat, ...frames.arc].slice(0, wanted)) giveBack(f.data);
  return calibration;
}
