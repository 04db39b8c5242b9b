import { describe, expect, it } from 'vitest';
import { InputError, StageError } from '../../../src/errors.js';
import { LINE_FLAGS } from '../../../src/products/lines.js';
import { Rng } from '../../../src/kernels/random.js';
import { computeVelocities } from '../../../src/stages/velocity/compute.js';
import { DEFAULT_VELOCITY_SETTINGS, type VelocitySettings } from '../../../src/stages/velocity/settings.js';
import { bins, C_KMS, frameFor, lineTable, measurement, observedWavelength, sequence, weightedCorrection } from './synthetic.js';

const HALPHA_NII: [string, number][] = [['NII6583', 6583.454], ['NII6548', 6548.05], ['Halpha', 6562.8]];
const SII: [string, number][] = [['SII6716', 6716.44], ['SII6731', 6730.816]];

/** A rotation curve through the bins: v_sys + 180 tanh(...) km/s. */
const truth = (vSys: number, n: number) => Array.from({ length: n }, (_, i) => vSys + 180 * Math.tanh((i - (n - 1) / 2) / 3));

function settings(extra: Partial<VelocitySettings> = {}): VelocitySettings {
  return { ...DEFAULT_VELOCITY_SETTINGS, ...extra };
}

/** Noise-free tied lines at the true velocities, seen through the exposure-weighted astropy correction. */
function exactTable(vTrue: number[], corrKms: number, convention: 'optical' | 'relativistic') {
  const ms = vTrue.flatMap((v, bin) => [
    ...HALPHA_NII.map(([name, rest]) => measurement(bin, name, 'Halpha+NII', rest, observedWavelength(rest, v, corrKms, convention), 0.02)),
    ...SII.map(([name, rest]) => measurement(bin, name, 'SII', rest, observedWavelength(rest, v, corrKms, convention), 0.05)),
  ]);
  return lineTable(bins(vTrue.length), ms);
}

describe('computeVelocities recovers known velocities (astropy corrections, Wright & Eastman 2014)', () => {
  it('optical, barycentric: within 0.003 km/s at cz 1500-10000 km/s with a 3-exposure night', () => {
    const seq = sequence('night');
    for (const vSys of [1500, 10000]) {
      const v = truth(vSys, 9);
      const out = computeVelocities(exactTable(v, weightedCorrection(seq, 'barycentricKms'), 'optical'), frameFor(seq), settings());
      out.product.points.forEach((p, i) => expect(Math.abs(p.vLos - v[i]!)).toBeLessThan(0.003));
      out.product.perLine.forEach((l, i) => expect(Math.abs(l.vLos - v[Math.floor(i / 5)]!)).toBeLessThan(0.003));
      expect(out.product.convention).toBe('optical');
    }
  });

  it('applies the correction multiplicatively: at cz 10000 km/s the additive form would be 0.9 km/s off', () => {
    const seq = sequence('months');
    const corr = weightedCorrection(seq, 'barycentricKms');
    const out = computeVelocities(exactTable([10000], corr, 'optical'), frameFor(seq), settings());
    expect(Math.abs(out.product.points[0]!.vLos - 10000)).toBeLessThan(0.003);
    expect(Math.abs((10000 * corr) / C_KMS)).toBeGreaterThan(0.3);
  });

  it('relativistic convention: within 0.003 km/s', () => {
    const seq = sequence('night');
    const v = truth(8000, 7);
    const out = computeVelocities(exactTable(v, weightedCorrection(seq, 'barycentricKms'), 'relativistic'), frameFor(seq), settings({ convention: 'relativistic' }));
    out.product.points.forEach((p, i) => expect(Math.abs(p.vLos - v[i]!)).toBeLessThan(0.003));
    expect(out.product.convention).toBe('relativistic');
  });

  it('heliocentric frame: within 0.003 km/s of astropy heliocentric', () => {
    const seq = sequence('night');
    const v = truth(3000, 5);
    const out = computeVelocities(exactTable(v, weightedCorrection(seq, 'heliocentricKms'), 'optical'), frameFor(seq), settings({ frame: 'heliocentric' }));
    out.product.points.forEach((p, i) => expect(Math.abs(p.vLos - v[i]!)).toBeLessThan(0.003));
    expect(out.product.barycentric.frame).toBe('heliocentric');
  });

  it('vacuum medium: recovers velocities defined on vacuum wavelengths (Morton 2000 written out here)', () => {
    // n - 1 of Morton (2000, ApJS 130, 403) eq. 8, the IAU standard, from REFERENCE.md.
    const nAir = (vac: number) => { const s2 = (1e4 / vac) ** 2; return 1 + 8.34254e-5 + 2.406147e-2 / (130 - s2) + 1.5998e-4 / (38.9 - s2); };
    const seq = sequence('night');
    const corr = weightedCorrection(seq, 'barycentricKms');
    const restVac = 6564.613; // H-alpha, vacuum (REFERENCE.md)
    const restAir = restVac / nAir(restVac);
    const vTrue = 5000;
    const obsVac = observedWavelength(restVac, vTrue, corr, 'optical');
    const table = lineTable(bins(1), [measurement(0, 'Halpha', 'Halpha', restAir, obsVac / nAir(obsVac), 0.02)]);
    const vac = computeVelocities(table, frameFor(seq), settings({ restMedium: 'vacuum' })).product.points[0]!.vLos;
    const air = computeVelocities(table, frameFor(seq), settings()).product.points[0]!.vLos;
    expect(Math.abs(vac - vTrue)).toBeLessThan(0.003);
    // Comparing in air carries the dispersion of air: c (n(rest)/n(obs) - 1) (1 + z) = +0.037 km/s here.
    const bias = (C_KMS * (nAir(restVac) / nAir(obsVac) - 1)) * (1 + vTrue / C_KMS);
    expect(air - vTrue).toBeCloseTo(bias, 3);
    expect(Math.abs(bias)).toBeGreaterThan(0.02);
  });
});

describe('computeVelocities: the frame correction of the exposures', () => {
  it('matches astropy per exposure (mid-exposure times) and weights them by exposure time', () => {
    const seq = sequence('night');
    const info = computeVelocities(exactTable([1000], 0, 'optical'), frameFor(seq), settings()).product.barycentric;
    expect(info.exposures.map((e) => e.midTimeUtc)).toEqual(['2018-04-12T01:20:00.000Z', '2018-04-12T01:42:00.000Z', '2018-04-12T06:05:00.000Z']);
    info.exposures.forEach((e, i) => expect(Math.abs(e.correctionKms - seq.exposures[i]!.barycentricKms)).toBeLessThan(0.003));
    expect(Math.abs(info.correctionKms - weightedCorrection(seq, 'barycentricKms'))).toBeLessThan(0.003);
    const values = seq.exposures.map((e) => e.barycentricKms);
    expect(info.spreadKms).toBeCloseTo(Math.max(...values) - Math.min(...values), 2);
  });

  it('warns when the corrections span more than 0.1 km/s and stays quiet below', () => {
    const months = sequence('months');
    const wide = computeVelocities(exactTable([1000], 0, 'optical'), frameFor(months), settings());
    expect(wide.product.barycentric.spreadKms).toBeGreaterThan(40);
    expect(wide.diagnostics.some((d) => d.rule === 'velocity.correction-spread' && d.severity === 'warning')).toBe(true);
    const night = sequence('night');
    const close = { ...night, exposures: night.exposures.slice(0, 2) };
    const quiet = computeVelocities(exactTable([1000], 0, 'optical'), frameFor(close), settings());
    expect(quiet.product.barycentric.spreadKms).toBeLessThan(0.1);
    expect(quiet.diagnostics.some((d) => d.rule === 'velocity.correction-spread')).toBe(false);
  });

  it('takes site and pointing from the settings when the headers lack them', () => {
    const seq = sequence('night');
    const bare = frameFor(seq, (h) => { for (const k of ['RA', 'DEC', 'EQUINOX', 'RADESYS', 'OBSGEO-B', 'OBSGEO-L', 'OBSGEO-H']) h.delete(k); });
    const out = computeVelocities(exactTable([2000], weightedCorrection(seq, 'barycentricKms'), 'optical'), bare, settings({ site: seq.site, pointing: { raDeg: seq.raDeg, decDeg: seq.decDeg } }));
    expect(Math.abs(out.product.points[0]!.vLos - 2000)).toBeLessThan(0.003);
  });

  it('refuses a frame without a site, naming the file, OBSGEO-B and the manifest key site', () => {
    const seq = sequence('night');
    const noSite = frameFor(seq, (h, i) => { if (i === 1) h.delete('OBSGEO-B').delete('OBSGEO-L').delete('OBSGEO-H'); });
    const e = (() => { try { computeVelocities(exactTable([1], 0, 'optical'), noSite, settings()); } catch (err) { return err; } return undefined; })();
    expect(e).toBeInstanceOf(InputError);
    expect((e as InputError).place).toMatchObject({ file: 'sci2.fits', key: 'OBSGEO-B' });
    expect((e as InputError).message).toContain('`site`');
  });

  it('refuses a frame without RA, naming the key and the manifest key coordinates', () => {
    const seq = sequence('night');
    const noRa = frameFor(seq, (h) => h.delete('RA'));
    expect(() => computeVelocities(exactTable([1], 0, 'optical'), noRa, settings())).toThrow(/sci1\.fits, RA: .*`coordinates`/);
  });

  it('reads RA/DEC given in degrees and precesses an FK4 1950 pointing (EQUINOX absent)', () => {
    const seq = sequence('night');
    const degrees = frameFor(seq, (h) => h.set('RA', seq.raDeg).set('DEC', seq.decDeg));
    const a = computeVelocities(exactTable([1], 0, 'optical'), degrees, settings()).product.barycentric.correctionKms;
    expect(Math.abs(a - weightedCorrection(seq, 'barycentricKms'))).toBeLessThan(0.003);
    const fk4 = frameFor(seq, (h) => h.delete('EQUINOX').set('RADESYS', 'FK4'));
    const b = computeVelocities(exactTable([1], 0, 'optical'), fk4, settings()).product.barycentric.correctionKms;
    // Same numbers read as 1950 coordinates point 0.7 deg away: the correction moves by > 0.01 km/s.
    expect(Math.abs(b - a)).toBeGreaterThan(0.01);
  });
});

describe('computeVelocities: errors, flags and bins', () => {
  it('gives pulls of unit width for the bin means (1000 bins, tied Halpha+[N II] and [S II] groups, seed 7)', () => {
    const seq = sequence('night');
    const corr = weightedCorrection(seq, 'barycentricKms');
    const rng = new Rng(7);
    const n = 1000;
    const v = Array.from({ length: n }, () => 1500 + rng.between(-200, 200));
    const ms = v.flatMap((vt, bin) => {
      // One velocity per tied group (the fit shares it); its error sets every member's wavelength error.
      const s1 = rng.between(2, 10);
      const s2 = rng.between(3, 15);
      const v1 = vt + s1 * rng.normal();
      const v2 = vt + s2 * rng.normal();
      return [
        ...HALPHA_NII.map(([name, rest]) => measurement(bin, name, 'Halpha+NII', rest, observedWavelength(rest, v1, corr, 'optical'), (rest * s1) / C_KMS)),
        ...SII.map(([name, rest]) => measurement(bin, name, 'SII', rest, observedWavelength(rest, v2, corr, 'optical'), (rest * s2) / C_KMS)),
      ];
    });
    const out = computeVelocities(lineTable(bins(n), ms), frameFor(seq), settings());
    const pulls = out.product.points.map((p, i) => (p.vLos - v[i]!) / p.vLosErr);
    const mean = pulls.reduce((s, x) => s + x, 0) / n;
    const sd = Math.sqrt(pulls.reduce((s, x) => s + (x - mean) ** 2, 0) / (n - 1));
    expect(Math.abs(mean)).toBeLessThan(0.1);
    expect(Math.abs(sd - 1)).toBeLessThan(0.08);
    // The same pulls with the tied lines counted as independent would be too wide: the test can fail.
    const naive = out.product.points.map((p, i) => {
      const errs = ms.filter((m) => m.bin === i).map((_, k) => out.product.perLine[i * 5 + k]!.vLosErr);
      return (p.vLos - v[i]!) * Math.sqrt(errs.reduce((s, e) => s + 1 / (e * e), 0));
    });
    const sdNaive = Math.sqrt(naive.reduce((s, x) => s + x * x, 0) / n);
    expect(sdNaive).toBeGreaterThan(1.2);
  });

  it('ORs the flags of the averaged lines and leaves out unconverged ones when others exist', () => {
    const seq = sequence('night');
    const w = (rest: number, v: number) => observedWavelength(rest, v, weightedCorrection(seq, 'barycentricKms'), 'optical');
    const table = lineTable(bins(3), [
      measurement(0, 'Halpha', 'Halpha', 6562.8, w(6562.8, 1000), 0.02, LINE_FLAGS.lowSnr),
      measurement(0, 'SII6716', 'SII6716', 6716.44, w(6716.44, 1000), 0.05, LINE_FLAGS.blended),
      measurement(1, 'Halpha', 'Halpha', 6562.8, w(6562.8, 1100), 0.02),
      measurement(1, 'SII6716', 'SII6716', 6716.44, w(6716.44, 5000), 0.001, LINE_FLAGS.notConverged),
      measurement(2, 'Halpha', 'Halpha', 6562.8, NaN, NaN, LINE_FLAGS.notConverged),
    ]);
    const out = computeVelocities(table, frameFor(seq), settings());
    const [p0, p1, p2] = out.product.points;
    expect(p0!.flags).toBe(LINE_FLAGS.lowSnr | LINE_FLAGS.blended);
    expect(Math.abs(p1!.vLos - 1100)).toBeLessThan(0.003);
    expect(p1!.flags).toBe(0);
    expect(p2!.vLos).toBeNaN();
    expect(p2!.flags).toBe(LINE_FLAGS.notConverged);
    expect(p2!).toMatchObject({ bin: 2, rowStart: 4, rowEnd: 5, yCentre: 4.5 });
    expect(out.diagnostics.some((d) => d.rule === 'velocity.bins-without-velocity')).toBe(true);
  });

  it('warns when line groups of a bin disagree beyond their errors', () => {
    const seq = sequence('night');
    const w = (rest: number, v: number) => observedWavelength(rest, v, weightedCorrection(seq, 'barycentricKms'), 'optical');
    const agree = lineTable(bins(1), [measurement(0, 'Halpha', 'Halpha', 6562.8, w(6562.8, 1000), 0.022), measurement(0, 'SII6716', 'SII', 6716.44, w(6716.44, 1002), 0.022)]);
    const disagree = lineTable(bins(1), [measurement(0, 'Halpha', 'Halpha', 6562.8, w(6562.8, 1000), 0.022), measurement(0, 'SII6716', 'SII', 6716.44, w(6716.44, 1010), 0.022)]);
    // Errors 1.0 km/s each: 2 km/s apart is chi-square 2, 10 km/s is 50 (99.9% point 10.83 for 1 dof, scipy).
    expect(computeVelocities(agree, frameFor(seq), settings()).diagnostics.some((d) => d.rule === 'velocity.lines-disagree')).toBe(false);
    expect(computeVelocities(disagree, frameFor(seq), settings()).diagnostics.some((d) => d.rule === 'velocity.lines-disagree')).toBe(true);
  });

  it('throws a StageError for a measurement of a bin the table does not have', () => {
    const seq = sequence('night');
    expect(() => computeVelocities(lineTable(bins(1), [measurement(3, 'Halpha', 'Halpha', 6562.8, 6600, 0.02)]), frameFor(seq), settings())).toThrow(StageError);
  });

  it('refuses invalid settings with an InputError naming the setting', () => {
    const seq = sequence('night');
    const bad = { ...settings(), convention: 'radio' } as unknown as VelocitySettings;
    expect(() => computeVelocities(lineTable(bins(1), []), frameFor(seq), bad)).toThrow(/convention/);
  });
});
