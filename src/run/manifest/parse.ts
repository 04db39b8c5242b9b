/**
 * Parse manifest text (YAML) and validate it against the schema. Every problem becomes an
 * InputError with the file, the key path (`targets[0].inclination_deg`), line:column and what was
 * expected; the first problem in file order gives the place, the others are listed after it.
 */
import { isMap, isPair, isScalar, LineCounter, parseDocument, type Document, type Node as YamlNode } from 'yaml';
import type { z } from 'zod';
import { InputError } from '../../errors.js';
import { manifestSchema, type Manifest } from './schema.js';

type PathPart = string | number;

export interface ManifestProblem {
  key: string;
  line?: number;
  column?: number;
  message: string;
}

/** `['targets', 0, 'lines']` -> `targets[0].lines` */
export function formatKeyPath(path: readonly PathPart[]): string {
  let out = '';
  for (const p of path) out += typeof p === 'number' ? `[${p}]` : out === '' ? p : `.${p}`;
  return out;
}

export interface ParsedManifest {
  manifest: Manifest;
  /** Key path and line:column of a key's value in the text, for errors found later (e.g. a glob matching nothing). */
  locate(path: readonly PathPart[]): { key: string; line?: number; column?: number };
}

/** Validate manifest text; returns the typed manifest or throws InputError (code `manifest.invalid` or `manifest.yaml`). */
export function parseManifestText(text: string, file: string): ParsedManifest {
  const lines = new LineCounter();
  const doc = parseDocument(text, { lineCounter: lines, uniqueKeys: true });
  if (doc.errors.length > 0) {
    const e = doc.errors[0]!;
    const pos = e.linePos?.[0];
    const place = pos ? { file, line: pos.line, column: pos.col } : { file };
    throw new InputError('manifest.yaml', `not valid YAML: ${e.message.split('\n')[0]!.replace(/ at line \d+, column \d+:?$/, '')}`, place);
  }
  const data: unknown = doc.toJS();
  const result = manifestSchema.safeParse(data ?? {});
  const problems: ManifestProblem[] = [];
  if (!result.success) for (const issue of result.error.issues) problems.push(describeIssue(issue, doc, lines, data));
  else problems.push(...crossChecks(result.data, doc, lines));
  if (problems.length === 0 && result.success) {
    return { manifest: result.data, locate: (path) => { const p = at(doc, lines, path, ''); return p.line !== undefined ? { key: p.key, line: p.line, column: p.column! } : { key: p.key }; } };
  }
  problems.sort((a, b) => (a.line ?? 1e9) - (b.line ?? 1e9) || (a.column ?? 0) - (b.column ?? 0));
  const first = problems[0]!;
  const rest = problems.slice(1).map((p) => `\n  also ${p.key}${p.line !== undefined ? ` (line ${p.line}:${p.column})` : ''}: ${p.message}`);
  const place = { file, key: first.key, ...(first.line !== undefined ? { line: first.line, column: first.column! } : {}) };
  throw new InputError('manifest.invalid', first.message + rest.join(''), place);
}

/** Checks across keys that the schema cannot express: known setups, unique target names. */
function crossChecks(m: Manifest, doc: Document, lines: LineCounter): ManifestProblem[] {
  const out: ManifestProblem[] = [];
  const seen = new Map<string, number>();
  m.targets.forEach((t, i) => {
    if (!(t.setup in m.setups)) {
      const known = Object.keys(m.setups).join(', ');
      out.push(at(doc, lines, ['targets', i, 'setup'], `unknown setup '${t.setup}' (expected one of: ${known})`));
    }
    const prev = seen.get(t.name);
    if (prev !== undefined) out.push(at(doc, lines, ['targets', i, 'name'], `target name '${t.name}' is already used by targets[${prev}]`));
    else seen.set(t.name, i);
  });
  return out;
}

function describeIssue(issue: z.core.$ZodIssue, doc: Document, lines: LineCounter, data: unknown): ManifestProblem {
  const path = issue.path.filter((p): p is PathPart => typeof p !== 'symbol');
  if (issue.code === 'unrecognized_keys') {
    const key = issue.keys[0]!;
    return at(doc, lines, [...path, key], `unknown key '${key}'${issue.keys.length > 1 ? ` (and ${issue.keys.slice(1).join(', ')})` : ''}`, true);
  }
  if (valueAt(data, path) === null) {
    return at(doc, lines, path, `no value given (expected ${wanted(issue)})`);
  }
  if (!present(data, path)) {
    // Placed at the key of the mapping that lacks it, which is where the user will add it.
    const p = at(doc, lines, path.slice(0, -1), `missing key '${String(path[path.length - 1] ?? '')}'${expectation(issue)}`, path.length > 1);
    return { ...p, key: formatKeyPath(path) };
  }
  return at(doc, lines, path, plainMessage(issue));
}

/** What the schema wanted, in words. */
function wanted(issue: z.core.$ZodIssue): string {
  if (issue.code === 'invalid_type') return issue.expected;
  if (issue.code === 'invalid_value') return `one of ${issue.values.map(String).join(', ')}`;
  return issue.message.replace(/^missing key: /, '');
}

/** The same, as the tail of a "missing key" message. */
function expectation(issue: z.core.$ZodIssue): string {
  return issue.code === 'custom' ? `: ${wanted(issue)}` : ` (expected ${wanted(issue)})`;
}

function plainMessage(issue: z.core.$ZodIssue): string {
  switch (issue.code) {
    case 'invalid_type':
      return `wrong type (expected ${issue.expected})`;
    case 'invalid_value':
      return `not an allowed value (expected one of ${issue.values.map(String).join(', ')})`;
    case 'too_small':
      return issue.origin === 'array' || issue.origin === 'string'
        ? `too short (expected at least ${String(issue.minimum)} ${issue.origin === 'array' ? 'entries' : 'characters'})`
        : `too small (expected ${issue.inclusive ? '>=' : '>'} ${String(issue.minimum)})`;
    case 'too_big':
      return issue.origin === 'array' ? `too long (expected at most ${String(issue.maximum)} entries)` : `too large (expected ${issue.inclusive ? '<=' : '<'} ${String(issue.maximum)})`;
    case 'invalid_format':
      return `wrong format (expected ${issue.message.replace(/^Invalid string: /, '')})`;
    default:
      return issue.message;
  }
}

/** The value at `path`, or undefined when a key on the way is absent (null stays null: `key: ` with no value). */
function valueAt(data: unknown, path: readonly PathPart[]): unknown {
  let cur: unknown = data;
  for (const p of path) {
    if (cur === null || typeof cur !== 'object' || !(p in (cur as object))) return undefined;
    cur = (cur as Record<PathPart, unknown>)[p];
  }
  return cur;
}

function present(data: unknown, path: readonly PathPart[]): boolean {
  return valueAt(data, path) !== undefined;
}

/** A problem placed at the deepest node of `path` that exists (the key itself when `atKey`). */
function at(doc: Document, lines: LineCounter, path: readonly PathPart[], message: string, atKey = false): ManifestProblem {
  const key = formatKeyPath(path);
  for (let n = path.length; n >= 0; n--) {
    const offset = nodeOffset(doc, path.slice(0, n), atKey && n === path.length);
    if (offset !== undefined) {
      const pos = lines.linePos(offset);
      return { key, line: pos.line, column: pos.col, message };
    }
  }
  return { key, message };
}

function nodeOffset(doc: Document, path: readonly PathPart[], wantKey: boolean): number | undefined {
  if (path.length === 0) return doc.contents?.range?.[0];
  const parent: unknown = path.length === 1 ? doc.contents : doc.getIn(path.slice(0, -1), true);
  const last = path[path.length - 1]!;
  if (isMap(parent)) {
    const pair = parent.items.find((it) => isPair(it) && isScalar(it.key) && String(it.key.value) === String(last));
    if (!pair) return undefined;
    const target = (wantKey ? pair.key : (pair.value ?? pair.key)) as YamlNode | null;
    return target?.range?.[0];
  }
  const node = doc.getIn(path, true) as YamlNode | undefined;
  return isScalar(node) || (node && typeof node === 'object' && 'range' in node) ? node.range?.[0] : undefined;
}
