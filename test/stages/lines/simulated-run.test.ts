/**
 * The sky and lines stages on the simulator's raw runs (src/sim simulateRun, size small), through
 * the CCD stage and the wavelength solution, against the simulator's true line-of-sight
 * velocities (trueVlos, barycentric). Observed wavelengths are topocentric: the truth is brought
 * to them with the exposures' barycentric corrections, (1 + z_obs) = (1 + z_bary) / (1 + v_B / c)
 * (Wright & Eastman 2014), and the measurements converted with velocityFromWavelength (optical).
 */
import { describe, expect, it } from 'vitest';
import { SPEED_OF_LIGHT_KMS as C } from '../../../src/physics/constants.js';
import { loadLampLines } from '../../../src/physics/catalogues.js';
import { velocityFromWavelength } from '../../../src/physics/doppler.js';
import { flipFrameX } from '../../../src/products/orientation.js';
import { simFrameToRaw, simulateRun, type SimVariant } from '../../../src/sim/index.js';
import { DEFAULT_ARC_SETTINGS, solveWavelengths } from '../../../src/stages/arc/index.js';
import { buildCalibration, calibrateScience, DEFAULT_CCD_SETTINGS } from '../../../src/stages/ccd/index.js';
import { DEFAULT_LINE_SETTINGS, measureLines } from '../../../src/stages/lines/index.js';
import { DEFAULT_SKY_SETTINGS, subtractSky } from '../../../src/stages/sky/index.js';

const skyCache = new Map<SimVariant, ReturnType<typeof skySubtracted>>();

function skySubtracted(variant: SimVariant) {
  const run = simulateRun({ size: 'small', variant, seed: 3 });
  const setupName = Object.keys(run.truth.setups)[0]!;
  const setup = run.truth.setups[setupName]!;
  const raw = (kind: string) => run.frames.filter((f) => f.kind === kind).map(simFrameToRaw);
  const cal = buildCalibration({ bias: raw('bias'), flat: raw('flat'), arc: raw('arc') }, DEFAULT_CCD_SETTINGS).product;
  const solution = solveWavelengths(cal.arc, loadLampLines(['Ne', 'Ar']), { ...DEFAULT_ARC_SETTINGS, approxWavelength: setup.approxWavelength, approxDispersion: setup.approxDispersion }).product;
  const target = run.truth.targets[0]!;
  const sci = calibrateScience(run.frames.filter((f) => f.kind === 'science' && f.target === target.name).map(simFrameToRaw), cal, DEFAULT_CCD_SETTINGS).product;
  const science = solution.flipX ? flipFrameX(sci) : sci;
  const sky = subtractSky(science, solution, DEFAULT_SKY_SETTINGS);
  return { run, target, solution, sky };
}

function reduceTarget(variant: SimVariant, lines: string[]) {
  if (!skyCache.has(variant)) skyCache.set(variant, skySubtracted(variant));
  const { target, solution, sky } = skyCache.get(variant)!;
  const table = measureLines(sky.product.frame, solution, sky.product.sky, { ...DEFAULT_LINE_SETTINGS, lines }).product;
  const exp = target.exposures;
  const vB = exp.reduce((s, e) => s + e.exptimeS * e.barycentricCorrectionKms, 0) / exp.reduce((s, e) => s + e.exptimeS, 0);
  // v_los per bin: observed topocentric, mean over the bin's rows
  const pulls: number[] = [];
  for (const m of table.measurements) {
    if (m.line !== 'Halpha' || m.snr < 5) continue;
    const b = table.bins[m.bin]!;
    let zObs = 0;
    for (let y = b.rowStart; y <= b.rowEnd; y++) zObs += (1 + target.vLosKms[y]! / C) / (1 + vB / C) - 1;
    zObs /= b.rowEnd - b.rowStart + 1;
    const v = velocityFromWavelength(m.wavelength, m.restAir);
    pulls.push((v - C * zObs) / ((C * m.wavelengthErr) / m.restAir));
  }
  return { pulls, table, skyDiagnostics: sky.diagnostics };
}

function stats(values: number[]): { mean: number; std: number } {
  const mean = values.reduce((a, b) => a + b, 0) / values.length;
  return { mean, std: Math.sqrt(values.reduce((a, b) => a + (b - mean) ** 2, 0) / (values.length - 1)) };
}

describe('sky and lines on a simulated run', () => {
  for (const [variant, name, lines] of [
    ['standard', 'tied H-alpha + [N II]', ['Halpha', 'NII6583', 'NII6548']],
    ['standard', 'H-alpha alone', ['Halpha']],
    ['faint', 'tied H-alpha + [N II]', ['Halpha', 'NII6583', 'NII6548']],
    ['rotated', 'tied H-alpha + [N II]', ['Halpha', 'NII6583', 'NII6548']],
    ['offset', 'tied H-alpha + [N II]', ['Halpha', 'NII6583', 'NII6548']],
    ['falling', 'tied H-alpha + [N II]', ['Halpha', 'NII6583', 'NII6548']],
  ] as const) {
    it(`${variant}: v_los per bin agrees with the truth within its errors where S/N >= 5 (${name})`, () => {
      const { pulls } = reduceTarget(variant, [...lines]);
      expect(pulls.length).toBeGreaterThan(30);
      const { mean, std } = stats(pulls);
      expect(Math.abs(mean)).toBeLessThan(0.2);
      expect(std).toBeGreaterThan(0.9);
      expect(std).toBeLessThan(1.1);
    });
  }
});
