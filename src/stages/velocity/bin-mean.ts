/**
 * The velocity of a row bin from its lines. Lines of one tied group share their velocity in the
 * fit, so their estimates are fully correlated: a group counts once, with the weighted mean of its
 * members and the matching error for correlation 1 (sum w_i s_i / sum w_i). Groups are independent:
 * inverse-variance mean, error 1/sqrt(sum w).
 */
import { weightedMean } from '../../kernels/weighted-mean.js';

export interface LineEstimate {
  group: string;
  vLos: number;
  vLosErr: number;
  flags: number;
}

export interface BinVelocity {
  vLos: number;
  vLosErr: number;
  /** OR of the flags of the estimates that were averaged (of all of them when none was usable). */
  flags: number;
  /** Chi-square of the groups about the mean and its degrees of freedom (groups - 1). */
  chi2: number;
  dof: number;
}

const usable = (e: LineEstimate) => Number.isFinite(e.vLos) && Number.isFinite(e.vLosErr) && e.vLosErr > 0;

/** Combine the estimates of one bin; `avoidFlags` leaves flagged estimates out when clean ones exist. */
export function binVelocity(estimates: LineEstimate[], avoidFlags: number): BinVelocity {
  const finite = estimates.filter(usable);
  const clean = finite.filter((e) => (e.flags & avoidFlags) === 0);
  const used = clean.length > 0 ? clean : finite;
  const flags = (used.length > 0 ? used : estimates).reduce((f, e) => f | e.flags, 0);
  if (used.length === 0) return { vLos: NaN, vLosErr: NaN, flags, chi2: NaN, dof: 0 };

  const groups = new Map<string, LineEstimate[]>();
  for (const e of used) groups.set(e.group, [...(groups.get(e.group) ?? []), e]);
  const perGroup = [...groups.values()].map((members) => {
    let sw = 0;
    let sv = 0;
    let ss = 0;
    for (const m of members) {
      const w = 1 / (m.vLosErr * m.vLosErr);
      sw += w;
      sv += w * m.vLos;
      ss += w * m.vLosErr;
    }
    return { v: sv / sw, s: ss / sw };
  });

  const m = weightedMean(perGroup.map((g) => g.v), perGroup.map((g) => g.s));
  return { vLos: m.mean, vLosErr: m.err, flags, chi2: m.chi2, dof: perGroup.length - 1 };
}
