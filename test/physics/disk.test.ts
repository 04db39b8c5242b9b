import { describe, expect, it } from 'vitest';
import { diskCoordinates, inclinationFromAxisRatio } from '../../src/physics/disk.js';

describe('inclinationFromAxisRatio (Hubble 1926)', () => {
  it('gives the REFERENCE.md check values with q0 = 0.2: q 0.5 -> 62.1144 deg, 0.7 -> 46.7917 deg', () => {
    expect(inclinationFromAxisRatio(0.5)).toBeCloseTo(62.1144, 4);
    expect(inclinationFromAxisRatio(0.7)).toBeCloseTo(46.7917, 4);
  });

  it('is face-on at q = 1 and edge-on at or below q0', () => {
    expect(inclinationFromAxisRatio(1)).toBe(0);
    expect(inclinationFromAxisRatio(0.2)).toBe(90);
    expect(inclinationFromAxisRatio(0.1)).toBe(90);
  });

  it('reduces to cos i = q for an infinitely thin disk (q0 = 0)', () => {
    expect(inclinationFromAxisRatio(0.5, 0)).toBeCloseTo(60, 10);
  });

  it('refuses axis ratios outside (0, 1]', () => {
    expect(() => inclinationFromAxisRatio(0)).toThrow(RangeError);
    expect(() => inclinationFromAxisRatio(1.2)).toThrow(RangeError);
  });
});

describe('diskCoordinates (thin disk, REFERENCE.md "Geometry")', () => {
  it('gives theta 36.0524 deg, R/r 1.16230 and sin i cos theta 0.70016 at dphi 20 deg, i 60 deg', () => {
    const p = diskCoordinates(10, 20, 60);
    expect(p.azimuthDeg).toBeCloseTo(36.0524, 4);
    expect(p.radiusArcsec / 10).toBeCloseTo(1.1623, 5);
    expect(p.projection).toBeCloseTo(0.70016, 5);
  });

  it('puts negative offsets on the other side: azimuth + 180 deg, projection negated, same radius', () => {
    const a = diskCoordinates(10, 20, 60);
    const b = diskCoordinates(-10, 20, 60);
    expect(b.radiusArcsec).toBeCloseTo(a.radiusArcsec, 12);
    expect(b.projection).toBeCloseTo(-a.projection, 12);
    expect(b.azimuthDeg).toBeCloseTo(a.azimuthDeg - 180, 10);
  });

  it('on the major axis keeps the radius and projects by sin i', () => {
    const p = diskCoordinates(7, 0, 30);
    expect(p.radiusArcsec).toBeCloseTo(7, 12);
    expect(p.projection).toBeCloseTo(0.5, 12);
  });

  it('edge-on and off the major axis is at infinite radius with no projection', () => {
    const p = diskCoordinates(5, 10, 90);
    expect(p.radiusArcsec).toBe(Infinity);
    expect(Math.abs(p.projection)).toBeLessThan(1e-12);
  });
});
