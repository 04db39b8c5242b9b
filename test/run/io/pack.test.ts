import { describe, expect, it } from 'vitest';
import { Header } from '../../../src/fits/header.js';
import { pack, packToBytes, unpack, unpackFromBytes } from '../../../src/run/io/pack.js';

describe('pack', () => {
  const header = new Header().set('OBJECT', 'Halden Spiral', 'name');
  const plain = { a: 1, list: [1, 2, null, 'x'], data: new Float32Array([1, 2]) };
  const value = { n: 3, s: 'x', none: null, gone: undefined, plain, rows: [plain, { header }, 7, null], header, sparse: [, header] };

  it('tags every Header, copies only the containers above one and shares the rest', () => {
    const p = pack(value) as typeof value;
    expect(p).not.toBe(value);
    expect(p.plain).toBe(plain);
    expect(p.rows).not.toBe(value.rows);
    expect(p.rows[0]).toBe(plain);
    expect(p.rows[1]).toEqual({ header: { __whorlHeaderCards: header.cards } });
    expect(p.header).toEqual({ __whorlHeaderCards: header.cards });
    expect(p.sparse[1]).toEqual({ __whorlHeaderCards: header.cards });
    expect(value.header).toBe(header);
    expect(value.rows[1]).toEqual({ header });
    expect(pack(plain)).toBe(plain);
  });

  it('round-trips through bytes with the Headers rebuilt', () => {
    const back = unpackFromBytes<typeof value>(packToBytes(value));
    expect(back.header).toBeInstanceOf(Header);
    expect(back.header.cards).toEqual(header.cards);
    expect((back.rows[1] as { header: Header }).header).toBeInstanceOf(Header);
    expect(back.plain).toEqual(plain);
    expect(unpack(pack([1, 'a', null]))).toEqual([1, 'a', null]);
  });
});
