/** What a caller may ask of the simulator, and the checked, defaulted form the simulator uses. */
import { InputError } from '../errors.js';

/** Scenario variants, described in index.ts. */
export type SimVariant = 'standard' | 'rotated' | 'offset' | 'falling' | 'faint';
export const SIM_VARIANTS: readonly SimVariant[] = ['standard', 'rotated', 'offset', 'falling', 'faint'];

export type SimSize = 'small' | 'full';

export interface SimOptions {
  /** Seed of every random draw; default 1. Same seed and options give identical frames. */
  seed?: number;
  /** `small`: 1024 (dispersion) x 300 (slit) pixels; `full`: 4096 x 2048. Default `small`. */
  size?: SimSize;
  /** Default `standard`. */
  variant?: SimVariant;
  /** Galaxies observed in one night on one setup (shared calibrations); default 1, at most 8. */
  targets?: number;
  /** Spectral setups; default 1. 2 adds a second grating tilt with its own flats, arcs and science. */
  setups?: number;
  /** Keep the noiseless expected image of every frame (electrons); default false. */
  expected?: boolean;
}

export interface ResolvedSimOptions {
  seed: number;
  size: SimSize;
  variant: SimVariant;
  targets: number;
  setups: number;
  expected: boolean;
}

export const MAX_TARGETS = 8;
export const MAX_SETUPS = 2;

function bad(key: string, expected: string, actual: unknown): InputError {
  return new InputError('sim.invalid-option', `invalid simulator option ${key}`, { key }, { expected, actual: JSON.stringify(actual) });
}

/** Fill defaults and check every option; throws InputError naming the option. */
export function resolveSimOptions(options: SimOptions = {}): ResolvedSimOptions {
  const seed = options.seed ?? 1;
  if (!Number.isInteger(seed) || seed < 0 || seed > 0xffffffff) throw bad('seed', 'an integer in [0, 4294967295]', seed);
  const size = options.size ?? 'small';
  if (size !== 'small' && size !== 'full') throw bad('size', "'small' or 'full'", size);
  const variant = options.variant ?? 'standard';
  if (!SIM_VARIANTS.includes(variant)) throw bad('variant', SIM_VARIANTS.join(' | '), variant);
  const targets = options.targets ?? 1;
  if (!Number.isInteger(targets) || targets < 1 || targets > MAX_TARGETS) throw bad('targets', `an integer in [1, ${MAX_TARGETS}]`, targets);
  const setups = options.setups ?? 1;
  if (!Number.isInteger(setups) || setups < 1 || setups > MAX_SETUPS) throw bad('setups', `an integer in [1, ${MAX_SETUPS}]`, setups);
  return { seed, size, variant, targets, setups, expected: options.expected ?? false };
}
