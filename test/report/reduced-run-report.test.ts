/**
 * The report of a real reduction (a small simulated night through `whorl reduce`) in headless
 * Chromium: every panel, one row panel per row bin of rows.csv, no errors, nothing fetched.
 */
import { mkdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { main } from '../../src/cli/main.js';
import { memoryIo } from '../../src/cli/io.js';
import { copyOfSimulatedRun } from '../run/simulated-run.js';
import { haveChromium, launchChromium, visit } from './browser.js';

const OUT = resolve('test-output/report');

describe.skipIf(!haveChromium)('report of a reduced simulated night, in headless Chromium', () => {
  let browser: Browser;
  let products: string;
  beforeAll(async () => {
    const dir = copyOfSimulatedRun({ size: 'small' }, 'report-browser');
    expect(await main(['node', 'whorl', 'reduce', join(dir, 'run.yaml'), '--jobs', '1', '--quiet'], memoryIo())).toBe(0);
    products = join(dir, 'products');
    browser = await launchChromium();
    mkdirSync(OUT, { recursive: true });
  });
  afterAll(async () => browser?.close());

  it('has one row panel per row bin of rows.csv and loads cleanly', async () => {
    const csv = readFileSync(join(products, 'Halden-Spiral', 'rows.csv'), 'utf8').split('\n').filter((l) => l && !l.startsWith('#'));
    const header = csv[0]!.split(',');
    const [iStart, iEnd] = [header.indexOf('row_start'), header.indexOf('row_end')];
    const bins = new Set(csv.slice(1).map((l) => { const f = l.split(','); return `${f[iStart]}-${f[iEnd]}`; }));
    let panels = 0;
    let sections: string[] = [];
    const result = await visit(browser, join(products, 'Halden-Spiral', 'report.html'), async (page) => {
      panels = await page.locator('.row-panel').count();
      sections = await page.$$eval('section.panel', (els) => els.map((e) => e.id));
      await page.screenshot({ path: join(OUT, 'reduced-run.png') });
    });
    expect(result.consoleErrors).toEqual([]);
    expect(result.outsideRequests).toEqual([]);
    expect(panels).toBe(bins.size);
    expect(sections).toContain('rotation-curve');
    expect(sections).toHaveLength(11);
  });

  it('the run index links to the target and loads cleanly', async () => {
    let href: string | null = null;
    const result = await visit(browser, join(products, 'index.html'), async (page) => {
      href = await page.getAttribute('table.targets a', 'href');
    });
    expect(result.consoleErrors).toEqual([]);
    expect(result.outsideRequests).toEqual([]);
    expect(href).toBe('Halden-Spiral/report.html');
  });
});
