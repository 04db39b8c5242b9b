/**
 * Cross-correlation of real sequences by FFT (fft.js), zero-padded so that nothing wraps.
 * Definition (as numpy.correlate(a, b, 'full') reversed in lag sign): c(k) = sum_i a[i + k] b[i],
 * for lags k in [-maxLag, maxLag]; a positive peak lag means a is b shifted towards higher index.
 */
import FFT from 'fft.js';

/** Correlates many sequences against one reference without redoing the reference's transform. */
export class Correlator {
  readonly size: number;
  private readonly fft: FFT;
  private readonly refSpectrum: number[];
  private readonly input: Float64Array;
  private readonly spectrum: number[];
  private readonly product: number[];
  private readonly back: number[];

  /**
   * @param reference the sequence `a` of the definition.
   * @param maxLength the longest `b` that will be correlated.
   */
  constructor(reference: ArrayLike<number>, maxLength: number) {
    let size = 4;
    while (size < reference.length + maxLength) size *= 2;
    this.size = size;
    this.fft = new FFT(size);
    this.input = new Float64Array(size);
    this.refSpectrum = this.fft.createComplexArray();
    this.spectrum = this.fft.createComplexArray();
    this.product = this.fft.createComplexArray();
    this.back = this.fft.createComplexArray();
    for (let i = 0; i < reference.length; i++) this.input[i] = reference[i]!;
    this.fft.realTransform(this.refSpectrum, this.input);
    this.fft.completeSpectrum(this.refSpectrum);
  }

  /** c(k) for k = -maxLag..maxLag into out[k + maxLag] (out has length 2 maxLag + 1). */
  correlate(b: ArrayLike<number>, maxLag: number, out = new Float64Array(2 * maxLag + 1)): Float64Array {
    return this.correlateTransformed(this.transform(b, this.spectrum), maxLag, out);
  }

  /**
   * The spectrum of `b` (zero-padded to `size`) that correlateTransformed takes, into `out`; the
   * same for every Correlator of this size, so one transform serves several references.
   */
  transform(b: ArrayLike<number>, out: number[] = this.fft.createComplexArray()): number[] {
    if (b.length > this.size) throw new RangeError(`Correlator: ${b.length} values for size ${this.size}`);
    this.input.fill(0);
    for (let i = 0; i < b.length; i++) this.input[i] = b[i]!;
    this.fft.realTransform(out, this.input);
    this.fft.completeSpectrum(out);
    return out;
  }

  /** As correlate, for `b` given by its spectrum from transform (of a Correlator of the same size). */
  correlateTransformed(spectrum: number[], maxLag: number, out = new Float64Array(2 * maxLag + 1)): Float64Array {
    if (2 * maxLag + 1 > this.size) throw new RangeError(`Correlator: maxLag ${maxLag} too large for size ${this.size}`);
    if (spectrum.length !== 2 * this.size) throw new RangeError(`Correlator: spectrum of ${spectrum.length / 2} values for size ${this.size}`);
    // A(f) conj(B(f)) transforms back to sum_i a[i + k] b[i] at index k (mod size).
    multiplyConjugate(this.refSpectrum, spectrum, this.product, this.size);
    this.fft.inverseTransform(this.back, this.product);
    for (let k = -maxLag; k <= maxLag; k++) out[k + maxLag] = this.back[2 * ((k + this.size) % this.size)]!;
    return out;
  }
}

/**
 * p = a conj(s), complex arrays of `size` interleaved values. A function of its own: code after
 * a long loop has no type feedback when V8 compiles that loop on the fly, and would send every
 * later call back to the interpreter.
 */
function multiplyConjugate(a: number[], s: number[], p: number[], size: number): void {
  for (let i = 0; i < 2 * size; i += 2) {
    p[i] = a[i]! * s[i]! + a[i + 1]! * s[i + 1]!;
    p[i + 1] = a[i + 1]! * s[i]! - a[i]! * s[i + 1]!;
  }
}

/** One-off c(k) = sum_i a[i + k] b[i], k = -maxLag..maxLag, into an array of length 2 maxLag + 1. */
export function crossCorrelate(a: ArrayLike<number>, b: ArrayLike<number>, maxLag: number): Float64Array {
  return new Correlator(a, b.length).correlate(b, maxLag);
}

/** Largest value of a correlation and its lag, refined by a parabola through the three samples around it. */
export function correlationPeak(c: Float64Array, maxLag: number): { lag: number; value: number; index: number } {
  let best = 0;
  for (let i = 1; i < c.length; i++) if (c[i]! > c[best]!) best = i;
  let offset = 0;
  if (best > 0 && best < c.length - 1) {
    const l = c[best - 1]!;
    const m = c[best]!;
    const r = c[best + 1]!;
    const d = l - 2 * m + r;
    if (d < 0) offset = (0.5 * (l - r)) / d;
  }
  return { lag: best - maxLag + offset, value: c[best]!, index: best };
}
