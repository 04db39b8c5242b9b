/**
 * The arc stage on the simulator's raw runs (src/sim simulateRun, size small, every variant),
 * calibrated by the CCD stage (buildCalibration), against the simulator's true lambda(x, y)
 * (trueWavelength). Line lists: config/lamps Ne and Ar (NIST Atomic Spectra Database, air).
 */
import { describe, expect, it } from 'vitest';
import { loadLampLines, skyLines } from '../../../src/physics/catalogues.js';
import { flipFrameX } from '../../../src/products/orientation.js';
import { SIM_VARIANTS, simFrameToRaw, simulateRun, trueWavelength } from '../../../src/sim/index.js';
import { pixelOfWavelength } from '../../../src/sim/optics.js';
import { DEFAULT_ARC_SETTINGS, DEFAULT_FLEXURE_SETTINGS, measureFlexure, solveWavelengths } from '../../../src/stages/arc/index.js';
import { buildCalibration, calibrateScience, DEFAULT_CCD_SETTINGS } from '../../../src/stages/ccd/index.js';

describe('solveWavelengths on simulated raw runs', () => {
  for (const variant of SIM_VARIANTS) {
    it(`${variant}: within 0.05 px RMS of the true wavelength at every pixel centre, right direction, honest RMS`, () => {
      const run = simulateRun({ size: 'small', variant });
      const setupName = Object.keys(run.truth.setups)[0]!;
      const setup = run.truth.setups[setupName]!;
      const raw = (kind: string) => run.frames.filter((f) => f.kind === kind).map(simFrameToRaw);
      const cal = buildCalibration({ bias: raw('bias'), flat: raw('flat'), arc: raw('arc') }, DEFAULT_CCD_SETTINGS).product;
      const r = solveWavelengths(cal.arc, loadLampLines(['Ne', 'Ar']), { ...DEFAULT_ARC_SETTINGS, approxWavelength: setup.approxWavelength, approxDispersion: setup.approxDispersion });
      const s = r.product;
      expect(s.flipX).toBe(variant === 'rotated');
      // a clean simulated arc raises no warning (no misfit, high RMS or long extrapolation)
      expect(r.diagnostics.filter((d) => d.severity !== 'info').map((d) => d.message)).toEqual([]);
      let sum = 0;
      for (let y = 0; y < s.height; y++) {
        for (let x = 0; x < s.width; x++) {
          const d = trueWavelength(run.truth, setupName, x + 0.5, y) - trueWavelength(run.truth, setupName, x - 0.5, y);
          const e = (s.wave[y * s.width + x]! - trueWavelength(run.truth, setupName, x, y)) / d;
          sum += e * e;
        }
      }
      expect(Math.sqrt(sum / s.wave.length)).toBeLessThan(0.05);
      // rmsPx means: the RMS scatter of the used line positions about the solution; compare it with
      // their true position error (mean of the true positions over the rows of each band)
      let err = 0;
      const used = s.lines.filter((l) => l.used);
      for (const l of used) {
        const y0 = Math.round(l.y - (DEFAULT_ARC_SETTINGS.rowBand - 1) / 2);
        let t = 0;
        for (let k = 0; k < DEFAULT_ARC_SETTINGS.rowBand; k++) t += pixelOfWavelength(setup, l.wavelength, y0 + k);
        err += (l.x - t / DEFAULT_ARC_SETTINGS.rowBand) ** 2;
      }
      expect(Math.abs(s.rmsPx / Math.sqrt(err / used.length) - 1)).toBeLessThan(0.3);

      if (variant === 'standard') {
        // no flexure in the simulator: the sky lines of the science frame must agree with the arc
        const target = run.truth.targets[0]!;
        const sci = calibrateScience(run.frames.filter((f) => f.kind === 'science' && f.target === target.name).map(simFrameToRaw), cal, DEFAULT_CCD_SETTINGS).product;
        const fr = measureFlexure(s.flipX ? flipFrameX(sci) : sci, s, skyLines(), DEFAULT_FLEXURE_SETTINGS);
        const f = fr.product.flexure!;
        expect(fr.diagnostics.filter((d) => d.severity !== 'info').map((d) => d.message)).toEqual([]);
        expect(f.lines.filter((l) => l.used).length).toBeGreaterThanOrEqual(3);
        expect(Math.abs(f.shiftAngstrom)).toBeLessThan(4 * f.shiftErrAngstrom);
      }
    });
  }
});
