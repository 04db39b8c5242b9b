/**
 * The draft run manifest (run.yaml, keys of src/run/manifest/schema.ts) written from an inventory:
 * everything the headers tell is filled in, everything they cannot tell is `null` with a
 * `FILL IN` comment, so that the manifest check stops at each one until the user gives it.
 */
import { relative, resolve, sep } from 'node:path';
import type { ClassifiedFrame, Inventory, SetupGroup, TargetDraft } from './types.js';

export const FILL_IN = 'FILL IN';

function q(s: string): string {
  return JSON.stringify(s); // a JSON string is a valid YAML double-quoted scalar
}

function describeKeywords(r: Record<string, string>): string {
  return Object.entries(r).map(([k, v]) => `${k} = '${v}'`).join(', ');
}

function timeText(f: ClassifiedFrame): string {
  return f.startMs === undefined ? 'no DATE-OBS' : new Date(f.startMs).toISOString().slice(0, 19);
}

function fileList(key: string, frames: ClassifiedFrame[], path: (f: ClassifiedFrame) => string, indent: string, what: string, withTimes = false): string[] {
  if (frames.length === 0) return [`${indent}${key}: null  # ${FILL_IN}: no ${what} frames found; list files or globs`];
  return [`${indent}${key}:`, ...frames.map((f) => `${indent}  - ${q(path(f))}${withTimes ? `  # ${timeText(f)}` : ''}`)];
}

function headerNumber(frames: ClassifiedFrame[], key: string): number | undefined {
  for (const f of frames) {
    const v = f.header.getNumber(key);
    if (v !== undefined) return v;
  }
  return undefined;
}

function setupLines(name: string, g: SetupGroup, arcs: ClassifiedFrame[], path: (f: ClassifiedFrame) => string): string[] {
  const lamps = [...new Set(arcs.flatMap((a) => a.lamps))];
  const all = [...g.science, ...g.flat, ...arcs];
  const gain = headerNumber(all, 'GAIN');
  const rn = headerNumber(all, 'RDNOISE');
  const lines = [
    `  ${name}:`,
    `    # ${g.width} x ${g.height} pixels${Object.keys(g.detector).length + Object.keys(g.spectral).length > 0 ? `, ${describeKeywords({ ...g.detector, ...g.spectral })}` : ''}`,
    '    dispersion_axis: auto',
    `    arcsec_per_pixel: null  # ${FILL_IN}: plate scale along the slit, arcsec per pixel`,
    `    approx_wavelength: null  # ${FILL_IN}: wavelength at the detector centre, Angstrom`,
    `    approx_dispersion: null  # ${FILL_IN}: Angstrom per pixel`,
    lamps.length > 0 ? `    lamps: [${lamps.map(q).join(', ')}]  # from the lamp keywords of the arcs` : `    lamps: null  # ${FILL_IN}: arc-lamp elements, e.g. [Ne, Ar]`,
    gain !== undefined ? `    # gain: ${gain}  (header GAIN, used when the key is absent)` : `    gain: null  # ${FILL_IN}: e-/ADU (no GAIN card in the headers)`,
    rn !== undefined ? `    # read_noise: ${rn}  (header RDNOISE, used when the key is absent)` : `    read_noise: null  # ${FILL_IN}: electrons (no RDNOISE card in the headers)`,
    ...fileList('bias', g.bias, path, '    ', 'bias'),
    ...fileList('flat', g.flat, path, '    ', 'flat'),
    ...fileList('arc', arcs, path, '    ', 'arc', true),
  ];
  const others = g.arc.filter((a) => !arcs.includes(a));
  if (others.length > 0) lines.push(`    # other arcs of this setup, farther in time: ${others.map((a) => `${path(a)} (${timeText(a)})`).join(', ')}`);
  return lines;
}

function targetLines(t: TargetDraft, path: (f: ClassifiedFrame) => string): string[] {
  const gap = t.arcGapMinutes === undefined ? 'times unknown' : `${t.arcGapMinutes.toFixed(0)} min from the science frames`;
  return [
    `  - name: ${q(t.name)}  # from OBJECT`,
    `    setup: ${t.setup}  # arcs nearest in time: ${t.arcs.length} (${gap})`,
    ...fileList('frames', t.frames, path, '    ', 'science', true),
    `    lines: null  # ${FILL_IN}: emission lines to measure, e.g. [Halpha, NII6583, NII6548]`,
    `    distance_mpc: null  # ${FILL_IN}: distance, Mpc`,
    `    inclination_deg: null  # ${FILL_IN}: degrees (90 = edge-on); or replace by axis_ratio: b/a`,
    `    major_axis_pa_deg: null  # ${FILL_IN}: position angle of the receding major axis, degrees east of north`,
    `    slit_pa_deg: null  # ${FILL_IN}: position angle of the slit, degrees east of north`,
  ];
}

/** Manifest text; file paths relative to `manifestDir`, the folder the manifest will live in (relative paths are taken from the working folder). */
export function draftManifestYaml(inv: Inventory, scannedDir: string, manifestDir: string): string {
  const rel = (p: string): string => relative(manifestDir, resolve(p)).split(sep).join('/');
  const path = (f: ClassifiedFrame): string => rel(f.path);
  const count = (k: string): number => inv.frames.filter((f) => f.kind === k).length;
  const out: string[] = [
    `# Draft run manifest made by \`whorl inventory\` from ${scannedDir}.`,
    `# Values marked ${FILL_IN} are not in the headers: give each one before running.`,
    `# Frames: ${count('bias')} bias, ${count('flat')} flat, ${count('arc')} arc, ${count('science')} science, ${count('unknown')} unclassified; ${inv.unreadable.length} unreadable file(s).`,
    'output: products',
    'setups:',
  ];
  const written = new Set<string>();
  for (const t of inv.targets) {
    if (written.has(t.setup)) continue;
    written.add(t.setup);
    out.push(...setupLines(t.setup, t.group, t.arcs, path));
  }
  if (inv.targets.length === 0) out.push(`  {}  # ${FILL_IN}: no science frames found`);
  out.push(inv.targets.length > 0 ? 'targets:' : `targets: []  # ${FILL_IN}: no science frames found`);
  for (const t of inv.targets) out.push(...targetLines(t, path));
  if (inv.notes.length > 0) out.push('# Notes:', ...inv.notes.map((n) => `#   ${n}`));
  if (inv.unreadable.length > 0) out.push('# Unreadable files (not used):', ...inv.unreadable.map((u) => `#   ${rel(u.path)}: ${u.reason.replace(/\n/g, ' ')}`));
  return `${out.join('\n')}\n`;
}
