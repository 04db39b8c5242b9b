/** The true galaxies of a run: geometry, kinematics, emission, and each exposure's barycentric correction. */
import { kpcPerArcsec } from '../physics/constants.js';
import { midExposure, parseDeclination, parseRightAscension } from '../physics/coordinates.js';
import { radialVelocityCorrection } from '../physics/barycentric.js';
import { diskCoordinates } from '../physics/disk.js';
import type { ResolvedSimOptions } from './options.js';
import { Rng, streamSeed } from '../kernels/random.js';
import { GALAXIES, LINE_RATIOS, SITE, SIZES, galaxySpec } from './scenario.js';
import { dateObsText, type FramePlan, type TargetPlan } from './schedule.js';
import { slitOffsetArcsec, trueRotation, trueVlos, type ExposureTruth, type SetupTruth, type TargetTruth } from './truth.js';

/** Step of the true-curve grid, arcsec. */
const CURVE_GRID_STEP_ARCSEC = 0.5;

/** Name in run.yaml and truth: the galaxy's name, with the setup appended when it is not the first. */
export function targetName(galaxy: number, setupIndex: number, setup: string): string {
  const name = GALAXIES[galaxy]!.name;
  return setupIndex === 0 ? name : `${name} ${setup}`;
}

/**
 * Truth of one target. Target 0 has the variant's exact numbers; later galaxies of a night get
 * their own systemic velocity, inclination, angles, size and brightness.
 */
export function makeTarget(options: ResolvedSimOptions, plan: TargetPlan, name: string, setup: SetupTruth, frames: FramePlan[]): TargetTruth {
  const spec = SIZES[options.size];
  const g = galaxySpec(options.variant);
  const sky = GALAXIES[plan.galaxy]!;
  const rng = new Rng(streamSeed(options.seed, `galaxy-${plan.galaxy}`));
  const other = plan.galaxy > 0;
  const vSys = other ? Math.round(900 + rng.between(0, 3200)) + 0.1 * rng.int(10) : g.vSysKms;
  const inclination = other ? Math.round(rng.between(40, 72)) : g.inclinationDeg;
  const majorPa = other ? Math.round(rng.between(0, 180)) : g.majorAxisPaDeg;
  const sizeFactor = other ? rng.between(0.8, 1.15) : 1;
  const brightness = g.brightness * (other ? rng.between(0.7, 1.3) : 1);
  const H = setup.internalHeight;
  const centreRow = (H - 1) / 2 + (other ? rng.between(-6, 6) : 3.37 * (H / 300));
  const ra = sky.ra;
  const dec = sky.dec;
  const raDeg = parseRightAscension(ra);
  const decDeg = parseDeclination(dec);

  const clumps: TargetTruth['emission']['clumps'] = [];
  const halfSlit = (H / 2) * spec.arcsecPerPixel;
  const nClumps = 7;
  for (let k = 0; k < nClumps; k++) {
    clumps.push({
      offsetArcsec: Math.round(rng.between(-0.8, 0.8) * Math.min(halfSlit, 6 * spec.emissionScaleArcsec) * 100) / 100,
      widthArcsec: Math.round(rng.between(0.6, 1.6) * (spec.arcsecPerPixel / 0.4) ** 0.5 * 100) / 100,
      relative: Math.round(rng.between(0.3, 1.5) * 100) / 100,
    });
  }

  const exposures: ExposureTruth[] = frames.map((f) => {
    const dateObs = dateObsText(f.startMs);
    const mid = midExposure(dateObs, f.exptimeS);
    return {
      frame: f.name,
      dateObs,
      exptimeS: f.exptimeS,
      midExposureUtc: mid.toISOString(),
      barycentricCorrectionKms: radialVelocityCorrection(mid, { raDeg, decDeg, equinox: 2000 }, SITE),
    };
  });

  const truth: TargetTruth = {
    name,
    object: sky.name,
    setup: setup.name,
    raDeg,
    decDeg,
    ra,
    dec,
    vSysKms: vSys,
    inclinationDeg: inclination,
    majorAxisPaDeg: majorPa,
    slitPaDeg: majorPa + g.slitToMajorDeg,
    distanceMpc: other ? Math.round(spec.distanceMpc * vSys / g.vSysKms * 10) / 10 : spec.distanceMpc,
    kpcPerArcsec: 0,
    centreRow,
    arcsecPerPixel: setup.arcsecPerPixel,
    gasDispersionKms: other ? Math.round(rng.between(10, 20)) : g.gasDispersionKms,
    curve: {
      vmaxKms: other ? Math.round(rng.between(120, 260)) : g.vmaxKms,
      turnoverArcsec: spec.turnoverArcsec * sizeFactor,
      declineArcsec: g.falling ? spec.declineArcsec * sizeFactor : null,
    },
    emission: { halphaCentreEPerS: spec.halphaCentreEPerS * brightness, scaleArcsec: spec.emissionScaleArcsec * sizeFactor, clumps, ratios: { ...LINE_RATIOS } },
    continuum: { centreEPerSPerPx: spec.continuumCentreEPerSPerPx * brightness, scaleArcsec: spec.continuumScaleArcsec * sizeFactor },
    exposures,
    vLosKms: [],
    curveGrid: { radiusArcsec: [], vRotKms: [] },
  };
  truth.kpcPerArcsec = kpcPerArcsec(truth.distanceMpc);
  for (let s = 0; s < H; s++) truth.vLosKms.push(trueVlos(truth, s));
  const rMax = Math.max(diskRadius(truth, 0), diskRadius(truth, H - 1));
  for (let r = 0; r <= rMax + 1e-9; r += CURVE_GRID_STEP_ARCSEC) {
    truth.curveGrid.radiusArcsec.push(r);
    truth.curveGrid.vRotKms.push(trueRotation(truth, r));
  }
  return truth;
}

/** In-plane radius (arcsec) of internal row s. */
export function diskRadius(truth: TargetTruth, s: number): number {
  return diskCoordinates(slitOffsetArcsec(truth, s), truth.slitPaDeg - truth.majorAxisPaDeg, truth.inclinationDeg).radiusArcsec;
}

/** H-alpha electrons per second in row s: exponential in the in-plane radius, with clumps along the slit. */
export function halphaRate(truth: TargetTruth, s: number): number {
  const r = slitOffsetArcsec(truth, s);
  const e = truth.emission;
  let clumps = 1;
  for (const c of e.clumps) clumps += c.relative * Math.exp(-0.5 * ((r - c.offsetArcsec) / c.widthArcsec) ** 2);
  return e.halphaCentreEPerS * Math.exp(-diskRadius(truth, s) / e.scaleArcsec) * clumps;
}

/** Stellar continuum, electrons per second per pixel in row s. */
export function continuumRate(truth: TargetTruth, s: number): number {
  return truth.continuum.centreEPerSPerPx * Math.exp(-diskRadius(truth, s) / truth.continuum.scaleArcsec);
}
