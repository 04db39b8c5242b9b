import { describe, expect, it } from 'vitest';
import { simulateRun, slitOffsetArcsec, trueRotation, trueVlos, trueWavelength, type TargetTruth } from '../../src/sim/index.js';
import { relativeVelocity } from '../../src/physics/doppler.js';
import { diskRadius } from '../../src/sim/targets.js';

const run = simulateRun({ variant: 'offset' });

function withGeometry(t: TargetTruth, slitToMajorDeg: number, inclinationDeg: number): TargetTruth {
  return { ...t, slitPaDeg: t.majorAxisPaDeg + slitToMajorDeg, inclinationDeg };
}

describe('trueVlos', () => {
  it('follows V(R) sin i cos(theta) relative to the galaxy with the worked example of REFERENCE.md (dphi 20, i 60: R/r 1.16230, sin i cos theta 0.70016)', () => {
    const t = withGeometry(run.truth.targets[0]!, 20, 60);
    const s = t.centreRow + 30.25;
    const r = slitOffsetArcsec(t, s);
    expect(diskRadius(t, s) / r).toBeCloseTo(1.1623, 4);
    // Velocity relative to the galaxy: c (z - z_sys) / (1 + z_sys) (REFERENCE.md, src/physics).
    expect(relativeVelocity(trueVlos(t, s), t.vSysKms) / trueRotation(t, 1.1623 * r)).toBeCloseTo(0.70016, 4);
    expect(relativeVelocity(trueVlos(t, s), t.vSysKms)).toBeCloseTo(trueRotation(t, diskRadius(t, s)) * 0.700164, 3);
  });

  it('is v_sys at the kinematic centre and antisymmetric about it', () => {
    const t = run.truth.targets[0]!;
    expect(trueVlos(t, t.centreRow)).toBeCloseTo(t.vSysKms, 9);
    for (const ds of [3.5, 17, 80]) expect(trueVlos(t, t.centreRow + ds) - t.vSysKms).toBeCloseTo(t.vSysKms - trueVlos(t, t.centreRow - ds), 9);
  });

  it('is tabulated per internal row in the truth', () => {
    const t = run.truth.targets[0]!;
    expect(t.vLosKms).toHaveLength(run.truth.setups[t.setup]!.internalHeight);
    for (const s of [0, 57, 149, 299]) expect(t.vLosKms[s]).toBeCloseTo(trueVlos(t, s), 9);
  });
});

describe('trueRotation', () => {
  it('rises as 1 - exp(-R/Rt): V(Rt) = Vmax (1 - 1/e), flat far out when there is no decline', () => {
    const t = simulateRun({}).truth.targets[0]!;
    expect(t.curve.declineArcsec).toBeNull();
    expect(trueRotation(t, t.curve.turnoverArcsec)).toBeCloseTo(t.curve.vmaxKms * (1 - Math.exp(-1)), 9);
    expect(trueRotation(t, 20 * t.curve.turnoverArcsec) / t.curve.vmaxKms).toBeGreaterThan(0.999);
  });

  it('falls as R^-1/2 far beyond the decline radius in the falling variant (Keplerian-like tail)', () => {
    const t = simulateRun({ variant: 'falling' }).truth.targets[0]!;
    const rd = t.curve.declineArcsec!;
    const ratio = trueRotation(t, 40 * rd) / trueRotation(t, 10 * rd);
    expect(ratio).toBeCloseTo(Math.sqrt(10 / 40), 2);
    expect(t.curveGrid.vRotKms.at(-1)!).toBeLessThan(0.8 * Math.max(...t.curveGrid.vRotKms));
  });
});

describe('trueWavelength', () => {
  it('gives the Legendre dispersion at the reference row and shifts lines by the tilt and curvature along the slit', () => {
    const st = run.truth.setups['red']!;
    const ref = st.lineShift.refRow;
    const mid = (st.internalWidth - 1) / 2;
    const c = st.dispersion.coeffs;
    // P0 - P2/2 at the centre (P2(0) = -1/2, P3(0) = 0).
    expect(trueWavelength(run.truth, 'red', mid, ref)).toBeCloseTo(c[0]! - 0.5 * c[2]!, 9);
    // Top of the slit: the same wavelength moves by tilt * dy + curvature * dy^2 pixels.
    const dy = st.internalHeight - 1 - ref;
    const shift = st.lineShift.tiltPxPerRow * dy + st.lineShift.curvaturePxPerRow2 * dy * dy;
    expect(trueWavelength(run.truth, 'red', mid + shift, ref + dy)).toBeCloseTo(trueWavelength(run.truth, 'red', mid, ref), 9);
    expect(Math.abs(shift)).toBeGreaterThan(2);
  });

  it('increases with d and covers [O I] 6300, H-alpha and [S II] 6731 at the galaxy redshift (small setup)', () => {
    const W = run.truth.setups['red']!.internalWidth;
    const lo = trueWavelength(run.truth, 'red', 0, 150);
    const hi = trueWavelength(run.truth, 'red', W - 1, 150);
    let last = -Infinity;
    for (let d = 0; d < W; d += 7) {
      const l = trueWavelength(run.truth, 'red', d, 150);
      expect(l).toBeGreaterThan(last);
      last = l;
    }
    expect(lo).toBeLessThan(6300);
    expect(hi).toBeGreaterThan(6730.816 * (1 + 2500 / 299792.458));
  });
});
