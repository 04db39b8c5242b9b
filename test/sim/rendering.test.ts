import { describe, expect, it } from 'vitest';
import { GALAXY_LINES } from '../../src/physics/catalogues.js';
import { applyFrameCorrection, velocityFromWavelength } from '../../src/physics/doppler.js';
import { trueWavelength } from '../../src/sim/index.js';
import { renderGas } from '../../src/sim/render.js';
import { halphaRate } from '../../src/sim/targets.js';
import { standardRun } from './shared-run.js';

const run = standardRun();
const setup = run.truth.setups['red']!;
const W = setup.internalWidth;

/** Internal d where the true wavelength of row s equals lambda, by bisection (independent of the simulator's Newton inverse). */
function pixelOf(lambda: number, s: number): number {
  let lo = -50;
  let hi = W + 50;
  for (let i = 0; i < 80; i++) {
    const mid = 0.5 * (lo + hi);
    if (trueWavelength(run.truth, 'red', mid, s) < lambda) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** Centroid (pixels) of image row s over [c - half, c + half] above a constant level (mean of the window ends). */
function centroid(img: Float32Array, s: number, c: number, half: number, background = 0): { centre: number; flux: number } {
  let sum = 0;
  let moment = 0;
  for (let d = Math.round(c) - half; d <= Math.round(c) + half; d++) {
    const v = img[s * W + d]! - background;
    sum += v;
    moment += v * d;
  }
  return { centre: moment / sum, flux: sum };
}

describe('arc frames', () => {
  it('put Ne and Ar lines where the true wavelength equals their NIST air wavelength, in every row (tilt and curvature included)', () => {
    const arc = run.expected!.get('raw/arc_001.fits')!;
    // Isolated lines (no other catalogue line within 10 A): Ne I 6402.2480, 6506.5281, Ar I 6965.431 (NIST ASD, air).
    for (const lambda of [6402.248, 6506.5281, 6965.431]) {
      for (const s of [5, 150, 294]) {
        const c = pixelOf(lambda, s);
        // The expected image includes the ~1% pixel response: centroid scatter ~0.01 px.
        expect(Math.abs(centroid(arc, s, c, 6).centre - c)).toBeLessThan(0.03);
      }
      expect(Math.abs(pixelOf(lambda, 0) - pixelOf(lambda, 299))).toBeGreaterThan(2);
    }
  });
});

describe('galaxy lines', () => {
  const target = run.truth.targets[0]!;
  const exposure = target.exposures[1]!;
  const gas = new Float32Array(W * setup.internalHeight);
  renderGas(setup, target, exposure, gas);

  it('place H-alpha at the true v_los once the barycentric correction is applied (optical Doppler and Wright & Eastman 2014 via src/physics)', () => {
    const rest = GALAXY_LINES['Halpha']!.air;
    for (const s of [95, 140, 153, 170, 215]) {
      const guess = pixelOf(rest * (1 + target.vLosKms[s]! / 299792.458), s);
      const c = centroid(gas, s, guess, 7).centre;
      const czObs = velocityFromWavelength(trueWavelength(run.truth, 'red', c, s), rest, 'optical');
      const vBary = applyFrameCorrection(czObs, exposure.barycentricCorrectionKms);
      // 0.005 px of centroid ~ 0.25 km/s at 1.1 A/px.
      expect(Math.abs(vBary - target.vLosKms[s]!)).toBeLessThan(0.3);
    }
  });

  it('carry the flux of the emission profile: H-alpha electrons per row = rate x exposure time', () => {
    for (const s of [60, 150, 240]) {
      const guess = pixelOf(GALAXY_LINES['Halpha']!.air * (1 + target.vLosKms[s]! / 299792.458), s);
      const flux = centroid(gas, s, guess, 8).flux;
      expect(Math.abs(flux / (halphaRate(target, s) * exposure.exptimeS) - 1)).toBeLessThan(1e-4);
    }
  });

  it('keep [N II] 6583 / 6548 at 3, as atomic physics fixes it (REFERENCE.md: 2.94-3.05)', () => {
    const r = target.emission.ratios;
    expect(r['NII6583']! / r['NII6548']!).toBeCloseTo(3, 6);
  });

  it('fall from high S/N at the centre to about 3 per row near the ends of the emission (three exposures)', () => {
    const sci = run.expected!.get(exposure.frame)!;
    const rn2 = setup.detector.readNoiseE ** 2;
    const snr = (s: number): number => {
      // Matched-filter S/N of the line flux: F sqrt(sum p^2 / var), the flux precision of a Gaussian fit.
      const c = pixelOf(GALAXY_LINES['Halpha']!.air * (1 + target.vLosKms[s]! / 299792.458), s);
      const sigma = 1.5;
      let info = 0;
      for (let d = Math.floor(c - 6); d <= Math.ceil(c + 6); d++) {
        const p = Math.exp(-0.5 * ((d - c) / sigma) ** 2) / (Math.sqrt(2 * Math.PI) * sigma);
        info += (p * p) / (sci[s * W + d]! + rn2);
      }
      return halphaRate(target, s) * exposure.exptimeS * Math.sqrt(3 * info);
    };
    expect(snr(Math.round(target.centreRow))).toBeGreaterThan(100);
    const rowsAbove3 = Array.from({ length: setup.internalHeight }, (_, s) => s).filter((s) => snr(s) >= 3);
    const first = rowsAbove3[0]!;
    const last = rowsAbove3.at(-1)!;
    // The emission is traced to about +-45 arcsec, leaving sky rows at both slit ends.
    expect(first).toBeGreaterThan(10);
    expect(first).toBeLessThan(60);
    expect(last).toBeGreaterThan(240);
    expect(last).toBeLessThan(290);
  });
});
