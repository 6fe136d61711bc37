/// <reference lib="dom" />
/**
 * Opens a rendered report in real headless Chromium (Debian's `chromium`, driven by
 * playwright-core): every chart is an SVG that is laid out with a nonzero size, the console
 * stays free of errors, the page asks for nothing over the network, and a full-page
 * screenshot is written to a temporary folder (its path is printed).
 */
import { existsSync, mkdtempSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { renderReport } from '@fractile/report';
import { sampleReportData } from '../packages/report/src/testing/sample-report-data.ts';

const CHROMIUM = process.env.FRACTILE_CHROMIUM ?? '/usr/bin/chromium';
const ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
  '--disable-quic',
];

describe('report in a browser', () => {
  it('shows every chart with a nonzero size, logs no errors, loads nothing from outside', async () => {
    expect(existsSync(CHROMIUM), `Chromium not found at ${CHROMIUM} (install Debian's chromium or set FRACTILE_CHROMIUM)`).toBe(true);
    const data = sampleReportData({ groups: 3, curvesPerGroup: 40, properties: 6, controlCharts: 4, firstSupplier: 'Northmill <Plate & Coil>' });
    const html = await renderReport(data);
    const dir = mkdtempSync(join(tmpdir(), 'fractile-report-'));
    const file = join(dir, 'report.html');
    writeFileSync(file, html);
    const url = pathToFileURL(file).href;

    const browser = await chromium.launch({ executablePath: CHROMIUM, args: ARGS });
    try {
      const page = await browser.newPage({ viewport: { width: 1366, height: 900 } });
      const problems: string[] = [];
      page.on('console', (m) => {
        if (m.type() === 'error' || m.type() === 'warning') problems.push(`console ${m.type()}: ${m.text()}`);
      });
      page.on('pageerror', (e) => problems.push(`page error: ${e.message}`));
      const requests: string[] = [];
      page.on('request', (r) => requests.push(r.url()));
      await page.goto(url, { waitUntil: 'load' });

      const boxes = await page.$$eval('svg', (svgs) =>
        svgs.map((s) => {
          const r = s.getBoundingClientRect();
          const style = getComputedStyle(s);
          return { w: r.width, h: r.height, visible: style.visibility !== 'hidden' && style.display !== 'none', paths: s.querySelectorAll('path, line, text').length };
        }),
      );
      // 3 groups × (curves + 6 histograms) + 4 control charts + 1 supplier comparison
      expect(boxes.length).toBe(3 * 7 + 4 + 1);
      for (const b of boxes) {
        expect(b.visible).toBe(true);
        expect(b.w).toBeGreaterThan(150);
        expect(b.h).toBeGreaterThan(100);
        expect(b.paths).toBeGreaterThan(10);
      }
      // no chart spills out of the page width
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
      expect(overflow).toBeLessThanOrEqual(0);
      // the caution is shown, top and bottom
      expect(await page.locator('aside.caution').count()).toBe(2);
      expect(await page.locator('aside.caution').first().isVisible()).toBe(true);
      // the hostile-looking supplier name is shown as text
      expect(await page.locator('h2', { hasText: 'Northmill <Plate & Coil>' }).count()).toBe(1);

      // the idealized-curve panel in the trade's words, one per group, laid out and readable
      const panels = page.locator('.side h3', { hasText: 'Idealized characteristic curve' });
      expect(await panels.count()).toBe(3);
      for (let i = 0; i < 3; i++) expect(await panels.nth(i).isVisible()).toBe(true);
      expect(await page.locator('dt', { hasText: 'Modulus of elasticity E' }).first().isVisible()).toBe(true);
      expect(await page.locator('dt', { hasText: 'Hardening modulus (vs true plastic strain)' }).first().isVisible()).toBe(true);
      const multilinear = page.locator('.side table.compact').first();
      expect(await multilinear.isVisible()).toBe(true);
      expect(await multilinear.locator('tbody tr').count()).toBeGreaterThan(5);
      // no machine keys in what a reader sees
      const text = await page.evaluate(() => document.querySelector('main')?.textContent ?? '');
      for (const key of ['e_mpa', 'hardening_modulus_mpa', 'tangent_modulus_mpa', 'rmse_mpa', 'flags, 0 set']) expect(text).not.toContain(key);
      // the side panel does not leave a blank area under the chart: the row is as tall as its taller part
      const rows = await page.$$eval('.curve-row', (els) =>
        els.map((el) => {
          const kids = Array.from(el.children).map((c) => c.getBoundingClientRect().height);
          return { row: el.getBoundingClientRect().height, tallest: Math.max(...kids) };
        }),
      );
      expect(rows.length).toBe(3);
      for (const r of rows) expect(r.row).toBeLessThanOrEqual(r.tallest + 40);
      // the planning and data-quality sections are shown
      expect(await page.locator('#planning h2').isVisible()).toBe(true);
      expect(await page.locator('#quality h2').isVisible()).toBe(true);

      expect(requests).toEqual([url]);
      expect(problems).toEqual([]);

      const shot = join(dir, 'report.png');
      await page.screenshot({ path: shot, fullPage: true });
      expect(statSync(shot).size).toBeGreaterThan(50_000);
      console.log(`report screenshot: ${shot}`);
    } finally {
      await browser.close();
    }
  });
});
