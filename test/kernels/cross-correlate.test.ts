import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { Correlator, correlationPeak, crossCorrelate } from '../../src/kernels/cross-correlate.js';

// Reference: Debian python3-numpy numpy.correlate(a, b, 'full'), fixtures/arc/make_legendre.py.
const ref = JSON.parse(readFileSync(new URL('../../fixtures/arc/legendre.json', import.meta.url), 'utf8')).correlate;

describe('crossCorrelate', () => {
  it('matches numpy.correlate full mode at lags -20..20', () => {
    const c = crossCorrelate(ref.a, ref.b, ref.maxLag);
    expect(c.length).toBe(2 * ref.maxLag + 1);
    c.forEach((v, i) => expect(v).toBeCloseTo(ref.c[i], 9));
  });

  it('a Correlator reused for a second sequence gives the same as a fresh one', () => {
    const corr = new Correlator(ref.a, 60);
    corr.correlate(ref.a, 10);
    const again = corr.correlate(ref.b, ref.maxLag);
    again.forEach((v, i) => expect(v).toBeCloseTo(ref.c[i], 9));
  });

  it('one transform serves Correlators of the same size: against numpy, and bit for bit as correlate', () => {
    const corr = new Correlator(ref.a, ref.b.length);
    const other = new Correlator(ref.b, ref.b.length);
    expect(other.size).toBe(corr.size);
    // the spectrum is made by the other Correlator, in an array that held another spectrum before
    const spectrum = other.transform(ref.b, other.transform(ref.a));
    const viaSpectrum = corr.correlateTransformed(spectrum, ref.maxLag);
    viaSpectrum.forEach((v, i) => expect(v).toBeCloseTo(ref.c[i], 9));
    expect(Buffer.from(viaSpectrum.buffer).equals(Buffer.from(corr.correlate(ref.b, ref.maxLag).buffer))).toBe(true);
    expect(() => corr.correlateTransformed(spectrum.slice(2), ref.maxLag)).toThrow(RangeError);
  });

  it('finds a sub-sample shift of a Gaussian to 0.05 samples (parabolic peak)', () => {
    const n = 256;
    const g = (c: number) => Float64Array.from({ length: n }, (_, i) => Math.exp(-0.5 * ((i - c) / 3) ** 2));
    const peak = correlationPeak(crossCorrelate(g(130.3), g(120), 30), 30);
    expect(Math.abs(peak.lag - 10.3)).toBeLessThan(0.05);
  });
});
