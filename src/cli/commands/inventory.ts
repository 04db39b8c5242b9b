/**
 * `whorl inventory DIR [--out FILE] [--rules FILE] [--force]`: classify the raw frames under DIR,
 * group them into setups and targets, and write a draft run manifest (printed when --out is not
 * given). Unreadable files are listed and skipped.
 */
import { mkdirSync, readFileSync, renameSync, statSync, writeFileSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import type { Command } from 'commander';
import { EXIT, InputError } from '../../errors.js';
import { classifyFrame } from '../../run/inventory/classify.js';
import { draftManifestYaml } from '../../run/inventory/draft.js';
import { buildInventory } from '../../run/inventory/group.js';
import { DEFAULT_RULES, RULES_FORMAT, parseRulesYaml } from '../../run/inventory/rules.js';
import { scanDirectory } from '../../run/inventory/scan.js';
import type { Inventory } from '../../run/inventory/types.js';
import type { CliIo } from '../io.js';
import type { CommandRegistrar } from '../main.js';

interface InventoryFlags {
  out?: string;
  rules?: string;
  force?: boolean;
}

function summary(inv: Inventory): string {
  const lines: string[] = [];
  const count = (k: string): number => inv.frames.filter((f) => f.kind === k).length;
  lines.push(`${inv.frames.length} frames: ${count('bias')} bias, ${count('flat')} flat, ${count('arc')} arc, ${count('science')} science, ${count('unknown')} unclassified`);
  for (const g of inv.setups) {
    const keys = Object.entries({ ...g.detector, ...g.spectral }).map(([k, v]) => `${k}=${v}`).join(' ');
    lines.push(`  ${g.name}: ${g.width} x ${g.height}${keys ? ` ${keys}` : ''}: ${g.bias.length} bias, ${g.flat.length} flat, ${g.arc.length} arc, ${g.science.length} science`);
  }
  for (const t of inv.targets) lines.push(`  target ${t.name}: ${t.frames.length} frames on ${t.setup}, ${t.arcs.length} arcs nearest in time`);
  for (const u of inv.unreadable) lines.push(`  unreadable: ${u.path}: ${u.reason}`);
  for (const n of inv.notes) lines.push(`  note: ${n}`);
  return `${lines.join('\n')}\n`;
}

function readRules(path: string | undefined) {
  if (path === undefined) return DEFAULT_RULES;
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch {
    throw new InputError('inventory.rules-missing', 'cannot read the rules file', { file: path }, { expected: 'a YAML rules file' });
  }
  return parseRulesYaml(text, path);
}

/** The --out path must be a new file (or, with --force, an existing file): checked before the scan. */
function checkOutFile(path: string, force: boolean): void {
  let stat;
  try {
    stat = statSync(path, { throwIfNoEntry: false });
  } catch {
    throw new InputError('inventory.out-unwritable', 'cannot write the draft there', { file: path }, { expected: 'a file path whose parent folders are folders' });
  }
  if (stat?.isDirectory()) throw new InputError('inventory.out-is-folder', 'is a folder', { file: path }, { expected: 'a file name for the draft manifest' });
  if (stat && !force) throw new InputError('inventory.out-exists', 'file exists; pass --force to overwrite it', { file: path }, { expected: 'a new file name' });
}

/** Write the draft beside its final name and rename it: the file is whole or absent; missing folders are made. */
function writeDraft(path: string, text: string): void {
  const temp = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
  try {
    mkdirSync(dirname(path), { recursive: true });
    writeFileSync(temp, text);
    renameSync(temp, path);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code ?? 'unknown';
    throw new InputError('inventory.out-unwritable', `cannot write the draft (${code})`, { file: path }, { expected: 'a writable file path' });
  }
}

export const registerInventory: CommandRegistrar = (program: Command, io: CliIo, setExit) => {
  program
    .command('inventory')
    .description('classify the raw frames under a folder and write a draft run manifest')
    .argument('<dir>', 'folder of raw FITS frames (searched recursively)')
    .option('-o, --out <file>', 'write the draft manifest to this file (default: print it)')
    .option('--rules <file>', 'YAML file extending the classification rules (format below)')
    .option('--force', 'overwrite the --out file if it exists')
    .addHelpText('after', `\nRules file (every key optional; lists extend the built-in ones):\n${RULES_FORMAT}`)
    .action((dir: string, flags: InventoryFlags) => {
      const rules = readRules(flags.rules);
      if (flags.out) checkOutFile(flags.out, Boolean(flags.force));
      const scanned = scanDirectory(dir);
      if (scanned.frames.length === 0) {
        throw new InputError('inventory.empty', 'no readable FITS frames found', { file: dir }, { expected: 'files named *.fits, *.fit, *.fts (optionally .gz or .fz)', actual: `${scanned.unreadable.length} unreadable` });
      }
      const inv = buildInventory(scanned.frames.map((f) => classifyFrame(f, rules)), scanned.unreadable, rules);
      const text = draftManifestYaml(inv, dir, resolve(flags.out ? dirname(flags.out) : '.'));
      if (flags.out) {
        writeDraft(flags.out, text);
        io.out(summary(inv));
        io.out(`wrote ${flags.out}: fill in the values marked FILL IN, then run whorl reduce ${flags.out}\n`);
      } else {
        io.err(summary(inv));
        io.out(text);
      }
      setExit(EXIT.ok);
    });
};
