/**
 * The report of the full-size target (about 2000 rows): time to render it from its kept inputs,
 * its size, and its load time in headless Chromium (when Debian's chromium is installed).
 * Needs the full-size run reduced by the harness first (src/bench/main.ts does that).
 */
import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { renderTargetReport } from '../report/target-report.js';
import type { TargetReportInput } from '../report/types.js';
import { unpackFromBytes } from '../run/io/pack.js';
import type { BenchContext, BenchRow } from './types.js';

const CHROMIUM = '/usr/bin/chromium';

export async function benchReport(ctx: BenchContext): Promise<BenchRow[]> {
  const dir = join(ctx.scratchDir, 'full', '.whorl', 'report');
  const name = existsSync(dir) ? readdirSync(dir).find((f) => f.endsWith('.bin') && f !== 'index.bin') : undefined;
  if (!name) return [{ name: 'report: (skipped: no reduced full-size target)', wallMs: NaN }];
  const input = unpackFromBytes<TargetReportInput>(readFileSync(join(dir, name)));
  const t0 = performance.now();
  const cpu0 = process.cpuUsage();
  const html = renderTargetReport(input);
  const cpu = process.cpuUsage(cpu0);
  const renderMs = performance.now() - t0;
  const file = join(ctx.scratchDir, 'bench-report.html');
  writeFileSync(file, html);
  const mb = Buffer.byteLength(html) / 1e6;
  const bins = input.lines?.bins.length ?? 0;
  const rows: BenchRow[] = [
    { name: `report: render a full-size target (${bins} row bins)`, wallMs: renderMs, figure: `cpu ${((cpu.user + cpu.system) / 1000).toFixed(0)} ms; ${mb.toFixed(1)} MB`, target: '< 3000 ms, < 15 MB' },
  ];
  if (existsSync(CHROMIUM)) {
    const { chromium } = await import('playwright-core');
    const browser = await chromium.launch({ executablePath: CHROMIUM, args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--no-first-run'] });
    const page = await browser.newPage();
    const l0 = performance.now();
    await page.goto(`file://${file}`, { waitUntil: 'load' });
    const loadMs = performance.now() - l0;
    await browser.close();
    rows.push({ name: 'report: load the full-size report in headless Chromium', wallMs: loadMs, target: '< 2000 ms' });
  }
  return rows;
}
