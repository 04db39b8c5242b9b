/** Content hashes (sha256, hex) of input files and of settings, for provenance and the cache. */
import { createHash } from 'node:crypto';
import { closeSync, openSync, readSync } from 'node:fs';

const CHUNK = 1 << 22;
/** One read buffer for every file hashed (per thread): a fresh one per file costs fresh memory pages. */
let scratch: Buffer | undefined;

/** sha256 of a file's bytes, read in 4 MiB chunks (no whole-file buffer). */
export function sha256File(path: string): string {
  scratch ??= Buffer.allocUnsafe(CHUNK);
  const h = createHash('sha256');
  const fd = openSync(path, 'r');
  try {
    for (;;) {
      const n = readSync(fd, scratch, 0, scratch.length, null);
      if (n === 0) break;
      h.update(scratch.subarray(0, n));
    }
  } finally {
    closeSync(fd);
  }
  return h.digest('hex');
}

export function sha256Text(text: string | Uint8Array): string {
  return createHash('sha256').update(text).digest('hex');
}

/** JSON with object keys sorted at every level, so equal settings always hash alike. */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(value, (_k, v: unknown) => {
    if (v && typeof v === 'object' && !Array.isArray(v) && !ArrayBuffer.isView(v)) {
      const o = v as Record<string, unknown>;
      return Object.fromEntries(Object.keys(o).sort().map((k) => [k, o[k]]));
    }
    return v;
  });
}
