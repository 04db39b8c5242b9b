/**
 * The public library surface (`import { ... } from 'whorl'`) is pinned: adding or removing a name
 * is a deliberate change of test/public-api.txt (one name per line, sorted).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import * as whorl from '../src/index.js';

describe('the public surface of whorl', () => {
  it('exports exactly the names listed in test/public-api.txt', () => {
    const pinned = readFileSync(new URL('./public-api.txt', import.meta.url), 'utf8').split('\n').filter(Boolean);
    expect(Object.keys(whorl).sort()).toEqual(pinned);
  });

  it('has the stage entry points README names', () => {
    for (const name of ['readFitsFile', 'loadRawFrame', 'writeFits', 'buildCalibration', 'calibrateScience', 'solveWavelengths', 'measureFlexure', 'subtractSky', 'measureLines', 'computeVelocities', 'buildRotationCurve', 'simulateRun', 'loadManifest', 'reduceRun', 'renderTargetReport', 'rebuildReports']) {
      expect(typeof (whorl as Record<string, unknown>)[name], name).toBe('function');
    }
  });
});
