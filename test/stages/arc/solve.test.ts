/**
 * The wavelength solution on arcs rendered with the simulator's optics (src/sim) from the lamp
 * lists of config/lamps (NIST Atomic Spectra Database air wavelengths): accuracy at every pixel
 * centre against the simulator's true lambda(x, y), honesty of the reported RMS and of the
 * centroid errors (injection and recovery), orders chosen by the data, the instrumental width.
 */
import { describe, expect, it } from 'vitest';
import { evalLegendre2D } from '../../../src/kernels/legendre.js';
import { pixelOfWavelength } from '../../../src/sim/optics.js';
import { trueLsfSigmaPx } from '../../../src/sim/truth.js';
import { DEFAULT_ARC_SETTINGS, solveWavelengths } from '../../../src/stages/arc/index.js';
import { pixelRmsError, settingsFor, syntheticArc, type SyntheticArc } from './synthetic-arc.js';

/** True centroid of a band-mean line: the mean over the band's rows of the true line position. */
function trueBandPosition(arc: SyntheticArc, wavelength: number, yCentre: number, rowBand: number): number {
  const y0 = Math.round(yCentre - (rowBand - 1) / 2);
  let sum = 0;
  for (let k = 0; k < rowBand; k++) sum += pixelOfWavelength(arc.setup, wavelength, y0 + k);
  return sum / rowBand;
}

describe('solveWavelengths on simulated arcs', () => {
  for (const [label, opts] of [
    ['red setup, bright arc', { seed: 1 }],
    ['orange setup', { seed: 2, setup: 1 }],
    ['faint arc (300 e per row at intensity 1000)', { seed: 3, electronsPer1000: 300 }],
  ] as const) {
    it(`${label}: wavelength at every pixel centre within 0.05 px RMS of the truth`, () => {
      const arc = syntheticArc(opts);
      const r = solveWavelengths(arc.frame, arc.lampLines, settingsFor(arc));
      expect(r.product.flipX).toBe(false);
      expect(pixelRmsError(arc, r.product)).toBeLessThan(0.05);
    });
  }

  it('the reported rmsPx (scatter of the used line positions about the solution) is within 30% of their true position error', () => {
    for (const seed of [4, 5]) {
      const arc = syntheticArc({ seed, electronsPer1000: 600 });
      const s = solveWavelengths(arc.frame, arc.lampLines, settingsFor(arc)).product;
      let sum = 0;
      let n = 0;
      for (const l of s.lines) {
        if (!l.used) continue;
        sum += (l.x - trueBandPosition(arc, l.wavelength, l.y, DEFAULT_ARC_SETTINGS.rowBand)) ** 2;
        n++;
      }
      const actual = Math.sqrt(sum / n);
      expect(actual).toBeGreaterThan(0.005); // noise-dominated, so the check means something
      expect(Math.abs(s.rmsPx / actual - 1)).toBeLessThan(0.3);
      // and the Angstrom and km/s figures are the same number in other units (c = 299792.458 km/s, SI)
      const mid = evalLegendre2D(s.model, (s.width - 1) / 2, (s.height - 1) / 2);
      expect(s.rmsKms).toBeCloseTo((s.rmsAngstrom / mid) * 299792.458, 6);
    }
  });

  it('centroid errors are honest: pulls (measured - true) / error of the centroid fits have unit width within 15%', async () => {
    const { extractBands } = await import('../../../src/stages/arc/band-spectra.js');
    const { measureBandPeaks } = await import('../../../src/stages/arc/band-peaks.js');
    const { isClean } = await import('../../../src/stages/arc/centroids.js');
    const arc = syntheticArc({ seed: 6, electronsPer1000: 400 });
    const s = solveWavelengths(arc.frame, arc.lampLines, settingsFor(arc)).product;
    const bands = extractBands(arc.frame, DEFAULT_ARC_SETTINGS.rowBand);
    const peaks = measureBandPeaks(bands, 5, 4);
    const pulls: number[] = [];
    for (const l of s.lines) {
      if (!l.used) continue;
      const b = bands.yCentre.indexOf(l.y);
      const p = peaks[b]!.filter(isClean).find((q) => Math.abs(q.x - l.x) < 1e-9)!;
      pulls.push((p.x - trueBandPosition(arc, l.wavelength, l.y, DEFAULT_ARC_SETTINGS.rowBand)) / p.xErr);
    }
    const mean = pulls.reduce((a, b) => a + b, 0) / pulls.length;
    const sd = Math.sqrt(pulls.reduce((a, b) => a + (b - mean) ** 2, 0) / (pulls.length - 1));
    expect(pulls.length).toBeGreaterThan(200);
    expect(Math.abs(sd - 1)).toBeLessThan(0.15);
    expect(Math.abs(mean)).toBeLessThan(0.2);
  });

  it('auto orders follow the data: the simulator dispersion is a cubic Legendre and the curvature quadratic along the slit', () => {
    const arc = syntheticArc({ seed: 7 });
    const s = solveWavelengths(arc.frame, arc.lampLines, settingsFor(arc)).product;
    expect(s.model.xOrder).toBe(3);
    expect(s.model.yOrder).toBe(2);
    const fixed = solveWavelengths(arc.frame, arc.lampLines, settingsFor(arc, { xOrder: 4, yOrder: 1 })).product;
    expect([fixed.model.xOrder, fixed.model.yOrder]).toEqual([4, 1]);
  });

  it('lsfSigmaPx follows the true LSF with the pixel integration added in quadrature (Sheppard 1898: + 1/12 px^2) within 3%', () => {
    const arc = syntheticArc({ seed: 8 });
    const s = solveWavelengths(arc.frame, arc.lampLines, settingsFor(arc)).product;
    const y = (s.height - 1) / 2;
    for (const x of [100, 300, 512, 700, 900]) {
      const expected = Math.sqrt(trueLsfSigmaPx(arc.setup, x) ** 2 + 1 / 12);
      expect(Math.abs(evalLegendre2D(s.lsfSigmaPx, x, y) / expected - 1)).toBeLessThan(0.03);
    }
  });

  it('reports the extrapolated ends with the identified and detector ranges', () => {
    const arc = syntheticArc({ seed: 9 });
    const r = solveWavelengths(arc.frame, arc.lampLines, settingsFor(arc));
    const d = r.diagnostics.find((x) => x.rule === 'arc.extrapolation')!;
    expect(d).toBeDefined();
    const [lo, hi] = r.product.identifiedRange;
    expect(d.expected).toBe(`${lo.toFixed(2)}-${hi.toFixed(2)} A`);
    expect(d.message).toMatch(/px on the blue side/);
    expect(r.diagnostics.find((x) => x.rule === 'arc.solution')!.message).toMatch(/RMS .* A = .* px = .* km\/s/);
  });

  it('warns of a misfit when the order is set too low for a cubic dispersion (residuals far above the centroid errors)', () => {
    const arc = syntheticArc({ seed: 11 });
    const r = solveWavelengths(arc.frame, arc.lampLines, settingsFor(arc, { xOrder: 1 }));
    const d = r.diagnostics.find((x) => x.rule === 'arc.misfit');
    expect(d?.severity).toBe('warning');
    expect(Number(d!.actual)).toBeGreaterThan(9);
    const clean = solveWavelengths(arc.frame, arc.lampLines, settingsFor(arc));
    expect(clean.diagnostics.some((x) => x.rule === 'arc.misfit')).toBe(false);
  });

  it('fills wave for every pixel centre and keeps it equal to the model, corners included, within 0.1 px of the simulated truth', () => {
    const arc = syntheticArc({ seed: 10 });
    const s = solveWavelengths(arc.frame, arc.lampLines, settingsFor(arc)).product;
    expect(s.wave.length).toBe(s.width * s.height);
    const dispersion = Math.abs(arc.setup.approxDispersion);
    for (const [x, y] of [[0, 0], [s.width - 1, s.height - 1], [417, 123]] as const) {
      expect(s.wave[y * s.width + x]).toBeCloseTo(evalLegendre2D(s.model, x, y), 9);
      expect(Math.abs(s.wave[y * s.width + x]! - arc.trueWave(x, y)) / dispersion).toBeLessThan(0.1);
    }
  });
});
