/** The per-target report: every panel, in the order a reader checks them. */
import { escapeHtml } from './html.js';
import { page } from './page.js';
import { PAGE_SCRIPT } from './page-script.js';
import type { TargetReportInput } from './types.js';
import { keyNumbersPanel } from './panels/key-numbers.js';
import { spectrumImagePanel } from './panels/spectrum-image.js';
import { wavelengthPanel } from './panels/wavelength.js';
import { skyPanel } from './panels/sky.js';
import { rowFitsPanel } from './panels/row-fits.js';
import { pvPanel } from './panels/pv.js';
import { curvePanel } from './panels/curve.js';
import { lightPanel } from './panels/light.js';
import { dynamicsPanel } from './panels/dynamics.js';
import { warningsPanel } from './panels/warnings.js';
import { provenancePanel } from './panels/provenance.js';

export function renderTargetReport(input: TargetReportInput): string {
  const title = `${input.name}: rotation curve report`;
  const objectNote = input.object !== undefined && input.object !== input.name ? ` (OBJECT ${input.object})` : '';
  const head = `<h1>${escapeHtml(input.name)}</h1><p class="sub">Set-up ${escapeHtml(input.setup)}${escapeHtml(objectNote)} \u00b7 <a href="../index.html">all targets</a></p>`;
  if (input.status === 'failed') {
    const body = `${head}<section class="panel" id="failure"><h2>This target failed</h2><p class="status-failed">${escapeHtml(input.failure ?? 'unknown reason')}</p></section>${warningsPanel(input)}${provenancePanel(input)}`;
    return page(title, body);
  }
  const panels = [
    keyNumbersPanel(input),
    spectrumImagePanel(input),
    wavelengthPanel(input),
    skyPanel(input),
    rowFitsPanel(input),
    pvPanel(input),
    curvePanel(input),
    lightPanel(input),
    dynamicsPanel(input),
    warningsPanel(input),
    provenancePanel(input),
  ];
  return page(title, head + panels.join(''), PAGE_SCRIPT);
}
