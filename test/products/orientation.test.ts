import { describe, expect, it } from 'vitest';
import { flipFrameX, toInternal, toRaw } from '../../src/products/orientation.js';
import { Header } from '../../src/fits/header.js';
import type { CalibratedFrame, Orientation } from '../../src/products/frame.js';
import { reference } from '../stages/ccd/reference.js';

// Outside reference: numpy transpose and fliplr of the same raw image (fixtures/ccd/make_ccd_fixtures.py).
describe('orientation mapping', () => {
  const o = reference.orientation;
  const raw = Float32Array.from(o.raw);
  const cases: [Orientation, number[]][] = [
    [{ transpose: false, flipX: false }, o.raw],
    [{ transpose: true, flipX: false }, o.transpose],
    [{ transpose: false, flipX: true }, o.flip],
    [{ transpose: true, flipX: true }, o.transposeFlip],
  ];
  for (const [orientation, expected] of cases) {
    it(`toInternal(${JSON.stringify(orientation)}) equals numpy's mapping, and toRaw inverts it`, () => {
      const internal = toInternal(raw, o.rawWidth, o.rawHeight, orientation);
      expect(Array.from(internal.data)).toEqual(expected);
      expect([internal.width, internal.height]).toEqual(orientation.transpose ? [o.rawHeight, o.rawWidth] : [o.rawWidth, o.rawHeight]);
      const back = toRaw(internal.data, internal.width, internal.height, orientation);
      expect(Array.from(back.data)).toEqual(o.raw);
      expect([back.width, back.height]).toEqual([o.rawWidth, o.rawHeight]);
    });
  }
  it('keeps the array type (masks stay Uint16Array)', () => {
    const m = toInternal(Uint16Array.from(o.raw), o.rawWidth, o.rawHeight, { transpose: true, flipX: true });
    expect(m.data).toBeInstanceOf(Uint16Array);
  });
  it('flipFrameX mirrors sci, var and mask and toggles flipX, so toRaw of the result is unchanged', () => {
    const internal = toInternal(raw, o.rawWidth, o.rawHeight, { transpose: true, flipX: false });
    const frame: CalibratedFrame = {
      width: internal.width, height: internal.height, sci: internal.data, var: internal.data.map((v) => 2 * v),
      mask: Uint16Array.from(internal.data), orientation: { transpose: true, flipX: false },
      section: { x0: 0, x1: o.rawWidth, y0: 0, y1: o.rawHeight }, header: new Header(), exposures: [], exptimeS: 1, gain: 1, readNoiseE: 1,
    };
    const flipped = flipFrameX(frame);
    expect(flipped.orientation).toEqual({ transpose: true, flipX: true });
    expect(Array.from(flipped.sci)).toEqual(o.transposeFlip);
    expect(Array.from(toRaw(flipped.var, flipped.width, flipped.height, flipped.orientation).data)).toEqual(o.raw.map((v) => 2 * v));
    expect(Array.from(toRaw(flipped.mask, flipped.width, flipped.height, flipped.orientation).data)).toEqual(o.raw);
    expect(frame.orientation.flipX).toBe(false);
  });
});
