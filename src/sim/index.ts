/**
 * The simulator: a raw long-slit observing night of invented disk galaxies with its known answer.
 *
 * `simulateRun(options)` returns the raw frames (uint16 ADU with overscan, FITS headers), the
 * run.yaml text and the truth (truth.ts: every parameter, with units). Variants:
 * - `standard`: slit on the major axis, rising-then-flat curve, dispersion along raw x;
 * - `rotated`: dispersion along raw y, wavelength decreasing with pixel ({ transpose, flipX });
 * - `offset`: slit at 20 deg to the major axis;
 * - `falling`: a curve that declines as R^-1/2 beyond the disk;
 * - `faint`: lines and continuum four times fainter.
 * Not simulated: flexure between arcs and science (none), seeing (rows are independent),
 * fringing, dark current outside the hot columns.
 */
export { SIM_VARIANTS, MAX_TARGETS, MAX_SETUPS, resolveSimOptions } from './options.js';
export type { SimVariant, SimSize, SimOptions, ResolvedSimOptions } from './options.js';
export { simulateRun } from './simulate.js';
export type { SimFrame, SimulatedRun } from './simulate.js';
export type { FrameKind } from './schedule.js';
export { simFrameToRaw, simFrameToFits, expectedToFits } from './convert.js';
export { writeSimulatedRun, truthJson } from './write.js';
export { trueWavelength, trueLsfSigmaPx, trueRotation, trueVlos, slitOffsetArcsec, lineShiftPx } from './truth.js';
export type { RunTruth, SetupTruth, DetectorTruth, TargetTruth, RotationCurveTruth, ExposureTruth, FrameTruth, CosmicRayTruth } from './truth.js';
