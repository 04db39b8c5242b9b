/**
 * The run manifest (`run.yaml`): the keys a user writes by hand, validated with zod.
 * Key names are stable: the simulator and the inventory write manifests against this file.
 *
 * Baseline keys (issue 3): output, setups.<name>.{dispersion_axis, arcsec_per_pixel,
 * approx_wavelength, approx_dispersion, lamps, gain, read_noise, bias, flat, arc},
 * targets[].{name, setup, frames, lines, distance_mpc, inclination_deg, major_axis_pa_deg,
 * slit_pa_deg}. Every other key is optional; each is documented beside its schema below.
 * Rows in the manifest are 1-based rows of the trimmed data section along the slit, as in rows.csv.
 */
import { z } from 'zod';

const positive = z.number().positive();
const finite = z.number().finite();
/** File names or globs (`*`, `?`), absolute or relative to the manifest's folder. */
const fileList = z.array(z.string().min(1)).min(1);
/** A FITS section in 1-based inclusive pixels, `[x1:x2,y1:y2]` (as in BIASSEC/DATASEC cards). */
const fitsSection = z.string().regex(/^\[\s*\d+\s*:\s*\d+\s*,\s*\d+\s*:\s*\d+\s*\]$/, 'a section like [1:1024,1:300]');

/** Observatory site; default: the OBSGEO-B/-L/-H cards of the science frames. */
export const siteSchema = z.strictObject({
  /** Geodetic latitude, degrees north. */
  latitude_deg: z.number().min(-90).max(90),
  /** Geodetic longitude, degrees east. */
  longitude_deg: z.number().min(-360).max(360),
  /** Height above the reference ellipsoid, metres. */
  height_m: finite,
});

export const setupSchema = z.strictObject({
  /** Which raw axis the dispersion runs along; `auto` decides from the arc. */
  dispersion_axis: z.enum(['auto', 'x', 'y']),
  /** Plate scale along the slit, arcsec per pixel. */
  arcsec_per_pixel: positive,
  /** Approximate wavelength at the detector centre, Angstrom (air). */
  approx_wavelength: positive,
  /** Approximate dispersion, Angstrom per pixel (magnitude; the sign is found from the arc). */
  approx_dispersion: positive,
  /** Arc-lamp elements, e.g. [Ne, Ar]. */
  lamps: z.array(z.string().min(1)).min(1),
  /** Detector gain, electrons per ADU; default: header GAIN. */
  gain: positive.optional(),
  /** Read noise, electrons; default: header RDNOISE. */
  read_noise: z.number().nonnegative().optional(),
  bias: fileList,
  flat: fileList,
  arc: fileList,
  /** Extra arc-line lists (files relative to the manifest) added to the built-in lamp lines. */
  line_lists: z.array(z.string().min(1)).optional(),
  /** Overscan section; default: header BIASSEC. */
  biassec: fitsSection.optional(),
  /** Data section; default: header DATASEC (or the whole frame). */
  datasec: fitsSection.optional(),
  site: siteSchema.optional(),
  /** Orders of the 2-D wavelength solution (Legendre), along the dispersion and along the slit. */
  wavelength_order: z
    .strictObject({ dispersion: z.number().int().min(1).max(9), slit: z.number().int().min(0).max(6) })
    .optional(),
});

/** Sky coordinates of the target; default: header RA/DEC/EQUINOX. */
export const coordinatesSchema = z.strictObject({
  /** Right ascension: sexagesimal hours `hh:mm:ss.s` or decimal degrees. */
  ra: z.union([z.string().min(1), z.number().min(0).max(360)]),
  /** Declination: sexagesimal degrees `±dd:mm:ss` or decimal degrees. */
  dec: z.union([z.string().min(1), z.number().min(-90).max(90)]),
  /** Equinox of the coordinates, Julian years; default 2000. */
  equinox: z.number().optional(),
});

const rowRange = z.tuple([z.number().int().min(1), z.number().int().min(1)]);

export const targetSchema = z
  .strictObject({
    /** The target's name; its product folder is derived from it. */
    name: z.string().min(1),
    /** A key of `setups`. */
    setup: z.string().min(1),
    /** Science exposures (files or globs), combined into one 2-D spectrum. */
    frames: fileList,
    /** Emission lines to measure, by catalogue name (`Halpha`, `NII6583`, ...). */
    lines: z.array(z.string().min(1)).min(1),
    /** Distance, Mpc. */
    distance_mpc: positive,
    /** Disk inclination, degrees (90 = edge-on). Give this or `axis_ratio`. */
    inclination_deg: z.number().gt(0).max(90).optional(),
    /** Apparent minor/major axis ratio b/a; the inclination follows from Hubble's formula. */
    axis_ratio: z.number().gt(0).max(1).optional(),
    /** Inclination error, degrees; enters the systematic error of the curve. Default: none (0, and the report says so). */
    inclination_err_deg: z.number().nonnegative().optional(),
    /** Position angle of the major axis (receding side), degrees east of north. */
    major_axis_pa_deg: finite,
    /** Position angle of the slit, degrees east of north. */
    slit_pa_deg: finite,
    /** Fix the systemic velocity (km/s, in `velocity_frame`) instead of fitting it. */
    systemic_velocity_kms: finite.optional(),
    /** Fix the kinematic centre: 1-based row along the slit in the trimmed data section (may be fractional). */
    centre_row: z.number().min(1).optional(),
    coordinates: coordinatesSchema.optional(),
    /** Doppler convention of the velocities; default optical. */
    velocity_convention: z.enum(['optical', 'relativistic']).optional(),
    /** Rest frame of the velocities; default barycentric. */
    velocity_frame: z.enum(['barycentric', 'heliocentric']).optional(),
    /** Signal-to-noise ratio per row bin the binning aims at. */
    snr_target: positive.optional(),
    /** Rows used for the sky, 1-based inclusive ranges along the slit; default: found automatically. */
    sky_rows: z.array(rowRange).min(1).optional(),
    /** Edges of the radial bins of the folded curve, arcsec (increasing); default: one point per row bin. */
    radial_bins_arcsec: z.array(z.number().nonnegative()).min(2).optional(),
    /** Points closer to the minor axis than this |cos(theta)| are left out of the curve. */
    min_cos_theta: z.number().min(0).lt(1).optional(),
  })
  .superRefine((t, ctx) => {
    const given = (t.inclination_deg !== undefined ? 1 : 0) + (t.axis_ratio !== undefined ? 1 : 0);
    if (given !== 1) {
      ctx.addIssue({
        code: 'custom',
        path: given === 0 ? ['inclination_deg'] : ['axis_ratio'],
        message: given === 0 ? 'missing key: give inclination_deg or axis_ratio' : 'give inclination_deg or axis_ratio, not both',
      });
    }
    t.sky_rows?.forEach(([first, last], i) => {
      if (last < first) ctx.addIssue({ code: 'custom', path: ['sky_rows', i], message: 'range ends before it starts: expected [first, last] with first <= last' });
    });
    const edges = t.radial_bins_arcsec;
    if (edges && edges.some((e, i) => i > 0 && e <= edges[i - 1]!)) {
      ctx.addIssue({ code: 'custom', path: ['radial_bins_arcsec'], message: 'bin edges must increase' });
    }
  });

export const manifestSchema = z.strictObject({
  /** Folder for the products, relative to the manifest's folder. */
  output: z.string().min(1),
  setups: z.record(z.string().min(1), setupSchema).refine((s) => Object.keys(s).length > 0, 'at least one setup'),
  targets: z.array(targetSchema).min(1),
});

export type Manifest = z.infer<typeof manifestSchema>;
export type ManifestSetup = z.infer<typeof setupSchema>;
export type ManifestTarget = z.infer<typeof targetSchema>;
export type ManifestSite = z.infer<typeof siteSchema>;
