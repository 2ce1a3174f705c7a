import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { escapeHtml } from '../../src/report/escapeHtml.js';
import { writeRunReport } from '../../src/report/writeRunReport.js';
import { buildRunFixture, HOSTILE, hostileRunFixture } from '../fixtures/results/buildRunFixture.js';

let root: string;
let shared: { dir: string; files: Record<string, string>; page: string };
beforeAll(async () => {
  root = mkdtempSync(join(tmpdir(), 'kerrtrace-report-'));
  // One report with images, shared by the checks that only read it (rendering costs seconds).
  const dir = join(root, 'shared');
  const { result, trace } = buildRunFixture();
  const images = { frameWithRegionsPng: await tinyPng(10, 20, 30), staticMapPng: await tinyPng(200, 0, 0), modulatedMapPng: await tinyPng(0, 0, 200) };
  const { files } = await writeRunReport(dir, { result, trace, images });
  shared = { dir, files, page: readFileSync(join(dir, 'report.html'), 'utf8') };
});
afterAll(() => {
  rmSync(root, { recursive: true, force: true });
});

async function tinyPng(r: number, g: number, b: number): Promise<Buffer> {
  return sharp({ create: { width: 32, height: 24, channels: 3, background: { r, g, b } } }).png().toBuffer();
}

function allFiles(dir: string): string[] {
  return readdirSync(dir, { recursive: true, withFileTypes: true }).filter((d) => d.isFile()).map((d) => join(d.parentPath, d.name));
}

describe('writeRunReport', () => {
  it('writes report.html, summary.md and every plot as SVG and PNG, and returns their names', async () => {
    const { dir, files } = shared;
    expect(files.report).toBe('report.html');
    expect(files.summary).toBe('summary.md');
    for (const plot of ['timeTrace', 'transmission', 'linearised', 'sync']) {
      expect(files[`${plot}Svg`]).toMatch(/^plots\/.+\.svg$/);
      const png = readFileSync(join(dir, files[`${plot}Png`]!));
      const meta = await sharp(png).metadata();
      expect(meta.format).toBe('png');
      expect(meta.width).toBeGreaterThan(600); // 144 dpi: about twice the CSS-pixel width
    }
    for (const rel of Object.values(files)) expect(existsSync(join(dir, rel))).toBe(true);
    expect(allFiles(dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });

  it('is one self-contained page: no scripts, no external references, a CSP that blocks the network', async () => {
    const { page } = shared;
    expect(page.startsWith('<!DOCTYPE html>')).toBe(true);
    expect(page).toContain(`content="default-src 'none'; img-src data:;`);
    expect(page).not.toMatch(/<script/i);
    expect(page).not.toMatch(/<link/i);
    const refs = [...page.matchAll(/\b(?:src|href)="([^"]*)"/g)].map((m) => m[1]!);
    for (const ref of refs) expect(ref).toMatch(/^(data:image\/png;base64,|#|(\.\.\/)*[\w./-]*recording-a-run\.md#)/);
    expect(page.match(/data:image\/png;base64,/g)?.length).toBe(3);
    expect(page.match(/<svg/g)?.length).toBeGreaterThanOrEqual(4);
    expect(page).toContain('@media print');
    expect(page).toContain('break-before: page');
  });

  it('shows the headline figures with units and uncertainties, and the cautions', async () => {
    const { page } = shared;
    expect(page).toContain('2.400 ± 0.029');
    expect(page).toContain('× 10⁻¹² m/V²');
    expect(page).toMatch(/10\.00\d ± 0\.060/); // V_π in kV
    expect(page).toContain('1.200 ± 0.072');
    expect(page).toContain('0.4000 ± 0.0040');
    expect(page).toContain('Nitrobenzene is poisonous');
  });

  it('links each warning to its guide section by a relative path that exists, and quotes the advice', async () => {
    const { dir, page } = shared;
    const link = /<a href="([^"]+#lock-exposure)"><em>Lock exposure and white balance<\/em><\/a>/.exec(page);
    expect(link).not.toBeNull();
    expect(existsSync(resolve(dir, link![1]!.split('#')[0]!))).toBe(true);
    expect(page).toContain('keep a constant reference card in view');
  });

  it('says plainly when B could not be separated from brightness and prints no number for it', async () => {
    const dir = join(root, 'unidentifiable');
    const { result, trace } = buildRunFixture({ identifiable: false, maxVoltageV: 4000 });
    await writeRunReport(dir, { result, trace });
    const page = readFileSync(join(dir, 'report.html'), 'utf8');
    expect(page).toContain('could not be separated from the brightness of the light');
    expect(page).toContain('open-level');
    expect(page).not.toContain('2.400 ± 0.029');
    const summary = readFileSync(join(dir, 'summary.md'), 'utf8');
    expect(summary).toContain('not separable from brightness');
    expect(summary).not.toContain('2.400 ± 0.029');
  });

  it('escapes hostile text planted in every user field, in the page and in summary.md', async () => {
    const dir = join(root, 'hostile');
    const { result, trace } = hostileRunFixture();
    await writeRunReport(dir, { result, trace, images: { frameWithRegionsPng: Buffer.from('<script>not a png</script>') } });
    const page = readFileSync(join(dir, 'report.html'), 'utf8');
    expect(page).not.toContain('<script>window.__pwned');
    expect(page).not.toContain('<img src=x');
    expect(page).not.toContain('<script>not a png');
    const escaped = escapeHtml(HOSTILE);
    // label (title + heading), video, volts, open video path and hash, warning code and message,
    // option key and values, fit reason, ffmpeg version (x2), transfer, excluded reason, channel
    // and conductivity notes, file key and name.
    expect(page.split(escaped).length - 1).toBeGreaterThanOrEqual(17);
    const summary = readFileSync(join(dir, 'summary.md'), 'utf8');
    expect(summary).not.toMatch(/<script|<img/);
    expect(summary).toContain('&lt;script&gt;');
    for (const f of allFiles(join(dir, 'plots')).filter((p) => p.endsWith('.svg'))) expect(readFileSync(f, 'utf8')).not.toMatch(/<script|<img/);
  });

  it('writes a report without trace rows, saying which plots are missing', async () => {
    const dir = join(root, 'notrace');
    const { result } = buildRunFixture();
    const { files } = await writeRunReport(dir, { result, trace: [] });
    expect(files.timeTraceSvg).toBeUndefined();
    expect(files.syncSvg).toBe('plots/sync.svg');
    const page = readFileSync(join(dir, 'report.html'), 'utf8');
    expect(page).toContain('No trace rows were supplied');
    expect(page).toContain('No frame image was supplied');
  });
});
