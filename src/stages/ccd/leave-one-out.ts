/**
 * Steps 1-3 of combine-exposures.ts at one pixel whose exposures do not all agree: the starting
 * set from a low order statistic of the rates, then the leave-one-out test repeated until the
 * kept set holds.
 */

/** Most exposures of one combination (the kept set is a bit mask of an int32). */
export const MAX_EXPOSURES = 30;
const MAX_ROUNDS = 5;

export interface KeptTest {
  values: Float64Array;
  t: Float64Array;
  nExp: number;
  /** Read noise and bias through the flat, e^2. */
  constant: number;
  flat: number;
  rel2: number;
  threshold: number;
}

/**
 * The exposures that pass against the others of `kept` (leave-one-out); an exposure that is the
 * only one kept stays. Noise model s^2(e) = constant + e / F + rel2 e^2 with e = max(r t, 0);
 * the reference's variance sums it over the others in closed form.
 */
function keptAgainstOthers(c: KeptTest, kept: number): number {
  let sumV = 0;
  let sumT = 0;
  let sumT2 = 0;
  let count = 0;
  for (let j = 0; j < c.nExp; j++) {
    if (!(kept & (1 << j))) continue;
    sumV += c.values[j]!;
    sumT += c.t[j]!;
    sumT2 += c.t[j]! * c.t[j]!;
    count++;
  }
  let next = 0;
  for (let i = 0; i < c.nExp; i++) {
    const self = kept & (1 << i) ? 1 : 0;
    const others = count - self;
    if (others === 0) {
      next |= self << i;
      continue;
    }
    const ti = c.t[i]!;
    const oT = sumT - self * ti;
    const oT2 = sumT2 - self * ti * ti;
    const rate = (sumV - self * c.values[i]!) / oT;
    const rp = rate > 0 ? rate : 0;
    const refVar = others * c.constant + (rp * oT) / c.flat + c.rel2 * rp * rp * oT2;
    const e = rp * ti;
    const variance = c.constant + e / c.flat + c.rel2 * e * e + (refVar * ti * ti) / (oT * oT);
    if (c.values[i]! - rate * ti <= c.threshold * Math.sqrt(variance)) next |= 1 << i;
  }
  return next;
}

/** k-th smallest of a[0..n) by insertion sort of a copy (n is a handful). */
const sorted = new Float64Array(MAX_EXPOSURES);
function orderStatistic(a: Float64Array, n: number, k: number): number {
  for (let i = 0; i < n; i++) {
    const v = a[i]!;
    let j = i - 1;
    while (j >= 0 && sorted[j]! > v) {
      sorted[j + 1] = sorted[j]!;
      j--;
    }
    sorted[j + 1] = v;
  }
  return sorted[k]!;
}

const rates = new Float64Array(MAX_EXPOSURES);

/** Steps 1-3 at one pixel (test.values, constant and flat set): the kept exposures' bits. */
export function searchKept(test: KeptTest, startRank: number): number {
  const { values, t, nExp } = test;
  for (let i = 0; i < nExp; i++) rates[i] = values[i]! / t[i]!;
  const startRate = orderStatistic(rates, nExp, startRank);
  let kept = 0;
  for (let i = 0; i < nExp; i++) if (rates[i]! <= startRate) kept |= 1 << i;
  for (let round = 0; round < MAX_ROUNDS; round++) {
    const next = keptAgainstOthers(test, kept);
    if (next === kept) break;
    kept = next;
  }
  return kept;
}

