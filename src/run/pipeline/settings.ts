/**
 * From the resolved manifest to each stage's settings: the manifest's words (snake case, 1-based
 * file rows) become the stages' (camel case, internal 0-based rows); everything the manifest
 * does not say keeps the stage's documented default. Pure and deterministic, so the settings
 * can be recorded in provenance and hashed into cache keys.
 */
import { DEFAULT_ARC_SETTINGS, type ArcSettings } from '../../stages/arc/settings.js';
import { DEFAULT_CCD_SETTINGS, type CcdSettings } from '../../stages/ccd/settings.js';
import type { GeometryInput } from '../../stages/geometry/settings.js';
import { DEFAULT_SKY_SETTINGS, type SkySettings } from '../../stages/sky/settings.js';
import { parseDeclination, parseRightAscension } from '../../physics/coordinates.js';
import { DEFAULT_LINE_SETTINGS, type LineSettings } from '../../stages/lines/settings.js';
import { DEFAULT_VELOCITY_SETTINGS, type VelocitySettings } from '../../stages/velocity/settings.js';
import type { ResolvedSetup, ResolvedTarget } from '../manifest/resolve.js';

export function ccdSettingsFor(setup: ResolvedSetup): CcdSettings {
  const s: CcdSettings = { ...DEFAULT_CCD_SETTINGS, dispersionAxis: setup.dispersion_axis };
  if (setup.gain !== undefined) s.gain = setup.gain;
  if (setup.read_noise !== undefined) s.readNoise = setup.read_noise;
  if (setup.biassec !== undefined) s.biasSection = setup.biassec;
  if (setup.datasec !== undefined) s.dataSection = setup.datasec;
  return s;
}

export function arcSettingsFor(setup: ResolvedSetup): ArcSettings {
  return {
    ...DEFAULT_ARC_SETTINGS,
    approxWavelength: setup.approx_wavelength,
    approxDispersion: setup.approx_dispersion,
    xOrder: setup.wavelength_order?.dispersion ?? DEFAULT_ARC_SETTINGS.xOrder,
    yOrder: setup.wavelength_order?.slit ?? DEFAULT_ARC_SETTINGS.yOrder,
  };
}

/** Manifest rows are 1-based along the slit of the trimmed section; internal rows are 0-based in the same sense. */
const internalRow = (fileRow: number) => fileRow - 1;

export function skySettingsFor(target: ResolvedTarget): SkySettings {
  const s: SkySettings = { ...DEFAULT_SKY_SETTINGS };
  if (target.sky_rows) s.regions = target.sky_rows.map(([a, b]) => [internalRow(a), internalRow(b)]);
  return s;
}

export function geometryInputFor(setup: ResolvedSetup, target: ResolvedTarget): GeometryInput {
  const g: GeometryInput = {
    arcsecPerPixel: setup.arcsec_per_pixel,
    distanceMpc: target.distance_mpc,
    majorAxisPaDeg: target.major_axis_pa_deg,
    slitPaDeg: target.slit_pa_deg,
  };
  if (target.inclination_deg !== undefined) g.inclinationDeg = target.inclination_deg;
  if (target.axis_ratio !== undefined) g.axisRatio = target.axis_ratio;
  if (target.inclination_err_deg !== undefined) g.inclinationErrDeg = target.inclination_err_deg;
  if (target.systemic_velocity_kms !== undefined) g.systemicVelocityKms = target.systemic_velocity_kms;
  if (target.centre_row !== undefined) g.centreRow = internalRow(target.centre_row);
  if (target.radial_bins_arcsec !== undefined) g.radialBinsArcsec = [...target.radial_bins_arcsec];
  if (target.min_cos_theta !== undefined) g.minCosTheta = target.min_cos_theta;
  return g;
}

export function lineSettingsFor(target: ResolvedTarget): LineSettings {
  const s: LineSettings = { ...DEFAULT_LINE_SETTINGS, lines: [...target.lines] };
  if (target.snr_target !== undefined) s.snrTarget = target.snr_target;
  return s;
}

export function velocitySettingsFor(setup: ResolvedSetup, target: ResolvedTarget): VelocitySettings {
  const s: VelocitySettings = { ...DEFAULT_VELOCITY_SETTINGS, convention: target.velocity_convention, frame: target.velocity_frame };
  if (setup.site) s.site = { latitudeDeg: setup.site.latitude_deg, longitudeDeg: setup.site.longitude_deg, heightM: setup.site.height_m };
  const c = target.coordinates;
  if (c) s.pointing = { raDeg: parseRightAscension(c.ra), decDeg: parseDeclination(c.dec), ...(c.equinox !== undefined ? { equinox: c.equinox } : {}) };
  return s;
}
