import { describe, expect, it } from 'vitest';
import { GALAXY_LINES } from '../../src/physics/catalogues.js';
import { COSMIC_EVENTS_PER_PX_PER_S, MIN_DEPOSIT_E, READOUT_S } from '../../src/sim/cosmic.js';
import { pixelOfWavelength } from '../../src/sim/optics.js';
import { electronsAboveBias, frameOf, overscanRowMeans, standardRun, trimmedWidth } from './shared-run.js';

const run = standardRun();
const det = run.truth.setups['red']!.detector;
const science = run.frames.filter((f) => f.kind === 'science');

describe('cosmic rays', () => {
  it('leave every listed hit standing out of the noise of the frame', () => {
    for (const f of science) {
      const hits = run.truth.frames[f.name]!.cosmicRays;
      const e = run.expected!.get(f.name)!;
      const means = overscanRowMeans(run, f);
      const tw = trimmedWidth(run, f);
      let clear = 0;
      hits.x.forEach((x, k) => {
        const y = hits.y[k]!;
        const excess = electronsAboveBias(run, f, x, y, means) - e[y * tw + x]!;
        const sigma = Math.sqrt(e[y * tw + x]! + det.readNoiseE ** 2);
        if (excess > 5 * sigma) clear++;
      });
      expect(clear / hits.x.length).toBeGreaterThan(0.99);
      expect(Math.min(...hits.electrons)).toBeGreaterThanOrEqual(MIN_DEPOSIT_E);
    }
  });

  it('arrive at about 2.5 events per cm^2 per minute on 15-micron pixels (common practice, from memory)', () => {
    expect(COSMIC_EVENTS_PER_PX_PER_S).toBeCloseTo((2.5 / 60) * 2.25e-6, 12);
    // Three science exposures; tracks average ~2-3 pixels, plus the deliberate hits.
    const px = 1024 * 300;
    const events = 3 * COSMIC_EVENTS_PER_PX_PER_S * px * (1200 + READOUT_S);
    const hitPixels = science.reduce((a, f) => a + run.truth.frames[f.name]!.cosmicRays.x.length, 0);
    expect(hitPixels).toBeGreaterThan(1.2 * events);
    expect(hitPixels).toBeLessThan(5 * events);
  });

  it('hit some pixels in two of the three exposures of a target', () => {
    const sets = science.map((f) => {
      const h = run.truth.frames[f.name]!.cosmicRays;
      return new Set(h.x.map((x, k) => `${x},${h.y[k]}`));
    });
    const twice = [...sets[0]!].filter((p) => sets[1]!.has(p));
    expect(twice.length).toBeGreaterThanOrEqual(3);
  });

  it('hit the H-alpha core in rows near the centre in every exposure', () => {
    const setup = run.truth.setups['red']!;
    const target = run.truth.targets[0]!;
    for (const exposure of target.exposures) {
      const h = run.truth.frames[exposure.frame]!.cosmicRays;
      const onCore = h.x.filter((x, k) => {
        const s = h.y[k]!;
        const lambda = (GALAXY_LINES['Halpha']!.air * (1 + target.vLosKms[s]! / 299792.458)) / (1 + exposure.barycentricCorrectionKms / 299792.458);
        return Math.abs(x - pixelOfWavelength(setup, lambda, s)) < 1 && Math.abs(s - target.centreRow) < 40;
      });
      expect(onCore.length).toBeGreaterThanOrEqual(3);
    }
  });

  it('are recorded for calibration frames too, in trimmed-section coordinates', () => {
    const f = frameOf(run, 'raw/flat_001.fits');
    const h = run.truth.frames[f.name]!.cosmicRays;
    for (let k = 0; k < h.x.length; k++) {
      expect(h.x[k]).toBeLessThan(trimmedWidth(run, f));
      expect(h.y[k]).toBeLessThan(f.height);
    }
  });
});
