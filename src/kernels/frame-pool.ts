/**
 * Dead full-frame arrays kept for the next array of the same type and length (one pool per
 * thread). A new large typed array comes from fresh memory pages, each faulted in on first touch
 * (~3-4 us a page here, ~35 ms a 32 MB frame); an array taken from here has its pages already.
 * A taken array holds old values: whoever takes one overwrites it in full. Only arrays that
 * nothing reads any more may be given back.
 */

/** Smaller arrays come cheaply from V8's own heap. */
const MIN_LENGTH = 1 << 20;
/** Arrays kept per type and length: most of what three exposures take, few enough to bound memory (6 raised the peak by ~80 MB). */
const MAX_PER_SIZE = 5;

type PooledArray = Float32Array | Uint16Array;

const float32 = new Map<number, Float32Array[]>();
const uint16 = new Map<number, Uint16Array[]>();
const pooled = new Set<ArrayBufferLike>();

function take<T extends PooledArray>(lists: Map<number, T[]>, n: number): T | undefined {
  const a = lists.get(n)?.pop();
  if (a) pooled.delete(a.buffer);
  return a;
}

/** A Float32Array of n values, old values in it when pooled: overwrite every one. */
export function takeFloat32(n: number): Float32Array {
  return take(float32, n) ?? new Float32Array(n);
}

/** A Uint16Array of n values, old values in it when pooled: overwrite every one. */
export function takeUint16(n: number): Uint16Array {
  return take(uint16, n) ?? new Uint16Array(n);
}

/**
 * Keep `arrays` (read by nobody any more) for takeFloat32 / takeUint16. Views that do not span
 * their whole buffer, buffers already kept and small arrays are left to the collector.
 */
export function giveBack(...arrays: PooledArray[]): void {
  for (const a of arrays) {
    if (a.length < MIN_LENGTH || a.byteOffset !== 0 || a.byteLength !== a.buffer.byteLength || pooled.has(a.buffer)) continue;
    if (a instanceof Float32Array) keep(float32, a);
    else keep(uint16, a);
  }
}

function keep<T extends PooledArray>(lists: Map<number, T[]>, a: T): void {
  let list = lists.get(a.length);
  if (!list) lists.set(a.length, (list = []));
  if (list.length >= MAX_PER_SIZE) return;
  list.push(a);
  pooled.add(a.buffer);
}

/** Drop every kept array, for the collector to return their memory. */
export function emptyPool(): void {
  float32.clear();
  uint16.clear();
  pooled.clear();
}
