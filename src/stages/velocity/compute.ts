/**
 * Stage velocity: observed line wavelengths -> line-of-sight velocities per measurement and per
 * row bin, in the chosen convention and rest frame (km/s).
 */
import { DiagnosticLog } from '../../diagnostics.js';
import { InputError, StageError } from '../../errors.js';
import type { VelocityPoint, VelocityTable } from '../../products/curve.js';
import type { CalibratedFrame, StageResult } from '../../products/frame.js';
import { LINE_FLAGS, type LineTable } from '../../products/lines.js';
import { binVelocity, type LineEstimate } from './bin-mean.js';
import { frameCorrection, SPREAD_WARNING_KMS } from './frame-correction.js';
import { lineVelocity } from './line-velocity.js';
import type { VelocitySettings } from './settings.js';

/** 99.9% quantiles of chi-square for 1..10 degrees of freedom (scipy.stats.chi2.ppf(0.999, k)). */
const CHI2_999 = [10.828, 13.816, 16.266, 18.467, 20.515, 22.458, 24.322, 26.124, 27.877, 29.588];

function checkSettings(s: VelocitySettings): void {
  const bad = (key: string, expected: string, actual: unknown) =>
    new InputError('velocity.settings-invalid', `invalid velocity setting ${key}`, { key }, { expected, actual: JSON.stringify(actual) });
  if (s.convention !== 'optical' && s.convention !== 'relativistic') throw bad('convention', "'optical' or 'relativistic'", s.convention);
  if (s.frame !== 'barycentric' && s.frame !== 'heliocentric') throw bad('frame', "'barycentric' or 'heliocentric'", s.frame);
  if (s.restMedium !== 'air' && s.restMedium !== 'vacuum') throw bad('restMedium', "'air' or 'vacuum'", s.restMedium);
}

/**
 * Velocities of every measurement of `lines` and the error-weighted velocity of each row bin
 * (one point per bin, in bin order; NaN where no line of the bin is usable). The frame correction
 * comes from the exposures of `frame` (times, pointing, site; InputError when one is missing).
 * Measurements flagged `notConverged` are left out of a bin's mean when the bin has others.
 */
export function computeVelocities(lines: LineTable, frame: CalibratedFrame, settings: VelocitySettings): StageResult<VelocityTable> {
  checkSettings(settings);
  const log = new DiagnosticLog('velocity');
  const barycentric = frameCorrection(frame, settings);
  log.info('correction', `${settings.frame} correction ${barycentric.correctionKms.toFixed(3)} km/s (exposure-weighted over ${barycentric.exposures.length}); wavelengths compared in ${settings.restMedium}, ${settings.convention} convention`, {
    actual: barycentric.correctionKms,
  });
  if (barycentric.spreadKms > SPREAD_WARNING_KMS) {
    log.warn('correction-spread', `the exposures' corrections span ${barycentric.spreadKms.toFixed(3)} km/s; their exposure-weighted mean is applied`, {
      expected: `<= ${SPREAD_WARNING_KMS}`,
      actual: barycentric.spreadKms,
    });
  }

  const perLine = lines.measurements.map((m) => lineVelocity(m.wavelength, m.wavelengthErr, m.restAir, barycentric.correctionKms, settings.convention, settings.restMedium));
  const byBin: LineEstimate[][] = lines.bins.map(() => []);
  lines.measurements.forEach((m, i) => {
    const slot = byBin[m.bin];
    if (!Number.isInteger(m.bin) || slot === undefined) throw new StageError('velocity', 'unknown-bin', `measurement ${i} (${m.line}) refers to bin ${m.bin}, but the table has ${lines.bins.length} bins`);
    slot.push({ group: m.group, vLos: perLine[i]!.vLos, vLosErr: perLine[i]!.vLosErr, flags: m.flags });
  });

  const disagreeing: number[] = [];
  const points: VelocityPoint[] = lines.bins.map((b, bin) => {
    const v = binVelocity(byBin[bin]!, LINE_FLAGS.notConverged);
    if (v.dof > 0 && v.chi2 > (CHI2_999[v.dof - 1] ?? Infinity)) disagreeing.push(bin);
    return { bin, rowStart: b.rowStart, rowEnd: b.rowEnd, yCentre: b.yCentre, vLos: v.vLos, vLosErr: v.vLosErr, flags: v.flags };
  });
  if (disagreeing.length > 0) {
    const first = lines.bins[disagreeing[0]!]!;
    log.warn('lines-disagree', `in ${disagreeing.length} of ${lines.bins.length} bins the line groups' velocities disagree beyond their errors (chi-square above its 99.9% point); bins ${disagreeing.slice(0, 10).join(', ')}${disagreeing.length > 10 ? ', ...' : ''}`, {
      place: { row: first.rowStart, rowEnd: first.rowEnd },
      actual: disagreeing.length,
    });
  }
  const empty = points.filter((p) => !Number.isFinite(p.vLos)).length;
  if (empty > 0) log.warn('bins-without-velocity', `${empty} of ${points.length} bins have no usable line velocity`, { actual: empty });

  return { product: { points, perLine, barycentric, convention: settings.convention }, diagnostics: log.items };
}
