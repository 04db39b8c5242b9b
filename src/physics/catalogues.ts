/**
 * Line catalogues: arc-lamp lists (config/lamps/), galaxy emission lines and night-sky lines
 * (config/lines/). Each data file names its source in its header comment.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { InputError, type ErrorPlace } from '../errors.js';
import { expectFieldCount, numberField, splitListRows } from './line-list-format.js';

/** One arc-lamp line. */
export interface LampLine {
  /** Laboratory wavelength, Angstrom, standard air. */
  wavelength: number;
  /** Emitter, e.g. `Ne`. */
  element: string;
  /** Relative intensity, for ranking and simulation only. */
  intensity: number;
}

const CONFIG_DIR = fileURLToPath(new URL('../../config/', import.meta.url));
/** Lamps with a built-in list config/lamps/<El>.txt. */
export const KNOWN_LAMPS = ['Ne', 'Ar', 'He', 'Hg', 'Kr', 'Xe'] as const;
const LAYOUT = 'wavelength_air_A  element  intensity  # comment';

/** Air wavelengths outside this range (Angstrom) are refused: the air/vacuum formula and NIST's air convention cover 2000-20000 A. */
const MIN_AIR_ANGSTROM = 2000;
const MAX_AIR_ANGSTROM = 20000;

/** Parse a line list in the user format `wavelength_air_A  element  intensity  # comment`; `source` names it in errors. */
export function parseLineList(text: string, source: string): LampLine[] {
  const lines: LampLine[] = [];
  for (const row of splitListRows(text)) {
    expectFieldCount(row, 3, LAYOUT, source);
    const wavelength = numberField(row, 0, 'air wavelength (Angstrom)', source, MIN_AIR_ANGSTROM, MAX_AIR_ANGSTROM);
    const intensity = numberField(row, 2, 'relative intensity', source, 0, Number.MAX_VALUE);
    lines.push({ wavelength, element: row.fields[1]!, intensity });
  }
  return lines.sort((a, b) => a.wavelength - b.wavelength);
}

function readText(path: string, place: ErrorPlace): string {
  try {
    return readFileSync(path, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError('file.unreadable', code === 'ENOENT' ? 'no such file' : `cannot read the file (${code ?? 'error'})`, place);
  }
}

/** Read a user line list from a file (InputError with the path when missing or malformed). */
export function readLineListFile(path: string): LampLine[] {
  return parseLineList(readText(path, { file: path }), path);
}

const lampCache = new Map<string, LampLine[]>();

/** The built-in lines of the named lamps (element symbols, any letter case), merged and sorted by wavelength. */
export function loadLampLines(lamps: string[]): LampLine[] {
  const all: LampLine[] = [];
  const wanted = new Set<(typeof KNOWN_LAMPS)[number]>();
  for (const name of lamps) {
    const known = KNOWN_LAMPS.find((k) => k.toLowerCase() === name.trim().toLowerCase());
    if (known === undefined) {
      throw new InputError('lamp.unknown', `no built-in line list for the lamp ${JSON.stringify(name)}`, { key: 'lamps' }, { expected: `one of ${KNOWN_LAMPS.join(', ')} (or a line-list file)`, actual: name });
    }
    wanted.add(known);
  }
  for (const known of wanted) {
    let lines = lampCache.get(known);
    if (lines === undefined) {
      const path = `${CONFIG_DIR}lamps/${known}.txt`;
      lines = parseLineList(readText(path, { file: path }), path);
      lampCache.set(known, lines);
    }
    all.push(...lines.map((l) => ({ ...l })));
  }
  return all.sort((a, b) => a.wavelength - b.wavelength);
}

/** A galaxy emission line by its manifest name. */
export interface GalaxyLine {
  /** Manifest name: Halpha, NII6583, NII6548, SII6716, SII6731, Hbeta, OIII5007, OIII4959, OI6300, OI6364, HeI5876. */
  name: string;
  /** Rest wavelength, Angstrom, standard air. */
  air: number;
  /** Rest wavelength, Angstrom, vacuum. */
  vacuum: number;
  /** Where the value comes from (file, tag and comment). */
  source: string;
}

function loadGalaxyLines(): Record<string, GalaxyLine> {
  const path = `${CONFIG_DIR}lines/galaxy.txt`;
  const out: Record<string, GalaxyLine> = {};
  for (const row of splitListRows(readText(path, { file: path }))) {
    expectFieldCount(row, 4, 'name  air_A  vacuum_A  tag  # comment', path);
    const name = row.fields[0]!;
    const air = numberField(row, 1, 'air wavelength', path, MIN_AIR_ANGSTROM, MAX_AIR_ANGSTROM);
    const vacuum = numberField(row, 2, 'vacuum wavelength', path, MIN_AIR_ANGSTROM, MAX_AIR_ANGSTROM);
    out[name] = Object.freeze({ name, air, vacuum, source: `config/lines/galaxy.txt [${row.fields[3]}] ${row.comment}`.trim() });
  }
  return out;
}

/** The galaxy emission lines whorl knows, by manifest name (frozen). */
export const GALAXY_LINES: Record<string, GalaxyLine> = Object.freeze(loadGalaxyLines());

/** The galaxy line of this manifest name, or an InputError listing the known names. */
export function galaxyLine(name: string, place: ErrorPlace = {}): GalaxyLine {
  const line = Object.hasOwn(GALAXY_LINES, name) ? GALAXY_LINES[name] : undefined;
  if (line === undefined) {
    throw new InputError('lines.unknown', `unknown line name ${JSON.stringify(name)}`, place, { expected: `one of ${Object.keys(GALAXY_LINES).join(', ')}`, actual: name });
  }
  return line;
}

/** A night-sky emission line. */
export interface SkyLine {
  name: string;
  /** Wavelength, Angstrom, standard air. */
  wavelength: number;
  /** Rough relative intensity, for ranking and simulation only. */
  intensity: number;
  source: string;
}

let skyCache: SkyLine[] | undefined;

/** Night-sky lines of config/lines/sky.txt, sorted by wavelength (copies). */
export function skyLines(): SkyLine[] {
  if (skyCache === undefined) {
    const path = `${CONFIG_DIR}lines/sky.txt`;
    skyCache = splitListRows(readText(path, { file: path })).map((row) => {
      expectFieldCount(row, 3, 'wavelength_air_A  name  intensity  # source', path);
      return {
        name: row.fields[1]!,
        wavelength: numberField(row, 0, 'air wavelength', path, MIN_AIR_ANGSTROM, MAX_AIR_ANGSTROM),
        intensity: numberField(row, 2, 'relative intensity', path, 0, Number.MAX_VALUE),
        source: `config/lines/sky.txt: ${row.comment}`,
      };
    });
    skyCache.sort((a, b) => a.wavelength - b.wavelength);
  }
  return skyCache.map((l) => ({ ...l }));
}
