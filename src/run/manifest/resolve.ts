/**
 * From a validated manifest to the frozen description of a run: every file list expanded to
 * absolute paths, the output folder resolved, defaults written out, and each target given its
 * folder. This is what provenance records and what the cache keys hash; nothing here reads pixels.
 */
import { readFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { InputError } from '../../errors.js';
import { GALAXY_LINES, KNOWN_LAMPS, readLineListFile } from '../../physics/catalogues.js';
import { parseDeclination, parseRightAscension } from '../../physics/coordinates.js';
import { uniqueFolderNames } from '../names.js';
import { globFiles } from './glob.js';
import { parseManifestText, type ParsedManifest } from './parse.js';
import type { ManifestSetup, ManifestTarget } from './schema.js';

/** A setup with its file lists as absolute paths (sorted, duplicates removed). */
export interface ResolvedSetup extends Omit<ManifestSetup, 'line_lists'> {
  name: string;
  /** Folder under `<output>/calib/` (safe, unique; see names.ts). */
  folder: string;
  line_lists: string[];
}

/** A target with defaults filled in and its frames as absolute paths. */
export interface ResolvedTarget extends ManifestTarget {
  /** Folder under `output` (safe, unique; see names.ts). */
  folder: string;
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

/** Read, validate and resolve a manifest file; throws InputError for every user mistake. */
export function loadManifest(path: string): ResolvedRun {
  const manifestPath = resolve(path);
  let text: string;
  try {
    text = readFileSync(manifestPath, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'is a folder, not a file' : code === 'EACCES' ? 'not readable (permission denied)' : (code ?? String(e));
    throw new InputError('manifest.unreadable', `cannot read the manifest: ${why}`, { file: path }, { expected: 'a YAML run manifest' });
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
  const refuse = (keyPath: (string | number)[], message: string, expected: string): never => {
    throw new InputError('manifest.invalid', message, { file: displayPath, ...parsed.locate(keyPath) }, { expected });
  };
  const setups: Record<string, ResolvedSetup> = {};
  const setupFolders = uniqueFolderNames(Object.keys(m.setups));
  for (const [index, [name, s]] of Object.entries(m.setups).entries()) {
    const key = ['setups', name];
    s.lamps.forEach((lamp, i) => {
      if (!KNOWN_LAMPS.some((k) => k.toLowerCase() === lamp.toLowerCase())) {
        refuse([...key, 'lamps', i], `no built-in line list for the lamp '${lamp}'`, `one of ${KNOWN_LAMPS.join(', ')}, or a file under line_lists`);
      }
    });
    setups[name] = {
      ...s,
      name,
      folder: setupFolders[index]!,
      bias: expand(s.bias, [...key, 'bias']),
      flat: expand(s.flat, [...key, 'flat']),
      arc: expand(s.arc, [...key, 'arc']),
      line_lists: expand(s.line_lists ?? [], [...key, 'line_lists']),
    };
    // Malformed line lists are user mistakes: find them now, before any pixel is read.
    for (const file of setups[name].line_lists) readLineListFile(file);
  }
  m.targets.forEach((t, i) => {
    t.lines.forEach((line, j) => {
      if (!Object.hasOwn(GALAXY_LINES, line)) refuse(['targets', i, 'lines', j], `unknown line name '${line}'`, `one of ${Object.keys(GALAXY_LINES).join(', ')}`);
    });
    if (t.coordinates) {
      parseRightAscension(t.coordinates.ra, { file: displayPath, ...parsed.locate(['targets', i, 'coordinates', 'ra']) });
      parseDeclination(t.coordinates.dec, { file: displayPath, ...parsed.locate(['targets', i, 'coordinates', 'dec']) });
    }
  });
  const folders = uniqueFolderNames(m.targets.map((t) => t.name));
  const targets = m.targets.map((t, i): ResolvedTarget => ({
    ...t,
    folder: folders[i]!,
    frames: expand(t.frames, ['targets', i, 'frames']),
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

/** A path as people read it in products: relative to the manifest's folder when inside it, else absolute. */
export function manifestRelative(baseDir: string, path: string): string {
  const base = baseDir.endsWith('/') ? baseDir : `${baseDir}/`;
  return path.startsWith(base) ? path.slice(base.length) : path;
}
