import { afterEach, describe, expect, it } from 'vitest';
import { emptyPool, giveBack, takeFloat32, takeUint16 } from '../../src/kernels/frame-pool.js';
import { decodeUnsigned16 } from '../../src/fits/unsigned16.js';

const BIG = (1 << 20) + 3; // above the pool's smallest length, odd

afterEach(() => emptyPool());

describe('frame pool', () => {
  it('hands a given-back array to the next taker of its type and length, once', () => {
    const a = new Float32Array(BIG);
    giveBack(a, a); // the second is the same buffer: kept once
    expect(takeUint16(BIG) === a).toBe(false);
    expect(takeFloat32(BIG - 1) === a).toBe(false);
    expect(takeFloat32(BIG) === a).toBe(true);
    const fresh = takeFloat32(BIG);
    expect(fresh === a).toBe(false);
    expect(fresh.buffer === a.buffer).toBe(false);
  });

  it('keeps no views into a larger buffer, no small arrays, a bounded number per size, nothing after emptyPool', () => {
    const whole = new Uint16Array(2 * BIG);
    giveBack(whole.subarray(0, BIG), whole.subarray(BIG), new Uint16Array(1000));
    expect(takeUint16(BIG).buffer === whole.buffer).toBe(false);
    expect(takeUint16(1000).buffer.byteLength).toBe(2000);
    const many = Array.from({ length: 10 }, () => new Uint16Array(BIG));
    giveBack(...many);
    const taken = Array.from({ length: 10 }, () => takeUint16(BIG));
    expect(taken.filter((t) => many.includes(t)).length).toBeLessThan(10);
    expect(new Set(taken.map((t) => t.buffer)).size).toBe(10); // never two takers on one buffer
    giveBack(new Float32Array(BIG));
    emptyPool();
    expect(takeFloat32(BIG).every((v) => v === 0)).toBe(true); // a new, zeroed array
  });

  it('decodeUnsigned16 overwrites a pooled dead frame in full (FITS Standard 4.0, 5.2.5: stored = value - 32768, big-endian)', () => {
    const values = new Uint16Array(BIG);
    for (let i = 0; i < BIG; i++) values[i] = (i * 7919 + 13) & 0xffff;
    const bytes = new Uint8Array(2 * BIG + 5);
    for (let i = 0; i < BIG; i++) {
      const stored = values[i]! - 32768; // two's complement, big-endian
      bytes[5 + 2 * i] = (stored >> 8) & 0xff;
      bytes[6 + 2 * i] = stored & 0xff;
    }
    const dead = new Uint16Array(BIG).fill(0xabcd);
    giveBack(dead);
    const got = decodeUnsigned16(bytes, 5, BIG);
    expect(got === dead).toBe(true);
    let wrong = 0;
    for (let i = 0; i < BIG; i++) if (got[i] !== values[i]) wrong++;
    expect(wrong).toBe(0);
  });
});
