/** Exposure time and start of a raw frame from its header (EXPTIME, DATE-OBS). */
import { InputError } from '../../errors.js';
import type { ExposureInfo, RawFrame } from '../../products/frame.js';

/** `strict`: science frames need both keywords; calibration frames may lack DATE-OBS (then ''). */
export function exposureInfo(frame: RawFrame, strict: boolean): ExposureInfo {
  const exptimeS = frame.header.getNumber('EXPTIME');
  if (exptimeS === undefined || !(exptimeS > 0)) {
    const card = frame.header.get('EXPTIME');
    if (strict || card !== undefined) {
      const actual = card === undefined ? 'no EXPTIME card' : JSON.stringify(card);
      throw new InputError('ccd.exptime-invalid', 'the exposure time is missing or not positive', { file: frame.path, hdu: frame.hdu, key: 'EXPTIME' }, { expected: 'EXPTIME > 0 (seconds)', actual });
    }
  }
  const dateObs = frame.header.getString('DATE-OBS');
  if (dateObs === undefined && strict) {
    throw new InputError('ccd.date-obs-missing', 'no start of exposure', { file: frame.path, hdu: frame.hdu, key: 'DATE-OBS' }, { expected: 'DATE-OBS (UTC, ISO 8601)' });
  }
  return { path: frame.path, header: frame.header, dateObs: dateObs ?? '', exptimeS: exptimeS ?? 1 };
}
