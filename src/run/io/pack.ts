/**
 * Products cross thread and cache boundaries by structured cloning (worker messages,
 * v8.serialize on disk), which keeps typed arrays but drops class prototypes. The only class in
 * the products is Header; `pack` tags each one and `unpack` rebuilds it.
 */
import { deserialize, serialize } from 'node:v8';
import { Header, type Card } from '../../fits/header.js';

const TAG = '__whorlHeaderCards';

/**
 * Headers tagged; the objects and arrays above one are copied, everything else is shared, not
 * copied (most of a product holds no Header). Primitives are passed over without a call: the
 * report's inputs hold long arrays of numbers and of small objects.
 */
export function pack<T>(value: T): unknown {
  if (value instanceof Header) return { [TAG]: value.cards };
  if (Array.isArray(value)) {
    let out: unknown[] | undefined;
    for (let i = 0; i < value.length; i++) {
      const v: unknown = value[i];
      if (v === null || typeof v !== 'object') continue;
      const p = pack(v);
      if (p !== v) (out ??= [...value])[i] = p;
    }
    return out ?? value;
  }
  if (value && typeof value === 'object' && !ArrayBuffer.isView(value)) {
    const o = value as Record<string, unknown>;
    let out: Record<string, unknown> | undefined;
    for (const k of Object.keys(o)) {
      const v = o[k];
      if (v === null || typeof v !== 'object') continue;
      const p = pack(v);
      if (p !== v) (out ??= { ...o })[k] = p;
    }
    return out ?? value;
  }
  return value;
}

export function unpack<T>(value: unknown): T {
  if (Array.isArray(value)) return value.map((v) => unpack(v)) as T;
  if (value && typeof value === 'object' && !ArrayBuffer.isView(value)) {
    const o = value as Record<string, unknown>;
    if (TAG in o) return new Header(o[TAG] as Card[]) as T;
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(o)) out[k] = unpack(v);
    return out as T;
  }
  return value as T;
}

/** Bytes of a packed value, for the on-disk cache. */
export function packToBytes(value: unknown): Buffer {
  return serialize(pack(value));
}

export function unpackFromBytes<T>(bytes: Uint8Array): T {
  return unpack<T>(deserialize(bytes));
}
