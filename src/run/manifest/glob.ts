/**
 * A small glob for manifest file lists: `*` (any run of characters but `/`) and `?` (one
 * character) in any path segment; no `**`, no braces. Matches are files only, sorted by path
 * so that runs are deterministic.
 */
import { readdirSync, statSync } from 'node:fs';
import { isAbsolute, join, resolve, sep } from 'node:path';

const WILD = /[*?]/;

export function hasWildcard(pattern: string): boolean {
  return WILD.test(pattern);
}

/** The regular expression of one path segment pattern. */
export function segmentMatcher(segment: string): RegExp {
  let re = '^';
  for (const ch of segment) {
    if (ch === '*') re += '[^/]*';
    else if (ch === '?') re += '[^/]';
    else re += ch.replace(/[.+^${}()|[\]\\]/g, '\\$&');
  }
  return new RegExp(`${re}$`);
}

/**
 * Files matching `pattern` (absolute, or relative to `baseDir`), as absolute paths, sorted.
 * A pattern without wildcards returns itself if it is a file, else nothing.
 */
export function globFiles(pattern: string, baseDir: string): string[] {
  const abs = isAbsolute(pattern) ? pattern : resolve(baseDir, pattern);
  const parts = abs.split(sep);
  let bases = [parts[0] === '' ? sep : parts[0]!];
  for (let i = 1; i < parts.length; i++) {
    const seg = parts[i]!;
    if (seg === '') continue;
    const last = i === parts.length - 1;
    const next: string[] = [];
    if (!hasWildcard(seg)) {
      for (const b of bases) next.push(join(b, seg));
    } else {
      const re = segmentMatcher(seg);
      for (const b of bases) {
        let names: string[];
        try {
          names = readdirSync(b);
        } catch {
          continue;
        }
        for (const n of names) if (re.test(n) && !(n.startsWith('.') && !seg.startsWith('.'))) next.push(join(b, n));
      }
    }
    bases = last ? next : next.filter(isDirectory);
  }
  return bases.filter(isFile).sort();
}

function isFile(p: string): boolean {
  try {
    return statSync(p).isFile();
  } catch {
    return false;
  }
}

function isDirectory(p: string): boolean {
  try {
    return statSync(p).isDirectory();
  } catch {
    return false;
  }
}
