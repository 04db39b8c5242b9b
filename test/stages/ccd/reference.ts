/** The committed outside-reference fixture of the CCD stage (fixtures/ccd/make_ccd_fixtures.py). */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

const path = fileURLToPath(new URL('../../../fixtures/ccd/ccd_reference.json', import.meta.url));

export interface CcdReference {
  median: { width: number; height: number; image: number[]; size3: number[]; size5: number[]; size7: number[] };
  laplacian: { width: number; height: number; lplus: number[] };
  stack: {
    width: number; height: number; count: number; gain: number; readNoiseE: number; nSigma: number; maxIterations: number;
    frames: number[]; meanStd: number[]; keptStd: number[]; meanReadNoise: number[]; keptReadNoise: number[];
  };
  /** Five of the stack's frames with values outside the small-stack window (null: NaN). */
  stack5: { count: number; frames: (number | null)[]; meanReadNoise: number[]; keptReadNoise: number[] };
  flat: {
    width: number; height: number; count: number; gain: number; readNoiseE: number; order: number;
    frames: number[]; levelAdu: number; combined: number[]; kept: number[]; normalised: number[];
  };
  /** Rows of an odd width (a centre pixel of its own) with outliers; clipping rounds taken per row. */
  flatOdd: { width: number; height: number; order: number; combined: number[]; model: number[]; rounds: number[] };
  science: {
    width: number; height: number; exptimes: number[]; gain: number; readNoiseE: number; biasVarianceAdu: number;
    crSigma: number; crRelativeScatter: number; flat: number[]; flatVariance: number[]; sci: number[]; var: number[];
    combinedSci: number[]; combinedVar: number[]; rejected: number[];
  };
  orientation: { rawWidth: number; rawHeight: number; raw: number[]; transpose: number[]; flip: number[]; transposeFlip: number[] };
}

export const reference: CcdReference = JSON.parse(readFileSync(path, 'utf8')) as CcdReference;

/** Split a flat list of count * size values into count Float32Arrays. */
export function frames(values: number[], count: number): Float32Array[] {
  const size = values.length / count;
  return Array.from({ length: count }, (_, i) => Float32Array.from(values.slice(i * size, (i + 1) * size)));
}

/** Largest |a - b| / max(|b|, floor). */
export function maxRelativeDiff(a: ArrayLike<number>, b: ArrayLike<number>, floor = 1): number {
  let worst = 0;
  for (let i = 0; i < b.length; i++) worst = Math.max(worst, Math.abs(a[i]! - b[i]!) / Math.max(Math.abs(b[i]!), floor));
  return worst;
}
