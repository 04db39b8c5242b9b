/** From a group fit in a bin to the measurements of its lines (with flags) and the report's BinFit. */
import { SPEED_OF_LIGHT_KMS as C } from '../../physics/constants.js';
import { LINE_FLAGS, type BinFit, type LineMeasurement } from '../../products/lines.js';
import type { GroupWindow } from './bin-fits.js';
import type { GroupFit } from './fit-group.js';
import type { LineSettings } from './settings.js';

/** Two lines closer than this many observed FWHM are blended (common practice). */
const BLEND_FWHM = 2;
const FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.log(2));

export function toMeasurements(bin: number, g: GroupWindow, fit: GroupFit, widthHeld: boolean, residualNormRms: Float32Array, settings: LineSettings): LineMeasurement[] {
  const { spec, win, excluded, x0 } = g;
  const q0 = spec.rest[0]!;
  const chi2Reduced = fit.dof > 0 ? fit.chi2 / fit.dof : NaN;
  return spec.members.map((line, k) => {
    const q = spec.rest[k]! / q0;
    const centre = fit.centre * q;
    const sigmaObs = fit.sigma * q;
    const sigmaObsErr = fit.sigmaErr * q;
    const col = columnIn(win.wave, centre);
    const sigmaInstr = g.instrumental[k]!;
    let sigmaKms = NaN;
    let sigmaKmsErr = NaN;
    if (sigmaObs > sigmaInstr) {
      const intrinsic = Math.sqrt(sigmaObs * sigmaObs - sigmaInstr * sigmaInstr);
      sigmaKms = (C * intrinsic) / centre;
      sigmaKmsErr = widthHeld ? NaN : ((C / centre) * sigmaObs * sigmaObsErr) / intrinsic;
    }
    const flux = fit.flux[k]!;
    const fluxErr = fit.fluxErr[k]!;
    const snr = fluxErr > 0 ? flux / fluxErr : 0;
    let flags = 0;
    if (!(snr >= settings.snrTarget)) flags |= LINE_FLAGS.lowSnr;
    if (chi2Reduced > settings.poorFitChi2) flags |= LINE_FLAGS.poorFit;
    if (fit.shapeAtBound || fit.fluxAtBound[k]) flags |= LINE_FLAGS.atBound;
    if (!fit.converged) flags |= LINE_FLAGS.notConverged;
    if (widthHeld) flags |= LINE_FLAGS.widthConstrained;
    let masked = false;
    let skyWorst = 0;
    for (let i = 0; i < win.wave.length; i++) {
      const d = Math.abs(win.wave[i]! - centre);
      if (d <= 3 * sigmaObs && excluded[i]) masked = true;
      if (d <= 2 * sigmaObs) skyWorst = Math.max(skyWorst, residualNormRms[x0 + i] ?? 0);
    }
    if (masked) flags |= LINE_FLAGS.maskedPixels;
    if (skyWorst > settings.skyResidualLimit) flags |= LINE_FLAGS.skyResidual;
    for (let j = 0; j < spec.members.length; j++) {
      if (j !== k && Math.abs(fit.centre * (spec.rest[j]! / q0) - centre) < BLEND_FWHM * FWHM_PER_SIGMA * sigmaObs) flags |= LINE_FLAGS.blended;
    }
    return {
      bin,
      line,
      group: spec.name,
      restAir: spec.rest[k]!,
      centerPx: x0 + col,
      wavelength: centre,
      wavelengthErr: fit.centreErr * q,
      sigmaObsAngstrom: sigmaObs,
      sigmaInstrAngstrom: sigmaInstr,
      sigmaKms,
      sigmaKmsErr,
      flux,
      fluxErr,
      snr,
      chi2Reduced,
      flags,
    };
  });
}

export function toBinFit(bin: number, g: GroupWindow, fit: GroupFit): BinFit {
  const { win } = g;
  const m = win.weight.length;
  // Plain loops: TypedArray.from with a mapping function takes V8's slow iterator path.
  const error = new Float32Array(m);
  const excluded = new Uint8Array(m);
  for (let i = 0; i < m; i++) {
    const w = win.weight[i]!;
    error[i] = w > 0 ? 1 / Math.sqrt(w) : NaN;
    excluded[i] = w > 0 ? 0 : 1;
  }
  return {
    bin,
    group: g.spec.name,
    wavelength: win.wave.slice(),
    data: new Float32Array(win.data),
    error,
    model: new Float32Array(fit.model),
    excluded,
  };
}

/** Fractional index of lambda in an increasing wavelength array (linear between centres). */
function columnIn(wave: Float64Array, lambda: number): number {
  const n = wave.length;
  if (lambda <= wave[0]!) return 0;
  for (let i = 1; i < n; i++) if (wave[i]! >= lambda) return i - 1 + (lambda - wave[i - 1]!) / (wave[i]! - wave[i - 1]!);
  return n - 1;
}
