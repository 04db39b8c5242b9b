import { InputError } from '../../src/errors.js';

/** The InputError that `f` throws; any other outcome fails the test. */
export function inputError(f: () => unknown): InputError {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error('expected an InputError, nothing was thrown');
}
