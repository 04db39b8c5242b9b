/**
 * Legendre polynomials in a coordinate normalised to [-1, 1] over a stated range
 * (the usual basis for wavelength solutions; recurrence (n+1) P_{n+1} = (2n+1) u P_n - n P_{n-1}).
 */

/** Map x in [min, max] to u in [-1, 1]. */
export function normalise(x: number, min: number, max: number): number {
  return (2 * x - (min + max)) / (max - min);
}

/** Fill out[0..order] with P_0(u) .. P_order(u). */
export function legendreBasis(u: number, order: number, out: Float64Array): Float64Array {
  out[0] = 1;
  if (order >= 1) out[1] = u;
  for (let n = 1; n < order; n++) out[n + 1] = ((2 * n + 1) * u * out[n]! - n * out[n - 1]!) / (n + 1);
  return out;
}

/** sum_k c_k P_k(u) by Clenshaw's recurrence (no allocation). */
export function legendreValue(coeffs: ArrayLike<number>, u: number): number {
  let b1 = 0;
  let b2 = 0;
  for (let k = coeffs.length - 1; k >= 1; k--) {
    // Clenshaw for Legendre: alpha_k = (2k+1)u/(k+1), beta_{k+1} = -(k+1)/(k+2)
    const b0 = coeffs[k]! + ((2 * k + 1) / (k + 1)) * u * b1 - ((k + 1) / (k + 2)) * b2;
    b2 = b1;
    b1 = b0;
  }
  return coeffs[0]! + u * b1 - 0.5 * b2;
}

/** A 1-D Legendre series over [min, max]. */
export interface Legendre1D {
  kind: 'legendre1d';
  min: number;
  max: number;
  coeffs: number[];
}

/**
 * A 2-D tensor-product Legendre series: f(x, y) = sum_{i<=xOrder, j<=yOrder} c[j*(xOrder+1)+i] P_i(u) P_j(v).
 */
export interface Legendre2D {
  kind: 'legendre2d';
  xOrder: number;
  yOrder: number;
  xMin: number;
  xMax: number;
  yMin: number;
  yMax: number;
  coeffs: number[];
}

export function evalLegendre1D(model: Legendre1D, x: number): number {
  return legendreValue(model.coeffs, normalise(x, model.min, model.max));
}

const scratchX = new Float64Array(32);
const scratchY = new Float64Array(32);

export function evalLegendre2D(model: Legendre2D, x: number, y: number): number {
  const px = legendreBasis(normalise(x, model.xMin, model.xMax), model.xOrder, scratchX);
  const py = legendreBasis(normalise(y, model.yMin, model.yMax), model.yOrder, scratchY);
  const nx = model.xOrder + 1;
  let sum = 0;
  for (let j = 0; j <= model.yOrder; j++) {
    let row = 0;
    for (let i = 0; i <= model.xOrder; i++) row += model.coeffs[j * nx + i]! * px[i]!;
    sum += row * py[j]!;
  }
  return sum;
}

/**
 * Evaluate a Legendre2D at every pixel centre (x = 0..width-1, y = 0..height-1) into `out`
 * (row-major, length width * height). The x bases are computed once and each row collapses the
 * y sum first, so the cost is (xOrder + 1) multiply-adds per pixel.
 */
export function evalLegendre2DGrid(model: Legendre2D, width: number, height: number, out: Float64Array): Float64Array {
  if (out.length < width * height) throw new RangeError(`evalLegendre2DGrid: out has ${out.length} values, expected ${width * height}`);
  const nx = model.xOrder + 1;
  const xBases = new Float64Array(width * nx);
  const px = new Float64Array(nx);
  for (let x = 0; x < width; x++) {
    legendreBasis(normalise(x, model.xMin, model.xMax), model.xOrder, px);
    xBases.set(px, x * nx);
  }
  const py = new Float64Array(model.yOrder + 1);
  const rowCoeffs = new Float64Array(nx);
  for (let y = 0; y < height; y++) {
    legendreBasis(normalise(y, model.yMin, model.yMax), model.yOrder, py);
    rowCoeffs.fill(0);
    for (let j = 0; j <= model.yOrder; j++) for (let i = 0; i < nx; i++) rowCoeffs[i] += model.coeffs[j * nx + i]! * py[j]!;
    const base = y * width;
    for (let x = 0; x < width; x++) {
      let s = 0;
      const b = x * nx;
      for (let i = 0; i < nx; i++) s += rowCoeffs[i]! * xBases[b + i]!;
      out[base + x] = s;
    }
  }
  return out;
}

/** Change of a Legendre1D over one unit of x centred on x: f(x + 1/2) - f(x - 1/2) (per pixel for a pixel axis). */
export function legendre1DStep(model: Legendre1D, x: number): number {
  return evalLegendre1D(model, x + 0.5) - evalLegendre1D(model, x - 0.5);
}

/** Change of a Legendre2D over one unit of x centred on (x, y): the dispersion per pixel of a wavelength model. */
export function legendre2DStepX(model: Legendre2D, x: number, y: number): number {
  return evalLegendre2D(model, x + 0.5, y) - evalLegendre2D(model, x - 0.5, y);
}
