/**
 * Products are written completely or not at all: each goes to a temporary file in the same
 * folder (same file system, so rename is atomic on POSIX) and is renamed into place once it is
 * whole. A run killed at any moment leaves at most `.*.partial` files, which the next run removes.
 * No fsync: a killed process loses nothing the kernel already holds, and fsync per product cost
 * seconds per run here; only a power cut could leave a renamed file short.
 */
import { closeSync, mkdirSync, openSync, readdirSync, renameSync, rmSync, writeSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';

const PARTIAL = /^\..+\.partial-\d+-\d+$/;
let counter = 0;

/** Write `data` to `path` atomically (creating the folder). */
export function writeFileAtomic(path: string, data: string | Uint8Array): void {
  const dir = dirname(path);
  mkdirSync(dir, { recursive: true });
  const tmp = join(dir, `.${basename(path)}.partial-${process.pid}-${counter++}`);
  const fd = openSync(tmp, 'w');
  try {
    const bytes = typeof data === 'string' ? Buffer.from(data, 'utf8') : data;
    let off = 0;
    while (off < bytes.length) off += writeSync(fd, bytes, off, bytes.length - off);
  } catch (e) {
    closeSync(fd);
    rmSync(tmp, { force: true });
    throw e;
  }
  closeSync(fd);
  renameSync(tmp, path);
}

/** Remove temporary files left by a killed run in `dir` (not recursive). Returns how many. */
export function removePartialFiles(dir: string): number {
  let names: string[];
  try {
    names = readdirSync(dir);
  } catch {
    return 0;
  }
  let n = 0;
  for (const name of names) {
    if (PARTIAL.test(name)) {
      rmSync(join(dir, name), { force: true });
      n++;
    }
  }
  return n;
}
