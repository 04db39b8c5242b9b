/** Grouping frames into setups and targets, and pairing targets with the arcs nearest in time. */
import { describe, expect, it } from 'vitest';
import { Header } from '../../../src/fits/header.js';
import { classifyFrame } from '../../../src/run/inventory/classify.js';
import { arcBlocks, buildInventory } from '../../../src/run/inventory/group.js';
import { DEFAULT_RULES } from '../../../src/run/inventory/rules.js';

const T0 = Date.UTC(2019, 3, 12, 20, 0, 0);
let n = 0;
/** A frame `minutes` after T0, with the given type and cards. */
function f(type: string, minutes: number, cards: Record<string, string | number> = {}) {
  const h = new Header().set('NAXIS', 2).set('NAXIS1', cards['W'] ?? 1056).set('NAXIS2', 300).set('IMAGETYP', type).set('EXPTIME', type === 'bias' ? 0 : 60);
  h.set('DATE-OBS', new Date(T0 + minutes * 60000).toISOString().slice(0, 23)).set('CCDSUM', '1 1');
  if (type !== 'bias') h.set('GRATING', 'G1200').set('GRTILT', cards['TILT'] ?? 18.25);
  for (const [k, v] of Object.entries(cards)) if (k !== 'W' && k !== 'TILT') h.set(k, v);
  return classifyFrame({ path: `raw/${type}_${String(++n).padStart(3, '0')}.fits`, hdu: 0, header: h }, DEFAULT_RULES);
}

describe('buildInventory', () => {
  it('splits setups by grating tilt and detector shape; biases join every setup of their detector', () => {
    const frames = [f('bias', 0), f('bias', 1), f('bias', 2, { W: 2048 }), f('flat', 10), f('flat', 11, { TILT: 17.4 }), f('arc', 12), f('arc', 13, { TILT: 17.4 }), f('object', 60, { OBJECT: 'Halden Spiral' }), f('object', 90, { OBJECT: 'Orrin Disk', TILT: 17.4 })];
    const inv = buildInventory(frames, [], DEFAULT_RULES);
    expect(inv.setups.map((s) => [s.name, s.spectral['GRTILT'], s.bias.length, s.flat.length, s.arc.length, s.science.length])).toEqual([
      ['setup1', '18.25', 2, 1, 1, 1],
      ['setup2', '17.4', 2, 1, 1, 1],
    ]);
    expect(inv.targets.map((t) => [t.name, t.setup])).toEqual([['Halden Spiral', 'setup1'], ['Orrin Disk', 'setup2']]);
    expect(inv.notes.join('\n')).toMatch(/raw\/bias_003\.fits: bias of a 2048x300 detector .* that no other frame uses/);
  });

  it('gives each target the arc block nearest in time, splitting the setup when targets need different arcs', () => {
    const frames = [f('arc', 0), f('arc', 2), f('object', 30, { OBJECT: 'A' }), f('object', 31, { OBJECT: 'A' }), f('object', 300, { OBJECT: 'B' }), f('arc', 330), f('flat', 340), f('bias', 350)];
    const inv = buildInventory(frames, [], DEFAULT_RULES);
    const [a, b] = inv.targets;
    expect(a!.arcs.map((x) => x.path)).toEqual([frames[0]!.path, frames[1]!.path]);
    expect(a!.setup).toBe('setup1-1');
    expect(a!.arcGapMinutes).toBeCloseTo(30 - 3, 6); // second arc ends at 3 min (60 s exposure)
    expect(b!.arcs.map((x) => x.path)).toEqual([frames[5]!.path]);
    expect(b!.setup).toBe('setup1-2');
  });

  it('names a galaxy observed on two setups once per setup, so the manifest keeps its target names unique', () => {
    const frames = [f('object', 10, { OBJECT: 'Halden Spiral' }), f('object', 40, { OBJECT: 'Halden Spiral', TILT: 17.4 }), f('object', 70, { OBJECT: 'Orrin Disk' })];
    const inv = buildInventory(frames, [], DEFAULT_RULES);
    expect(inv.targets.map((t) => [t.name, t.setup])).toEqual([['Halden Spiral (setup1)', 'setup1'], ['Orrin Disk', 'setup1'], ['Halden Spiral (setup2)', 'setup2']]);
  });

  it('notes missing calibrations, calibration-only setups and unclassified frames', () => {
    const frames = [f('object', 10, { OBJECT: 'A' }), f('flat', 20, { TILT: 17.4 }), f('focus', 30)];
    const notes = buildInventory(frames, [], DEFAULT_RULES).notes.join('\n');
    expect(notes).toMatch(/setup1 has no bias frames/);
    expect(notes).toMatch(/setup1 has no arc frames/);
    expect(notes).toMatch(/setup2 .* has calibrations but no science frames/);
    expect(notes).toMatch(/not classified \(IMAGETYP = 'focus' is not a known exposure type\)/);
  });
});

describe('arcBlocks', () => {
  it('starts a new block after a gap longer than arc_block_minutes', () => {
    const arcs = [f('arc', 0), f('arc', 5), f('arc', 40), f('arc', 41)];
    expect(arcBlocks(arcs, 15).map((b) => b.length)).toEqual([2, 2]);
    expect(arcBlocks(arcs, 60).map((b) => b.length)).toEqual([4]);
  });
});
