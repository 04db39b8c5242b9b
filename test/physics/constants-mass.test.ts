import { describe, expect, it } from 'vitest';
import { ARCSEC_RAD, AU_M, G_KPC_KMS2_PER_MSUN, GM_SUN_M3_S2, KPC_M, kpcPerArcsec } from '../../src/physics/constants.js';
import { circularSpeedKms, enclosedMassMsun } from '../../src/physics/mass.js';

describe('constants (IAU 2012 B2, IAU 2015 B2/B3, REFERENCE.md)', () => {
  it('has the kpc of REFERENCE.md (3.085677581491367e19 m) to 1e-15 relative', () => {
    expect(Math.abs(KPC_M / 3.085677581491367e19 - 1)).toBeLessThan(1e-15);
  });

  it('derives G = 4.300917e-6 kpc (km/s)^2 / M_sun (REFERENCE.md)', () => {
    expect(G_KPC_KMS2_PER_MSUN).toBeCloseTo(4.300917e-6, 12);
  });

  it('takes 1 arcsec as 4.848136811e-6 rad and 4.848137e-3 D kpc at D Mpc', () => {
    expect(ARCSEC_RAD).toBeCloseTo(4.848136811e-6, 15);
    expect(kpcPerArcsec(1)).toBeCloseTo(4.848137e-3, 9);
    expect(kpcPerArcsec(20)).toBeCloseTo(20 * 4.848136811e-3, 9);
  });

  it('refuses a non-positive distance', () => {
    expect(() => kpcPerArcsec(0)).toThrow(RangeError);
  });
});

describe('Keplerian speeds and enclosed mass', () => {
  it("recovers IAU 2015 GM_sun within 0.5% from Earth's mean orbital speed 29.78 km/s (NASA planetary fact sheet)", () => {
    const gm = (29.78e3) ** 2 * AU_M;
    expect(Math.abs(gm / GM_SUN_M3_S2 - 1)).toBeLessThan(0.005);
  });

  it('gives 29.7847 km/s at 1 au (REFERENCE.md, computed from IAU values)', () => {
    expect(circularSpeedKms(GM_SUN_M3_S2, AU_M)).toBeCloseTo(29.7847, 4);
  });

  it('matches the fact-sheet mean orbital speeds of the planets within 1.5% (semi-major axes in au [memory])', () => {
    // Mean speeds: NASA planetary fact sheet [memory of the sheet, REFERENCE.md]; a in au [memory].
    const planets: [number, number][] = [[0.387098, 47.87], [0.723332, 35.02], [1.523679, 24.07], [5.2026, 13.07], [9.5549, 9.69], [19.2184, 6.81], [30.1104, 5.43]];
    for (const [a, v] of planets) expect(Math.abs(circularSpeedKms(GM_SUN_M3_S2, a * AU_M) / v - 1)).toBeLessThan(0.015);
  });

  it('gives 9.30034e10 M_sun inside 10 kpc at 200 km/s (REFERENCE.md)', () => {
    expect(enclosedMassMsun(200, 10) / 9.30034e10).toBeCloseTo(1, 5);
  });
});
