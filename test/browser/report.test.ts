/**
 * Opens the HTML reports in a real browser (Debian's chromium driven by playwright-core):
 * no console errors, no network requests, every plot and image has a size, hostile text stays
 * text (no script runs), the page prints to PDF; screenshots go to test-output/screenshots/.
 *
 * The pages come from a real run: the built-in demo (simulate → analyze with maps → compare) is
 * run into a temporary folder, and its before-run report and its comparison are opened. A
 * fixture with hostile text in every user field is opened as well. Set KERRTRACE_BROWSER_REPORT
 * and/or KERRTRACE_BROWSER_COMPARISON to open other pages instead; KERRTRACE_BROWSER_FIXTURES=1
 * builds the run and comparison from the fixtures in test/fixtures/results/ (fast, no video).
 */
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { compareRuns } from '../../src/compare/compareRuns.js';
import { writeComparison } from '../../src/compare/writeComparison.js';
import { writeRunReport } from '../../src/report/writeRunReport.js';
import { buildRunFixture, hostileRunFixture } from '../fixtures/results/buildRunFixture.js';
import { runDemo } from '../../src/demo/runDemo.js';

const CHROMIUM = '/usr/bin/chromium';
const hasChromium = existsSync(CHROMIUM);
if (!hasChromium) console.warn(`[browser tests skipped] ${CHROMIUM} is missing; install it with: apt-get install -y chromium`);

const projectRoot = fileURLToPath(new URL('../../', import.meta.url));
const screenshots = join(projectRoot, 'test-output', 'screenshots');

interface Pages {
  report: string;
  hostileReport: string | null;
  comparison: string;
}

/** A frame as a phone would show it: dark background, a bright spot, and the regions drawn on top. */
async function frameWithRegions(): Promise<Buffer> {
  const overlay = Buffer.from(`<svg xmlns="http://www.w3.org/2000/svg" width="320" height="240">
    <rect width="320" height="240" fill="#101418"/><circle cx="160" cy="115" r="26" fill="#f4f0c8" opacity="0.9"/>
    <rect x="140" y="100" width="40" height="30" fill="none" stroke="#56B4E9" stroke-width="2"/>
    <rect x="8" y="8" width="30" height="30" fill="none" stroke="#E69F00" stroke-width="2" stroke-dasharray="4 2"/></svg>`);
  return sharp(overlay).png().toBuffer();
}

async function mapImage(hue: number): Promise<Buffer> {
  const svg = Buffer.from(`<svg xmlns="http://www.w3.org/2000/svg" width="160" height="120"><defs><radialGradient id="g"><stop offset="0" stop-color="hsl(${hue},80%,70%)"/><stop offset="1" stop-color="#000"/></radialGradient></defs><rect width="160" height="120" fill="url(#g)"/></svg>`);
  return sharp(svg).png().toBuffer();
}

async function buildPages(dir: string): Promise<Pages> {
  const fromEnvReport = process.env.KERRTRACE_BROWSER_REPORT;
  const fromEnvComparison = process.env.KERRTRACE_BROWSER_COMPARISON;
  let report = fromEnvReport ? resolve(fromEnvReport) : '';
  let hostileReport: string | null = null;
  let comparisonFromDemo = '';
  if (!fromEnvReport && !process.env.KERRTRACE_BROWSER_FIXTURES) {
    const demo = await runDemo({ outDir: join(dir, 'demo'), force: true, toolVersion: 'test', ffmpegVersion: null });
    report = join(demo.runs[0]!.dir, 'report.html');
    comparisonFromDemo = join(demo.comparisonDir, 'comparison.html');
    const hostile = hostileRunFixture();
    await writeRunReport(join(dir, 'hostile'), { result: hostile.result, trace: hostile.trace });
    hostileReport = join(dir, 'hostile', 'report.html');
  } else if (!fromEnvReport) {
    const { result, trace } = buildRunFixture({ label: 'cell A, nitrobenzene, after filtering' });
    await writeRunReport(join(dir, 'run'), { result, trace, images: { frameWithRegionsPng: await frameWithRegions(), staticMapPng: await mapImage(30), modulatedMapPng: await mapImage(200) } });
    report = join(dir, 'run', 'report.html');
    const hostile = hostileRunFixture();
    await writeRunReport(join(dir, 'hostile'), { result: hostile.result, trace: hostile.trace });
    hostileReport = join(dir, 'hostile', 'report.html');
  }
  let comparison = fromEnvComparison ? resolve(fromEnvComparison) : comparisonFromDemo;
  if (!comparison) {
    const before = buildRunFixture({ label: 'before', seed: 3 }).result;
    const after = buildRunFixture({ label: 'after', seed: 4, floorFraction: 0.0046, warnings: [] }).result;
    const c = compareRuns([before, after], ['before filtering', '<script>window.__pwned=3</script>']);
    await writeComparison(join(dir, 'cmp'), c, { createdAt: '2025-03-15T12:00:00.000Z' });
    comparison = join(dir, 'cmp', 'comparison.html');
  }
  return { report, hostileReport, comparison };
}

interface Visit {
  consoleErrors: string[];
  failedRequests: string[];
  foreignRequests: string[];
}

async function visit(browser: Browser, file: string, shot: string, check: (page: Page) => Promise<void>): Promise<Visit> {
  const page = await browser.newPage({ viewport: { width: 1100, height: 900 } });
  const out: Visit = { consoleErrors: [], failedRequests: [], foreignRequests: [] };
  page.on('console', (m) => {
    if (m.type() === 'error') out.consoleErrors.push(m.text());
  });
  page.on('pageerror', (e) => out.consoleErrors.push(e.message));
  page.on('requestfailed', (r) => out.failedRequests.push(`${r.url()} ${r.failure()?.errorText ?? ''}`));
  page.on('request', (r) => {
    if (!/^(file:|data:)/.test(r.url())) out.foreignRequests.push(r.url());
  });
  await page.goto(pathToFileURL(file).href, { waitUntil: 'load' });
  await check(page);
  await page.screenshot({ path: join(screenshots, `${shot}.png`), fullPage: true });
  await page.close();
  return out;
}

async function expectEverythingHasSize(page: Page): Promise<void> {
  const sizes = await page.$$eval('svg, img', (els) => els.map((e) => {
    const r = e.getBoundingClientRect();
    const natural = e.tagName === 'IMG' ? (e as unknown as { naturalWidth: number }).naturalWidth : 1;
    return { tag: e.tagName, w: r.width, h: r.height, natural };
  }));
  expect(sizes.length).toBeGreaterThan(0);
  for (const s of sizes) {
    expect(s.w, `${s.tag} width`).toBeGreaterThan(0);
    expect(s.h, `${s.tag} height`).toBeGreaterThan(0);
    expect(s.natural, `${s.tag} decoded`).toBeGreaterThan(0);
  }
}

describe('reports in a browser', () => {
  let browser: Browser;
  let pages: Pages;
  let dir: string;

  beforeAll(async () => {
    if (!hasChromium) return;
    mkdirSync(screenshots, { recursive: true });
    dir = mkdtempSync(join(tmpdir(), 'kerrtrace-browser-'));
    pages = await buildPages(dir);
    const { chromium } = await import('playwright-core');
    browser = await chromium.launch({
      executablePath: CHROMIUM,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
  });

  afterAll(async () => {
    await browser?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it.skipIf(!hasChromium)('opens report.html with no errors, no network, and every plot and image drawn', async () => {
    const v = await visit(browser, pages.report, 'report', async (page) => {
      await expectEverythingHasSize(page);
      expect(await page.$$eval('figure[data-plot] svg', (e) => e.length)).toBeGreaterThanOrEqual(3);
      expect(await page.locator('#figures .card').count()).toBeGreaterThanOrEqual(4);
      expect(await page.locator('#safety').innerText()).toMatch(/Nitrobenzene/);
    });
    expect(v.consoleErrors).toEqual([]);
    expect(v.failedRequests).toEqual([]);
    expect(v.foreignRequests).toEqual([]);
  });

  it.skipIf(!hasChromium)('prints report.html to PDF with sections on separate pages', async () => {
    const page = await browser.newPage();
    await page.goto(pathToFileURL(pages.report).href);
    await page.emulateMedia({ media: 'print' });
    await page.screenshot({ path: join(screenshots, 'report-print.png'), fullPage: true });
    const pdf = await page.pdf({ format: 'A4', printBackground: true });
    await page.close();
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    const pagesInPdf = (pdf.toString('latin1').match(/\/Type\s*\/Page[^s]/g) ?? []).length;
    expect(pagesInPdf).toBeGreaterThanOrEqual(6);
  });

  it.skipIf(!hasChromium)('shows hostile text as text and runs no script from it', async () => {
    if (pages.hostileReport === null) return; // a report from elsewhere has no planted strings
    const v = await visit(browser, pages.hostileReport, 'report-hostile', async (page) => {
      expect(await page.evaluate(() => (globalThis as unknown as { __pwned?: number }).__pwned)).toBeUndefined();
      expect(await page.locator('h1').innerText()).toContain('<script>window.__pwned=1</script>');
      expect(await page.locator('script').count()).toBe(0);
      expect(await page.locator('img[src="x"]').count()).toBe(0);
    });
    expect(v.consoleErrors).toEqual([]);
    expect(v.failedRequests).toEqual([]);
  });

  it.skipIf(!hasChromium)('opens comparison.html with no errors, every plot drawn, and the hostile label inert', async () => {
    const v = await visit(browser, pages.comparison, 'comparison', async (page) => {
      await expectEverythingHasSize(page);
      expect(await page.$$eval('figure[data-plot] svg', (e) => e.length)).toBeGreaterThanOrEqual(2);
      expect(await page.evaluate(() => (globalThis as unknown as { __pwned?: number }).__pwned)).toBeUndefined();
      expect(await page.locator('script').count()).toBe(0);
    });
    expect(v.consoleErrors).toEqual([]);
    expect(v.failedRequests).toEqual([]);
    expect(v.foreignRequests).toEqual([]);
  });
});
