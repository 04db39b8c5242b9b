/**
 * Opening report pages in Debian's headless Chromium through playwright-core. Tests skip with a
 * visible message when the browser is not installed (.ci/run installs it).
 */
import { existsSync } from 'node:fs';
import type { Browser } from 'playwright-core';

export const CHROMIUM = process.env['WHORL_CHROMIUM'] ?? '/usr/bin/chromium';
export const haveChromium = existsSync(CHROMIUM);

export async function launchChromium(): Promise<Browser> {
  const { chromium } = await import('playwright-core');
  return chromium.launch({
    executablePath: CHROMIUM,
    // As the machine notes advise for root in a closed network: no sandbox, no background traffic.
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}

export interface PageVisit {
  consoleErrors: string[];
  outsideRequests: string[];
  dialogs: string[];
}

/** Open a file:// page, record console errors, requests that leave the file, and dialogs. */
export async function visit(browser: Browser, path: string, act: (page: import('playwright-core').Page) => Promise<void>): Promise<PageVisit> {
  const page = await browser.newPage({ viewport: { width: 1100, height: 900 } });
  const visitLog: PageVisit = { consoleErrors: [], outsideRequests: [], dialogs: [] };
  page.on('console', (m) => {
    if (m.type() === 'error') visitLog.consoleErrors.push(m.text());
  });
  page.on('pageerror', (e) => visitLog.consoleErrors.push(e.message));
  page.on('dialog', (d) => {
    visitLog.dialogs.push(d.message());
    void d.dismiss();
  });
  page.on('request', (r) => {
    const url = r.url();
    if (!url.startsWith('file://') && !url.startsWith('data:')) visitLog.outsideRequests.push(url);
  });
  await page.goto(`file://${path}`, { waitUntil: 'load' });
  await act(page);
  await page.close();
  return visitLog;
}
