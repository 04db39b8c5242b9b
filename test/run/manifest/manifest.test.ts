import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../../../src/errors.js';
import { loadManifest } from '../../../src/run/manifest/resolve.js';

// The example manifest of issue 3, verbatim (with its comments).
const ISSUE_EXAMPLE = `output: products                 # folder for products, relative to this file
setups:
  red:                           # a name of the user's choosing
    dispersion_axis: auto        # auto | x | y
    arcsec_per_pixel: 0.40
    approx_wavelength: 6650      # Angstrom at the detector centre
    approx_dispersion: 1.1       # Angstrom per pixel
    lamps: [Ne, Ar]
    gain: 1.4                    # e-/ADU, default: header GAIN
    read_noise: 4.0              # e-, default: header RDNOISE
    bias: [raw/bias_*.fits]      # files or globs, absolute or relative to this file
    flat: [raw/flat_*.fits]
    arc: [raw/arc_*.fits]
targets:
  - name: Target A
    setup: red
    frames: [raw/sci_*.fits]
    lines: [Halpha, NII6583, NII6548]
    distance_mpc: 31.0
    inclination_deg: 58
    major_axis_pa_deg: 35
    slit_pa_deg: 35
`;

let dir: string;

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'whorl-manifest-'));
  mkdirSync(join(dir, 'raw'));
  for (const f of ['bias_2.fits', 'bias_1.fits', 'flat_1.fits', 'arc_1.fits', 'sci_1.fits', 'sci_2.fits', '.sci_hidden.fits', 'notes.txt']) writeFileSync(join(dir, 'raw', f), '');
});

function manifestWith(text: string): string {
  const path = join(dir, `m${Math.random().toString(36).slice(2)}.yaml`);
  writeFileSync(path, text);
  return path;
}

/** Load a manifest expected to be refused; returns the InputError. */
function refused(text: string): InputError {
  try {
    loadManifest(manifestWith(text));
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return e as InputError;
  }
  throw new Error('the manifest was accepted');
}

describe('loadManifest', () => {
  it('accepts the example of issue 3 and resolves globs to sorted absolute files, skipping hidden ones', () => {
    const run = loadManifest(manifestWith(ISSUE_EXAMPLE));
    expect(run.outputDir).toBe(join(dir, 'products'));
    expect(run.setups['red']!.bias).toEqual([join(dir, 'raw/bias_1.fits'), join(dir, 'raw/bias_2.fits')]);
    expect(run.targets[0]!.frames).toEqual([join(dir, 'raw/sci_1.fits'), join(dir, 'raw/sci_2.fits')]);
    expect(run.targets[0]!.folder).toBe('Target-A');
    expect(run.targets[0]!.velocity_convention).toBe('optical');
    expect(run.targets[0]!.velocity_frame).toBe('barycentric');
  });

  it('freezes the resolved settings before any pixel is read', () => {
    const run = loadManifest(manifestWith(ISSUE_EXAMPLE));
    expect(Object.isFrozen(run.targets[0])).toBe(true);
    expect(() => (run.targets[0]!.lines as string[]).push('Hbeta')).toThrow(TypeError);
  });

  it('names a missing key with its path and the line of the mapping that lacks it', () => {
    const e = refused(ISSUE_EXAMPLE.replace('    slit_pa_deg: 35\n', ''));
    expect(e.code).toBe('manifest.invalid');
    expect(e.place).toMatchObject({ key: 'targets[0].slit_pa_deg', line: 15, column: 5 });
    expect(e.message).toMatch(/missing key 'slit_pa_deg' \(expected number\)/);
  });

  it('says "no value given" at a key left empty (as drafts from whorl inventory leave them)', () => {
    const e = refused(ISSUE_EXAMPLE.replace('arcsec_per_pixel: 0.40', 'arcsec_per_pixel: null  # FILL IN'));
    expect(e.place).toMatchObject({ key: 'setups.red.arcsec_per_pixel', line: 5, column: 23 });
    expect(e.message).toContain('no value given (expected number)');
  });

  it('names a wrong type at the value, with line:column in the message', () => {
    const e = refused(ISSUE_EXAMPLE.replace('inclination_deg: 58', 'inclination_deg: "steep"'));
    expect(e.place).toMatchObject({ key: 'targets[0].inclination_deg', line: 20, column: 22 });
    expect(e.message).toContain('line 20:22');
    expect(e.message).toContain('expected number');
  });

  it('lists the allowed values of an enum', () => {
    const e = refused(ISSUE_EXAMPLE.replace('dispersion_axis: auto', 'dispersion_axis: diagonal'));
    expect(e.place).toMatchObject({ key: 'setups.red.dispersion_axis', line: 4, column: 22 });
    expect(e.message).toMatch(/expected one of auto, x, y/);
  });

  it('refuses a target on an unknown setup, naming the known ones', () => {
    const e = refused(ISSUE_EXAMPLE.replace('    setup: red', '    setup: blue'));
    expect(e.place).toMatchObject({ key: 'targets[0].setup', line: 16, column: 12 });
    expect(e.message).toMatch(/unknown setup 'blue' \(expected one of: red\)/);
  });

  it('refuses a glob that matches no file, at the entry of the list', () => {
    const e = refused(ISSUE_EXAMPLE.replace('frames: [raw/sci_*.fits]', 'frames: [raw/sci_1.fits, raw/zzz_*.fits]'));
    expect(e.code).toBe('manifest.no-files');
    expect(e.place).toMatchObject({ key: 'targets[0].frames[1]', line: 17 });
    expect(e.message).toContain("'raw/zzz_*.fits' matches no file");
  });

  it('refuses unknown keys (a typo is not silently ignored)', () => {
    const e = refused(ISSUE_EXAMPLE.replace('    gain: 1.4', '    gian: 1.4'));
    expect(e.place).toMatchObject({ key: 'setups.red.gian', line: 9, column: 5 });
    expect(e.message).toContain("unknown key 'gian'");
  });

  it('refuses out-of-range numbers with the bound', () => {
    const e = refused(ISSUE_EXAMPLE.replace('inclination_deg: 58', 'inclination_deg: 95'));
    expect(e.message).toMatch(/too large \(expected <= 90\)/);
  });

  it('needs exactly one of inclination_deg and axis_ratio', () => {
    expect(refused(ISSUE_EXAMPLE.replace('    inclination_deg: 58\n', '')).place.key).toBe('targets[0].inclination_deg');
    const both = refused(ISSUE_EXAMPLE.replace('inclination_deg: 58', 'inclination_deg: 58\n    axis_ratio: 0.5'));
    expect(both.place).toMatchObject({ key: 'targets[0].axis_ratio', line: 21 });
    expect(() => loadManifest(manifestWith(ISSUE_EXAMPLE.replace('inclination_deg: 58', 'axis_ratio: 0.53')))).not.toThrow();
  });

  it('refuses unknown lamps and line names before reading any pixel', () => {
    expect(refused(ISSUE_EXAMPLE.replace('[Ne, Ar]', '[Ne, Unobtainium]')).place).toMatchObject({ key: 'setups.red.lamps[1]', line: 8 });
    expect(refused(ISSUE_EXAMPLE.replace('NII6548]', 'NII6549]')).place).toMatchObject({ key: 'targets[0].lines[2]', line: 18 });
  });

  it('refuses duplicate target names', () => {
    const second = ISSUE_EXAMPLE.slice(ISSUE_EXAMPLE.indexOf('  - name: Target A'));
    const e = refused(ISSUE_EXAMPLE + second);
    expect(e.place).toMatchObject({ key: 'targets[1].name', line: 23 });
  });

  it('reports YAML syntax errors with line and column', () => {
    const e = refused(ISSUE_EXAMPLE.replace('lamps: [Ne, Ar]', 'lamps: [Ne, Ar'));
    expect(e.code).toBe('manifest.yaml');
    expect(e.place.line).toBeGreaterThanOrEqual(8);
    expect(e.place.column).toBeGreaterThanOrEqual(1);
  });

  it('lists every problem, the first in file order giving the place', () => {
    const e = refused(ISSUE_EXAMPLE.replace('arcsec_per_pixel: 0.40', 'arcsec_per_pixel: -1').replace('distance_mpc: 31.0', 'distance_mpc: zero'));
    expect(e.place.key).toBe('setups.red.arcsec_per_pixel');
    expect(e.message).toContain('also targets[0].distance_mpc (line 19:19)');
  });

  it('turns 1-based optional rows and ranges into checked values', () => {
    const e = refused(ISSUE_EXAMPLE.replace('slit_pa_deg: 35', 'slit_pa_deg: 35\n    sky_rows: [[40, 10]]'));
    expect(e.place.key).toBe('targets[0].sky_rows[0]');
    expect(e.message).toContain('first <= last');
  });

  it('says when the manifest file cannot be read', () => {
    expect(() => loadManifest(join(dir, 'absent.yaml'))).toThrow(/cannot read the manifest: no such file/);
  });
});
