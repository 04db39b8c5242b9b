/**
 * Flexure from night-sky lines (catalogue: config/lines/sky.txt, [O I] 5577.338/6300.304/6363.776
 * and OH lines after Osterbrock et al. 1996), injected as a known displacement of the sky in
 * frames rendered with the simulator's optics, and recovered with honest errors.
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../src/errors.js';
import { skyLines } from '../../../src/physics/catalogues.js';
import { DEFAULT_FLEXURE_SETTINGS, measureFlexure, solveWavelengths } from '../../../src/stages/arc/index.js';
import { settingsFor, syntheticArc } from './synthetic-arc.js';
import { syntheticSky } from './synthetic-sky.js';

const arc = syntheticArc({ seed: 31 });
const solution = solveWavelengths(arc.frame, arc.lampLines, settingsFor(arc)).product;

describe('measureFlexure', () => {
  it('recovers an injected 0.35 A shift with pulls of unit width over 30 noise realisations (within 30%)', () => {
    const pulls: number[] = [];
    for (let seed = 1; seed <= 30; seed++) {
      const sci = syntheticSky(arc.setup, { seed, shiftAngstrom: 0.35, electronsPer100: 150 });
      const f = measureFlexure(sci, solution, skyLines(), DEFAULT_FLEXURE_SETTINGS).product.flexure!;
      pulls.push((f.shiftAngstrom - -0.35) / f.shiftErrAngstrom);
    }
    const mean = pulls.reduce((a, b) => a + b, 0) / pulls.length;
    const sd = Math.sqrt(pulls.reduce((a, b) => a + (b - mean) ** 2, 0) / (pulls.length - 1));
    expect(Math.abs(mean)).toBeLessThan(0.6);
    expect(Math.abs(sd - 1)).toBeLessThan(0.3);
  });

  it('shifts wave by the measured amount, keeps the model, and reports the shift in km/s (c = 299792.458 km/s, SI)', () => {
    const sci = syntheticSky(arc.setup, { seed: 40, shiftAngstrom: -0.6 });
    const r = measureFlexure(sci, solution, skyLines(), DEFAULT_FLEXURE_SETTINGS);
    const f = r.product.flexure!;
    expect(Math.abs(f.shiftAngstrom - 0.6)).toBeLessThan(4 * f.shiftErrAngstrom);
    expect(f.shiftErrAngstrom).toBeLessThan(0.05);
    expect(r.product.wave[1234]! - solution.wave[1234]!).toBeCloseTo(f.shiftAngstrom, 9);
    expect(r.product.model).toEqual(solution.model);
    expect(f.lines.filter((l) => l.used).length).toBeGreaterThanOrEqual(4);
    // blended [O I] 6300.304 and OH 6297.992 (2.3 A apart, under 4 LSF sigmas) are not measured
    expect(f.lines.some((l) => l.name === 'OI6300')).toBe(false);
    const mid = solution.wave[Math.round((solution.height - 1) / 2) * solution.width + Math.round((solution.width - 1) / 2)]!;
    expect(Math.abs(f.shiftKms - (f.shiftAngstrom / mid) * 299792.458)).toBeLessThan(0.05);
    // 0.6 A at an error below 0.05 A: the sky disagrees with the arc, a warning with the numbers
    const d = r.diagnostics.find((x) => x.rule === 'arc.flexure')!;
    expect(d.severity).toBe('warning');
    expect(d.message).toMatch(/disagree with the arc solution by \d+\.\d sigma/);
  });

  it('writes the shifted wavelengths into the array given, which may be the arc solution\'s own, bit for bit as into a new one', () => {
    const sci = syntheticSky(arc.setup, { seed: 41, shiftAngstrom: 0.4 });
    const before = solution.wave.slice();
    const fresh = measureFlexure(sci, solution, skyLines(), DEFAULT_FLEXURE_SETTINGS).product;
    // the default path leaves the arc's wavelengths alone and shares no memory with them
    expect(Buffer.from(solution.wave.buffer).equals(Buffer.from(before.buffer))).toBe(true);
    expect(fresh.wave.buffer).not.toBe(solution.wave.buffer);
    const arcCopy = { ...solution, wave: solution.wave.slice() };
    const inPlace = measureFlexure(sci, arcCopy, skyLines(), DEFAULT_FLEXURE_SETTINGS, arcCopy.wave).product;
    expect(inPlace.wave).toBe(arcCopy.wave);
    expect(inPlace.flexure).toEqual(fresh.flexure);
    expect(Buffer.from(inPlace.wave.buffer).equals(Buffer.from(fresh.wave.buffer))).toBe(true);
    // a reused array with other values in it is overwritten in full
    const stale = new Float64Array(solution.wave.length).fill(NaN);
    const reused = measureFlexure(sci, solution, skyLines(), DEFAULT_FLEXURE_SETTINGS, stale).product;
    expect(Buffer.from(reused.wave.buffer).equals(Buffer.from(fresh.wave.buffer))).toBe(true);
  });

  it('leaves the galaxy rows out: a bright galaxy with an emission line on top of a sky line does not bias the shift', () => {
    const galaxy = { rows: [120, 180] as [number, number], continuum: 400, line: { wavelength: 6863.955 + 1.0, electrons: 20000 } };
    const sci = syntheticSky(arc.setup, { seed: 41, shiftAngstrom: 0.2, galaxy });
    const f = measureFlexure(sci, solution, skyLines(), DEFAULT_FLEXURE_SETTINGS).product.flexure!;
    expect(Math.abs(f.shiftAngstrom - -0.2)).toBeLessThan(4 * f.shiftErrAngstrom);
  });

  it('uses the sky rows the user gives instead of the row test', () => {
    // the galaxy fills rows 60-240, with an emission line 1 A from OH 6863.955: given rows 0-40 avoid it
    const galaxy = { rows: [60, 240] as [number, number], continuum: 5, line: { wavelength: 6863.955 + 1.0, electrons: 20000 } };
    const sci = syntheticSky(arc.setup, { seed: 44, shiftAngstrom: 0.25, galaxy });
    const f = measureFlexure(sci, solution, skyLines(), { ...DEFAULT_FLEXURE_SETTINGS, skyRows: [[0, 40], [260, 299]] }).product.flexure!;
    expect(Math.abs(f.shiftAngstrom - -0.25)).toBeLessThan(4 * f.shiftErrAngstrom);
    const r = measureFlexure(sci, solution, skyLines(), { ...DEFAULT_FLEXURE_SETTINGS, skyRows: [[0, 40]] });
    expect(r.diagnostics.find((d) => d.rule === 'arc.flexure')!.message).toMatch(/in 41 sky rows/);
  });

  it('warns and scales the error when the sky lines disagree beyond their errors', () => {
    const sci = syntheticSky(arc.setup, { seed: 42, shiftAngstrom: 0.1, lineShifts: { OH6864: 0.8, OH6923: -0.6 } });
    const r = measureFlexure(sci, solution, skyLines(), DEFAULT_FLEXURE_SETTINGS);
    expect(r.diagnostics.find((d) => d.rule === 'arc.flexure-disagree')?.severity).toBe('warning');
  });

  it('warns and applies no shift when no sky line is usable', () => {
    const sci = syntheticSky(arc.setup, { seed: 43, shiftAngstrom: 0.3, only: [] });
    const r = measureFlexure(sci, solution, skyLines(), DEFAULT_FLEXURE_SETTINGS);
    expect(r.product.flexure!.shiftAngstrom).toBe(0);
    expect(r.diagnostics.find((d) => d.rule === 'arc.no-sky-lines')?.severity).toBe('warning');
    expect(r.product.wave[99]).toBe(solution.wave[99]);
  });

  it('refuses an impossible search window or sky-row range with an InputError naming the setting', () => {
    const sci = syntheticSky(arc.setup, { seed: 44, shiftAngstrom: 0 });
    const keyOf = (settings: typeof DEFAULT_FLEXURE_SETTINGS): string | undefined => {
      try {
        measureFlexure(sci, solution, skyLines(), settings);
      } catch (e) {
        return e instanceof InputError ? e.place.key : 'not an InputError';
      }
      return undefined;
    };
    expect(keyOf({ ...DEFAULT_FLEXURE_SETTINGS, searchAngstrom: -1 })).toBe('searchAngstrom');
    expect(keyOf({ ...DEFAULT_FLEXURE_SETTINGS, skyRows: [[0, 40.5]] })).toBe('skyRows[0]');
  });
});
