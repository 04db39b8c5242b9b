import { readFileSync } from 'node:fs';
import { levenbergMarquardt as mlLevenbergMarquardt } from 'ml-levenberg-marquardt';
import { describe, expect, it } from 'vitest';
import { fitGaussianLine } from '../../src/kernels/gaussian-fit.js';
import { Rng } from '../../src/kernels/random.js';

type Named = Record<string, number>;
interface SingleCase { name: string; kind: string; x: number[]; y: number[]; sigma: number[]; initial: Named; params: Named; errors: Named }

// Reference fits from scipy.optimize.curve_fit (Debian python3-scipy), fixtures/lines/make_curve_fit.py.
const fixture = JSON.parse(readFileSync(new URL('../../fixtures/lines/curve_fit.json', import.meta.url), 'utf8')) as { cases: SingleCase[] };
const singles = fixture.cases.filter((c) => c.kind === 'gaussian-linear');

const FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.log(2));

/** Cramer-Rao centroid limit for a sampled Gaussian in white noise, sigma(x0) = 0.6922 sqrt(FWHM) / (peak S/N) px:
 * the form of Lenz & Ayres 1992 (PASP 104, 1104), coefficient from /work/shared/REFERENCE.md [computed]. */
function centroidLimit(fwhmPx: number, snr: number): number {
  return (0.6922 * Math.sqrt(fwhmPx)) / snr;
}

interface MonteCarlo { bias: number; scatter: number; pullStd: number; converged: number }

function monteCarlo(seed: number, trials: number, snr: number, fwhmPx: number, fixedWidth: boolean): MonteCarlo {
  const rng = new Rng(seed);
  const normal = (): number => rng.normal();
  const n = 31;
  const sigma = fwhmPx / FWHM_PER_SIGMA;
  const amp = 1;
  const noise = amp / snr;
  const x = Float64Array.from({ length: n }, (_, i) => i);
  const y = new Float64Array(n);
  const w = new Float64Array(n).fill(1 / (noise * noise));
  let sumD = 0;
  let sumD2 = 0;
  let sumP2 = 0;
  let converged = 0;
  for (let t = 0; t < trials; t++) {
    // a random sub-pixel phase, so that the bias is averaged over where the line falls on a pixel
    const centre = 15 + (t % 20) / 20 - 0.5;
    for (let i = 0; i < n; i++) y[i] = amp * Math.exp(-((i - centre) ** 2) / (2 * sigma * sigma)) + 0.3 + noise * normal();
    const guess = { amplitude: amp * 0.9, centre: centre + 0.3 * normal() * noise * 3, sigma: sigma * 1.1, c0: 0.3 };
    const r = fitGaussianLine(x, y, w, guess, fixedWidth ? { fixedSigma: sigma } : {});
    if (r.converged) converged++;
    const d = r.centre - centre;
    sumD += d;
    sumD2 += d * d;
    sumP2 += (d / r.errors.centre) ** 2;
  }
  const bias = sumD / trials;
  return { bias, scatter: Math.sqrt(sumD2 / trials - bias * bias), pullStd: Math.sqrt(sumP2 / trials), converged: converged / trials };
}

describe('fitGaussianLine', () => {
  for (const c of singles) {
    it(`agrees with scipy curve_fit in centroid and error: ${c.name}`, () => {
      const x = Float64Array.from(c.x);
      const y = Float64Array.from(c.y);
      const w = Float64Array.from(c.sigma, (s) => 1 / (s * s));
      const r = fitGaussianLine(x, y, w, { amplitude: c.initial.amplitude!, centre: c.initial.centre!, sigma: c.initial.sigma!, c0: c.initial.c0!, c1: c.initial.c1! });
      expect(r.converged).toBe(true);
      expect(Math.abs(r.centre - c.params.centre!)).toBeLessThan(1e-3 * c.errors.centre!);
      expect(Math.abs(r.sigma - c.params.sigma!)).toBeLessThan(1e-3 * c.errors.sigma!);
      expect(Math.abs(r.amplitude - c.params.amplitude!)).toBeLessThan(1e-3 * c.errors.amplitude!);
      expect(r.errors.centre / c.errors.centre!).toBeCloseTo(1, 3);
      expect(r.errors.sigma / c.errors.sigma!).toBeCloseTo(1, 3);
      expect(r.errors.c1 / c.errors.c1!).toBeCloseTo(1, 3);
    });
  }

  it('finds the same centroid as ml-levenberg-marquardt 5.1 (the cross-check solver) on clean data', () => {
    const c = singles[0]!;
    const xref = (c.x[0]! + c.x[c.x.length - 1]!) / 2;
    const ours = fitGaussianLine(Float64Array.from(c.x), Float64Array.from(c.y), Float64Array.from(c.sigma, (s) => 1 / (s * s)), { amplitude: 80, centre: 12.6, sigma: 1.4, c0: 50 });
    const model = ([a, m, s, k0, k1]: number[]) => (x: number) => a! * Math.exp(-((x - m!) ** 2) / (2 * s! * s!)) + k0! + k1! * (x - xref);
    const theirs = mlLevenbergMarquardt({ x: c.x, y: c.y }, model, {
      initialValues: [80, 12.6, 1.4, 50, 0],
      weights: c.sigma.map((s) => 1 / s),
      // it stops only on errorTolerance (an absolute chi-square), so on noisy data it runs all its
      // iterations; its additive damping needs ~2000 of them here where ours needs ~10.
      maxIterations: 2000,
      errorTolerance: 1e-10,
      jacobianFunction: ([a, m, s]: number[]) => (x: number) => {
        const e = Math.exp(-((x - m!) ** 2) / (2 * s! * s!));
        return [e, (a! * e * (x - m!)) / (s! * s!), (a! * e * (x - m!) ** 2) / s! ** 3, 1, x - xref];
      },
    });
    // ml-levenberg-marquardt has no covariance: compare in units of our error.
    expect(Math.abs(theirs.parameterValues[1]! - ours.centre)).toBeLessThan(0.02 * ours.errors.centre);
    expect(Math.abs(theirs.parameterValues[2]! - ours.sigma)).toBeLessThan(0.02 * ours.errors.sigma);
  });

  it('reaches the Cramer-Rao centroid limit (Lenz & Ayres 1992 form) at S/N 10, FWHM 3 px over 2000 noise realisations', () => {
    const mc = monteCarlo(11, 2000, 10, 3, false);
    const limit = centroidLimit(3, 10);
    expect(mc.converged).toBe(1);
    expect(Math.abs(mc.scatter / limit - 1)).toBeLessThan(0.1);
    expect(Math.abs(mc.bias)).toBeLessThan(0.02);
    expect(mc.pullStd).toBeGreaterThan(0.9);
    expect(mc.pullStd).toBeLessThan(1.1);
  });

  it('keeps honest centroid errors at S/N 4 with the width held (Lenz & Ayres 1992 form, 2000 realisations)', () => {
    const mc = monteCarlo(12, 2000, 4, 3, true);
    const limit = centroidLimit(3, 4);
    expect(Math.abs(mc.scatter / limit - 1)).toBeLessThan(0.1);
    expect(Math.abs(mc.bias)).toBeLessThan(0.02);
    expect(mc.pullStd).toBeGreaterThan(0.9);
    expect(mc.pullStd).toBeLessThan(1.1);
  });

  it('quotes too-small centroid errors at S/N 4 with a free width (pull std above 1.1): why the lines stage holds the width there', () => {
    const mc = monteCarlo(12, 2000, 4, 3, false);
    expect(mc.pullStd).toBeGreaterThan(1.1);
  });

  it('holds sigma when asked and reports zero sigma error', () => {
    const c = singles[1]!;
    const r = fitGaussianLine(Float64Array.from(c.x), Float64Array.from(c.y), Float64Array.from(c.sigma, (s) => 1 / (s * s)), { amplitude: 90, centre: 12, sigma: 1.3 }, { fixedSigma: 1.27 });
    expect(r.sigma).toBe(1.27);
    expect(r.errors.sigma).toBe(0);
    expect(r.dof).toBe(c.x.length - 4);
  });

  it('rejects a non-positive starting sigma', () => {
    expect(() => fitGaussianLine(new Float64Array(5), new Float64Array(5), new Float64Array(5), { amplitude: 1, centre: 2, sigma: 0 })).toThrow(RangeError);
  });
});
