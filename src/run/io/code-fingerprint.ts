/**
 * A hash of whorl's own code (every .js or .ts file of the tree this module runs from: dist/ or
 * src/) and of its data (config/: line lists, catalogues), part of every cache key besides the
 * version: a changed stage between two releases
 * (a developer's build, a patched install) must not reuse products made by the old code.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { sha256Text } from './hash.js';
import { PACKAGE_ROOT } from './versions.js';

/** src/run/io and dist/run/io: the code tree is two levels up, the package root three. */
const CODE_ROOT = fileURLToPath(new URL('../../', import.meta.url));
const CONFIG_ROOT = join(PACKAGE_ROOT, 'config');
let cached: string | undefined;

function fileHashes(root: string, keep: (name: string) => boolean): string[] {
  return readdirSync(root, { recursive: true })
    .map(String)
    .filter(keep)
    .sort()
    .map((f) => `${f}:${sha256Text(readFileSync(join(root, f)))}`);
}

export function codeFingerprint(): string {
  if (cached !== undefined) return cached;
  const code = fileHashes(CODE_ROOT, (f) => /\.(js|ts)$/.test(f) && !f.endsWith('.d.ts'));
  const config = fileHashes(CONFIG_ROOT, (f) => /\.(txt|json|ya?ml)$/.test(f));
  cached = sha256Text([...code, '--config--', ...config].join('\n'));
  return cached;
}
