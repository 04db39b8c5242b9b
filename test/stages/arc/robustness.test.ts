/**
 * The robustness matrix of issue 5: identification from the manifest's rough centre and dispersion
 * must survive a dispersion off by +-10%, a centre off by +-50 A, 20% of the lines missing, extra
 * spurious peaks, the flipped direction and saturated lines; a hopeless arc gives a helpful error.
 * Arcs: simulator optics (src/sim) with the NIST-based lists of config/lamps.
 */
import { describe, expect, it } from 'vitest';
import { StageError } from '../../../src/errors.js';
import { pixelOfWavelength } from '../../../src/sim/optics.js';
import { solveWavelengths } from '../../../src/stages/arc/index.js';
import { loadLampLines } from '../../../src/physics/catalogues.js';
import { pixelRmsError, settingsFor, syntheticArc, trueScale, type SyntheticArcOptions } from './synthetic-arc.js';

interface Case {
  name: string;
  arc: SyntheticArcOptions;
  /** Factor on the true dispersion and offset (A) of the true centre given to the stage. */
  dispersionFactor: number;
  centreOffset: number;
}

const CASES: Case[] = [
  { name: 'dispersion +10%', arc: { seed: 11 }, dispersionFactor: 1.1, centreOffset: 0 },
  { name: 'dispersion -10%', arc: { seed: 12 }, dispersionFactor: 0.9, centreOffset: 0 },
  { name: 'centre +50 A', arc: { seed: 13 }, dispersionFactor: 1, centreOffset: 50 },
  { name: 'centre -50 A', arc: { seed: 14 }, dispersionFactor: 1, centreOffset: -50 },
  { name: 'dispersion +10% and centre -50 A', arc: { seed: 15, setup: 1 }, dispersionFactor: 1.1, centreOffset: -50 },
  { name: '20% of the lines missing', arc: { seed: 16, dropFraction: 0.2 }, dispersionFactor: 1.025, centreOffset: -9 },
  { name: '10 spurious peaks', arc: { seed: 17, spurious: 10 }, dispersionFactor: 1.025, centreOffset: -9 },
  { name: 'flipped direction', arc: { seed: 18, flip: true }, dispersionFactor: 1.025, centreOffset: -9 },
  { name: 'three brightest lines saturated', arc: { seed: 19, saturate: 3 }, dispersionFactor: 1.025, centreOffset: -9 },
  { name: 'all at once, flipped', arc: { seed: 20, flip: true, dropFraction: 0.2, spurious: 8 }, dispersionFactor: 0.9, centreOffset: 50 },
];

describe('arc identification robustness matrix', () => {
  for (const c of CASES) {
    it(`${c.name}: identified, every used line within 0.3 px of its true place, solution within 0.05 px RMS`, () => {
      const arc = syntheticArc(c.arc);
      const scale = trueScale(arc);
      const r = solveWavelengths(arc.frame, arc.lampLines, settingsFor(arc, { approxDispersion: scale.dispersion * c.dispersionFactor, approxWavelength: scale.centre + c.centreOffset }));
      const s = r.product;
      expect(s.flipX).toBe(c.arc.flip === true);
      const used = s.lines.filter((l) => l.used);
      expect(new Set(used.map((l) => l.wavelength)).size).toBeGreaterThanOrEqual(10);
      for (const l of used) expect(Math.abs(l.x - pixelOfWavelength(arc.setup, l.wavelength, l.y))).toBeLessThan(0.3);
      expect(pixelRmsError(arc, s)).toBeLessThan(0.05);
      if (c.arc.saturate) expect(r.diagnostics.find((d) => d.rule === 'arc.rejected-peaks')?.message).toMatch(/[1-9]\d* saturated/);
    });
  }
});

describe('arc identification failures', () => {
  it('names the arc, the lines found and what to change when the lamp list is wrong', () => {
    const arc = syntheticArc({ seed: 21 });
    const run = () => solveWavelengths(arc.frame, loadLampLines(['Xe']), settingsFor(arc));
    expect(run).toThrow(StageError);
    expect(run).toThrow(/raw\/arc-test\.fits.*\d+ clean lines found.*approx_wavelength and approx_dispersion/);
  });

  it('fails with the same help when the central wavelength is far outside the search', () => {
    const arc = syntheticArc({ seed: 22 });
    expect(() => solveWavelengths(arc.frame, arc.lampLines, settingsFor(arc, { approxWavelength: arc.setup.approxWavelength + 800 }))).toThrow(/cannot identify the arc raw\/arc-test\.fits.*approx_wavelength/);
  });

  it('fails on an arc without lines, saying none were found', () => {
    const arc = syntheticArc({ seed: 23, electronsPer1000: 0 });
    expect(() => solveWavelengths(arc.frame, arc.lampLines, settingsFor(arc))).toThrow(/: 0 clean lines found/);
  });

  it('refuses impossible settings with an InputError naming the setting', () => {
    const arc = syntheticArc({ seed: 24 });
    expect(() => solveWavelengths(arc.frame, arc.lampLines, settingsFor(arc, { approxDispersion: -1 }))).toThrow(/approxDispersion/);
  });
});

describe('arc identification under everything at once (seeded stress)', () => {
  it('12 arcs with 20% of the lines missing, 10 spurious peaks, dispersion +-10% and centre +-50 A: at least 10 right, and never a silent wrong answer', () => {
    let right = 0;
    for (let seed = 100; seed < 112; seed++) {
      const flip = seed % 4 < 2;
      const arc = syntheticArc({ seed, setup: seed % 2, flip, dropFraction: 0.2, spurious: 10, electronsPer1000: seed % 3 === 0 ? 300 : 20000 });
      const scale = trueScale(arc);
      const settings = settingsFor(arc, { approxDispersion: scale.dispersion * (seed % 2 === 0 ? 1.1 : 0.9), approxWavelength: scale.centre + (seed % 3 === 1 ? 50 : -50) });
      let r;
      try {
        r = solveWavelengths(arc.frame, arc.lampLines, settings);
      } catch (e) {
        expect(e).toBeInstanceOf(StageError); // a refusal is an acceptable answer
        continue;
      }
      const s = r.product;
      const correct = s.flipX === flip && pixelRmsError(arc, s) < 0.05 && s.lines.every((l) => !l.used || Math.abs(l.x - pixelOfWavelength(arc.setup, l.wavelength, l.y)) < 0.3);
      if (correct) right++;
      else expect(r.diagnostics.some((d) => d.severity === 'warning')).toBe(true);
    }
    expect(right).toBeGreaterThanOrEqual(10);
  });
});
