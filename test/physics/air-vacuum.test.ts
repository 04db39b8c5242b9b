import { describe, expect, it } from 'vitest';
import { airToVacuum, vacuumToAir } from '../../src/physics/air-vacuum.js';
import { velocityFromWavelength } from '../../src/physics/doppler.js';

describe('air and vacuum wavelengths (Morton 2000, ApJS 130, 403)', () => {
  it('takes H-alpha 6562.80 air to 6564.61 vac (NIST ASD, H I 6564.61 vacuum)', () => {
    expect(airToVacuum(6562.8)).toBeCloseTo(6564.613, 3);
  });

  it('agrees with the Ciddor (1996, Appl. Opt. 35, 1566) check values within 0.002 A', () => {
    // REFERENCE.md: 2000.000 vac -> 1999.353 air; 4861.363 air -> 4862.721 vac; 6056.125 air -> 6057.8019 vac.
    // Ciddor and Morton differ by up to 0.0002 A at 4000-9000 A and more near 2000 A.
    expect(Math.abs(vacuumToAir(2000) - 1999.353)).toBeLessThan(0.002);
    expect(Math.abs(airToVacuum(4861.363) - 4862.721)).toBeLessThan(0.0005);
    expect(Math.abs(airToVacuum(6056.125) - 6057.8019)).toBeLessThan(0.0005);
  });

  it('gives the vacuum wavelengths of REFERENCE.md galaxy lines within 0.003 A', () => {
    const pairs: [number, number][] = [
      [4861.35, 4862.708], [4958.911, 4960.295], [5006.843, 5008.24], [5875.621, 5877.25], [6300.304, 6302.046],
      [6363.776, 6365.535], [6548.05, 6549.859], [6583.454, 6585.273], [6716.44, 6718.294], [6730.816, 6732.674],
      [8498.023, 8500.358], [8542.091, 8544.438], [8662.141, 8664.52],
    ];
    for (const [air, vac] of pairs) expect(Math.abs(airToVacuum(air) - vac)).toBeLessThan(0.003);
  });

  it('round-trips air -> vacuum -> air to 1e-6 A from 2000 to 20000 A', () => {
    for (let air = 2000; air <= 20000; air += 137.3) expect(Math.abs(vacuumToAir(airToVacuum(air)) - air)).toBeLessThan(1e-6);
  });

  it('leaves wavelengths below 2000 A (vacuum) alone, as NIST does', () => {
    expect(vacuumToAir(1215.67)).toBe(1215.67);
    expect(airToVacuum(1215.67)).toBe(1215.67);
  });

  it('makes mixing air and vacuum an 82.8 km/s error at H-alpha', () => {
    // From the published pair 6562.80 air / 6564.613 vac: c (6564.613 - 6562.80) / 6562.80 = 82.82 km/s.
    // REFERENCE.md says 83.25 km/s, which this pair does not give (reported to the lead).
    const published = velocityFromWavelength(6564.613, 6562.8);
    expect(published).toBeCloseTo(82.822, 2);
    expect(velocityFromWavelength(airToVacuum(6562.8), 6562.8)).toBeCloseTo(published, 2);
  });

  it('refuses non-positive wavelengths', () => {
    expect(() => airToVacuum(-1)).toThrow(RangeError);
    expect(() => vacuumToAir(Number.NaN)).toThrow(RangeError);
  });
});
