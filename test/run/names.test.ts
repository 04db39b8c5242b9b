import { resolve } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { safeFolderName, uniqueFolderNames } from '../../src/run/names.js';

describe('safeFolderName', () => {
  it('keeps plain names readable', () => {
    expect(safeFolderName('Halden Spiral')).toBe('Halden-Spiral');
    expect(safeFolderName('Orrin_Disk.2')).toBe('Orrin_Disk.2');
    expect(safeFolderName('Émeraude Wheel')).toBe('Emeraude-Wheel');
  });

  it('cannot climb out of the output folder', () => {
    for (const evil of ['../../etc/passwd', '..', '.', '/abs/path', 'a/../../b', '..\\..\\win', '~', '']) {
      const name = safeFolderName(evil);
      expect(name).not.toMatch(/[/\\]/);
      expect(name.startsWith('.')).toBe(false);
      expect(resolve('/out', name).startsWith('/out/')).toBe(true);
    }
  });

  it('avoids the run files and device names', () => {
    expect(safeFolderName('calib')).toBe('target-calib');
    expect(safeFolderName('summary.json')).toBe('target-summary.json');
    expect(safeFolderName('NUL')).toBe('target-NUL');
  });

  it('any string gives a single safe path segment inside the output folder (property, seeded)', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary', maxLength: 200 }), (s) => {
        const name = safeFolderName(s);
        return /^[A-Za-z0-9_][A-Za-z0-9._-]{0,63}$/.test(name) && resolve('/out', name) === `/out/${name}`;
      }),
      { seed: 20261202, numRuns: 2000 },
    );
  });
});

describe('uniqueFolderNames', () => {
  it('resolves collisions in manifest order, case-insensitively, the same way every time', () => {
    const names = ['Target A', 'Target-A', 'target a', 'Target B'];
    expect(uniqueFolderNames(names)).toEqual(['Target-A', 'Target-A-2', 'target-a-3', 'Target-B']);
    expect(uniqueFolderNames(names)).toEqual(uniqueFolderNames([...names]));
  });
});
