import { existsSync, mkdirSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { htmlReport } from '../src/report/index.js';
import { loadReportInput } from './fixtures/report/load.js';
import { cli, ensureDemoTables, REPO } from './helpers/cli.js';

const CHROMIUM = '/usr/bin/chromium';
const present = existsSync(CHROMIUM);
if (!present && !process.env.CI) {
  console.warn(`\n*** WARNING: ${CHROMIUM} not found — the HTML report browser test is SKIPPED. Install Debian's chromium to run it. ***\n`);
}
// On CI a missing browser is a failure, not a skip.
const run = present || process.env.CI ? describe : describe.skip;

run('HTML report in a real browser (Debian chromium via playwright-core)', () => {
  const outDir = resolve('test-output');
  const htmlPath = join(outDir, 'report.html');
  type Browser = Awaited<ReturnType<typeof import('playwright-core')['chromium']['launch']>>;
  let browser: Browser;

  beforeAll(async () => {
    mkdirSync(outDir, { recursive: true });
    writeFileSync(htmlPath, htmlReport(loadReportInput()));
    const { chromium } = await import('playwright-core');
    browser = await chromium.launch({
      executablePath: CHROMIUM,
      headless: true,
      args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
    });
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('loads with no console errors, no failed or network requests, and every chart draws', async () => {
    const page = await browser.newPage({ viewport: { width: 1400, height: 1000 } });
    const errors: string[] = [];
    const failed: string[] = [];
    const foreign: string[] = [];
    page.on('console', (m) => { if (m.type() === 'error' || m.type() === 'warning') errors.push(m.text()); });
    page.on('pageerror', (e) => errors.push(String(e)));
    page.on('requestfailed', (r) => failed.push(r.url()));
    page.on('request', (r) => { if (!r.url().startsWith('file:') && !r.url().startsWith('data:')) foreign.push(r.url()); });
    await page.goto(pathToFileURL(htmlPath).href, { waitUntil: 'load' });

    const charts = await page.$$eval('svg.chart', (svgs) =>
      svgs.map((svg) => {
        const paths = [...svg.querySelectorAll('path')].filter((p) => (p.getAttribute('d') ?? '').trim() !== '');
        const drawn = paths.filter((p) => {
          const b = p.getBoundingClientRect();
          return b.width > 0 && b.height > 0;
        });
        // The browser's own XML parser is the well-formedness reference here.
        const doc = new DOMParser().parseFromString(new XMLSerializer().serializeToString(svg), 'image/svg+xml');
        const svgBox = svg.getBoundingClientRect();
        return { id: svg.id, paths: paths.length, drawn: drawn.length, xmlError: doc.getElementsByTagName('parsererror').length, w: svgBox.width, h: svgBox.height };
      }),
    );
    const caution = await page.$eval('.caution', (e) => ({ text: e.textContent ?? '', top: e.getBoundingClientRect().top }));
    mkdirSync('test-output', { recursive: true });
    await page.screenshot({ path: join(outDir, 'report.png'), fullPage: true });

    expect(errors).toEqual([]);
    expect(failed).toEqual([]);
    expect(foreign).toEqual([]);
    // Fixture: 2 stacks × 4 stack charts + 2 devices × 3 design charts.
    expect(charts.length).toBe(14);
    for (const c of charts) {
      expect(c.paths, c.id).toBeGreaterThan(0);
      expect(c.drawn, c.id).toBeGreaterThan(0);
      expect(c.xmlError, c.id).toBe(0);
      expect(c.w * c.h, c.id).toBeGreaterThan(0);
    }
    // The caution is near the top of the page, before any result.
    expect(caution.text).toContain('Verify them by simulation');
    expect(caution.top).toBeLessThan(250);
    await page.close();
  });

  it('the demo report (sized from the demo spec through the CLI) draws every chart, alternatives unfolded', async () => {
    ensureDemoTables();
    const demoHtml = join(outDir, 'demo-report.html');
    const r = cli(['size', join('demo-tables', 'specs', 'marsh-wren.yaml'), '--report', demoHtml, '--force', '--tables', join(REPO, 'tables')]);
    expect([0, 3]).toContain(r.code);
    const page = await browser.newPage({ viewport: { width: 1400, height: 1000 } });
    const errors: string[] = [];
    page.on('console', (m) => { if (m.type() === 'error' || m.type() === 'warning') errors.push(m.text()); });
    page.on('pageerror', (e) => errors.push(String(e)));
    await page.goto(pathToFileURL(demoHtml).href, { waitUntil: 'load' });
    await page.$$eval('details', (ds) => ds.forEach((d) => { (d as HTMLDetailsElement).open = true; }));
    const charts = await page.$$eval('svg.chart', (svgs) => svgs.map((svg) => {
      const drawn = [...svg.querySelectorAll('path')].filter((p) => {
        const b = p.getBoundingClientRect();
        return (p.getAttribute('d') ?? '').trim() !== '' && b.width > 0 && b.height > 0;
      });
      return { id: svg.id, drawn: drawn.length };
    }));
    await page.screenshot({ path: join(outDir, 'demo-report.png'), fullPage: false });
    expect(errors).toEqual([]);
    // Every stack result has Rout and Iout charts at least, plus design charts of both polarities.
    expect(charts.length).toBeGreaterThanOrEqual(20);
    for (const c of charts) expect(c.drawn, c.id).toBeGreaterThan(0);
    await page.close();
  });
});
