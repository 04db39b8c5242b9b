/**
 * Folder names for targets, derived from the names in the manifest so that no name can leave
 * the output folder: only letters, digits, `.`, `_` and `-` survive; no leading dot; names that
 * would clash with the run's own files are prefixed. Collisions (compared case-insensitively, for
 * file systems that fold case) get `-2`, `-3`, ... in manifest order, so the mapping is stable.
 */

const RESERVED = new Set(['calib', 'summary.json', 'provenance.json', 'index.html', 'timings.json', '.whorl']);
/** Device names Windows refuses as file names (common practice to avoid on shared disks). */
const WINDOWS_DEVICES = /^(con|prn|aux|nul|com\d|lpt\d)(\..*)?$/i;
const MAX_LENGTH = 64;

export function safeFolderName(name: string): string {
  let s = name
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^A-Za-z0-9._-]+/g, '-')
    .replace(/-{2,}/g, '-')
    .replace(/^[-.]+/, '')
    .replace(/[-.]+$/, '');
  if (s.length > MAX_LENGTH) s = s.slice(0, MAX_LENGTH).replace(/[-.]+$/, '');
  if (s === '') s = 'target';
  if (RESERVED.has(s.toLowerCase()) || WINDOWS_DEVICES.test(s)) s = `target-${s}`;
  return s;
}

/** Folder names for a list of target names, same order, unique case-insensitively. */
export function uniqueFolderNames(names: readonly string[]): string[] {
  const used = new Set<string>();
  return names.map((n) => {
    const base = safeFolderName(n);
    let candidate = base;
    for (let k = 2; used.has(candidate.toLowerCase()); k++) candidate = `${base}-${k}`;
    used.add(candidate.toLowerCase());
    return candidate;
  });
}
