/**
 * A small hand-made report input for rendering tests. It only has to look like products; the
 * science in it is not checked here (the stages' own tests do that).
 */
import type { TargetReportInput } from '../../src/report/types.js';
import type { LineTable } from '../../src/products/lines.js';
import type { RotationCurve } from '../../src/products/curve.js';
import type { WavelengthSolution } from '../../src/products/wavelength.js';

export function sampleReportInput(nBins = 12, object = 'Sample galaxy'): TargetReportInput {
  const width = 64;
  const height = nBins * 2;
  const wave = new Float64Array(width * height);
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) wave[y * width + x] = 6540 + x * 1.1;
  const legendre = { kind: 'legendre2d' as const, xOrder: 1, yOrder: 0, xMin: 0, xMax: width - 1, yMin: 0, yMax: height - 1, coeffs: [6575, 35] };
  const solution: WavelengthSolution = {
    width, height, wave, model: legendre, lsfSigmaPx: { ...legendre, coeffs: [1.3, 0] }, flipX: false,
    lines: [6598.9529, 6678.2762, 6717.043].map((w, i) => ({ wavelength: w, element: 'Ne', x: 10 + i * 20, y: 5, sigmaPx: 1.3, residualAngstrom: (i - 1) * 0.01, used: i !== 2 })),
    rmsAngstrom: 0.012, rmsPx: 0.011, rmsKms: 0.55, identifiedRange: [6598.9, 6717.0], flexure: { shiftAngstrom: 0.05, shiftErrAngstrom: 0.01, shiftKms: 2.3, lines: [] },
  };
  const bins = Array.from({ length: nBins }, (_, i) => ({ rowStart: 2 * i, rowEnd: 2 * i + 1, yCentre: 2 * i + 0.5 }));
  const fits = bins.map((_, i) => {
    const n = 30;
    const w = Float64Array.from({ length: n }, (_, k) => 6560 + k * 1.1);
    const model = Float32Array.from(w, (v) => 10 + 200 * Math.exp(-0.5 * ((v - 6575 - i) / 2) ** 2));
    return { bin: i, group: 'Halpha+NII', wavelength: w, data: Float32Array.from(model, (m, k) => m + ((k * 7) % 5) - 2), error: new Float32Array(n).fill(3), model, excluded: new Uint8Array(n) };
  });
  const measurements = bins.map((b, i) => ({
    bin: i, line: 'Halpha', group: 'Halpha+NII', restAir: 6562.8, centerPx: 30 + (i - nBins / 2) * 0.5, wavelength: 6575 + i, wavelengthErr: 0.05,
    sigmaObsAngstrom: 2, sigmaInstrAngstrom: 1.4, sigmaKms: 60, sigmaKmsErr: 3, flux: 1000, fluxErr: 30, snr: 30 - i, chi2Reduced: 1.1, flags: i % 4 === 3 ? 1 : 0,
  }));
  const lines: LineTable = {
    bins, measurements, fits, continuumProfile: new Float64Array(height).fill(5),
    sky: { skyRegions: [[0, 1]], galaxyRegion: [2, height - 1], skySpectrum: new Float32Array(width).fill(20), residualNormRms: new Float32Array(width).fill(1.02) },
  };
  const radii = [1, 2, 3, 4, 5];
  const curve: RotationCurve = {
    vSys: 2150.3, vSysErr: 1.1, centreRow: nBins, centreRowErr: 0.2, centreSource: 'fitted', vSysSource: 'fitted',
    geometry: { inclinationDeg: 58, inclinationErrDeg: 3, inclinationSource: 'given', majorAxisPaDeg: 35, slitPaDeg: 35, distanceMpc: 31, arcsecPerPixel: 0.4, kpcPerArcsec: 0.150 },
    pv: bins.map((b, i) => ({ bin: i, yCentre: b.yCentre, projection: 0.85, flags: 0, offsetArcsec: (b.yCentre - nBins) * 0.4, vLos: 2150 + (i - nBins / 2) * 20, vLosErr: 3, radiusArcsec: Math.abs(b.yCentre - nBins) * 0.4, azimuthDeg: 0, vRot: 100, vRotErr: 4, side: i < nBins / 2 ? 'approaching' : 'receding', exclusion: i === 0 ? 'centre' : null })),
    points: radii.map((r) => ({ rArcsec: r / 0.15, rKpc: r, vRot: 150 * (1 - Math.exp(-r)), errStat: 3, errSys: 5, errTotal: 5.8, errAsymmetry: 4, errInclination: 3, vApproaching: 148 * (1 - Math.exp(-r)), vReceding: 152 * (1 - Math.exp(-r)), nApproaching: 2, nReceding: 2, oneSided: r === 5 })),
    light: radii.map((r) => ({ rArcsec: r / 0.15, rKpc: r, flux: 100 * Math.exp(-r), fluxApproaching: 98 * Math.exp(-r), fluxReceding: 102 * Math.exp(-r) })),
    dynamics: radii.map((r) => ({ rKpc: r, massMsun: 1e10 * r, massErrMsun: 1e9, logSlope: 0.1 })),
    shape: 'flat', shapeSummary: 'flat: the radius is still inside most of the mass', vOuter: 148,
  };
  return {
    name: 'Sample galaxy', object, setup: 'red', status: 'ok', solution, lines, curve,
    velocities: { points: [], perLine: [], barycentric: { correctionKms: -12.345, exposures: [], spreadKms: 0.02, frame: 'barycentric' }, convention: 'optical' },
    cutout: { x0: 0, width, height, data: Float32Array.from({ length: width * height }, (_, i) => (i % width === 30 ? 100 : 1)), wavelength: wave.subarray(0, width) },
    diagnostics: [{ severity: 'warning', rule: 'lines.low-snr', stage: 'lines', message: 'bin 3 below the S/N target <b>', place: { row: 6 } }],
    provenance: { whorl: '0.1.0', inputs: [{ path: 'raw/sci_001.fits', sha256: 'abc' }] },
  };
}
