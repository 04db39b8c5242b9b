/**
 * FITS speed: decoding and writing a full-size 4096 x 2048 frame, unsigned 16-bit (raw frames) and
 * float32 (products), made in memory. Target from issue 2: decode of the uint16 frame well under 100 ms.
 */
import { parseFits } from '../fits/parse.js';
import { readImage } from '../fits/image.js';
import { writeFits } from '../fits/write.js';
import type { WriteHdu } from '../fits/write-types.js';
import type { BenchContext, BenchRow } from './types.js';

const WIDTH = 4096;
const HEIGHT = 2048;
const REPEATS = 5;

/** Best of REPEATS wall and CPU times in ms (CPU time is the honest figure on a shared machine), and the peak RSS seen (MB). */
function time(run: () => void): { ms: number; cpuMs: number; peakRssMb: number } {
  let best = Infinity;
  let bestCpu = Infinity;
  let peak = 0;
  for (let i = 0; i < REPEATS; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    run();
    best = Math.min(best, performance.now() - t0);
    const c = process.cpuUsage(c0);
    bestCpu = Math.min(bestCpu, (c.user + c.system) / 1000);
    peak = Math.max(peak, process.memoryUsage().rss / 2 ** 20);
  }
  return { ms: best, cpuMs: bestCpu, peakRssMb: peak };
}

function figure(megabytes: number, t: { ms: number; cpuMs: number }): string {
  return `${(megabytes / (t.ms / 1000)).toFixed(0)} MB/s (CPU ${t.cpuMs.toFixed(0)} ms)`;
}

function frame(bitpix: 16 | -32): WriteHdu {
  const data = new Float32Array(WIDTH * HEIGHT);
  // A smooth ramp plus a hash-like pattern: every byte value occurs, nothing compressible matters here.
  for (let i = 0; i < data.length; i++) data[i] = bitpix === 16 ? (i * 2654435761) % 65536 : Math.sin(i) * 1000;
  return bitpix === 16 ? { kind: 'image', bitpix, bzero: 32768, width: WIDTH, height: HEIGHT, data } : { kind: 'image', bitpix, width: WIDTH, height: HEIGHT, data };
}

export async function benchFits(_ctx: BenchContext): Promise<BenchRow[]> {
  const rows: BenchRow[] = [];
  for (const [label, bitpix] of [['uint16', 16], ['float32', -32]] as const) {
    const spec = frame(bitpix);
    const megabytes = (WIDTH * HEIGHT * (bitpix === 16 ? 2 : 4)) / 1e6;
    let bytes: Uint8Array = new Uint8Array(0);
    const w = time(() => void (bytes = writeFits([spec], { imageInPrimary: true })));
    const r = time(() => void readImage(parseFits(bytes, 'bench', { checksum: 'skip' }), 0, { float32: true }));
    const rc = time(() => void readImage(parseFits(bytes, 'bench'), 0, { float32: true }));
    rows.push(
      { name: `fits: decode ${WIDTH}x${HEIGHT} ${label}`, wallMs: r.ms, peakRssMb: r.peakRssMb, figure: figure(megabytes, r), ...(bitpix === 16 ? { target: '< 100 ms' } : {}) },
      { name: `fits: decode ${WIDTH}x${HEIGHT} ${label} + checksum check`, wallMs: rc.ms, peakRssMb: rc.peakRssMb, figure: figure(megabytes, rc) },
      { name: `fits: write ${WIDTH}x${HEIGHT} ${label} with checksums`, wallMs: w.ms, peakRssMb: w.peakRssMb, figure: figure(megabytes, w) },
    );
  }
  return rows;
}
