import { describe, expect, it } from 'vitest';
import { combineExposures } from '../../../src/stages/ccd/combine-exposures.js';
import type { ExposureCalibration } from '../../../src/stages/ccd/exposure.js';
import { DEFAULT_CCD_SETTINGS } from '../../../src/stages/ccd/settings.js';
import { reference, frames, maxRelativeDiff } from './reference.js';

// Outside reference: the rule of combine-exposures.ts written again in numpy
// (fixtures/ccd/make_ccd_fixtures.py), on three exposures of 600, 1200 and 1200 s with single hits
// and two pixels hit in two of the three; agreement to float32 precision.
describe('combineExposures', () => {
  const s = reference.science;
  const n = s.width * s.height;
  const cal: ExposureCalibration = {
    orientation: { transpose: false, flipX: false }, width: s.width, height: s.height, gain: s.gain, readNoiseE: s.readNoiseE,
    masterBias: new Float32Array(n), biasVarianceAdu: s.biasVarianceAdu, masterFlat: Float32Array.from(s.flat),
    flatVariance: Float32Array.from(s.flatVariance), flatMask: new Uint16Array(n),
  };
  const sci = frames(s.sci, 3);
  const vars = frames(s.var, 3);
  const exposures = sci.map((e, i) => ({ sci: e, var: vars[i]!, mask: new Uint16Array(n) }));
  const settings = { ...DEFAULT_CCD_SETTINGS, crSigma: s.crSigma, crRelativeScatter: s.crRelativeScatter, crGrow: 0 };
  const out = combineExposures(exposures, s.exptimes, cal, settings);

  it('rejects the same exposures as the numpy rule, the two-of-three hits included', () => {
    expect(Array.from(out.rejected)).toEqual(s.rejected);
    expect(s.rejected[10 * s.width + 10]).toBe(2);
    expect(s.rejected[5 * s.width + 12]).toBe(2);
  });
  it('gives the same time-weighted mean scaled to 3000 s and the same variance', () => {
    expect(out.exptimeS).toBe(3000);
    expect(maxRelativeDiff(out.sci, s.combinedSci, 1)).toBeLessThan(2e-7);
    expect(maxRelativeDiff(out.var, s.combinedVar, 1)).toBeLessThan(2e-7);
  });
});
