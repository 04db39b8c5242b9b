/**
 * Reading the headers of every FITS file under a folder (the inventory's edge with the disk).
 * A file that cannot be read is recorded with the reason; it never stops the scan.
 */
import { readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '../../errors.js';
import { readFitsFile } from '../../fits/read-file.js';
import { inheritedHeader } from '../../fits/raw-frame.js';
import type { FrameHeader, UnreadableFile } from './types.js';

/** File names the scan reads: .fits, .fit, .fts, optionally .gz or .fz (case-insensitive). */
export const FITS_NAME = /\.(fits?|fts)(\.gz|\.fz)?$/i;

function walk(dir: string, out: string[]): void {
  for (const entry of readdirSync(dir, { withFileTypes: true }).sort((a, b) => a.name.localeCompare(b.name))) {
    const p = join(dir, entry.name);
    if (entry.isDirectory()) walk(p, out);
    else if (FITS_NAME.test(entry.name)) out.push(p);
  }
}

export function scanDirectory(dir: string): { frames: FrameHeader[]; unreadable: UnreadableFile[] } {
  let isDir = false;
  try {
    isDir = statSync(dir).isDirectory();
  } catch {
    throw new InputError('inventory.no-dir', 'no such folder', { file: dir }, { expected: 'a folder of raw FITS frames' });
  }
  if (!isDir) throw new InputError('inventory.not-dir', 'is not a folder', { file: dir }, { expected: 'a folder of raw FITS frames' });
  const paths: string[] = [];
  walk(dir, paths);
  const frames: FrameHeader[] = [];
  const unreadable: UnreadableFile[] = [];
  for (const path of paths) {
    try {
      const file = readFitsFile(path, { checksum: 'skip' });
      const hdu = file.hdus.find((h) => (h.kind === 'image' || h.kind === 'compressed-image') && (h.header.getNumber('NAXIS') ?? 0) >= 2);
      if (!hdu) unreadable.push({ path, reason: 'no HDU holds a 2-D image' });
      else frames.push({ path, hdu: hdu.index, header: inheritedHeader(file, hdu) });
    } catch (e) {
      if (!(e instanceof InputError)) throw e;
      unreadable.push({ path, reason: e.message.startsWith(`${path}, `) || e.message.startsWith(`${path}: `) ? e.message.slice(path.length + 2) : e.message });
    }
  }
  return { frames, unreadable };
}
