import { describe, expect, it } from 'vitest';
import { midExposure, parseDeclination, parseRightAscension, siteFromHeader } from '../../src/physics/coordinates.js';
import { simulateRun } from '../../src/sim/index.js';
import { electronsAboveBias, frameOf, overscanRowMeans, standardRun, trimmedWidth } from './shared-run.js';

const run = standardRun();
const det = run.truth.setups['red']!.detector;

function stats(values: number[]): { mean: number; variance: number } {
  const mean = values.reduce((a, b) => a + b, 0) / values.length;
  return { mean, variance: values.reduce((a, b) => a + (b - mean) ** 2, 0) / (values.length - 1) };
}

describe('raw frames', () => {
  it('has 5 bias, 3 flat, 2 arc and 3 science frames of the raw size with overscan', () => {
    const count = (k: string) => run.frames.filter((f) => f.kind === k).length;
    expect([count('bias'), count('flat'), count('arc'), count('science')]).toEqual([5, 3, 2, 3]);
    for (const f of run.frames) {
      expect([f.width, f.height]).toEqual([1024 + 32, 300]);
      expect(f.adu).toHaveLength(f.width * f.height);
    }
  });

  it('writes the keywords an observatory writes, readable by the physics parsers', () => {
    for (const f of run.frames) {
      const h = f.header;
      for (const key of ['OBJECT', 'IMAGETYP', 'EXPTIME', 'DATE-OBS', 'RA', 'DEC', 'EQUINOX', 'OBSGEO-B', 'OBSGEO-L', 'OBSGEO-H', 'GAIN', 'RDNOISE', 'BIASSEC', 'DATASEC', 'TELESCOP', 'INSTRUME', 'GRATING']) {
        expect(h.has(key), `${f.name} ${key}`).toBe(true);
      }
      expect(h.getString('DATASEC')).toBe('[1:1024,1:300]');
      expect(h.getString('BIASSEC')).toBe('[1025:1056,1:300]');
      expect(midExposure(h.getString('DATE-OBS')!, h.getNumber('EXPTIME')!).getUTCFullYear()).toBe(2019);
      expect(parseRightAscension(h.getString('RA')!)).toBeCloseTo((10 + 8 / 60 + 41.2 / 3600) * 15, 6);
      expect(parseDeclination(h.getString('DEC')!)).toBeCloseTo(-(18 + 44 / 60 + 7 / 3600), 6);
      expect(siteFromHeader(h)).toEqual({ latitudeDeg: run.truth.site.latitudeDeg, longitudeDeg: run.truth.site.longitudeDeg, heightM: run.truth.site.heightM });
    }
    expect(frameOf(run, 'raw/arc_001.fits').header.getString('LAMPS')).toBe('Ne,Ar');
    expect(run.frames.map((f) => f.header.getString('IMAGETYP'))).toEqual(['bias', 'bias', 'bias', 'bias', 'bias', 'flat', 'flat', 'flat', 'arc', 'object', 'object', 'object', 'arc']);
  });

  it('makes the same frames for the same seed and different ones for another seed', () => {
    expect(simulateRun({ seed: 1 }).frames[9]!.adu).toEqual(run.frames[9]!.adu);
    expect(simulateRun({ seed: 2 }).frames[9]!.adu).not.toEqual(run.frames[9]!.adu);
  });
});

describe('detector', () => {
  it('has read noise RDNOISE/GAIN in the overscan (plus 1/12 ADU^2 of rounding)', () => {
    const f = frameOf(run, 'raw/bias_002.fits');
    const means = overscanRowMeans(run, f);
    const residuals: number[] = [];
    const x0 = trimmedWidth(run, f);
    for (let y = 0; y < f.height; y++) for (let x = x0; x < f.width; x++) residuals.push(f.adu[y * f.width + x]! - means[y]!);
    const expectedAdu2 = ((det.readNoiseE / det.gainEPerAdu) ** 2 + 1 / 12) * (1 - 1 / (f.width - x0));
    expect(stats(residuals).variance / expectedAdu2).toBeGreaterThan(0.95);
    expect(stats(residuals).variance / expectedAdu2).toBeLessThan(1.05);
  });

  it('sits at the bias level plus the frame offset, with a weak row pattern common to all frames', () => {
    for (const name of ['raw/bias_001.fits', 'raw/sci_002.fits']) {
      const f = frameOf(run, name);
      const m = overscanRowMeans(run, f);
      const mean = m.reduce((a, b) => a + b, 0) / m.length;
      expect(Math.abs(mean - det.biasLevelAdu - run.truth.frames[name]!.biasOffsetAdu)).toBeLessThan(1);
    }
    const a = overscanRowMeans(run, frameOf(run, 'raw/bias_001.fits'));
    const b = overscanRowMeans(run, frameOf(run, 'raw/bias_003.fits'));
    const ma = a.reduce((x, y) => x + y, 0) / a.length;
    const mb = b.reduce((x, y) => x + y, 0) / b.length;
    let cov = 0;
    let va = 0;
    let vb = 0;
    a.forEach((v, y) => {
      cov += (v - ma) * (b[y]! - mb);
      va += (v - ma) ** 2;
      vb += (b[y]! - mb) ** 2;
    });
    expect(cov / Math.sqrt(va * vb)).toBeGreaterThan(0.7);
  });

  it('recovers the gain by the photon-transfer method from two flats (Janesick, Photon Transfer, 2007; from memory)', () => {
    // var(F1 - k F2) / 2 = mean / g + RN^2 / g^2 (ADU), over a flat-looking patch away from hot columns.
    const f1 = frameOf(run, 'raw/flat_001.fits');
    const f2 = frameOf(run, 'raw/flat_002.fits');
    const m1 = overscanRowMeans(run, f1);
    const m2 = overscanRowMeans(run, f2);
    const a: number[] = [];
    const b: number[] = [];
    for (let y = 100; y < 200; y++) {
      for (let x = 300; x < 400; x++) {
        if (det.hotColumns.includes(x)) continue;
        a.push(f1.adu[y * f1.width + x]! - m1[y]!);
        b.push(f2.adu[y * f2.width + x]! - m2[y]!);
      }
    }
    const sa = stats(a);
    const k = sa.mean / stats(b).mean;
    const diff = stats(a.map((v, i) => v - k * b[i]!));
    const shotAdu2 = diff.variance / (1 + k * k) - (det.readNoiseE / det.gainEPerAdu) ** 2 - 1 / 12;
    const gain = sa.mean / shotAdu2;
    expect(Math.abs(gain / det.gainEPerAdu - 1)).toBeLessThan(0.04);
  });

  it('adds the hot-column excess to the listed columns (bias frames included)', () => {
    const f = frameOf(run, 'raw/bias_004.fits');
    for (const x of det.hotColumns) {
      let excess = 0;
      for (let y = 0; y < f.height; y++) excess += f.adu[y * f.width + x]! - 0.5 * (f.adu[y * f.width + x - 2]! + f.adu[y * f.width + x + 2]!);
      expect(Math.abs((excess / f.height) * det.gainEPerAdu - det.hotColumnOffsetE)).toBeLessThan(10);
    }
  });

  it('matches the expected electrons: (raw - overscan) x gain minus cosmic rays sums to the expected image', () => {
    for (const name of ['raw/flat_003.fits', 'raw/sci_001.fits', 'raw/arc_002.fits']) {
      const f = frameOf(run, name);
      const e = run.expected!.get(name)!;
      const means = overscanRowMeans(run, f);
      const tw = trimmedWidth(run, f);
      let measured = 0;
      let expected = 0;
      for (let y = 0; y < f.height; y++) {
        for (let x = 0; x < tw; x++) {
          measured += electronsAboveBias(run, f, x, y, means);
          expected += e[y * tw + x]!;
        }
      }
      const cr = run.truth.frames[name]!.cosmicRays.electrons.reduce((a, b) => a + b, 0);
      const noise = Math.sqrt(expected + tw * f.height * (det.readNoiseE ** 2 + 0.5));
      expect(Math.abs(measured - cr - expected)).toBeLessThan(5 * noise + 0.7 * tw * f.height * 0.1);
    }
  });

  it('has honest noise: pulls (raw - expected) / sqrt(expected + RN^2) of unit width in every kind of frame', () => {
    for (const name of ['raw/bias_001.fits', 'raw/flat_002.fits', 'raw/arc_001.fits', 'raw/sci_003.fits']) {
      const f = frameOf(run, name);
      const e = run.expected!.get(name)!;
      const means = overscanRowMeans(run, f);
      const tw = trimmedWidth(run, f);
      const hit = new Set(run.truth.frames[name]!.cosmicRays.x.map((x, k) => run.truth.frames[name]!.cosmicRays.y[k]! * tw + x));
      // Read noise, the rounding to ADU (g^2 / 12) and the noise of the 32-pixel overscan mean.
      const fixed = det.readNoiseE ** 2 + det.gainEPerAdu ** 2 / 12 + (det.readNoiseE ** 2 + det.gainEPerAdu ** 2 / 12) / 32;
      const pulls: number[] = [];
      for (let y = 0; y < f.height; y++) {
        for (let x = 0; x < tw; x++) {
          const i = y * tw + x;
          if (hit.has(i) || f.adu[y * f.width + x] === det.saturationAdu) continue;
          pulls.push((electronsAboveBias(run, f, x, y, means) - e[i]!) / Math.sqrt(e[i]! + fixed));
        }
      }
      const p = stats(pulls);
      expect(Math.abs(p.mean), name).toBeLessThan(0.02);
      expect(Math.abs(Math.sqrt(p.variance) - 1), name).toBeLessThan(0.02);
    }
  });

  it('lets the brightest arc lines come close to saturation without exceeding the converter range', () => {
    const f = frameOf(run, 'raw/arc_001.fits');
    let max = 0;
    for (const v of f.adu) max = Math.max(max, v);
    expect(max).toBeGreaterThan(0.7 * det.saturationAdu);
    expect(max).toBeLessThanOrEqual(det.saturationAdu);
  });
});
