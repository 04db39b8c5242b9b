/**
 * Grouping classified frames into setups (same detector shape, detector keywords and spectral
 * keywords), science frames into targets (same OBJECT on the same setup), and pairing each target
 * with the block of arcs nearest it in time. Biases go with every setup of their detector.
 */
import type { InventoryRules } from './rules.js';
import type { ClassifiedFrame, Inventory, SetupGroup, TargetDraft, UnreadableFile } from './types.js';

function entries(r: Record<string, string>): string {
  return Object.keys(r).sort().map((k) => `${k}=${r[k]}`).join(';');
}
const detectorKey = (f: ClassifiedFrame): string => `${f.width}x${f.height}|${entries(f.detector)}`;
const setupKey = (f: ClassifiedFrame): string => `${detectorKey(f)}|${entries(f.spectral)}`;

const endMs = (f: ClassifiedFrame): number => (f.startMs ?? 0) + 1000 * (f.exptimeS ?? 0);

/** Frames sorted by start time (frames without DATE-OBS last, by path). */
function byTime(frames: ClassifiedFrame[]): ClassifiedFrame[] {
  return [...frames].sort((a, b) => (a.startMs ?? Infinity) - (b.startMs ?? Infinity) || a.path.localeCompare(b.path));
}

/** Arcs split where consecutive ones are more than `minutes` apart; one block when any lacks DATE-OBS. */
export function arcBlocks(arcs: ClassifiedFrame[], minutes: number): ClassifiedFrame[][] {
  if (arcs.length === 0) return [];
  if (arcs.some((a) => a.startMs === undefined)) return [byTime(arcs)];
  const blocks: ClassifiedFrame[][] = [];
  let last = -Infinity;
  for (const a of byTime(arcs)) {
    if (a.startMs! - last > minutes * 60000) blocks.push([]);
    blocks[blocks.length - 1]!.push(a);
    last = endMs(a);
  }
  return blocks;
}

/** Minutes between two time spans (0 when they overlap). */
function gapMinutes(a: [number, number], b: [number, number]): number {
  return Math.max(0, a[0] - b[1], b[0] - a[1]) / 60000;
}

function span(frames: ClassifiedFrame[]): [number, number] | undefined {
  if (frames.some((f) => f.startMs === undefined)) return undefined;
  return [Math.min(...frames.map((f) => f.startMs!)), Math.max(...frames.map(endMs))];
}

/** The setup's science frames as targets, each with its nearest arc block; manifest setup names assigned. */
export function pairTargets(group: SetupGroup, rules: InventoryRules): TargetDraft[] {
  const byObject = new Map<string, ClassifiedFrame[]>();
  for (const f of byTime(group.science)) {
    const name = f.object ?? 'unnamed target';
    byObject.set(name, [...(byObject.get(name) ?? []), f]);
  }
  const blocks = arcBlocks(group.arc, rules.arcBlockMinutes);
  const drafts = [...byObject].map(([name, frames]) => {
    const s = span(frames);
    let best = 0;
    let gap: number | undefined;
    blocks.forEach((b, i) => {
      const bs = span(b);
      if (!s || !bs) return;
      const g = gapMinutes(s, bs);
      if (gap === undefined || g < gap) (gap = g), (best = i);
    });
    const d: TargetDraft = { name, setup: group.name, group, frames, arcs: blocks[best] ?? [] };
    if (gap !== undefined) d.arcGapMinutes = gap;
    return { d, block: best };
  });
  const used = [...new Set(drafts.map((x) => x.block))].sort((a, b) => a - b);
  if (used.length > 1) for (const x of drafts) x.d.setup = `${group.name}-${used.indexOf(x.block) + 1}`;
  return drafts.map((x) => x.d);
}

export function buildInventory(frames: ClassifiedFrame[], unreadable: UnreadableFile[], rules: InventoryRules): Inventory {
  const notes: string[] = [];
  const groups = new Map<string, SetupGroup>();
  for (const f of byTime(frames)) {
    if (f.kind === 'bias' || f.kind === 'unknown') continue;
    const key = setupKey(f);
    let g = groups.get(key);
    if (!g) {
      g = { name: '', width: f.width, height: f.height, detector: f.detector, spectral: f.spectral, bias: [], flat: [], arc: [], science: [] };
      groups.set(key, g);
    }
    g[f.kind].push(f);
  }
  // Setups with science first, in order of their first science frame; calibration-only setups after.
  const firstScience = (g: SetupGroup): number => (g.science.length > 0 ? (g.science[0]!.startMs ?? Number.MAX_VALUE) : Infinity);
  const setups = [...groups.values()].sort((a, b) => firstScience(a) - firstScience(b));
  setups.forEach((g, i) => (g.name = `setup${i + 1}`));
  const biases = byTime(frames.filter((f) => f.kind === 'bias'));
  for (const g of setups) g.bias = biases.filter((b) => detectorKey(b) === detectorKey(g.science[0] ?? g.flat[0] ?? g.arc[0]!));
  for (const b of biases) if (!setups.some((g) => g.bias.includes(b))) notes.push(`${b.path}: bias of a ${b.width}x${b.height} detector (${entries(b.detector) || 'no detector keywords'}) that no other frame uses`);
  const targets: TargetDraft[] = [];
  for (const g of setups) {
    if (g.science.length === 0) {
      notes.push(`${g.name} (${entries(g.spectral) || 'no setup keywords'}) has calibrations but no science frames; left out of the manifest`);
      continue;
    }
    for (const kind of ['bias', 'flat', 'arc'] as const) if (g[kind].length === 0) notes.push(`${g.name} has no ${kind} frames: fill them in by hand`);
    targets.push(...pairTargets(g, rules));
  }
  for (const f of frames.filter((x) => x.kind === 'unknown')) notes.push(`${f.path}: not classified (${f.reason}); add a rule or list it by hand`);
  distinctTargetNames(targets);
  return { frames, unreadable, setups, targets, notes };
}

/** The manifest wants unique target names: an object observed on several setups gets the setup name added. */
function distinctTargetNames(targets: TargetDraft[]): void {
  const count = new Map<string, number>();
  for (const t of targets) count.set(t.name, (count.get(t.name) ?? 0) + 1);
  for (const t of targets) if (count.get(t.name)! > 1) t.name = `${t.name} (${t.setup})`;
}
