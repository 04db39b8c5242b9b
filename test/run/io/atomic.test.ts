import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, utimesSync, writeFileSync } from 'node:fs';
import { hostname, tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { removePartialFiles, writeFileAtomic } from '../../../src/run/io/atomic.js';

const HOST = hostname().replace(/[^A-Za-z0-9_-]/g, '_');

describe('writeFileAtomic', () => {
  it('creates the folder, writes the bytes and leaves no temporary file', () => {
    const dir = mkdtempSync(join(tmpdir(), 'whorl-atomic-'));
    writeFileAtomic(join(dir, 'a', 'b.txt'), 'hello');
    writeFileAtomic(join(dir, 'a', 'b.txt'), new Uint8Array([104, 105]));
    expect(readFileSync(join(dir, 'a', 'b.txt'), 'utf8')).toBe('hi');
    expect(readdirSync(join(dir, 'a'))).toEqual(['b.txt']);
  });

  it('writes pieces at their positions, and a failing writer leaves the old file and no temporary file', () => {
    const dir = mkdtempSync(join(tmpdir(), 'whorl-atomic-'));
    const path = join(dir, 'c.bin');
    writeFileAtomic(path, (write) => {
      write(new Uint8Array([3]), 2);
      write(new Uint8Array(0), 1);
      write(new Uint8Array([1, 2]), 0);
    });
    expect([...readFileSync(path)]).toEqual([1, 2, 3]);
    const failing = (write: (bytes: Uint8Array, position: number) => void) => {
      write(new Uint8Array([9, 9]), 0);
      throw new Error('encoder failed');
    };
    expect(() => writeFileAtomic(path, failing)).toThrow('encoder failed');
    expect([...readFileSync(path)]).toEqual([1, 2, 3]);
    expect(readdirSync(dir)).toEqual(['c.bin']);
  });
});

describe('removePartialFiles', () => {
  it("removes the leftovers of dead processes, keeps live ones' and recent ones of other hosts", () => {
    const dir = mkdtempSync(join(tmpdir(), 'whorl-partial-'));
    const dead = spawnSync(process.execPath, ['-e', 'console.log(process.pid)'], { encoding: 'utf8' });
    const deadPid = Number(dead.stdout.trim());
    const files = {
      dead: `.spectrum.fits.partial-${HOST}-${deadPid}-0`,
      live: `.spectrum.fits.partial-${HOST}-${process.ppid}-3`,
      otherRecent: '.rows.csv.partial-othernode-123-0',
      otherOld: '.rows.csv.partial-othernode-456-0',
      product: 'spectrum.fits',
    };
    for (const f of Object.values(files)) writeFileSync(join(dir, f), 'x');
    const old = new Date(Date.now() - 2 * 24 * 3600 * 1000);
    utimesSync(join(dir, files.otherOld), old, old);
    expect(removePartialFiles(dir)).toBe(2);
    expect(existsSync(join(dir, files.dead))).toBe(false);
    expect(existsSync(join(dir, files.otherOld))).toBe(false);
    for (const f of [files.live, files.otherRecent, files.product]) expect(existsSync(join(dir, f)), f).toBe(true);
    expect(removePartialFiles(join(dir, 'absent'))).toBe(0);
  });
});
