/** Reference values made by fixtures/sim/make_fixtures.py with Debian's scipy and astropy. */
import { readFileSync } from 'node:fs';

export interface SimReference {
  erf: { x: number[]; erf: number[] };
  pixelGaussian: { centre: number; sigma: number; flux: number; n: number; values: number[] }[];
  poissonPmf: Record<string, number[]>;
  chi2ppf999: Record<string, number>;
  normalTail: Record<string, number>;
  /** Bin probabilities of N(0, 1): bins (-inf, e0), [e0, e1), ..., [e_last, inf). */
  normalBins: { edges: number[]; p: number[] };
  barycentric: { source: string; site: { latitudeDeg: number; longitudeDeg: number; heightM: number }; ra: string; dec: string; midExposureUtc: string[]; kms: number[] };
}

export const REFERENCE: SimReference = JSON.parse(readFileSync(new URL('../../fixtures/sim/reference.json', import.meta.url), 'utf8'));
