/**
 * The 2-D solution: the central band's identified lines traced through the bands, and
 * lambda(x, y) fitted to every traced position with clipping (y order chosen by the data or set).
 */
import { StageError } from '../../errors.js';
import { legendre1DStep, legendre2DStepX } from '../../kernels/legendre.js';
import { fitLegendre2D } from '../../kernels/legendre-fit.js';
import type { ArcLineMeasurement, WavelengthSolution } from '../../products/wavelength.js';
import type { BandSpectra } from './band-spectra.js';
import { isClean, type ArcPeak } from './centroids.js';
import type { CentralSolution } from './central-solution.js';
import { CENTROID_FLOOR_PX } from './match.js';
import { chooseOrderY } from './order-choice.js';
import type { ArcSettings } from './settings.js';
import { traceLines, type TracePeak } from './trace.js';

/** The solution's model, traced positions (kept or clipped), RMS and identified range, as WavelengthSolution holds them. */
export interface SlitFit extends Pick<WavelengthSolution, 'model' | 'lines' | 'rmsAngstrom' | 'rmsPx' | 'identifiedRange'> {
  /** chi2 / dof of the kept positions with their centroid errors (plus the floor): near 1 when the model fits. */
  reducedChi2: number;
  /** Bands with at least one traced position, and distinct lines kept. */
  bandsWithLines: number;
  linesKept: number;
}

export function fitAlongSlit(bands: BandSpectra, bandPeaks: ArcPeak[][], centralBand: number, central: CentralSolution, width: number, height: number, settings: ArcSettings, arcName: string): SlitFit {
  const { id, matches, xOrder } = central;
  const orient = (x: number): number => (id.flipped ? width - 1 - x : x);
  const oriented: TracePeak[][] = bandPeaks.map((list) => list.filter(isClean).map((p) => ({ x: orient(p.x), xErr: p.xErr, sigma: p.sigma })).sort((a, b) => a.x - b.x));
  const keptIdx = matches.peak.filter((_, i) => matches.fit.used[i]);
  const startLines = matches.line.filter((_, i) => matches.fit.used[i]).map((j) => id.lines[j]!);
  const clean = bandPeaks[centralBand]!.filter(isClean);
  const start = keptIdx.map((k) => ({ x: id.peaks[k]!.x, xErr: clean[k]!.xErr, sigma: clean[k]!.sigma }));
  const points = traceLines(oriented, centralBand, start, settings.traceTolerancePx);
  const n = points.length;
  const px = Float64Array.from(points, (p) => p.x);
  const py = Float64Array.from(points, (p) => bands.yCentre[p.band]!);
  const pz = Float64Array.from(points, (p) => startLines[p.line]!.wavelength);
  const pw = Float64Array.from(points, (p) => 1 / (Math.hypot(p.xErr, CENTROID_FLOOR_PX) * legendre1DStep(matches.fit.model, p.x)) ** 2);
  const range = { xMin: 0, xMax: width - 1, yMin: 0, yMax: Math.max(height - 1, 1) };
  const bandsWithLines = new Set(points.map((p) => p.band)).size;
  const maxY = Math.min(settings.maxYOrder, bandsWithLines - 1);
  const yOrder = settings.yOrder === 'auto' ? chooseOrderY(px, py, pz, pw, xOrder, maxY, range, settings.clipSigma) : Math.min(settings.yOrder, maxY);
  if (n < (xOrder + 1) * (yOrder + 1) + 2) {
    throw new StageError('arc', 'arc.too-few-points', `the arc ${arcName}: only ${n} line positions traced along the slit for a ${xOrder}x${yOrder} solution; set a lower wavelength_order (dispersion, slit) in the manifest`);
  }
  const fit = fitLegendre2D(px, py, pz, pw, xOrder, yOrder, range, { clipSigma: settings.clipSigma, robust: true });
  const lines: ArcLineMeasurement[] = [];
  const kept = new Set<number>();
  let sumA = 0;
  let sumPx = 0;
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    const residualAngstrom = -fit.residuals[i]!;
    const used = fit.used[i] === 1;
    const line = startLines[points[i]!.line]!;
    lines.push({ wavelength: line.wavelength, element: line.element, x: px[i]!, y: py[i]!, sigmaPx: points[i]!.sigma, residualAngstrom, used });
    if (!used) continue;
    kept.add(points[i]!.line);
    sumA += residualAngstrom * residualAngstrom;
    const rp = residualAngstrom / legendre2DStepX(fit.model, px[i]!, py[i]!);
    sumPx += rp * rp;
    lo = Math.min(lo, line.wavelength);
    hi = Math.max(hi, line.wavelength);
  }
  return {
    model: fit.model,
    lines,
    rmsAngstrom: Math.sqrt(sumA / fit.nUsed),
    rmsPx: Math.sqrt(sumPx / fit.nUsed),
    identifiedRange: [lo, hi],
    reducedChi2: fit.reducedChi2,
    bandsWithLines,
    linesKept: kept.size,
  };
}
