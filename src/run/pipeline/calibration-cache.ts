/**
 * A setup's calibration kept between runs under `<output>/.whorl/calib/`, without what other files
 * already hold: the master bias, flat, flat variance and flat mask are read back from bias.fits and
 * flat.fits (bit for bit), and the per-pixel wavelengths are evaluated again from the solution's
 * model as solveWavelengths evaluates them. The products are trusted only when they are the files
 * written with the cache (same size and modification time) and their DATASUM and CHECKSUM verify;
 * otherwise the cache is a miss and the setup is calibrated again.
 */
import { statSync } from 'node:fs';
import { join } from 'node:path';
import { readFitsFile } from '../../fits/read-file.js';
import { storedFloat32, storedUint16 } from '../../fits/stored-image.js';
import { evalLegendre2DGrid } from '../../kernels/legendre.js';
import { toInternal } from '../../products/orientation.js';
import { readCachedCalibration, writeCachedCalibration } from '../io/state.js';
import type { SetupCalibration } from './setup-stages.js';

/** The calibration products the cache leans on, by file name under `calib/<setup>/`. */
export const BIAS_FILE = 'bias.fits';
export const FLAT_FILE = 'flat.fits';

interface FileStamp {
  /** Relative to the output folder. */
  file: string;
  size: number;
  mtimeMs: number;
}

interface CachedCalibration {
  /** The calibration with its large arrays emptied. */
  calibration: SetupCalibration;
  stamps: FileStamp[];
}

function stampOf(outputDir: string, file: string): FileStamp {
  const s = statSync(join(outputDir, file));
  return { file, size: s.size, mtimeMs: s.mtimeMs };
}

function productPath(cal: SetupCalibration, name: string): string {
  const file = cal.products.find((p) => p.endsWith(`/${name}`) || p === name);
  if (file === undefined) throw new Error(`calibration products lack ${name}`);
  return file;
}

/** Cache `cal` (whose products are written) for `key`; written in the background, so await the promise before the run ends. */
export function cacheCalibration(outputDir: string, folder: string, key: string, cal: SetupCalibration): Promise<void> {
  const none = { masterBias: new Float32Array(0), masterFlat: new Float32Array(0), flatVariance: new Float32Array(0), flatMask: new Uint16Array(0) };
  const calibration: SetupCalibration = { ...cal, ccd: { ...cal.ccd, ...none }, solution: { ...cal.solution, wave: new Float64Array(0) } };
  const stamps = cal.products.map((p) => stampOf(outputDir, p));
  return writeCachedCalibration(outputDir, folder, key, { calibration, stamps } satisfies CachedCalibration);
}

/** The calibration cached for `key`, made whole again from its products; undefined when absent, stale or unreadable. */
export function cachedCalibration(outputDir: string, folder: string, key: string): SetupCalibration | undefined {
  const cached = readCachedCalibration<CachedCalibration>(outputDir, folder, key);
  if (!cached) return undefined;
  try {
    for (const s of cached.stamps) {
      const now = stampOf(outputDir, s.file);
      if (now.size !== s.size || now.mtimeMs !== s.mtimeMs) return undefined;
    }
    return restore(outputDir, cached.calibration);
  } catch {
    return undefined;
  }
}

function restore(outputDir: string, cal: SetupCalibration): SetupCalibration {
  const { width, height, orientation } = cal.ccd;
  // checksum 'error': a product whose data no longer match its DATASUM throws, and the cache misses
  const bias = readFitsFile(join(outputDir, productPath(cal, BIAS_FILE)), { checksum: 'error' });
  const flat = readFitsFile(join(outputDir, productPath(cal, FLAT_FILE)), { checksum: 'error' });
  const internal = <T extends Float32Array | Uint16Array>(img: { width: number; height: number; data: T }): T => {
    // The stored arrays are already copies: reordered only when the orientation is not the identity.
    const out = orientation.transpose || orientation.flipX ? toInternal(img.data, img.width, img.height, orientation) : img;
    if (out.width !== width || out.height !== height) throw new Error(`calibration product is ${out.width} x ${out.height}, the cache says ${width} x ${height}`);
    return out.data;
  };
  const hdu = (file: typeof flat, name: string) => file.hdus.findIndex((h) => h.name === name);
  const ccd = {
    ...cal.ccd,
    masterBias: internal(storedFloat32(bias, 1)),
    masterFlat: internal(storedFloat32(flat, hdu(flat, 'FLAT'))),
    flatVariance: internal(storedFloat32(flat, hdu(flat, 'FLATVAR'))),
    flatMask: internal(storedUint16(flat, hdu(flat, 'FLATMASK'))),
  };
  const s = cal.solution;
  const wave = evalLegendre2DGrid(s.model, s.width, s.height, new Float64Array(s.width * s.height));
  return { ...cal, ccd, solution: { ...s, wave } };
}
