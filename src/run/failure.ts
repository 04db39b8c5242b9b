/** How a failed target or setup is described: the error's stable code and a one-line reason. */
import { InputError, StageError } from '../errors.js';

export function describeFailure(e: unknown): [code: string, reason: string] {
  if (e instanceof InputError || e instanceof StageError) return [e.code, e.message];
  const err = e instanceof Error ? e : new Error(String(e));
  return ['run.internal', `internal error: ${err.message}`];
}
