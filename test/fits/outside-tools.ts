/** Calling Debian's outside references from tests: fitsverify and python3-astropy. */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';

export const PYTHON = '/usr/bin/python3';
export const FITSVERIFY = '/usr/bin/fitsverify';

export const hasFitsverify = existsSync(FITSVERIFY);
export const hasAstropy = existsSync(PYTHON) && spawnSync(PYTHON, ['-c', 'import astropy.io.fits'], { encoding: 'utf8' }).status === 0;

if (!hasFitsverify) console.warn('SKIPPED: fitsverify not installed (apt-get install fitsverify); writer files not verified');
if (!hasAstropy) console.warn('SKIPPED: python3-astropy not installed at /usr/bin/python3; astropy read-back not checked');

/** fitsverify's summary: errors and warnings counted over the file. */
export function fitsverify(path: string): { errors: number; warnings: number; text: string } {
  const r = spawnSync(FITSVERIFY, [path], { encoding: 'utf8' });
  const text = `${r.stdout}${r.stderr}`;
  const m = /(\d+) warning\(s\) and (\d+) error\(s\)/.exec(text);
  if (!m) throw new Error(`unexpected fitsverify output: ${text}`);
  return { warnings: Number(m[1]), errors: Number(m[2]), text };
}

/** Run a python snippet with astropy; `path` is sys.argv[1]; returns the parsed JSON it prints. */
export function astropyJson<T>(script: string, path: string): T {
  const r = spawnSync(PYTHON, ['-c', script, path], { encoding: 'utf8', maxBuffer: 64 << 20 });
  if (r.status !== 0) throw new Error(`python failed: ${r.stderr}`);
  return JSON.parse(r.stdout) as T;
}
