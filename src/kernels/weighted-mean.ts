/** The inverse-variance weighted mean of measurements with 1-sigma errors, and its error. */

export interface WeightedMean {
  /** sum(v / e^2) / sum(1 / e^2), in the units of the values. */
  mean: number;
  /** 1 / sqrt(sum(1 / e^2)): the error of the mean when the errors are honest. */
  err: number;
  /** sum(((v - mean) / e)^2): near n - 1 when the values agree within their errors. */
  chi2: number;
}

/** Over the pairs (values[i], errors[i]); NaN mean and error when there are none. */
export function weightedMean(values: ArrayLike<number>, errors: ArrayLike<number>): WeightedMean {
  let sw = 0;
  let swv = 0;
  for (let i = 0; i < values.length; i++) {
    const w = 1 / (errors[i]! * errors[i]!);
    sw += w;
    swv += w * values[i]!;
  }
  const mean = swv / sw;
  let chi2 = 0;
  for (let i = 0; i < values.length; i++) chi2 += ((values[i]! - mean) / errors[i]!) ** 2;
  return { mean, err: 1 / Math.sqrt(sw), chi2 };
}
