/** Reading a FITS file from disk (the edge where the reader meets the file system). */
import { closeSync, fstatSync, openSync, readSync, statSync } from 'node:fs';
import { InputError } from '../errors.js';
import { parseFits } from './parse.js';
import type { FitsFile, ParseOptions } from './types.js';

/** The buffer readFitsFileTransient reads into, reused by its next call (one per thread). */
let transient: Buffer | undefined;

function checkPath(path: string): void {
  let stat;
  try {
    stat = statSync(path);
  } catch {
    throw new InputError('fits.missing', 'no such file', { file: path }, { expected: 'an existing FITS file' });
  }
  if (stat.isDirectory()) throw new InputError('fits.directory', 'is a directory, not a file', { file: path }, { expected: 'a FITS file' });
  if (!stat.isFile()) throw new InputError('fits.not-file', 'is not a regular file', { file: path }, { expected: 'a FITS file' });
}

/** The file's bytes, in `into` when it is large enough, else in a new buffer. */
function readBytes(path: string, into?: Buffer): Buffer {
  let fd: number | undefined;
  try {
    fd = openSync(path, 'r');
    const size = fstatSync(fd).size;
    const buffer = into && into.length >= size ? into : Buffer.allocUnsafeSlow(size);
    let n = 0;
    for (let got = -1; n < size && got !== 0; n += got) got = readSync(fd, buffer, n, size - n, n);
    return buffer.subarray(0, n);
  } catch (e) {
    throw new InputError('fits.unreadable', `cannot read: ${(e as Error).message}`, { file: path });
  } finally {
    if (fd !== undefined) closeSync(fd);
  }
}

/** Read and parse a FITS file (gzipped or not); InputError for a missing file, a directory or an empty file. */
export function readFitsFile(path: string, options: ParseOptions = {}): FitsFile {
  checkPath(path);
  return parseFits(readBytes(path), path, options);
}

/**
 * readFitsFile into a buffer that its next call reuses, so that reading the frames of a run does
 * not take fresh memory pages for each (~6 ms per full-size frame): only for callers that keep
 * nothing pointing into the file's bytes (loadRawFrame copies the pixels; header cards are text).
 */
export function readFitsFileTransient(path: string, options: ParseOptions = {}): FitsFile {
  checkPath(path);
  const bytes = readBytes(path, transient);
  if (bytes.buffer !== transient?.buffer) transient = Buffer.from(bytes.buffer);
  return parseFits(bytes, path, options);
}
