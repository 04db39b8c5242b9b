import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { radialVelocityCorrection } from '../../src/physics/barycentric.js';

interface Case {
  timeUtc: string;
  pointing: { raDeg: number; decDeg: number; equinox: number };
  site: { latitudeDeg: number; longitudeDeg: number; heightM: number };
  barycentricKms: number;
  heliocentricKms: number;
}

// Outside reference: Debian python3-astropy SkyCoord.radial_velocity_correction, made by
// fixtures/physics/make_barycentric.py (60 cases, 2015-2022, 7 sites, 1 in 6 targets at equinox J1950).
const fixture = JSON.parse(readFileSync(new URL('../../fixtures/physics/barycentric.json', import.meta.url), 'utf8')) as { cases: Case[] };

function worst(kind: 'barycentric' | 'heliocentric'): number {
  let max = 0;
  for (const c of fixture.cases) {
    const ours = radialVelocityCorrection(new Date(c.timeUtc), c.pointing, c.site, kind);
    const ref = kind === 'barycentric' ? c.barycentricKms : c.heliocentricKms;
    max = Math.max(max, Math.abs(ours - ref));
  }
  return max;
}

describe('radialVelocityCorrection against astropy', () => {
  it('matches astropy barycentric corrections within 0.003 km/s (brief: 0.01) on 60 dates, sites and targets', () => {
    expect(fixture.cases.length).toBe(60);
    // Measured worst difference 0.0012 km/s (astronomy-engine's ephemeris against astropy's built-in one).
    expect(worst('barycentric')).toBeLessThan(0.003);
  });

  it('matches astropy heliocentric corrections within 0.003 km/s (brief: 0.01)', () => {
    expect(worst('heliocentric')).toBeLessThan(0.003);
  });

  it('changes sign with the target direction (opposite points on the sky)', () => {
    const c = fixture.cases[0]!;
    const t = new Date(c.timeUtc);
    const a = radialVelocityCorrection(t, { raDeg: 10, decDeg: 20 }, c.site);
    const b = radialVelocityCorrection(t, { raDeg: 190, decDeg: -20 }, c.site);
    // Only the tiny relativistic terms (gamma, potential; ~0.003 km/s, Wright & Eastman 2014 eq. 28) break the antisymmetry.
    expect(Math.abs(a + b)).toBeLessThan(0.01);
    expect(Math.abs(a)).toBeLessThan(30.5);
  });
});

describe("the Earth's rotation in radialVelocityCorrection", () => {
  // REFERENCE.md: the rotation part is 0.4651 km/s x cos(latitude) (omega = 7.292115e-5 rad/s, a = 6378.137 km).
  // Two sites at opposite longitudes at one instant share the orbital part, so half their difference
  // is the rotation alone; its largest value over targets on the equator is the rotation speed.
  function rotationAmplitude(latitudeDeg: number): number {
    const t = new Date('2019-06-01T00:00:00Z');
    let max = 0;
    for (let ra = 0; ra < 360; ra += 0.5) {
      const p = { raDeg: ra, decDeg: 0 };
      const a = radialVelocityCorrection(t, p, { latitudeDeg, longitudeDeg: 10, heightM: 0 });
      const b = radialVelocityCorrection(t, p, { latitudeDeg, longitudeDeg: -170, heightM: 0 });
      max = Math.max(max, (a - b) / 2);
    }
    return max;
  }

  it('is 0.4651 km/s on the equator', () => {
    expect(Math.abs(rotationAmplitude(0) - 0.4651)).toBeLessThan(0.0005);
  });

  it('scales as cos(latitude) within the 0.2% of the ellipsoid at 60 deg', () => {
    expect(rotationAmplitude(60) / (0.4651 * 0.5)).toBeCloseTo(1, 2);
  });

  it('refuses an invalid time, pointing or site', () => {
    const site = { latitudeDeg: 0, longitudeDeg: 0, heightM: 0 };
    expect(() => radialVelocityCorrection(new Date('nope'), { raDeg: 0, decDeg: 0 }, site)).toThrow(RangeError);
    expect(() => radialVelocityCorrection(new Date(), { raDeg: 0, decDeg: 100 }, site)).toThrow(RangeError);
    expect(() => radialVelocityCorrection(new Date(), { raDeg: 0, decDeg: 0 }, { ...site, latitudeDeg: NaN })).toThrow(RangeError);
  });
});

describe('bounds of the barycentric correction', () => {
  const site = { latitudeDeg: 28.76, longitudeDeg: -17.88, heightM: 2330 };

  it('stays within 30.3 km/s (orbit, REFERENCE.md) + 0.47 km/s (rotation) for any date and target (seeded)', () => {
    fc.assert(
      fc.property(fc.integer({ min: Date.UTC(2000, 0, 1), max: Date.UTC(2040, 0, 1) }), fc.double({ min: 0, max: 359.999, noNaN: true }), fc.double({ min: -90, max: 90, noNaN: true }), (ms, ra, dec) => {
        expect(Math.abs(radialVelocityCorrection(new Date(ms), { raDeg: ra, decDeg: dec }, site))).toBeLessThan(30.3 + 0.47);
      }),
      { seed: 42, numRuns: 300 },
    );
  });

  it('is below 0.5 km/s all year towards the ecliptic pole (obliquity 23.4393 deg, IAU 2006) [the orbit lies in the ecliptic]', () => {
    // North ecliptic pole: RA 18h, Dec 90 - 23.4393 deg.
    for (let day = 0; day < 365; day += 7) {
      const t = new Date(Date.UTC(2020, 0, 1) + day * 86400e3);
      expect(Math.abs(radialVelocityCorrection(t, { raDeg: 270, decDeg: 90 - 23.4393 }, site))).toBeLessThan(0.5);
    }
  });
});
