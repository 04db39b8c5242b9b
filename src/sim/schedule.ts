/**
 * The night plan: which frames are taken, in what order, when, and their file names.
 * One night: biases, then per setup its flats and a first arc, the targets one after the
 * other (each a block of science exposures), and a closing arc per setup.
 */
import { EXPOSURE_S, FRAME_COUNTS, NIGHT_START_UTC, OVERHEAD_S } from './scenario.js';

export type FrameKind = 'bias' | 'flat' | 'arc' | 'science';

export interface FramePlan {
  /** Relative path, e.g. `raw/bias_001.fits`. */
  name: string;
  kind: FrameKind;
  setup: string;
  /** Index into the run's target list (science frames only). */
  target?: number;
  /** Start of the exposure, ms since 1970 (UTC). */
  startMs: number;
  exptimeS: number;
}

export interface TargetPlan {
  /** Index of the galaxy in the scenario list. */
  galaxy: number;
  setup: string;
}

/** Slew and acquisition before each target, seconds. */
const ACQUISITION_S = 420;
/** The first science exposure starts at astronomical twilight, ~1 h 10 min after NIGHT_START_UTC. */
const SCIENCE_START_MS = NIGHT_START_UTC + 70 * 60 * 1000;

function pad(n: number): string {
  return String(n).padStart(3, '0');
}

/**
 * Frame names: setup 0 uses `raw/<kind>_NNN.fits`; other setups prefix their name
 * (`raw/<setup>_<kind>_NNN.fits`) so that the first setup's globs do not pick them up.
 */
export function planNight(setupNames: string[], targets: TargetPlan[]): FramePlan[] {
  const frames: FramePlan[] = [];
  let t = NIGHT_START_UTC;
  const counters = new Map<string, number>();
  const add = (kind: FrameKind, setupIndex: number, exptimeS: number, target?: number): void => {
    const setup = setupNames[setupIndex]!;
    const stem = kind === 'science' ? 'sci' : kind;
    const key = `${setupIndex}/${stem}`;
    const n = (counters.get(key) ?? 0) + 1;
    counters.set(key, n);
    const prefix = setupIndex === 0 || kind === 'bias' ? '' : `${setup}_`;
    const plan: FramePlan = { name: `raw/${prefix}${stem}_${pad(n)}.fits`, kind, setup, startMs: t, exptimeS };
    if (target !== undefined) plan.target = target;
    frames.push(plan);
    t += (exptimeS + OVERHEAD_S) * 1000;
  };
  // Biases are shared by all setups (same detector and readout); they are listed under the first.
  for (let i = 0; i < FRAME_COUNTS.bias; i++) add('bias', 0, EXPOSURE_S.bias);
  setupNames.forEach((_, k) => {
    for (let i = 0; i < FRAME_COUNTS.flat; i++) add('flat', k, EXPOSURE_S.flat);
    add('arc', k, EXPOSURE_S.arc);
  });
  t = Math.max(t, SCIENCE_START_MS);
  targets.forEach((target, index) => {
    t += ACQUISITION_S * 1000;
    const k = setupNames.indexOf(target.setup);
    for (let i = 0; i < FRAME_COUNTS.science; i++) add('science', k, EXPOSURE_S.science, index);
  });
  setupNames.forEach((_, k) => {
    for (let i = 1; i < FRAME_COUNTS.arc; i++) add('arc', k, EXPOSURE_S.arc);
  });
  return frames;
}

/** DATE-OBS text, UTC with milliseconds: `YYYY-MM-DDThh:mm:ss.sss`. */
export function dateObsText(ms: number): string {
  return new Date(ms).toISOString().slice(0, 23);
}
