/** The run.yaml of a simulated run, with the manifest keys of issue 3. */
import { stringify } from 'yaml';
import type { SimFrame } from './simulate.js';
import type { RunTruth } from './truth.js';

/** Lines the simulated galaxies emit, by manifest name. */
const MANIFEST_LINES = ['Halpha', 'NII6583', 'NII6548', 'SII6716', 'SII6731'];

/**
 * run.yaml text: setups with the approximate (not true) wavelength and dispersion, the header
 * gain and read noise, and file globs; targets with their frames and the true geometry an
 * observer would give (distance, inclination, angles).
 */
export function runManifestYaml(truth: RunTruth, frames: SimFrame[]): string {
  const first = Object.keys(truth.setups)[0]!;
  // File names follow schedule.ts: the first setup's frames are raw/<kind>_NNN.fits, the others
  // raw/<setup>_<kind>_NNN.fits, so each setup's globs pick up its own frames only.
  const prefixOf = (setup: string): string => (setup === first ? 'raw/' : `raw/${setup}_`);
  const setups: Record<string, unknown> = {};
  for (const [name, s] of Object.entries(truth.setups)) {
    setups[name] = {
      dispersion_axis: 'auto',
      arcsec_per_pixel: s.arcsecPerPixel,
      approx_wavelength: s.approxWavelength,
      approx_dispersion: s.approxDispersion,
      lamps: ['Ne', 'Ar'],
      gain: s.detector.gainEPerAdu,
      read_noise: s.detector.readNoiseE,
      bias: ['raw/bias_*.fits'],
      flat: [`${prefixOf(name)}flat_*.fits`],
      arc: [`${prefixOf(name)}arc_*.fits`],
    };
  }
  const science = frames.filter((f) => f.kind === 'science');
  const targets = truth.targets.map((t) => {
    const own = science.filter((f) => f.target === t.name).map((f) => f.name);
    const sameSetup = science.filter((f) => truth.frames[f.name]!.setup === t.setup).length;
    return {
      name: t.name,
      setup: t.setup,
      // A glob when the target has its setup's science frames to itself, else the explicit list.
      frames: own.length === sameSetup ? [`${prefixOf(t.setup)}sci_*.fits`] : own,
      lines: MANIFEST_LINES,
      distance_mpc: t.distanceMpc,
      inclination_deg: t.inclinationDeg,
      major_axis_pa_deg: t.majorAxisPaDeg,
      slit_pa_deg: t.slitPaDeg,
    };
  });
  const header = `# A simulated observing night at ${truth.site.name} (fictional), made by \`whorl simulate\`.\n# Seed ${truth.seed}, size ${truth.size}, variant ${truth.variant}. The true answer is in truth.json.\n`;
  return header + stringify({ output: 'products', setups, targets }, { lineWidth: 0, flowCollectionPadding: false });
}
