/** Versions of whorl's runtime libraries, read from their package.json files, for provenance. */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

/** The package root: src/run/io and dist/run/io both sit three levels below it. */
export const PACKAGE_ROOT = fileURLToPath(new URL('../../../', import.meta.url));

let cached: Record<string, string> | undefined;

/** `{ name: version }` of every dependency in whorl's package.json, plus node itself. */
export function libraryVersions(): Record<string, string> {
  if (cached) return cached;
  const pkg = JSON.parse(readFileSync(join(PACKAGE_ROOT, 'package.json'), 'utf8')) as { dependencies?: Record<string, string> };
  const out: Record<string, string> = { node: process.versions.node };
  for (const name of Object.keys(pkg.dependencies ?? {}).sort()) {
    try {
      const dep = JSON.parse(readFileSync(join(PACKAGE_ROOT, 'node_modules', name, 'package.json'), 'utf8')) as { version: string };
      out[name] = dep.version;
    } catch {
      out[name] = 'not found';
    }
  }
  cached = out;
  return out;
}
