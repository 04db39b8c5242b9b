import { describe, expect, it } from 'vitest';
import { InputError } from '../../../src/errors.js';
import { SPEED_OF_LIGHT_KMS as C } from '../../../src/physics/constants.js';
import { velocityFromWavelength } from '../../../src/physics/doppler.js';
import { MASK_BITS } from '../../../src/products/frame.js';
import { LINE_FLAGS, type LineTable } from '../../../src/products/lines.js';
import { DEFAULT_LINE_SETTINGS, measureLines, type LineSettings } from '../../../src/stages/lines/index.js';
import { DEFAULT_SKY_SETTINGS, subtractSky } from '../../../src/stages/sky/index.js';
import { makeSyntheticFrame, type SyntheticFrame, type SyntheticOptions } from '../sky/synthetic-frame.js';

// Injection and recovery on frames built with a known wavelength map and rotation
// (test/stages/sky/synthetic-frame.ts): H-alpha and [N II] rest wavelengths from the physics
// catalogue (NIST air values), velocities converted with src/physics/doppler.ts.

const REST_HA = 6562.8;

function reduce(opts: SyntheticOptions, lines: Partial<LineSettings> = {}): { s: SyntheticFrame; table: LineTable; rules: string[] } {
  const s = makeSyntheticFrame(opts);
  const sky = subtractSky(s.frame, s.solution, DEFAULT_SKY_SETTINGS).product;
  const r = measureLines(sky.frame, s.solution, sky.sky, { ...DEFAULT_LINE_SETTINGS, ...lines });
  return { s, table: r.product, rules: r.diagnostics.map((d) => d.rule) };
}

/** True H-alpha velocity of a bin: the line-flux-weighted mean over its rows (what a sum of rows measures). */
function trueBinVelocity(s: SyntheticFrame, rowStart: number, rowEnd: number): number {
  let w = 0;
  let l = 0;
  for (let y = rowStart; y <= rowEnd; y++) {
    w += s.halphaFlux[y]!;
    l += s.halphaFlux[y]! * REST_HA * (1 + s.vLos[y]! / C);
  }
  return velocityFromWavelength(l / w, REST_HA);
}

function velocityPulls(runs: { s: SyntheticFrame; table: LineTable }[], minSnr: number): number[] {
  const pulls: number[] = [];
  for (const { s, table } of runs) {
    for (const m of table.measurements) {
      if (m.line !== 'Halpha' || m.snr < minSnr) continue;
      const b = table.bins[m.bin]!;
      const v = velocityFromWavelength(m.wavelength, REST_HA);
      const err = (C * m.wavelengthErr) / REST_HA;
      pulls.push((v - trueBinVelocity(s, b.rowStart, b.rowEnd)) / err);
    }
  }
  return pulls;
}

function stats(values: number[]): { mean: number; std: number } {
  const mean = values.reduce((a, b) => a + b, 0) / values.length;
  return { mean, std: Math.sqrt(values.reduce((a, b) => a + (b - mean) ** 2, 0) / (values.length - 1)) };
}

describe('measureLines on frames with a known rotation', () => {
  const seeds = [11, 12, 13, 14];
  const tied = seeds.map((seed) => reduce({ seed }));

  it('recovers the true H-alpha velocity of every bin within its error in the tied H-alpha + [N II] fit (pulls of unit width, S/N >= 5)', () => {
    const p = velocityPulls(tied, 5);
    expect(p.length).toBeGreaterThan(200);
    const { mean, std } = stats(p);
    expect(Math.abs(mean)).toBeLessThan(0.2);
    expect(std).toBeGreaterThan(0.9);
    expect(std).toBeLessThan(1.1);
  });

  it('recovers it as well with H-alpha fitted alone', () => {
    const alone = seeds.map((seed) => reduce({ seed }, { lines: ['Halpha'] }));
    const p = velocityPulls(alone, 5);
    const { mean, std } = stats(p);
    expect(p.length).toBeGreaterThan(200);
    expect(Math.abs(mean)).toBeLessThan(0.2);
    expect(std).toBeGreaterThan(0.9);
    expect(std).toBeLessThan(1.1);
  });

  it('keeps [N II] 6548 at one third of 6583 and on the same velocity', () => {
    const { table } = tied[0]!;
    for (let b = 0; b < table.bins.length; b++) {
      const n2 = table.measurements.find((m) => m.bin === b && m.line === 'NII6583')!;
      const n1 = table.measurements.find((m) => m.bin === b && m.line === 'NII6548')!;
      expect(n1.flux / n2.flux).toBeCloseTo(1 / 3, 10);
      expect(n1.wavelength / n1.restAir).toBeCloseTo(n2.wavelength / n2.restAir, 12);
    }
  });

  it('measures the intrinsic gas dispersion (25 km/s injected) once the instrumental width is removed in quadrature', () => {
    const sig = tied.flatMap(({ table }) => table.measurements.filter((m) => m.line === 'Halpha' && m.snr > 20).map((m) => m.sigmaKms));
    sig.sort((a, b) => a - b);
    expect(sig[Math.floor(sig.length / 2)]!).toBeGreaterThan(22.5);
    expect(sig[Math.floor(sig.length / 2)]!).toBeLessThan(27.5);
  });

  it('finds the starting velocity itself when none is given (3000 km/s injected)', () => {
    const { table, rules } = tied[0]!;
    expect(rules).toContain('lines.velocity-guess');
    const centre = table.measurements.find((m) => m.line === 'Halpha' && m.bin === Math.floor(table.bins.length / 2))!;
    expect(Math.abs(velocityFromWavelength(centre.wavelength, REST_HA) - 3000)).toBeLessThan(250);
  });

  it('fills a continuum profile that peaks at the galaxy centre and keeps the report fits to the window', () => {
    const { table, s } = tied[0]!;
    let peak = 0;
    table.continuumProfile.forEach((v, y) => {
      if (v > table.continuumProfile[peak]!) peak = y;
    });
    expect(Math.abs(peak - s.options.centreRow)).toBeLessThanOrEqual(2);
    expect(table.fits.length).toBe(table.bins.length);
    expect(table.fits[0]!.data).toBeInstanceOf(Float32Array);
    expect(table.fits[0]!.data.length).toBeLessThan(120);
  });
});

describe('measureLines binning and flags', () => {
  const faint = reduce({ seed: 21, halphaFlux: 400, emissionHalfRows: 45, emissionScaleRows: 25 });

  it('sums rows into contiguous bins that do not overlap and reach the S/N target', () => {
    const bins = faint.table.bins;
    expect(bins.some((b) => b.rowEnd > b.rowStart)).toBe(true);
    for (let i = 1; i < bins.length; i++) expect(bins[i]!.rowStart).toBeGreaterThan(bins[i - 1]!.rowEnd);
    for (const b of bins) expect(b.rowEnd - b.rowStart + 1).toBeLessThanOrEqual(DEFAULT_LINE_SETTINGS.maxBinRows);
    const reached = faint.table.measurements.filter((m) => m.line === 'Halpha' && m.snr >= DEFAULT_LINE_SETTINGS.snrTarget * 0.8);
    expect(reached.length / bins.length).toBeGreaterThan(0.6);
  });

  it('holds the width below the free-width S/N, flags it, and keeps the velocity pulls honest there', () => {
    const held = faint.table.measurements.filter((m) => m.line === 'Halpha' && (m.flags & LINE_FLAGS.widthConstrained) !== 0);
    expect(held.length).toBeGreaterThan(0);
    for (const m of held) expect(m.snr).toBeLessThan(DEFAULT_LINE_SETTINGS.freeWidthSnr + 3);
    const p = velocityPulls([faint], 5);
    const { std } = stats(p);
    expect(std).toBeLessThan(1.3);
  });

  it('flags a line whose core has masked pixels', () => {
    const s = makeSyntheticFrame({ seed: 31 });
    const sky = subtractSky(s.frame, s.solution, DEFAULT_SKY_SETTINGS).product;
    const x = Math.round((REST_HA * (1 + s.vLos[60]! / C) - s.options.lambda0) / s.options.dispersion);
    sky.frame.mask[60 * s.frame.width + x] = MASK_BITS.cosmicRay;
    const r = measureLines(sky.frame, s.solution, sky.sky, DEFAULT_LINE_SETTINGS).product;
    const bin = r.bins.findIndex((b) => b.rowStart <= 60 && b.rowEnd >= 60);
    const m = r.measurements.find((mm) => mm.bin === bin && mm.line === 'Halpha')!;
    expect(m.flags & LINE_FLAGS.maskedPixels).toBeTruthy();
  });

  it('refuses unknown line names and impossible settings with an InputError', () => {
    const s = makeSyntheticFrame({ seed: 1 });
    const sky = subtractSky(s.frame, s.solution, DEFAULT_SKY_SETTINGS).product;
    expect(() => measureLines(sky.frame, s.solution, sky.sky, { ...DEFAULT_LINE_SETTINGS, lines: ['Hgamma'] })).toThrow(InputError);
    expect(() => measureLines(sky.frame, s.solution, sky.sky, { ...DEFAULT_LINE_SETTINGS, snrTarget: 0 })).toThrow(InputError);
    expect(() => measureLines(sky.frame, s.solution, sky.sky, { ...DEFAULT_LINE_SETTINGS, windowSigmas: 0 })).toThrow(/line setting windowSigmas/);
    expect(() => measureLines(sky.frame, s.solution, sky.sky, { ...DEFAULT_LINE_SETTINGS, maxFailedBins: 0 })).toThrow(/line setting maxFailedBins/);
  });
});

describe('measureLines flags', () => {
  it('holds the width of a group too faint ever to reach the free-width S/N at the H-alpha group median', () => {
    // No [S II] is injected: every [S II] fit is noise, its width borrowed from H-alpha + [N II].
    const s = makeSyntheticFrame({ seed: 43 });
    const sky = subtractSky(s.frame, s.solution, DEFAULT_SKY_SETTINGS).product;
    const r = measureLines(sky.frame, s.solution, sky.sky, { ...DEFAULT_LINE_SETTINGS, lines: ['Halpha', 'NII6583', 'NII6548', 'SII6716', 'SII6731'] });
    const warn = r.diagnostics.find((d) => d.rule === 'lines.width-unconstrained');
    expect(warn?.message).toMatch(/held at the Halpha\+NII median/);
    const sii = r.product.measurements.filter((m) => m.group === 'SII');
    expect(sii.length).toBeGreaterThan(0);
    expect(sii.every((m) => (m.flags & LINE_FLAGS.widthConstrained) !== 0)).toBe(true);
  });

  it('flags H-alpha and [N II] as blended when the lines are broader than their separation allows', () => {
    // 250 km/s gas at 0.9 A/px: observed sigma about 5.6 A, two FWHM 26 A, beyond the 14.75 A to [N II] 6548.
    const { table } = reduce({ seed: 41, gasSigmaKms: 250 }, { redshiftGuessKms: 3000 });
    const ha = table.measurements.filter((m) => m.line === 'Halpha');
    expect(ha.length).toBeGreaterThan(0);
    expect(ha.every((m) => (m.flags & LINE_FLAGS.blended) !== 0)).toBe(true);
  });

  it('flags a line whose core sits on columns where the sky left residuals', () => {
    const s = makeSyntheticFrame({ seed: 42 });
    const sky = subtractSky(s.frame, s.solution, DEFAULT_SKY_SETTINGS).product;
    const x = Math.round((REST_HA * (1 + s.vLos[60]! / C) - s.options.lambda0) / s.options.dispersion);
    for (let k = -1; k <= 1; k++) sky.sky.residualNormRms[x + k] = 3;
    const r = measureLines(sky.frame, s.solution, sky.sky, DEFAULT_LINE_SETTINGS).product;
    const bin = r.bins.findIndex((b) => b.rowStart <= 60 && b.rowEnd >= 60);
    expect(r.measurements.find((m) => m.bin === bin && m.line === 'Halpha')!.flags & LINE_FLAGS.skyResidual).toBeTruthy();
    const far = r.bins.findIndex((b) => b.rowStart <= 29 && b.rowEnd >= 29);
    expect(r.measurements.find((m) => m.bin === far && m.line === 'Halpha')!.flags & LINE_FLAGS.skyResidual).toBeFalsy();
  });
});
