/**
 * Opens the HTML reports in a real browser (Chromium driven by playwright-core; the browser is
 * found by test/helpers/browser.ts: KERRTRACE_BROWSER, then chromium/chromium-browser/google-chrome
 * on PATH; none is a failure saying how to get one, and only KERRTRACE_SKIP_BROWSER=1 skips):
 * no console errors, no network requests, every plot and image has a size, hostile text stays
 * text (no script runs), the page prints to PDF; screenshots go to test-output/screenshots/.
 *
 * The pages come from a real run: the built-in demo (simulate → analyze with maps → compare) is
 * run into a temporary folder, and its before-run report and its comparison are opened. A run
 * report with hostile text in every user field and a comparison whose labels are hostile are
 * always built and opened as well, whichever pages are under test. Set KERRTRACE_BROWSER_REPORT
 * and/or KERRTRACE_BROWSER_COMPARISON to open other pages for the general checks;
 * KERRTRACE_BROWSER_FIXTURES=1 builds the run and comparison from the fixtures in
 * test/fixtures/results/ (fast, no video).
 */
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { compareRuns } from '../../src/compare/compareRuns.js';
import { writeComparison } from '../../src/compare/writeComparison.js';
import { writeRunReport } from '../../src/report/writeRunReport.js';
import { HOSTILE, buildRunFixture, hostileRunFixture } from '../fixtures/results/buildRunFixture.js';
import { runDemo } from '../../src/demo/runDemo.js';
import { BROWSER_FLAGS, findBrowser, requireBrowser } from '../helpers/browser.js';
import { OUTSIDE } from '../setup/outsideSources.js';

/** Only KERRTRACE_SKIP_BROWSER=1 skips; the run's summary says so (test/setup/summaryReporter.ts). */
const skipBrowser = findBrowser().skip;

const projectRoot = fileURLToPath(new URL('../../', import.meta.url));
const screenshots = join(projectRoot, 'test-output', 'screenshots');

interface Pages {
  report: string;
  hostileReport: string;
  comparison: string;
  hostileComparison: string;
}

/** Labels a user might type, each trying another way into the page. */
const HOSTILE_LABELS = [`before ${HOSTILE}`, 'after <svg onload="window.__pwned=5"></svg><a href="javascript:window.__pwned=6">x</a>'] as const;

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
  let comparisonFromDemo = '';
  if (!fromEnvReport && !process.env.KERRTRACE_BROWSER_FIXTURES) {
    const demo = await runDemo({ outDir: join(dir, 'demo'), force: true, toolVersion: 'test', ffmpegVersion: null });
    report = join(demo.runs[0]!.dir, 'report.html');
    comparisonFromDemo = join(demo.comparisonDir, 'comparison.html');
  } else if (!fromEnvReport) {
    const { result, trace } = buildRunFixture({ label: 'cell A, nitrobenzene, after filtering' });
    await writeRunReport(join(dir, 'run'), { result, trace, images: { frameWithRegionsPng: await frameWithRegions(), staticMapPng: await mapImage(30), modulatedMapPng: await mapImage(200) } });
    report = join(dir, 'run', 'report.html');
  }
  let comparison = fromEnvComparison ? resolve(fromEnvComparison) : comparisonFromDemo;
  if (!comparison) {
    const before = buildRunFixture({ label: 'before', seed: 3 }).result;
    const after = buildRunFixture({ label: 'after', seed: 4, floorFraction: 0.0046, warnings: [] }).result;
    await writeComparison(join(dir, 'cmp'), compareRuns([before, after], ['before filtering', 'after filtering']), { createdAt: '2025-03-15T12:00:00.000Z' });
    comparison = join(dir, 'cmp', 'comparison.html');
  }
  // The hostile pages are built every time, whatever pages the variables above chose.
  const hostile = hostileRunFixture();
  await writeRunReport(join(dir, 'hostile'), { result: hostile.result, trace: hostile.trace });
  const hostileBefore = hostileRunFixture().result;
  const hostileAfter = buildRunFixture({ label: `after ${HOSTILE}`, seed: 4, floorFraction: 0.0046, warnings: [] }).result;
  await writeComparison(join(dir, 'hostile-cmp'), compareRuns([hostileBefore, hostileAfter], [...HOSTILE_LABELS]), { createdAt: '2025-03-15T12:00:00.000Z' });
  return { report, hostileReport: join(dir, 'hostile', 'report.html'), comparison, hostileComparison: join(dir, 'hostile-cmp', 'comparison.html') };
}

/** No planted script ran, no element came from the planted markup, and the text shows as typed. */
async function expectInert(page: Page, shownAsText: readonly string[]): Promise<void> {
  expect(await page.evaluate(() => (globalThis as unknown as { __pwned?: number }).__pwned)).toBeUndefined();
  expect(await page.locator('script').count()).toBe(0);
  expect(await page.locator('img[src="x"]').count()).toBe(0);
  expect(await page.locator('svg[onload], [onerror], a[href^="javascript:"]').count()).toBe(0);
  const text = await page.locator('body').innerText();
  for (const s of shownAsText) expect(text).toContain(s);
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

describe.skipIf(skipBrowser)('reports in a browser', { tags: [OUTSIDE.browser] }, () => {
  let browser: Browser;
  let pages: Pages;
  let dir: string;

  beforeAll(async () => {
    const executablePath = requireBrowser(); // no browser: fails here with one line saying how to get one
    mkdirSync(screenshots, { recursive: true });
    dir = mkdtempSync(join(tmpdir(), 'kerrtrace-browser-'));
    pages = await buildPages(dir);
    const { chromium } = await import('playwright-core');
    browser = await chromium.launch({ executablePath, args: [...BROWSER_FLAGS] });
  });

  afterAll(async () => {
    await browser?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('opens report.html with no errors, no network, and every plot and image drawn', async () => {
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

  it('prints report.html to PDF with sections on separate pages', async () => {
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

  it('shows hostile text in a run report as text and runs no script from it', async () => {
    const v = await visit(browser, pages.hostileReport, 'report-hostile', async (page) => {
      await expectInert(page, [HOSTILE]);
      expect(await page.locator('h1').innerText()).toContain('<script>window.__pwned=1</script>');
    });
    expect(v.consoleErrors).toEqual([]);
    expect(v.failedRequests).toEqual([]);
    expect(v.foreignRequests).toEqual([]);
  });

  it('opens comparison.html with no errors, no network, and every plot drawn', async () => {
    const v = await visit(browser, pages.comparison, 'comparison', async (page) => {
      await expectEverythingHasSize(page);
      expect(await page.$$eval('figure[data-plot] svg', (e) => e.length)).toBeGreaterThanOrEqual(2);
      await expectInert(page, []);
    });
    expect(v.consoleErrors).toEqual([]);
    expect(v.failedRequests).toEqual([]);
    expect(v.foreignRequests).toEqual([]);
  });

  it('shows hostile comparison labels as text in the page and the plots, and runs no script from them', async () => {
    const v = await visit(browser, pages.hostileComparison, 'comparison-hostile', async (page) => {
      await expectEverythingHasSize(page);
      await expectInert(page, HOSTILE_LABELS);
      expect(await page.locator('h1').innerText()).toContain(HOSTILE_LABELS[0]);
      // the plots name the runs too (shortened with an ellipsis): there the labels are SVG text, never markup
      const plotText = await page.$$eval('figure[data-plot] svg', (els) => els.map((e) => e.textContent ?? '').join(' '));
      expect(plotText).toContain('before <scr');
      expect(plotText).toContain('after <svg');
    });
    expect(v.consoleErrors).toEqual([]);
    expect(v.failedRequests).toEqual([]);
    expect(v.foreignRequests).toEqual([]);
  });
});
