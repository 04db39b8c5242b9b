import { describe, expect, it } from 'vitest';
import { relativeVelocity } from '../../src/physics/doppler.js';
import { toInternal } from '../../src/products/orientation.js';
import { simulateRun, trueVlos, trueWavelength } from '../../src/sim/index.js';
import { REFERENCE } from './reference.js';
import { standardRun } from './shared-run.js';

const standard = standardRun();

describe('barycentric correction in the truth', () => {
  it('matches astropy radial_velocity_correction for the standard exposures within 0.003 km/s', () => {
    const ref = REFERENCE.barycentric;
    const t = standard.truth.targets[0]!;
    // The fixture was made for these inputs; a change of scenario must remake it.
    expect([t.ra, t.dec]).toEqual([ref.ra, ref.dec]);
    expect(standard.truth.site).toMatchObject(ref.site);
    t.exposures.forEach((e, i) => {
      expect(e.midExposureUtc.slice(0, 23)).toBe(ref.midExposureUtc[i]);
      expect(Math.abs(e.barycentricCorrectionKms - ref.kms[i]!)).toBeLessThan(0.003);
    });
  });
});

describe('rotated variant', () => {
  const rotated = simulateRun({ variant: 'rotated', expected: true });
  const setup = rotated.truth.setups['red']!;

  it('puts the dispersion along raw y with wavelength decreasing with pixel: orientation { transpose, flipX }', () => {
    expect(setup.orientation).toEqual({ transpose: true, flipX: true });
    const f = rotated.frames[0]!;
    expect([f.width, f.height]).toEqual([300 + 32, 1024]);
    expect(f.header.getString('DATASEC')).toBe('[1:300,1:1024]');
    expect(f.header.getString('BIASSEC')).toBe('[301:332,1:1024]');
  });

  it('maps back through products/orientation toInternal to the same arc as the standard run (hot columns aside)', () => {
    const name = 'raw/arc_001.fits';
    const internal = toInternal(rotated.expected!.get(name)!, 300, 1024, setup.orientation).data;
    const reference = standard.expected!.get(name)!;
    const hotRows = new Set(setup.detector.hotColumns);
    const hotCols = new Set(standard.truth.setups['red']!.detector.hotColumns);
    let worst = 0;
    for (let s = 0; s < 300; s++) {
      if (hotRows.has(s)) continue;
      for (let d = 0; d < 1024; d++) {
        if (hotCols.has(d)) continue;
        worst = Math.max(worst, Math.abs(internal[s * 1024 + d]! - reference[s * 1024 + d]!));
      }
    }
    expect(worst).toBe(0);
    // Raw y = W - 1 - d: the red end of the spectrum is at raw y = 0.
    expect(trueWavelength(rotated.truth, 'red', 1023, 0)).toBeGreaterThan(trueWavelength(rotated.truth, 'red', 0, 0));
  });
});

describe('offset variant', () => {
  it('puts the slit at 20 deg to the major axis, lowering the projected amplitude by cos(theta) (REFERENCE.md thin-disk formulas)', () => {
    const run = simulateRun({ variant: 'offset' });
    const t = run.truth.targets[0]!;
    const dphi = ((t.slitPaDeg - t.majorAxisPaDeg) * Math.PI) / 180;
    expect(dphi).toBeCloseTo((20 * Math.PI) / 180, 9);
    const i = (t.inclinationDeg * Math.PI) / 180;
    const theta = Math.atan(Math.tan(dphi) / Math.cos(i));
    const r = 40 * t.arcsecPerPixel;
    const R = r * Math.sqrt(Math.cos(dphi) ** 2 + Math.sin(dphi) ** 2 / Math.cos(i) ** 2);
    const v = t.curve.vmaxKms * (1 - Math.exp(-R / t.curve.turnoverArcsec));
    expect(relativeVelocity(trueVlos(t, t.centreRow + 40), t.vSysKms)).toBeCloseTo(v * Math.sin(i) * Math.cos(theta), 6);
    const m = run.manifestYaml;
    expect(m).toContain(`slit_pa_deg: ${t.slitPaDeg}`);
    expect(m).toContain(`major_axis_pa_deg: ${t.majorAxisPaDeg}`);
  });
});

describe('faint variant', () => {
  it('is four times fainter in lines and continuum than the standard galaxy', () => {
    const t = simulateRun({ variant: 'faint' }).truth.targets[0]!;
    const s = standard.truth.targets[0]!;
    expect(t.emission.halphaCentreEPerS / s.emission.halphaCentreEPerS).toBeCloseTo(0.25, 9);
    expect(t.continuum.centreEPerSPerPx / s.continuum.centreEPerSPerPx).toBeCloseTo(0.25, 9);
  });
});
