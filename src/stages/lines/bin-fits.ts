/**
 * The fits of every line group in one bin: cut each group's window from the bin spectrum,
 * start from the current velocity and width, fit, and keep the window for a width-held refit
 * and for the report.
 */
import { median } from '../../kernels/robust.js';
import { lowerIndex } from '../../kernels/sorted-search.js';
import { GALAXY_LINES } from '../../physics/catalogues.js';
import { SPEED_OF_LIGHT_KMS as C } from '../../physics/constants.js';
import type { BinSpectrum } from './bin-spectrum.js';
import { fitGroup, type GroupFit, type Window } from './fit-group.js';
import type { GroupSpec } from './group-model.js';
import { quickFlux } from './quick-flux.js';
import type { LineSettings } from './settings.js';

const OTHER_LINES = Object.values(GALAXY_LINES);

/** Where the fit starts: optical velocity and observed velocity width (km/s). */
export interface VelocityState {
  vKms: number;
  sigmaKms: number;
}

export interface GroupWindow {
  spec: GroupSpec;
  /** First frame column of the window. */
  x0: number;
  win: Window;
  /** 1 where the column is excluded. */
  excluded: Uint8Array;
  /** Instrumental sigma (Angstrom) at each member's expected place. */
  instrumental: Float64Array;
  centreRange: [number, number];
  sigmaRange: [number, number];
  fit: GroupFit;
}

/** Instrumental sigma (Angstrom) at fractional column x of row y. */
export type InstrumentalSigma = (x: number, y: number) => number;

export function fitBinGroups(bin: BinSpectrum, specs: GroupSpec[], state: VelocityState, settings: LineSettings, instrumental: InstrumentalSigma): (GroupWindow | null)[] {
  return specs.map((spec) => fitOneGroup(bin, spec, state, settings, instrumental));
}

function fitOneGroup(bin: BinSpectrum, spec: GroupSpec, state: VelocityState, settings: LineSettings, instrumental: InstrumentalSigma): GroupWindow | null {
  const z = 1 + state.vKms / C;
  // Typed arrays: arrays from .map change their element kind as doubles arrive, and each new
  // kind had V8 compile this function again.
  const nMembers = spec.rest.length;
  const centres = new Float64Array(nMembers);
  const inst = new Float64Array(nMembers);
  for (let k = 0; k < nMembers; k++) {
    centres[k] = spec.rest[k]! * z;
    inst[k] = instrumental(bin.columnOf(centres[k]!), bin.yCentre);
  }
  const instRef = inst[0]!;
  const centre = centres[0]!;
  const sigma = Math.max((state.sigmaKms / C) * centre, instRef);
  const tolerance = (settings.velocityToleranceKms / C) * centre;
  const half = settings.windowSigmas * sigma + tolerance;
  // Loops, not Math.min(...centres): spreading a typed array takes the iterator protocol.
  let first = centres[0]!;
  let last = centres[0]!;
  for (let k = 1; k < nMembers; k++) {
    first = Math.min(first, centres[k]!);
    last = Math.max(last, centres[k]!);
  }
  const lo = first - half;
  const hi = last + half;
  if (lo < bin.wave[bin.x0]! || hi > bin.wave[bin.x1 - 1]!) return null;
  const x0 = lowerIndex(bin.wave, lo);
  const x1 = lowerIndex(bin.wave, hi);
  const m = x1 - x0;
  const win: Window = {
    wave: bin.wave.slice(x0, x1),
    pixelWidth: bin.pixelWidth.slice(x0, x1),
    data: bin.sci.slice(x0, x1),
    weight: new Float64Array(m),
  };
  const excluded = bin.bad.slice(x0, x1);
  for (let i = 0; i < m; i++) {
    const v = bin.var[x0 + i]!;
    win.weight[i] = excluded[i] || !(v > 0) ? 0 : 1 / v;
  }
  // Other catalogue lines that fall in the window are left out (their cores +-4 sigma).
  for (const other of OTHER_LINES) {
    if (spec.members.includes(other.name)) continue;
    const l = other.air * z;
    if (l < lo - 4 * sigma || l > hi + 4 * sigma) continue;
    for (let i = 0; i < m; i++) if (Math.abs(win.wave[i]! - l) <= 4 * sigma) win.weight[i] = 0;
  }
  let good = 0;
  for (let i = 0; i < m; i++) if (win.weight[i]! > 0) good++;
  if (good < spec.nFree + 6) return null;
  // Starting fluxes from the quick estimate at the expected places; the continuum from the window's median.
  const view = { wave: win.wave, pixelWidth: win.pixelWidth, sci: win.data, var: bin.var.subarray(x0, x1), bad: excluded };
  const fluxes = new Array<number>(spec.nFree).fill(0);
  for (let k = 0; k < nMembers; k++) {
    if (spec.fluxFactor[k] === 1) fluxes[spec.fluxIndex[k]!] = Math.max(0, quickFlux(view, centres[k]!, sigma).flux);
  }
  const c0 = median(win.data);
  const maxSigma = Math.hypot(instRef, (settings.maxDispersionKms / C) * centre);
  const centreRange: [number, number] = [centre - tolerance, centre + tolerance];
  const sigmaRange: [number, number] = [0.5 * instRef, maxSigma];
  const fit = fitGroup(win, spec, { centre, sigma, fluxes, c0 }, { centreRange, sigmaRange, scaleByChi2: settings.scaleByChi2 });
  return { spec, x0, win, excluded, instrumental: inst, centreRange, sigmaRange, fit };
}

/** Refit a group window with its width held at `sigmaAngstrom` (sigma of members[0]). */
export function refitHeldWidth(g: GroupWindow, sigmaAngstrom: number, scaleByChi2: boolean): GroupFit {
  const fluxes = new Array<number>(g.spec.nFree).fill(0);
  g.spec.members.forEach((_, k) => {
    if (g.spec.fluxFactor[k] === 1) fluxes[g.spec.fluxIndex[k]!] = g.fit.flux[k]!;
  });
  const guess = { centre: g.fit.centre, sigma: sigmaAngstrom, fluxes, c0: g.fit.model[0]! };
  return fitGroup(g.win, g.spec, guess, { centreRange: g.centreRange, sigmaRange: g.sigmaRange, fixedSigma: sigmaAngstrom, scaleByChi2 });
}
