/**
 * The sky spline's refits take clipped and masked pixels out of the fit's normal equations
 * instead of summing the kept pixels again. Against a direct penalised least-squares fit built
 * with scipy's B-spline design matrix and solved with numpy (Debian python3-scipy, python3-numpy)
 * on a tilted sky line with a slit gradient: clipping rounds at 4 sigma, then a patch of
 * "emission" pixels removed with the slit factor held.
 */
import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { Rng } from '../../../src/kernels/random.js';
import { fitSkySpline, refitWithout } from '../../../src/stages/sky/sky-spline.js';
import { hasAstropy, PYTHON } from '../../fits/outside-tools.js';

const SCRIPT = `
import json, sys
import numpy as np
from scipy.interpolate import BSpline
q = json.load(sys.stdin)
sci, var, wave = (np.array(q[k], dtype=np.float64) for k in ('sci', 'var', 'wave'))
g = np.repeat(np.array(q['slit']), q['width'])
n_int, start, spacing = q['nIntervals'], q['start'], q['spacing']
knots = start + spacing * np.arange(-3, n_int + 4)
# Points at the last breakpoint belong to the last interval (extrapolate covers them).
A = BSpline.design_matrix(np.clip(wave, knots[3], knots[-4]), knots, 3, extrapolate=True).toarray() * g[:, None]
nb = A.shape[1]
D = np.diff(np.eye(nb), 2, axis=0)
def solve(use):
    w = use / var
    N = A.T @ (A * w[:, None])
    kappa = 1e-6 * np.trace(N) / nb
    N = N + kappa * D.T @ D + kappa * 1e-6 * np.eye(nb)
    return np.linalg.solve(N, A.T @ (w * sci))
use = np.ones(len(sci))
c = solve(use)
for _ in range(q['iterations']):
    res = sci - A @ c
    drop = (use > 0) & (res * res > q['clipSigma'] ** 2 * var)
    if not drop.any():
        break
    use[drop] = 0
    c = solve(use)
clipped = c
use[np.array(q['marked'], dtype=int)] = 0
print(json.dumps({'clipped': clipped.tolist(), 'dropped': np.flatnonzero(use == 0).tolist(), 'refit': solve(use).tolist()}))
`;

const W = 160;
const H = 24;

function frame() {
  const rng = new Rng(17);
  const sci = new Float32Array(W * H);
  const variance = new Float32Array(W * H);
  const wave = new Float64Array(W * H);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const i = y * W + x;
      wave[i] = 6500 + 0.5 * x + 0.04 * y; // 2 px of tilt over the slit
      const sky = (1 + (0.03 * (y - H / 2)) / H) * (300 + 2000 * Math.exp(-0.5 * ((wave[i]! - 6540) / 0.9) ** 2));
      variance[i] = sky + 16;
      sci[i] = sky + Math.sqrt(variance[i]!) * rng.normal();
    }
  }
  for (const [x, y] of [[20, 3], [81, 10], [82, 10], [140, 19], [60, 22]] as const) sci[y * W + x] += 40 * Math.sqrt(variance[y * W + x]!);
  return { sci, variance, wave };
}

describe.skipIf(!hasAstropy)('sky spline refits without pixels', () => {
  it('match a direct numpy fit after the clipping rounds and after masking pixels, slit factor held', () => {
    const { sci, variance, wave } = frame();
    const use = new Uint8Array(W * H).fill(1);
    const input = { width: W, height: H, sci, var: variance, wave, use };
    const fit = fitSkySpline(input, 1, 1, 4, 2)!;
    const marks = new Uint8Array(W * H);
    const marked: number[] = [];
    for (let y = 5; y <= 9; y++) for (let x = 100; x <= 104; x++) marked.push(y * W + x);
    for (const i of marked) if (use[i]) (marks[i] = 1), (use[i] = 0);
    const refit = refitWithout(fit, input, new Uint8Array(H).fill(1), marks, 1)!;

    const { start, spacing, nIntervals } = fit.spline;
    const query = { sci: Array.from(sci), var: Array.from(variance), wave: Array.from(wave), slit: Array.from(fit.slit), width: W, start, spacing, nIntervals, clipSigma: 4, iterations: 2, marked };
    const r = spawnSync(PYTHON, ['-c', SCRIPT], { input: JSON.stringify(query), encoding: 'utf8', maxBuffer: 64 << 20 });
    if (r.status !== 0) throw new Error(`python failed: ${r.stderr}`);
    const ref = JSON.parse(r.stdout) as { clipped: number[]; dropped: number[]; refit: number[] };

    // The injected outliers are clipped (and whatever noise crosses 4 sigma, the same pixels as numpy's).
    const dropped: number[] = [];
    use.forEach((u, i) => u === 0 && dropped.push(i));
    expect(dropped).toEqual(ref.dropped);
    expect(fit.dropped + refit.dropped).toBeGreaterThan(0);
    expect(refit.used).toBe(W * H - dropped.length);
    const scale = Math.max(...ref.clipped.map(Math.abs));
    ref.clipped.forEach((c, k) => expect(Math.abs(fit.coeffs[k]! - c)).toBeLessThan(1e-9 * scale));
    ref.refit.forEach((c, k) => expect(Math.abs(refit.coeffs[k]! - c)).toBeLessThan(1e-9 * scale));
    // The masked patch sits on the sky line's wing: removing it moves the model there measurably.
    const moved = Math.max(...ref.refit.map((c, k) => Math.abs(c - ref.clipped[k]!)));
    expect(moved).toBeGreaterThan(1e-6 * scale);
  });
});
