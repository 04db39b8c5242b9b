/** Mistakes in the inputs become InputErrors naming the file, keyword or manifest key (DEVELOPERS.md, two error channels). */
import { describe, expect, it } from 'vitest';
import { buildCalibration } from '../../../src/stages/ccd/build-calibration.js';
import { calibrateScience } from '../../../src/stages/ccd/calibrate-science.js';
import { checkCcdSettings, DEFAULT_CCD_SETTINGS } from '../../../src/stages/ccd/settings.js';
import { formatSection, parseSection } from '../../../src/stages/ccd/section.js';
import { StageError } from '../../../src/errors.js';
import { arcSignal, flatSignal, syntheticFrame, type SyntheticOptions } from './synthetic.js';
import { inputError } from '../../helpers/input-error.js';

function calibrationFrames(o: SyntheticOptions = {}) {
  return {
    bias: [syntheticFrame('raw/b1.fits', () => 0, o), syntheticFrame('raw/b2.fits', () => 0, o)],
    flat: [syntheticFrame('raw/f1.fits', flatSignal, o)],
    arc: [syntheticFrame('raw/a1.fits', arcSignal, o)],
  };
}

// Sections follow the DATASEC/BIASSEC convention: '[x1:x2,y1:y2]', 1-based inclusive, x first.
describe('image sections', () => {
  it("reads '[x1:x2,y1:y2]' as 0-based end-exclusive and writes it back", () => {
    const s = parseSection('[ 3:10 , 2:5 ]', 20, 10, {});
    expect(s).toEqual({ x0: 2, x1: 10, y0: 1, y1: 5 });
    expect(formatSection(s)).toBe('[3:10,2:5]');
  });
  it('names the keyword of a section outside the frame or badly written', () => {
    const e = inputError(() => parseSection('[1:21,1:10]', 20, 10, { file: 'raw/x.fits', key: 'DATASEC' }));
    expect(e.code).toBe('ccd.section-outside');
    expect(e.place).toMatchObject({ file: 'raw/x.fits', key: 'DATASEC' });
    expect(inputError(() => parseSection('1:20,1:10', 20, 10, {})).code).toBe('ccd.section-syntax');
    expect(inputError(() => parseSection('[5:4,1:10]', 20, 10, {})).code).toBe('ccd.section-outside');
  });
});

describe('calibration inputs', () => {
  it('a missing gain names the file, the keyword GAIN and the manifest key `gain`', () => {
    const e = inputError(() => buildCalibration(calibrationFrames({ gain: null }), DEFAULT_CCD_SETTINGS));
    expect(e.code).toBe('ccd.gain-missing');
    expect(e.place).toMatchObject({ file: 'raw/b1.fits', key: 'GAIN' });
    expect(e.message).toContain('`gain`');
    expect(() => buildCalibration(calibrationFrames({ gain: null }), { ...DEFAULT_CCD_SETTINGS, gain: 1.5 })).not.toThrow();
  });
  it('a data section outside the frame is an error naming DATASEC', () => {
    const e = inputError(() => buildCalibration(calibrationFrames({ datasec: '[1:60,1:30]' }), DEFAULT_CCD_SETTINGS));
    expect(e.code).toBe('ccd.section-outside');
    expect(e.place.key).toBe('DATASEC');
  });
  it('an overscan that overlaps the data names the key it came from: manifest biassec, else header BIASSEC', () => {
    const e = inputError(() => buildCalibration(calibrationFrames(), { ...DEFAULT_CCD_SETTINGS, biasSection: '[1:8,1:30]' }));
    expect(e.code).toBe('ccd.section-overlap');
    expect(e.place).toMatchObject({ file: 'raw/b1.fits', key: 'biassec' });
    const h = inputError(() => buildCalibration(calibrationFrames({ datasec: '[1:44,1:30]' }), DEFAULT_CCD_SETTINGS));
    expect(h.code).toBe('ccd.section-overlap');
    expect(h.place.key).toBe('BIASSEC');
  });
  it('flats without lamp light (bias frames listed as flats) are a StageError naming them, not a flat of random factors', () => {
    const frames = { ...calibrationFrames(), flat: [syntheticFrame('raw/b3.fits', () => 0.5), syntheticFrame('raw/b4.fits', () => -0.5)] };
    let error: unknown;
    try {
      buildCalibration(frames, DEFAULT_CCD_SETTINGS);
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(StageError);
    expect((error as StageError).code).toBe('flat-unlit');
    expect((error as StageError).message).toMatch(/raw\/b3\.fits, raw\/b4\.fits\) hold no lamp light/);
    expect(() => buildCalibration(calibrationFrames(), DEFAULT_CCD_SETTINGS)).not.toThrow();
  });
  it('an exposed frame listed as a bias is a warning naming it (common practice: a bias is a zero-second readout)', () => {
    const zero = { ...calibrationFrames(), bias: [syntheticFrame('raw/b1.fits', () => 0, { exptime: 0 }), syntheticFrame('raw/s9.fits', () => 0, { exptime: 600 })] };
    const warned = buildCalibration(zero, DEFAULT_CCD_SETTINGS).diagnostics.filter((d) => d.rule === 'ccd.bias-exposed');
    expect(warned.map((d) => [d.severity, d.place?.file, d.actual])).toEqual([['warning', 'raw/s9.fits', 600]]);
  });
  it('no arc frames is an error', () => {
    expect(inputError(() => buildCalibration({ ...calibrationFrames(), arc: [] }, DEFAULT_CCD_SETTINGS)).code).toBe('ccd.no-arc');
  });
  it('a calibration frame of another shape names both files', () => {
    const frames = calibrationFrames();
    frames.flat.push(syntheticFrame('raw/f2.fits', flatSignal, { height: 31 }));
    const e = inputError(() => buildCalibration(frames, DEFAULT_CCD_SETTINGS));
    expect(e.code).toBe('ccd.shape-mismatch');
    expect(e.message).toContain('raw/f2.fits');
    expect(e.message).toContain('raw/b1.fits');
  });
  it('a science frame of another shape or binning than the calibrations names both files', () => {
    const cal = buildCalibration(calibrationFrames(), DEFAULT_CCD_SETTINGS).product;
    const shape = inputError(() => calibrateScience([syntheticFrame('raw/s1.fits', () => 50, { width: 41 })], cal, DEFAULT_CCD_SETTINGS));
    expect(shape.code).toBe('ccd.shape-mismatch');
    expect(shape.message).toMatch(/raw\/s1\.fits.*raw\/b1\.fits/);
    const binning = inputError(() => calibrateScience([syntheticFrame('raw/s2.fits', () => 50, { binning: '2 2' })], cal, DEFAULT_CCD_SETTINGS));
    expect(binning.code).toBe('ccd.binning-mismatch');
    expect(binning.message).toMatch(/raw\/s2\.fits.*raw\/b1\.fits/);
  });
  it('a science frame without an exposure time names EXPTIME', () => {
    const cal = buildCalibration(calibrationFrames(), DEFAULT_CCD_SETTINGS).product;
    const frame = syntheticFrame('raw/s3.fits', () => 50);
    frame.header.delete('EXPTIME');
    const e = inputError(() => calibrateScience([frame], cal, DEFAULT_CCD_SETTINGS));
    expect(e.code).toBe('ccd.exptime-invalid');
    expect(e.place).toMatchObject({ file: 'raw/s3.fits', key: 'EXPTIME' });
  });
  it('a science exposure read out with another GAIN or RDNOISE is a warning naming the file; a manifest gain silences it', () => {
    const cal = buildCalibration(calibrationFrames(), DEFAULT_CCD_SETTINGS).product;
    const same = calibrateScience([syntheticFrame('raw/s5.fits', () => 50)], cal, DEFAULT_CCD_SETTINGS).diagnostics;
    expect(same.filter((d) => d.rule === 'ccd.readout-differs')).toEqual([]);
    const other = calibrateScience([syntheticFrame('raw/s6.fits', () => 50, { gain: 4, readNoise: 9 })], cal, DEFAULT_CCD_SETTINGS).diagnostics;
    expect(other.filter((d) => d.rule === 'ccd.readout-differs').map((d) => [d.severity, d.place?.file, d.expected, d.actual])).toEqual([
      ['warning', 'raw/s6.fits', '2 e-/ADU', '4 e-/ADU'],
      ['warning', 'raw/s6.fits', '5 e-', '9 e-'],
    ]);
    const fixed = { ...DEFAULT_CCD_SETTINGS, gain: 2, readNoise: 5 };
    const calFixed = buildCalibration(calibrationFrames(), fixed).product;
    expect(calibrateScience([syntheticFrame('raw/s7.fits', () => 50, { gain: 4, readNoise: 9 })], calFixed, fixed).diagnostics.filter((d) => d.rule === 'ccd.readout-differs')).toEqual([]);
  });
  it('an EXPTIME that is not a number is shown as written', () => {
    const cal = buildCalibration(calibrationFrames(), DEFAULT_CCD_SETTINGS).product;
    const frame = syntheticFrame('raw/s4.fits', () => 50);
    frame.header.set('EXPTIME', 'long');
    const e = inputError(() => calibrateScience([frame], cal, DEFAULT_CCD_SETTINGS));
    expect(e.message).toBe('raw/s4.fits, HDU 0, EXPTIME: the exposure time is missing or not positive (expected EXPTIME > 0 (seconds), found "long")');
  });
});

describe('settings', () => {
  it('a setting out of its range is an InputError naming it', () => {
    const frames = calibrationFrames();
    const e = inputError(() => buildCalibration(frames, { ...DEFAULT_CCD_SETTINGS, flatOrder: -1 }));
    expect(e.code).toBe('ccd.invalid-setting');
    expect(e.place.key).toBe('flatOrder');
    const l = inputError(() => buildCalibration(frames, { ...DEFAULT_CCD_SETTINGS, laplacian: { ...DEFAULT_CCD_SETTINGS.laplacian, sigmaFrac: 2 } }));
    expect(l.place.key).toBe('laplacian.sigmaFrac');
    expect(() => checkCcdSettings(DEFAULT_CCD_SETTINGS)).not.toThrow();
  });
});
