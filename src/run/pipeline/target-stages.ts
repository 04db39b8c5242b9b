/**
 * The stages of one target, in the order of DEVELOPERS.md "Stage contracts", on its setup's
 * calibration. Each stage is a pure function; this file only loads the science frames and
 * threads the products through.
 */
import type { CalibratedFrame } from '../../products/frame.js';
import { emptyPool } from '../../kernels/frame-pool.js';
import { flipFrameX } from '../../products/orientation.js';
import type { RotationCurve, VelocityTable } from '../../products/curve.js';
import type { LineTable, SkyModel } from '../../products/lines.js';
import type { WavelengthSolution } from '../../products/wavelength.js';
import { skyLines } from '../../physics/catalogues.js';
import { measureFlexure } from '../../stages/arc/flexure.js';
import { DEFAULT_FLEXURE_SETTINGS, type FlexureSettings } from '../../stages/arc/settings.js';
import { calibrateScience } from '../../stages/ccd/calibrate-science.js';
import { buildRotationCurve } from '../../stages/geometry/build.js';
import type { GeometryInput } from '../../stages/geometry/settings.js';
import { measureLines } from '../../stages/lines/measure.js';
import type { LineSettings } from '../../stages/lines/settings.js';
import type { SkySettings } from '../../stages/sky/settings.js';
import { computeVelocities } from '../../stages/velocity/compute.js';
import type { VelocitySettings } from '../../stages/velocity/settings.js';
import { subtractSky } from '../../stages/sky/subtract.js';
import type { CcdSettings } from '../../stages/ccd/settings.js';
import type { TargetJob } from '../target-job.js';
import { loadFrames } from './frames.js';
import type { SetupCalibration } from './setup-stages.js';
import { geometryInputFor, lineSettingsFor, skySettingsFor, velocitySettingsFor } from './settings.js';
import type { StageTimer } from './timer.js';

/** Stage names of a target, in order (progress and cache keys). */
export const TARGET_STAGES = ['load science', 'ccd science', 'flexure', 'sky', 'lines', 'velocities', 'rotation curve'] as const;

/** The settings each stage ran with, for provenance. */
export interface TargetStageSettings {
  ccd: CcdSettings;
  flexure: FlexureSettings;
  sky: SkySettings;
  lines: LineSettings;
  velocity: VelocitySettings;
  geometry: GeometryInput;
}

export interface TargetProducts {
  /** The setup's wavelength solution, shifted by this frame's flexure. */
  solution: WavelengthSolution;
  /** The combined, calibrated and sky-subtracted science frame, internal orientation (wavelength increasing with x). */
  skySubtracted: CalibratedFrame;
  sky: SkyModel;
  lines: LineTable;
  velocities: VelocityTable;
  curve: RotationCurve;
  settings: TargetStageSettings;
}

/**
 * `lastUse`: no target after this one reads `cal`'s per-pixel wavelengths, so the flexure stage
 * shifts them in place instead of into a new full-frame array.
 */
export function runTargetStages(job: TargetJob, cal: SetupCalibration, timer: StageTimer, lastUse = false): TargetProducts {
  const settings: TargetStageSettings = {
    ccd: cal.settings.ccd,
    flexure: { ...DEFAULT_FLEXURE_SETTINGS },
    sky: skySettingsFor(job.target),
    lines: lineSettingsFor(job.target),
    velocity: velocitySettingsFor(job.setup, job.target),
    geometry: geometryInputFor(job.setup, job.target),
  };
  const { solution, sky } = skySubtractedScience(job, cal, settings, timer, lastUse);
  const lines = timer.stage(TARGET_STAGES[4], () => measureLines(sky.frame, solution, sky.sky, settings.lines));
  const velocities = timer.stage(TARGET_STAGES[5], () => computeVelocities(lines, sky.frame, settings.velocity));
  const curve = timer.stage(TARGET_STAGES[6], () => buildRotationCurve(velocities, lines, settings.geometry));
  return { solution, skySubtracted: sky.frame, sky: sky.sky, lines, velocities, curve, settings };
}

/**
 * The stages up to the sky, in a function of their own so that the raw frames and the frame
 * before sky subtraction can be freed once it returns (full-size frames are tens of MB each).
 */
function skySubtractedScience(job: TargetJob, cal: SetupCalibration, settings: TargetStageSettings, timer: StageTimer, lastUse: boolean) {
  const science = calibratedScience(job, cal, settings, timer);
  const solution = timer.stage(TARGET_STAGES[2], () => measureFlexure(science, cal.solution, skyLines(), settings.flexure, lastUse ? cal.solution.wave : undefined));
  // Nothing reads the frame before sky subtraction after this stage: its variance array takes the result.
  const sky = timer.stage(TARGET_STAGES[3], () => subtractSky(science, solution, settings.sky, science.var));
  return { solution, sky };
}

function calibratedScience(job: TargetJob, cal: SetupCalibration, settings: TargetStageSettings, timer: StageTimer): CalibratedFrame {
  const calibrated = combinedScience(job, cal, settings, timer);
  // The arc stage decided the direction of the wavelengths; the science follows it.
  return cal.solution.flipX ? flipFrameX(calibrated) : calibrated;
}

/** Loading and the CCD stage in a function of their own, so the raw frames are freed before the flip copies the frame. */
function combinedScience(job: TargetJob, cal: SetupCalibration, settings: TargetStageSettings, timer: StageTimer): CalibratedFrame {
  try {
    const frames = timer.stage(TARGET_STAGES[0], () => loadFrames(job.target.frames, job.baseDir));
    return timer.stage(TARGET_STAGES[1], () => calibrateScience(frames, cal.ccd, settings.ccd));
  } finally {
    // The frames pooled since the calibration are not needed by the later stages: their memory goes back.
    emptyPool();
  }
}
