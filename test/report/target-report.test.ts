import { mkdirSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { renderTargetReport } from '../../src/report/target-report.js';
import { sampleReportInput } from './sample-input.js';
import { haveChromium, launchChromium, visit } from './browser.js';

const OUT = resolve('test-output/report');
const PANELS = ['key-numbers', 'spectrum-image', 'wavelength-solution', 'sky-residual', 'row-fits', 'position-velocity', 'rotation-curve', 'light-profile', 'dynamics', 'warnings', 'provenance'];

describe('target report (static HTML)', () => {
  it('escapes text from headers: an OBJECT of <script> stays text', () => {
    const html = renderTargetReport(sampleReportInput(4, '<script>alert(1)</script>'));
    expect(html).not.toContain('<script>alert(1)</script>');
    expect(html).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    // the diagnostic message with markup is escaped too
    expect(html).toContain('S/N target &lt;b&gt;');
  });

  it('forbids network access by its Content-Security-Policy', () => {
    expect(renderTargetReport(sampleReportInput(2))).toContain("default-src 'none'");
  });
});

describe.skipIf(!haveChromium)('target report in headless Chromium', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchChromium();
    mkdirSync(OUT, { recursive: true });
  });
  afterAll(async () => browser?.close());

  it('shows every panel, one row panel per fitted bin, a working filter, no errors and no requests', async () => {
    const input = sampleReportInput(12);
    const file = join(OUT, 'sample.html');
    writeFileSync(file, renderTargetReport(input));
    let panelsFound: string[] = [];
    let rowPanels = 0;
    let visibleAfterFilter = 0;
    let inkedPixels = 0;
    const result = await visit(browser, file, async (page) => {
      panelsFound = await page.$$eval('section.panel', (els) => els.map((e) => e.id));
      rowPanels = await page.locator('.row-panel').count();
      await page.check('#only-flagged');
      visibleAfterFilter = await page.locator('.row-panel:visible').count();
      await page.uncheck('#only-flagged');
      await page.locator('.row-panel canvas').first().scrollIntoViewIfNeeded();
      await page.waitForFunction(() => document.querySelector('.row-panel')?.getAttribute('data-drawn') === '1');
      inkedPixels = await page.$eval('.row-panel canvas', (c) => {
        const ctx = (c as HTMLCanvasElement).getContext('2d')!;
        const px = ctx.getImageData(0, 0, (c as HTMLCanvasElement).width, (c as HTMLCanvasElement).height).data;
        let n = 0;
        for (let i = 3; i < px.length; i += 4) if (px[i]! > 0) n++;
        return n;
      });
      await page.screenshot({ path: join(OUT, 'sample.png'), fullPage: true });
    });
    expect(result.consoleErrors).toEqual([]);
    expect(result.outsideRequests).toEqual([]);
    expect(panelsFound).toEqual(PANELS);
    expect(rowPanels).toBe(input.lines!.bins.length);
    const flaggedBins = new Set(input.lines!.measurements.filter((m) => m.flags !== 0).map((m) => m.bin)).size;
    expect(visibleAfterFilter).toBe(flaggedBins);
    // the page script decoded the packed data and drew the first panel
    expect(inkedPixels).toBeGreaterThan(200);
  });

  it('runs no script from an OBJECT keyword', async () => {
    const file = join(OUT, 'escaping.html');
    writeFileSync(file, renderTargetReport(sampleReportInput(3, '<script>alert(1)</script><img src=x onerror=alert(2)>')));
    let heading = '';
    const result = await visit(browser, file, async (page) => {
      heading = (await page.textContent('p.sub')) ?? '';
    });
    expect(result.dialogs).toEqual([]);
    expect(heading).toContain('<script>alert(1)</script>');
  });
});

if (!haveChromium) console.warn('SKIPPED: report browser tests need Chromium at /usr/bin/chromium (apt-get install chromium)');
