import { describe, expect, it } from 'vitest';
import { givenSkyRows, skyRowMask } from '../../../src/stages/arc/sky-rows.js';
import { syntheticArc } from './synthetic-arc.js';
import { syntheticSky } from './synthetic-sky.js';

describe('sky rows of a science frame', () => {
  const arc = syntheticArc({ seed: 51 });

  it('leaves out the galaxy rows (continuum 400 e/px at the peak, Gaussian profile) and keeps the sky rows', () => {
    const sci = syntheticSky(arc.setup, { seed: 52, shiftAngstrom: 0, galaxy: { rows: [120, 180], continuum: 400 } });
    const sky = skyRowMask(sci, 5);
    for (let y = 135; y <= 165; y++) expect(sky[y]).toBe(0);
    for (const y of [0, 50, 100, 200, 250, 299]) expect(sky[y]).toBe(1);
  });

  it('keeps every row of a frame with sky only', () => {
    const sci = syntheticSky(arc.setup, { seed: 53, shiftAngstrom: 0 });
    const sky = skyRowMask(sci, 5);
    expect(sky.reduce((a, b) => a + b, 0)).toBeGreaterThan(295);
  });

  it('given ranges are inclusive and clipped to the frame', () => {
    const sky = givenSkyRows([[-5, 2], [8, 7]], 10);
    expect(Array.from(sky)).toEqual([1, 1, 1, 0, 0, 0, 0, 1, 1, 0]);
  });
});
