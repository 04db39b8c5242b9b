import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { airToVacuum } from '../../src/physics/air-vacuum.js';
import { GALAXY_LINES, KNOWN_LAMPS, galaxyLine, loadLampLines, parseLineList, readLineListFile, skyLines } from '../../src/physics/catalogues.js';
import { groupLines } from '../../src/physics/line-groups.js';
import { inputError } from '../helpers/input-error.js';

describe('lamp line lists (NIST ASD air wavelengths, REFERENCE.md)', () => {
  it('loads every built-in lamp, sorted, with positive intensities', () => {
    for (const lamp of KNOWN_LAMPS) {
      const lines = loadLampLines([lamp]);
      expect(lines.length).toBeGreaterThan(4);
      for (let i = 1; i < lines.length; i++) expect(lines[i]!.wavelength).toBeGreaterThan(lines[i - 1]!.wavelength);
      for (const l of lines) expect(l.element).toBe(lamp);
    }
  });

  it('holds the NIST values of REFERENCE.md (spot checks: Ne 6402.2480, Ar 6965.431, Hg 5460.750, He 5875.621)', () => {
    const has = (lamp: string, w: number) => loadLampLines([lamp]).some((l) => Math.abs(l.wavelength - w) < 1e-6);
    expect(has('Ne', 6402.248)).toBe(true);
    expect(has('Ne', 7032.4131)).toBe(true);
    expect(has('Ar', 6965.431)).toBe(true);
    expect(has('Hg', 5460.75)).toBe(true);
    expect(has('He', 5875.621)).toBe(true);
    expect(has('Kr', 5870.916)).toBe(true);
    expect(has('Xe', 4671.226)).toBe(true);
  });

  it('leaves out lines blended within 1 A (Ne 5975.5340 with 5974.6273, Ar 7723.761 with 7724.207)', () => {
    const all = loadLampLines(['Ne', 'Ar']);
    expect(all.some((l) => Math.abs(l.wavelength - 5975.534) < 0.01)).toBe(false);
    expect(all.some((l) => Math.abs(l.wavelength - 7723.761) < 0.01)).toBe(false);
  });

  it('merges lamps case-insensitively and counts a repeated lamp once', () => {
    const merged = loadLampLines(['ne', 'Ar', 'Ne']);
    expect(merged.length).toBe(loadLampLines(['Ne']).length + loadLampLines(['Ar']).length);
  });

  it('refuses an unknown lamp with an InputError naming it and listing the known ones', () => {
    const e = inputError(() => loadLampLines(['Ne', 'Zz']));
    expect(e.code).toBe('lamp.unknown');
    expect(e.message).toContain('"Zz"');
    for (const k of KNOWN_LAMPS) expect(e.message).toContain(k);
  });
});

describe('parseLineList (user format)', () => {
  it('reads wavelength, element and intensity, skipping comments and blank lines', () => {
    const lines = parseLineList('# my lamp\n\n6965.431 Ar 2000 # strong\n  6402.248\tNe  30\n', 'mine.txt');
    expect(lines).toEqual([
      { wavelength: 6402.248, element: 'Ne', intensity: 30 },
      { wavelength: 6965.431, element: 'Ar', intensity: 2000 },
    ]);
  });

  it('names the file, line and column of a bad field', () => {
    const e = inputError(() => parseLineList('6402.248 Ne 30\n6965.431 Ar lots\n', 'mine.txt'));
    expect(e.place).toEqual({ file: 'mine.txt', line: 2, column: 13 });
    expect(inputError(() => parseLineList('6402.248 Ne\n', 'x')).place.line).toBe(1);
    expect(inputError(() => parseLineList('1215.67 H 1\n', 'x')).place.column).toBe(1);
  });

  it('reads a file, and names a missing file', () => {
    const dir = mkdtempSync(join(tmpdir(), 'whorl-lines-'));
    const path = join(dir, 'lamp.txt');
    writeFileSync(path, '5460.750 Hg 5000\n');
    expect(readLineListFile(path)).toEqual([{ wavelength: 5460.75, element: 'Hg', intensity: 5000 }]);
    expect(inputError(() => readLineListFile(join(dir, 'none.txt'))).place.file).toBe(join(dir, 'none.txt'));
  });
});

describe('galaxy lines', () => {
  it('has the eleven manifest names with the REFERENCE.md air wavelengths', () => {
    expect(Object.keys(GALAXY_LINES).sort()).toEqual(['HeI5876', 'Halpha', 'Hbeta', 'NII6548', 'NII6583', 'OI6300', 'OI6364', 'OIII4959', 'OIII5007', 'SII6716', 'SII6731'].sort());
    expect(galaxyLine('Halpha').air).toBe(6562.8);
    expect(galaxyLine('NII6583').air).toBe(6583.454);
    expect(galaxyLine('OIII5007').air).toBe(5006.843);
  });

  it('lists vacuum wavelengths that agree with Morton (2000) air-to-vacuum within 0.003 A', () => {
    for (const l of Object.values(GALAXY_LINES)) expect(Math.abs(airToVacuum(l.air) - l.vacuum)).toBeLessThan(0.003);
  });

  it('refuses an unknown name, listing the known ones', () => {
    const e = inputError(() => galaxyLine('Hgamma', { key: 'targets[0].lines[2]' }));
    expect(e.place.key).toBe('targets[0].lines[2]');
    expect(e.message).toContain('Halpha');
  });
});

describe('groupLines', () => {
  it('ties Halpha with [N II], the [N II] ratio fixed to 1/3 of 6583 (REFERENCE.md)', () => {
    const [g] = groupLines(['Halpha', 'NII6548', 'NII6583']);
    expect(g!.name).toBe('Halpha+NII');
    expect(g!.members).toEqual(['NII6583', 'NII6548', 'Halpha']);
    expect(g!.ratios).toEqual({ NII6548: 1 / 3 });
  });

  it('fixes [O III] 4959/5007 to 1/2.98 (Storey & Zeippen 2000) and leaves [S II] and [O I] free', () => {
    const groups = groupLines(['SII6731', 'OIII4959', 'OIII5007', 'SII6716', 'OI6300', 'OI6364', 'Hbeta']);
    expect(groups.map((g) => g.name)).toEqual(['SII', 'OIII', 'OI', 'Hbeta']);
    expect(groups[1]!.ratios.OIII4959).toBeCloseTo(1 / 2.98, 12);
    expect(groups[0]!.ratios).toEqual({});
    expect(groups[2]!.ratios).toEqual({});
  });

  it('keeps a line alone when its partners are not requested, and ties nothing it cannot', () => {
    expect(groupLines(['Halpha'])).toEqual([{ name: 'Halpha', members: ['Halpha'], ratios: {}, source: '' }]);
    const [g] = groupLines(['Halpha', 'NII6548']);
    expect(g!.members).toEqual(['NII6548', 'Halpha']);
    expect(g!.ratios).toEqual({});
  });

  it('refuses unknown names', () => {
    expect(() => groupLines(['Halpha', 'Lya'])).toThrow(InputError);
  });
});

describe('sky lines', () => {
  it('has [O I] 5577.338, 6300.304, 6363.776 and Na D (REFERENCE.md), sorted', () => {
    const sky = skyLines();
    for (const w of [5577.338, 5889.95, 5895.924, 6300.304, 6363.776]) expect(sky.some((l) => l.wavelength === w)).toBe(true);
    for (let i = 1; i < sky.length; i++) expect(sky[i]!.wavelength).toBeGreaterThan(sky[i - 1]!.wavelength);
  });

  it('has the OH lines computed from measured wavenumbers 15873.687 and 15851.404 cm-1 (Morton 2000 to air)', () => {
    const sky = skyLines();
    for (const sigma of [15873.687, 15851.404]) {
      const vac = 1e8 / sigma;
      const air = sky.find((l) => Math.abs(l.wavelength - (vac - 1.75)) < 0.5)!;
      expect(airToVacuum(air.wavelength)).toBeCloseTo(vac, 3);
    }
  });

  it('names a source for every line and has OH lines in the simulator range 6200-7000 A', () => {
    const sky = skyLines();
    for (const l of sky) expect(l.source.length).toBeGreaterThan(20);
    expect(sky.filter((l) => l.name.startsWith('OH') && l.wavelength > 6200 && l.wavelength < 7000).length).toBeGreaterThanOrEqual(4);
  });
});
