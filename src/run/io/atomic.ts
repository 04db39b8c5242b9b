/**
 * Products are written completely or not at all: each goes to a temporary file in the same
 * folder (same file system, so rename is atomic on POSIX) and is renamed into place once it is
 * whole. A run killed at any moment leaves at most `.*.partial-*` files, which the next run
 * removes. No fsync: a killed process loses nothing the kernel already holds, and fsync per
 * product cost seconds per run here; only a power cut could leave a renamed file short.
 *
 * Several whorl processes may share one output folder (a batch-scheduler array with `--only`),
 * so a temporary name carries the host and process id, and only the leftovers of processes that
 * are gone are removed: dead ones on this host, and those of other hosts after a day.
 */
import { closeSync, mkdirSync, openSync, readdirSync, renameSync, rmSync, statSync, writeSync } from 'node:fs';
import { rename, rm, writeFile } from 'node:fs/promises';
import { hostname } from 'node:os';
import { basename, dirname, join } from 'node:path';

const HOST = hostname().replace(/[^A-Za-z0-9_-]/g, '_');
const PARTIAL = /^\..+\.partial-([A-Za-z0-9_-]+)-(\d+)-\d+$/;
/** Leftovers of another host are removed once this old (ms): no product takes a day to write. */
const FOREIGN_AGE_MS = 24 * 3600 * 1000;
let counter = 0;

function temporaryName(path: string): string {
  const dir = dirname(path);
  mkdirSync(dir, { recursive: true });
  return join(dir, `.${basename(path)}.partial-${HOST}-${process.pid}-${counter++}`);
}

/** Writes `bytes` at byte `position` of the file being written. */
export type PositionedWrite = (bytes: Uint8Array, position: number) => void;

/**
 * Write `data` to `path` atomically (creating the folder). `data` may be a function that writes
 * the file in pieces at their positions (e.g. writeFitsPieces), so a large file need not be held
 * whole; the pieces must cover the file.
 */
export function writeFileAtomic(path: string, data: string | Uint8Array | ((write: PositionedWrite) => void)): void {
  const tmp = temporaryName(path);
  const fd = openSync(tmp, 'w');
  const write: PositionedWrite = (bytes, position) => {
    for (let off = 0; off < bytes.length; ) off += writeSync(fd, bytes, off, bytes.length - off, position + off);
  };
  try {
    if (typeof data === 'function') data(write);
    else write(typeof data === 'string' ? Buffer.from(data, 'utf8') : data, 0);
  } catch (e) {
    closeSync(fd);
    rmSync(tmp, { force: true });
    throw e;
  }
  closeSync(fd);
  renameSync(tmp, path);
}

/**
 * The same, in the background (the copy into the kernel runs off this thread): for large files
 * that nothing later in the run reads, such as the calibration cache. Await it before exiting.
 */
export async function writeFileAtomicInBackground(path: string, data: Uint8Array): Promise<void> {
  const tmp = temporaryName(path);
  try {
    await writeFile(tmp, data);
    await rename(tmp, path);
  } catch (e) {
    await rm(tmp, { force: true });
    throw e;
  }
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'EPERM';
  }
}

function ageMs(path: string): number {
  try {
    return Date.now() - statSync(path).mtimeMs;
  } catch {
    return 0;
  }
}

/** Remove temporary files that killed runs left in `dir` (not recursive). Returns how many. */
export function removePartialFiles(dir: string): number {
  let names: string[];
  try {
    names = readdirSync(dir);
  } catch {
    return 0;
  }
  let n = 0;
  for (const name of names) {
    const m = PARTIAL.exec(name);
    if (!m) continue;
    const path = join(dir, name);
    const stale = m[1] === HOST ? Number(m[2]) !== process.pid && !alive(Number(m[2])) : ageMs(path) > FOREIGN_AGE_MS;
    if (stale) {
      rmSync(path, { force: true });
      n++;
    }
  }
  return n;
}
