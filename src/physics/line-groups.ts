/**
 * Which galaxy lines are fitted together, and the flux ratios atomic physics fixes between them.
 * Ratios from /work/shared/REFERENCE.md: [O III] 5007/4959 = 2.98 (Storey & Zeippen 2000) [memory];
 * [N II] 6583/6548 = about 3 (2.94-3.05 by the A-values used) [memory]. [S II] 6716/6731 depends on
 * the electron density and [O I] 6300/6364 has no checked value here: both left free.
 */
import { galaxyLine } from './catalogues.js';

/** Lines fitted together (shared velocity and width). */
export interface LineGroup {
  /** e.g. `Halpha+NII`, `SII`, `OIII`, `OI`, or the line's own name when alone. */
  name: string;
  /**
   * Member names. The first member is the reference of the fixed ratios: for `Halpha+NII` with
   * both [N II] lines that is NII6583, then NII6548, then Halpha.
   */
  members: string[];
  /** flux(member) / flux(members[0]) where atomic physics fixes it; members absent here have a free flux. */
  ratios: Record<string, number>;
  /** Where the ratios come from ('' when none). */
  source: string;
}

interface GroupRule {
  name: string;
  /** Order: the ratio reference first. */
  order: string[];
  /** Fixed ratio of a member to the reference, applied only when both are requested. */
  fixed: { reference: string; member: string; ratio: number; source: string }[];
}

const RULES: GroupRule[] = [
  {
    name: 'Halpha+NII',
    order: ['NII6583', 'NII6548', 'Halpha'],
    fixed: [{ reference: 'NII6583', member: 'NII6548', ratio: 1 / 3, source: '[N II] 6583/6548 = 3 (2.94-3.05 by A-values) [memory]' }],
  },
  {
    name: 'OIII',
    order: ['OIII5007', 'OIII4959'],
    fixed: [{ reference: 'OIII5007', member: 'OIII4959', ratio: 1 / 2.98, source: '[O III] 5007/4959 = 2.98, Storey & Zeippen 2000 [memory]' }],
  },
  { name: 'SII', order: ['SII6716', 'SII6731'], fixed: [] },
  { name: 'OI', order: ['OI6300', 'OI6364'], fixed: [] },
];

/**
 * Group the requested lines (manifest names; unknown names are an InputError) in the order they
 * first appear. A group with one requested member is that line alone. Duplicates count once.
 */
export function groupLines(names: string[]): LineGroup[] {
  const requested = [...new Set(names)];
  requested.forEach((n, i) => galaxyLine(n, { key: `lines[${i}]` }));
  const groups: LineGroup[] = [];
  const done = new Set<string>();
  for (const name of requested) {
    if (done.has(name)) continue;
    const rule = RULES.find((r) => r.order.includes(name));
    const members = rule ? rule.order.filter((m) => requested.includes(m)) : [name];
    members.forEach((m) => done.add(m));
    if (!rule || members.length === 1) {
      groups.push({ name, members, ratios: {}, source: '' });
      continue;
    }
    const fixed = rule.fixed.filter((f) => members[0] === f.reference && members.includes(f.member));
    const ratios: Record<string, number> = {};
    for (const f of fixed) ratios[f.member] = f.ratio;
    groups.push({ name: rule.name, members, ratios, source: fixed.map((f) => f.source).join('; ') });
  }
  return groups;
}
