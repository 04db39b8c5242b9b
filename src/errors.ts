/**
 * The error channel for caller and input mistakes (see DEVELOPERS.md, "Two error channels").
 * Data-quality problems are not errors: they become Diagnostics and the run goes on.
 */

/** Exit codes of the `whorl` command. */
export const EXIT = {
  ok: 0,
  internal: 1,
  badInput: 2,
  someTargetsFailed: 3,
} as const;

/** Where in an input the problem is; every field optional, fill what you know. */
export interface ErrorPlace {
  /** File path as the user gave it (or as resolved from the manifest). */
  file?: string;
  /** 0-based HDU index. */
  hdu?: number;
  /** FITS keyword, manifest key path (`targets[0].lines`), or setting name. */
  key?: string;
  /** Byte offset in the file. */
  offset?: number;
  /** 1-based line and column in a text file (manifest, line list). */
  line?: number;
  column?: number;
}

/**
 * A mistake in what the user gave whorl: a malformed file, a bad manifest, an impossible setting.
 * The CLI prints `message` (with the place) and exits 2, without a stack trace.
 */
export class InputError extends Error {
  override readonly name = 'InputError';
  /** Stable machine-readable code, e.g. `fits.truncated`, `manifest.invalid`. */
  readonly code: string;
  readonly place: ErrorPlace;
  /** What was expected, in words (`"a multiple of 2880 bytes"`). */
  readonly expected?: string;
  readonly actual?: string;

  constructor(code: string, message: string, place: ErrorPlace = {}, extra: { expected?: string; actual?: string } = {}) {
    super(formatMessage(message, place, extra.expected, extra.actual));
    this.code = code;
    this.place = place;
    if (extra.expected !== undefined) this.expected = extra.expected;
    if (extra.actual !== undefined) this.actual = extra.actual;
  }
}

/**
 * A stage could not produce its product from valid input (for example an arc whose lines
 * cannot be identified). The batch runner fails that target alone and goes on.
 */
export class StageError extends Error {
  override readonly name = 'StageError';
  readonly code: string;
  readonly stage: string;
  constructor(stage: string, code: string, message: string) {
    super(`${stage}: ${message}`);
    this.stage = stage;
    this.code = code;
  }
}

function formatMessage(message: string, place: ErrorPlace, expected?: string, actual?: string): string {
  const where: string[] = [];
  if (place.file !== undefined) where.push(place.file);
  if (place.hdu !== undefined) where.push(`HDU ${place.hdu}`);
  if (place.key !== undefined) where.push(place.key);
  if (place.line !== undefined) where.push(place.column !== undefined ? `line ${place.line}:${place.column}` : `line ${place.line}`);
  if (place.offset !== undefined) where.push(`byte ${place.offset}`);
  let text = where.length > 0 ? `${where.join(', ')}: ${message}` : message;
  if (expected !== undefined) text += ` (expected ${expected}${actual !== undefined ? `, found ${actual}` : ''})`;
  return text;
}

export function isInputError(e: unknown): e is InputError {
  return e instanceof InputError;
}
