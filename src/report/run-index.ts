/** The run-level index: every target with its status, key numbers and a thumbnail of its curve. */
import { COLORS } from './colors.js';
import { escapeHtml, fmt } from './html.js';
import { page } from './page.js';
import { renderPlot } from './plot.js';
import type { RunIndexEntry, RunIndexInput } from './types.js';

function thumbnail(t: RunIndexEntry): string {
  if (!t.curve || t.curve.rKpc.length === 0) return '';
  return renderPlot({
    width: 220,
    height: 130,
    xLabel: 'R (kpc)',
    yLabel: 'V (km/s)',
    series: [{ kind: 'points', x: t.curve.rKpc, y: t.curve.vRot, yErr: t.curve.err, color: COLORS.combined }],
    xRange: [0, Math.max(1e-3, ...t.curve.rKpc.filter(Number.isFinite)) * 1.05],
  });
}

export function renderRunIndex(input: RunIndexInput): string {
  const rows = input.targets
    .map((t) => {
      const link = `${encodeURI(t.folder)}/report.html`;
      const status = t.status === 'ok' ? '<span class="status-ok">ok</span>' : `<span class="status-failed">failed</span><br>${escapeHtml(t.failure ?? '')}`;
      return (
        `<tr><td><a href="${escapeHtml(link)}">${escapeHtml(t.name)}</a></td><td>${status}</td>` +
        `<td>${fmt(t.vSys, 1)} \u00b1 ${fmt(t.vSysErr, 1)}</td><td>${fmt(t.vOuter, 1)}</td><td>${fmt(t.inclinationDeg, 1)}</td><td>${fmt(t.distanceMpc, 1)}</td><td>${t.warnings}</td><td>${thumbnail(t)}</td></tr>`
      );
    })
    .join('');
  const failed = input.targets.filter((t) => t.status === 'failed').length;
  const body =
    `<h1>${escapeHtml(input.title)}</h1><p class="sub">${input.targets.length} targets, ${failed} failed \u00b7 whorl ${escapeHtml(input.whorlVersion)}</p>` +
    `<section class="panel" id="targets"><table class="targets"><tr><th>target</th><th>status</th><th>v_sys (km/s)</th><th>outer V (km/s)</th><th>inclination (deg)</th><th>distance (Mpc)</th><th>warnings</th><th>curve</th></tr>${rows}</table></section>`;
  return page(input.title, body);
}
