/**
 * A small SVG plot renderer: linear axes with round ticks, labelled with units, points with error
 * bars and polylines. Enough for the report's panels without bundling a plotting library.
 */
import { escapeHtml } from './html.js';

export interface Series {
  kind: 'points' | 'line';
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  /** Symmetric 1-sigma errors in y (points only). */
  yErr?: ArrayLike<number>;
  color: string;
  label?: string;
  /** Open markers (for excluded or flagged points). */
  hollow?: boolean;
  dashed?: boolean;
}

export interface PlotSpec {
  width: number;
  height: number;
  xLabel: string;
  yLabel: string;
  series: Series[];
  xRange?: [number, number];
  yRange?: [number, number];
  /** Horizontal reference lines (e.g. zero residual). */
  hLines?: number[];
  title?: string;
}

const MARGIN = { left: 58, right: 12, top: 22, bottom: 40 };

/** Round tick positions covering [lo, hi] (1, 2, 5 x 10^n steps). */
export function niceTicks(lo: number, hi: number, target = 5): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / target;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const ticks: number[] = [];
  for (let t = Math.ceil(lo / step) * step; t <= hi + step * 1e-9; t += step) ticks.push(Math.abs(t) < step * 1e-9 ? 0 : t);
  return ticks;
}

function extent(series: Series[], axis: 'x' | 'y'): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const s of series) {
    const v = axis === 'x' ? s.x : s.y;
    for (let i = 0; i < v.length; i++) {
      const e = axis === 'y' && s.yErr ? s.yErr[i]! : 0;
      const a = v[i]!;
      if (!Number.isFinite(a)) continue;
      const err = Number.isFinite(e) ? e : 0;
      lo = Math.min(lo, a - err);
      hi = Math.max(hi, a + err);
    }
  }
  if (!Number.isFinite(lo)) return [0, 1];
  if (lo === hi) return [lo - 1, hi + 1];
  const pad = (hi - lo) * 0.05;
  return [lo - pad, hi + pad];
}

function tickLabel(t: number, step: number): string {
  const decimals = step >= 1 ? 0 : Math.min(6, Math.ceil(-Math.log10(step)));
  return t.toFixed(decimals);
}

export function renderPlot(spec: PlotSpec): string {
  const { width, height } = spec;
  const [x0, x1] = spec.xRange ?? extent(spec.series, 'x');
  const [y0, y1] = spec.yRange ?? extent(spec.series, 'y');
  const pw = width - MARGIN.left - MARGIN.right;
  const ph = height - MARGIN.top - MARGIN.bottom;
  const sx = (x: number) => MARGIN.left + ((x - x0) / (x1 - x0)) * pw;
  const sy = (y: number) => MARGIN.top + (1 - (y - y0) / (y1 - y0)) * ph;
  const parts: string[] = [];
  parts.push(`<svg xmlns="http://www.w3.org/2000/svg" class="plot" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" role="img">`);
  if (spec.title) parts.push(`<title>${escapeHtml(spec.title)}</title>`);
  parts.push(`<rect x="${MARGIN.left}" y="${MARGIN.top}" width="${pw}" height="${ph}" fill="none" stroke="#444"/>`);
  const xt = niceTicks(x0, x1);
  const yt = niceTicks(y0, y1);
  const xStep = xt.length > 1 ? xt[1]! - xt[0]! : 1;
  const yStep = yt.length > 1 ? yt[1]! - yt[0]! : 1;
  for (const t of xt) {
    const px = sx(t).toFixed(1);
    parts.push(`<line x1="${px}" x2="${px}" y1="${MARGIN.top + ph}" y2="${MARGIN.top + ph + 4}" stroke="#444"/>`);
    parts.push(`<text x="${px}" y="${MARGIN.top + ph + 16}" text-anchor="middle">${tickLabel(t, xStep)}</text>`);
  }
  for (const t of yt) {
    const py = sy(t).toFixed(1);
    parts.push(`<line x1="${MARGIN.left - 4}" x2="${MARGIN.left}" y1="${py}" y2="${py}" stroke="#444"/>`);
    parts.push(`<text x="${MARGIN.left - 6}" y="${py}" text-anchor="end" dominant-baseline="middle">${tickLabel(t, yStep)}</text>`);
  }
  parts.push(`<text x="${MARGIN.left + pw / 2}" y="${height - 6}" text-anchor="middle" class="axis-label">${escapeHtml(spec.xLabel)}</text>`);
  parts.push(
    `<text transform="translate(14 ${MARGIN.top + ph / 2}) rotate(-90)" text-anchor="middle" class="axis-label">${escapeHtml(spec.yLabel)}</text>`,
  );
  parts.push(`<clipPath id="c${width}x${height}"><rect x="${MARGIN.left}" y="${MARGIN.top}" width="${pw}" height="${ph}"/></clipPath>`);
  parts.push(`<g clip-path="url(#c${width}x${height})">`);
  for (const h of spec.hLines ?? []) {
    if (h >= y0 && h <= y1) parts.push(`<line x1="${MARGIN.left}" x2="${MARGIN.left + pw}" y1="${sy(h).toFixed(1)}" y2="${sy(h).toFixed(1)}" stroke="#888" stroke-dasharray="3 3"/>`);
  }
  for (const s of spec.series) parts.push(renderSeries(s, sx, sy));
  parts.push('</g>');
  const labelled = spec.series.filter((s) => s.label);
  labelled.forEach((s, i) => {
    const lx = MARGIN.left + 8 + i * 120;
    parts.push(`<circle cx="${lx}" cy="${MARGIN.top - 9}" r="4" fill="${s.hollow ? 'none' : s.color}" stroke="${s.color}"/>`);
    parts.push(`<text x="${lx + 8}" y="${MARGIN.top - 9}" dominant-baseline="middle">${escapeHtml(s.label)}</text>`);
  });
  parts.push('</svg>');
  return parts.join('');
}

function renderSeries(s: Series, sx: (x: number) => number, sy: (y: number) => number): string {
  const out: string[] = [];
  if (s.kind === 'line') {
    const pts: string[] = [];
    for (let i = 0; i < s.x.length; i++) {
      if (Number.isFinite(s.x[i]!) && Number.isFinite(s.y[i]!)) pts.push(`${sx(s.x[i]!).toFixed(1)},${sy(s.y[i]!).toFixed(1)}`);
    }
    out.push(`<polyline fill="none" stroke="${s.color}" stroke-width="1.5"${s.dashed ? ' stroke-dasharray="5 3"' : ''} points="${pts.join(' ')}"/>`);
    return out.join('');
  }
  for (let i = 0; i < s.x.length; i++) {
    const x = s.x[i]!;
    const y = s.y[i]!;
    if (!Number.isFinite(x) || !Number.isFinite(y)) continue;
    const px = sx(x).toFixed(1);
    const e = s.yErr ? s.yErr[i]! : NaN;
    if (Number.isFinite(e) && e > 0) out.push(`<line x1="${px}" x2="${px}" y1="${sy(y - e).toFixed(1)}" y2="${sy(y + e).toFixed(1)}" stroke="${s.color}" stroke-opacity="0.6"/>`);
    out.push(`<circle cx="${px}" cy="${sy(y).toFixed(1)}" r="2.5" fill="${s.hollow ? 'none' : s.color}" stroke="${s.color}"/>`);
  }
  return out.join('');
}
