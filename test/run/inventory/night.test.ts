/**
 * The inventory of a simulated multi-target, two-setup night (src/sim) with a corrupt file added:
 * every frame classified as the simulator made it, targets and setups found, the corrupt file
 * listed with its reason, and the draft manifest accepted by the manifest check once the
 * FILL IN values are given. Also `whorl inventory` run in-process.
 */
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { memoryIo } from '../../../src/cli/io.js';
import { main } from '../../../src/cli/main.js';
import { parseManifestText } from '../../../src/run/manifest/parse.js';
import { resolveManifest } from '../../../src/run/manifest/resolve.js';
import { classifyFrame } from '../../../src/run/inventory/classify.js';
import { draftManifestYaml, FILL_IN } from '../../../src/run/inventory/draft.js';
import { buildInventory } from '../../../src/run/inventory/group.js';
import { DEFAULT_RULES } from '../../../src/run/inventory/rules.js';
import { scanDirectory } from '../../../src/run/inventory/scan.js';
import { simulateRun } from '../../../src/sim/simulate.js';
import { writeSimulatedRun } from '../../../src/sim/write.js';

const dir = mkdtempSync(join(tmpdir(), 'whorl-night-'));
const run = simulateRun({ seed: 3, targets: 2, setups: 2 });
writeSimulatedRun(run, dir);
const raw = join(dir, 'raw');
writeFileSync(join(raw, 'corrupt.fits'), readFileSync(join(raw, 'bias_001.fits')).subarray(0, 5000));
const scanned = scanDirectory(raw);
const inv = buildInventory(scanned.frames.map((f) => classifyFrame(f, DEFAULT_RULES)), scanned.unreadable, DEFAULT_RULES);

/** The draft with every FILL IN value given, as a user would. */
function filled(text: string): string {
  const values: Record<string, string> = {
    arcsec_per_pixel: '0.4', approx_wavelength: '6650', approx_dispersion: '1.1', lines: '[Halpha, NII6583]',
    distance_mpc: '30', inclination_deg: '60', major_axis_pa_deg: '35', slit_pa_deg: '35',
  };
  return text.replace(/^(\s*)([a-z_]+): null  # FILL IN.*$/gm, (_m, indent: string, key: string) => `${indent}${key}: ${values[key] ?? 'null'}`);
}

describe('inventory of a simulated night', () => {
  it('classifies every frame as the simulator made it', () => {
    const kinds = new Map(inv.frames.map((f) => [f.path.slice(dir.length + 1), f.kind]));
    for (const f of run.frames) expect(kinds.get(f.name), f.name).toBe(f.kind);
    expect(inv.frames.length).toBe(run.frames.length);
  });

  it('classifies by headers, not names: renamed, upper-case, .fit, gzipped and nested files; a text file is listed, a notes file ignored', () => {
    const messy = join(dir, 'messy');
    mkdirSync(join(messy, 'night1', 'late'), { recursive: true });
    const renamed = new Map<string, string>(); // new path -> simulator name
    run.frames.forEach((frame, i) => {
      const bytes = readFileSync(join(dir, frame.name));
      const stem = `frame${String(i).padStart(3, '0')}`;
      const path = [join(messy, `${stem.toUpperCase()}.FITS`), join(messy, 'night1', `${stem}.fit`), join(messy, 'night1', 'late', `${stem}.fits.gz`)][i % 3]!;
      writeFileSync(path, path.endsWith('.gz') ? gzipSync(bytes) : bytes);
      renamed.set(path, frame.name);
    });
    writeFileSync(join(messy, 'pointing.fits'), 'RA 10:08:41 DEC -18:44:07\n');
    writeFileSync(join(messy, 'notes.txt'), 'cloudy after 3 UT\n');
    const s = scanDirectory(messy);
    const kinds = buildInventory(s.frames.map((f) => classifyFrame(f, DEFAULT_RULES)), s.unreadable, DEFAULT_RULES).frames;
    expect(kinds).toHaveLength(run.frames.length);
    for (const f of kinds) expect(f.kind, f.path).toBe(run.frames.find((x) => x.name === renamed.get(f.path))!.kind);
    expect(s.unreadable).toEqual([{ path: join(messy, 'pointing.fits'), reason: expect.stringMatching(/not a FITS file/) }]);
  });

  it('lists the corrupt file with the reason and goes on', () => {
    expect(inv.unreadable).toEqual([{ path: join(raw, 'corrupt.fits'), reason: expect.stringMatching(/data unit is shorter than the header says/) }]);
  });

  it('finds the two setups (grating tilts) and one target per observed galaxy and setup', () => {
    expect(inv.setups.map((s) => s.spectral['GRTILT'])).toEqual(Object.values(run.truth.setups).map((s) => String(s.gratingTiltDeg)));
    expect(inv.targets.map((t) => t.name).sort()).toEqual(run.truth.targets.map((t) => t.name).sort());
    for (const t of inv.targets) {
      const want = run.frames.filter((f) => f.target === t.name).map((f) => f.name);
      expect(t.frames.map((f) => f.path.slice(dir.length + 1))).toEqual(want);
      expect(t.arcs.length).toBeGreaterThan(0);
    }
  });

  it('writes a draft that marks what headers cannot tell and passes the manifest check once filled in', () => {
    const text = draftManifestYaml(inv, raw, dir);
    for (const key of ['arcsec_per_pixel', 'approx_wavelength', 'approx_dispersion', 'lines', 'distance_mpc', 'inclination_deg', 'major_axis_pa_deg', 'slit_pa_deg']) {
      expect(text).toMatch(new RegExp(`^\\s*${key}: null  # ${FILL_IN}`, 'm'));
    }
    expect(text).toMatch(/#\s+raw\/corrupt\.fits: /);
    expect(() => parseManifestText(text, 'run.yaml')).toThrow(/distance_mpc|arcsec_per_pixel|lines/);
    const manifestPath = join(dir, 'draft.yaml');
    const parsed = parseManifestText(filled(text), manifestPath);
    const resolved = resolveManifest(parsed, manifestPath);
    expect(resolved.targets.map((t) => t.name).sort()).toEqual(run.truth.targets.map((t) => t.name).sort());
  });

  it('whorl inventory --out writes the draft, refuses to overwrite it without --force, and exits 0', async () => {
    const out = join(dir, 'inventory.yaml');
    const io = memoryIo();
    expect(await main(['node', 'whorl', 'inventory', raw, '--out', out], io)).toBe(0);
    expect(io.stdout).toMatch(/unreadable: .*corrupt\.fits/);
    expect(readFileSync(out, 'utf8')).toBe(draftManifestYaml(inv, raw, dir));
    const again = memoryIo();
    expect(await main(['node', 'whorl', 'inventory', raw, '--out', out], again)).toBe(2);
    expect(again.stderr).toMatch(/inventory\.yaml: file exists; pass --force/);
    expect(await main(['node', 'whorl', 'inventory', raw, '--out', out, '--force'], memoryIo())).toBe(0);
  });

  it('whorl inventory --out makes missing folders, and a folder or a file in the way exits 2 naming it', async () => {
    const nested = join(dir, 'drafts', 'night1', 'run.yaml');
    expect(await main(['node', 'whorl', 'inventory', raw, '--out', nested], memoryIo())).toBe(0);
    expect(readFileSync(nested, 'utf8')).toBe(draftManifestYaml(inv, raw, join(dir, 'drafts', 'night1')));
    const blocker = join(dir, 'a-file');
    writeFileSync(blocker, 'x\n');
    for (const [out, words] of [[join(dir, 'drafts'), /drafts: is a folder/], [join(blocker, 'run.yaml'), /a-file\/run\.yaml: cannot write the draft/]] as const) {
      const io = memoryIo();
      expect(await main(['node', 'whorl', 'inventory', raw, '--out', out, '--force'], io)).toBe(2);
      expect(io.stderr).toMatch(words);
      expect(io.stderr).not.toMatch(/internal error|\n\s+at /);
    }
  });

  it('whorl inventory on a missing folder exits 2 naming it', async () => {
    const io = memoryIo();
    expect(await main(['node', 'whorl', 'inventory', join(dir, 'nope')], io)).toBe(2);
    expect(io.stderr).toMatch(/nope: no such folder/);
  });
});
