import { describe, expect, it } from 'vitest';
import { parse } from 'yaml';
import { simulateRun, trueWavelength } from '../../src/sim/index.js';

describe('a night with several targets', () => {
  const run = simulateRun({ targets: 3 });
  const names = run.truth.targets.map((t) => t.name);

  it('observes three different galaxies on one setup, each with its own truth', () => {
    expect(new Set(names).size).toBe(3);
    expect(run.truth.targets.every((t) => t.setup === 'red')).toBe(true);
    expect(new Set(run.truth.targets.map((t) => t.vSysKms)).size).toBe(3);
    for (const t of run.truth.targets) {
      expect(t.exposures).toHaveLength(3);
      const frames = run.frames.filter((f) => f.target === t.name);
      expect(frames.map((f) => f.name)).toEqual(t.exposures.map((e) => e.frame));
      expect(frames.every((f) => f.header.getString('OBJECT') === t.object)).toBe(true);
      expect(frames.every((f) => f.header.getString('RA') === t.ra)).toBe(true);
    }
  });

  it('shares bias and flats, with arcs at the start and the end of the night', () => {
    const kinds = run.frames.map((f) => f.kind);
    expect(kinds.filter((k) => k === 'bias')).toHaveLength(5);
    expect(kinds.filter((k) => k === 'flat')).toHaveLength(3);
    const arcs = kinds.flatMap((k, i) => (k === 'arc' ? [i] : []));
    const sci = kinds.flatMap((k, i) => (k === 'science' ? [i] : []));
    expect(arcs).toHaveLength(2);
    expect(arcs[0]!).toBeLessThan(sci[0]!);
    expect(arcs[1]!).toBeGreaterThan(sci.at(-1)!);
  });

  it('takes the exposures one after the other in time, each with its own barycentric correction', () => {
    const starts = run.frames.map((f) => Date.parse(`${f.header.getString('DATE-OBS')}Z`));
    const ends = run.frames.map((f, i) => starts[i]! + f.header.getNumber('EXPTIME')! * 1000);
    for (let i = 1; i < starts.length; i++) expect(starts[i]!).toBeGreaterThan(ends[i - 1]!);
    const corrections = run.truth.targets.flatMap((t) => t.exposures.map((e) => e.barycentricCorrectionKms));
    expect(new Set(corrections).size).toBe(9);
    // Within one night the Earth-rotation part changes by a few tenths of a km/s at most per hour.
    for (const t of run.truth.targets) expect(Math.abs(t.exposures[0]!.barycentricCorrectionKms - t.exposures[2]!.barycentricCorrectionKms)).toBeLessThan(0.47);
  });

  it('lists each target with its own frames in run.yaml', () => {
    const m = parse(run.manifestYaml);
    expect(m.targets.map((t: { name: string }) => t.name)).toEqual(names);
    m.targets.forEach((t: { frames: string[] }, i: number) => expect(t.frames).toEqual(run.truth.targets[i]!.exposures.map((e) => e.frame)));
  });
});

describe('a night with two setups', () => {
  const run = simulateRun({ setups: 2 });

  it('adds a second setup with its own flats, arcs and science, sharing the bias frames', () => {
    expect(Object.keys(run.truth.setups)).toEqual(['red', 'orange']);
    const of = (setup: string, kind: string) => run.frames.filter((f) => f.kind === kind && run.truth.frames[f.name]!.setup === setup).map((f) => f.name);
    expect(of('orange', 'flat')).toEqual(['raw/orange_flat_001.fits', 'raw/orange_flat_002.fits', 'raw/orange_flat_003.fits']);
    expect(of('orange', 'arc')).toHaveLength(2);
    expect(of('orange', 'science')).toHaveLength(3);
    expect(of('orange', 'bias')).toHaveLength(0);
    expect(of('red', 'bias')).toHaveLength(5);
    const tilt = (name: string) => run.frames.find((f) => f.name === name)!.header.getNumber('GRTILT');
    expect(tilt('raw/orange_flat_001.fits')).not.toBe(tilt('raw/flat_001.fits'));
  });

  it('observes the galaxy again at another central wavelength', () => {
    const [red, orange] = run.truth.targets;
    expect(orange!.setup).toBe('orange');
    expect(orange!.object).toBe(red!.object);
    expect(orange!.name).not.toBe(red!.name);
    const shift = trueWavelength(run.truth, 'red', 512, 150) - trueWavelength(run.truth, 'orange', 512, 150);
    expect(shift).toBeGreaterThan(150);
    const m = parse(run.manifestYaml);
    expect(m.setups.orange.flat).toEqual(['raw/orange_flat_*.fits']);
    expect(m.setups.red.flat).toEqual(['raw/flat_*.fits']);
    expect(m.targets[1].frames).toEqual(['raw/orange_sci_*.fits']);
  });
});

describe('simulator options', () => {
  it('refuses bad options with an InputError naming the option', () => {
    expect(() => simulateRun({ targets: 0 })).toThrow(/targets/);
    expect(() => simulateRun({ variant: 'tilted' as never })).toThrow(/variant/);
    expect(() => simulateRun({ size: 'huge' as never })).toThrow(/size/);
    expect(() => simulateRun({ seed: -1 })).toThrow(/seed/);
    expect(() => simulateRun({ setups: 3 })).toThrow(/setups/);
  });
});
