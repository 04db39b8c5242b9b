/**
 * The error function and the pixel-integrated Gaussian the simulator renders lines with.
 * erf: Abramowitz & Stegun (1964) formula 7.1.26, absolute error below 1.5e-7.
 */

const P = 0.3275911;
const A1 = 0.254829592;
const A2 = -0.284496736;
const A3 = 1.421413741;
const A4 = -1.453152027;
const A5 = 1.061405429;

/** erf(x) to 1.5e-7 absolute (Abramowitz & Stegun 7.1.26). */
export function erf(x: number): number {
  const ax = x < 0 ? -x : x;
  const t = 1 / (1 + P * ax);
  const y = 1 - ((((A5 * t + A4) * t + A3) * t + A2) * t + A1) * t * Math.exp(-ax * ax);
  return x < 0 ? -y : y;
}

/** Half-width of the rendered Gaussian, in sigmas: the flux beyond is below 2e-9 of the total. */
const HALF_WIDTH_SIGMAS = 6;

/**
 * Add a Gaussian of total `flux` centred at pixel coordinate `centre` (0-based pixel centres)
 * with standard deviation `sigma` (pixels), integrated over each pixel [d - 0.5, d + 0.5], to
 * out[offset + d] for 0 <= d < n. Only the pixels within 6 sigma are touched; flux falling
 * outside 0..n-1 is lost, as on a detector.
 */
export function addPixelGaussian(out: Float32Array, offset: number, n: number, centre: number, sigma: number, flux: number): void {
  const first = Math.max(0, Math.floor(centre - HALF_WIDTH_SIGMAS * sigma));
  const last = Math.min(n - 1, Math.ceil(centre + HALF_WIDTH_SIGMAS * sigma));
  if (last < first) return;
  const scale = 1 / (Math.SQRT2 * sigma);
  const half = 0.5 * flux;
  let lower = erf((first - 0.5 - centre) * scale);
  for (let d = first; d <= last; d++) {
    const upper = erf((d + 0.5 - centre) * scale);
    out[offset + d] += half * (upper - lower);
    lower = upper;
  }
}
