/**
 * From a validated manifest to the frozen description of a run: every file list expanded to
 * absolute paths, the output folder resolved, defaults written out, and each target given its
 * folder. This is what provenance records and what the cache keys hash; nothing here reads pixels.
 */
import { readFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { InputError } from '../../errors.js';
import { uniqueFolderNames } from '../names.js';
import { globFiles } from './glob.js';
import { parseManifestText, type ParsedManifest } from './parse.js';
import type { ManifestSetup, ManifestTarget } from './schema.js';

/** A setup with its file lists as absolute paths (sorted, duplicates removed). */
export interface ResolvedSetup extends Omit<ManifestSetup, 'line_lists'> {
  name: string;
  line_lists: string[];
}

/** A target with defaults filled in and its frames as absolute paths. */
export interface ResolvedTarget extends ManifestTarget {
  /** Folder under `output` (safe, unique; see names.ts). */
  folder: string;
  /** Inclination error, degrees (default 3, common practice for photometric inclinations). */
  inclination_err_deg: number;
  velocity_convention: 'optical' | 'relativistic';
  velocity_frame: 'barycentric' | 'heliocentric';
}

export interface ResolvedRun {
  /** Absolute path of the manifest and its folder (relative names are taken from there). */
  manifestPath: string;
  baseDir: string;
  /** Absolute output folder. */
  outputDir: string;
  setups: Record<string, ResolvedSetup>;
  targets: ResolvedTarget[];
}

/** Default inclination error, degrees (common practice: photometric inclinations are good to a few degrees). */
export const DEFAULT_INCLINATION_ERR_DEG = 3;

/** Read, validate and resolve a manifest file; throws InputError for every user mistake. */
export function loadManifest(path: string): ResolvedRun {
  const manifestPath = resolve(path);
  let text: string;
  try {
    text = readFileSync(manifestPath, 'utf8');
  } catch (e) {
    throw new InputError('manifest.unreadable', `cannot read the manifest: ${(e as NodeJS.ErrnoException).code ?? String(e)}`, { file: path });
  }
  return resolveManifest(parseManifestText(text, path), manifestPath, path);
}

export function resolveManifest(parsed: ParsedManifest, manifestPath: string, displayPath = manifestPath): ResolvedRun {
  const m = parsed.manifest;
  const baseDir = dirname(manifestPath);
  const expand = (patterns: readonly string[], keyPath: (string | number)[]): string[] => {
    const out = new Set<string>();
    patterns.forEach((p, i) => {
      const found = globFiles(p, baseDir);
      if (found.length === 0) {
        const where = parsed.locate([...keyPath, i]);
        throw new InputError('manifest.no-files', `'${p}' matches no file (relative names are taken from ${baseDir})`, { file: displayPath, ...where });
      }
      for (const f of found) out.add(f);
    });
    return [...out].sort();
  };
  const setups: Record<string, ResolvedSetup> = {};
  for (const [name, s] of Object.entries(m.setups)) {
    const key = ['setups', name];
    setups[name] = {
      ...s,
      name,
      bias: expand(s.bias, [...key, 'bias']),
      flat: expand(s.flat, [...key, 'flat']),
      arc: expand(s.arc, [...key, 'arc']),
      line_lists: expand(s.line_lists ?? [], [...key, 'line_lists']),
    };
  }
  const folders = uniqueFolderNames(m.targets.map((t) => t.name));
  const targets = m.targets.map((t, i): ResolvedTarget => ({
    ...t,
    folder: folders[i]!,
    frames: expand(t.frames, ['targets', i, 'frames']),
    inclination_err_deg: t.inclination_err_deg ?? DEFAULT_INCLINATION_ERR_DEG,
    velocity_convention: t.velocity_convention ?? 'optical',
    velocity_frame: t.velocity_frame ?? 'barycentric',
  }));
  return deepFreeze({ manifestPath, baseDir, outputDir: resolve(baseDir, m.output), setups, targets });
}

/** Freeze the resolved settings before any pixel is read (house style: frozen settings). */
export function deepFreeze<T>(value: T): T {
  if (value && typeof value === 'object' && !Object.isFrozen(value)) {
    Object.freeze(value);
    for (const v of Object.values(value as object)) deepFreeze(v);
  }
  return value;
}
