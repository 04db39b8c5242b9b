/** Reading a FITS file from disk (the edge where the reader meets the file system). */
import { readFileSync, statSync } from 'node:fs';
import { InputError } from '../errors.js';
import { parseFits } from './parse.js';
import type { FitsFile, ParseOptions } from './types.js';

/** Read and parse a FITS file (gzipped or not); InputError for a missing file, a directory or an empty file. */
export function readFitsFile(path: string, options: ParseOptions = {}): FitsFile {
  let stat;
  try {
    stat = statSync(path);
  } catch {
    throw new InputError('fits.missing', 'no such file', { file: path }, { expected: 'an existing FITS file' });
  }
  if (stat.isDirectory()) throw new InputError('fits.directory', 'is a directory, not a file', { file: path }, { expected: 'a FITS file' });
  if (!stat.isFile()) throw new InputError('fits.not-file', 'is not a regular file', { file: path }, { expected: 'a FITS file' });
  let bytes: Uint8Array;
  try {
    bytes = readFileSync(path);
  } catch (e) {
    throw new InputError('fits.unreadable', `cannot read: ${(e as Error).message}`, { file: path });
  }
  return parseFits(bytes, path, options);
}
