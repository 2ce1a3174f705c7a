import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeRunReport } from '../../src/report/writeRunReport.js';
import { timeTraceSpec } from '../../src/report/plots/timeTraceSpec.js';
import { transmissionSpec } from '../../src/report/plots/transmissionSpec.js';
import { buildRunFixture } from '../fixtures/results/buildRunFixture.js';
import { stillsRunFixture } from './stillsFixture.js';

interface Written { page: string; text: string; summary: string; svgs: string[]; files: Record<string, string> }

let root: string;
const written: Record<'index' | 'exif' | 'video', Written> = {} as Record<'index' | 'exif' | 'video', Written>;

/** The words a reader sees: tags, the style sheet and attribute values removed, entities kept. */
function visibleText(page: string): string {
  return page.replace(/<style[\s\S]*?<\/style>/g, ' ').replace(/<svg[\s\S]*?<\/svg>/g, ' ').replace(/<[^>]*>/g, ' ');
}

async function write(name: string, fixture: ReturnType<typeof buildRunFixture>): Promise<Written> {
  const dir = join(root, name);
  const png = await sharp({ create: { width: 32, height: 24, channels: 3, background: { r: 40, g: 40, b: 40 } } }).png().toBuffer();
  const { files } = await writeRunReport(dir, { ...fixture, images: { frameWithRegionsPng: png } });
  const page = readFileSync(join(dir, 'report.html'), 'utf8');
  const svgs = readdirSync(join(dir, 'plots')).filter((f) => f.endsWith('.svg')).map((f) => readFileSync(join(dir, 'plots', f), 'utf8'));
  return { page, text: visibleText(page), summary: readFileSync(join(dir, 'summary.md'), 'utf8'), svgs, files };
}

beforeAll(async () => {
  root = mkdtempSync(join(tmpdir(), 'kerrtrace-stills-report-'));
  written.index = await write('index', stillsRunFixture('photo-index'));
  written.exif = await write('exif', stillsRunFixture('exif-capture-time'));
  written.video = await write('video', buildRunFixture({ durationS: 12, fps: 2 }));
});
afterAll(() => {
  rmSync(root, { recursive: true, force: true });
});

describe('reports of a photo series (result.source "stills")', () => {
  it('never say "video" in report.html, summary.md or the plots, nor describe a video clock or frame rate', () => {
    for (const w of [written.index, written.exif]) {
      expect(w.page).not.toMatch(/video/i);
      expect(w.summary).not.toMatch(/video/i);
      for (const svg of w.svgs) expect(svg).not.toMatch(/video/i);
      expect(w.text).not.toMatch(/given by hand|frame rate|sync offset|\bframes?\b/i);
    }
  });

  it('call the samples photos and the picture a photo with the regions drawn', () => {
    const { page, summary } = written.index;
    expect(page).toContain('A photo with the regions drawn');
    expect(page).toContain('Photo size');
    expect(page).toMatch(/crosses mark the \d+ photos left out of the fit/);
    expect(page).toContain('Each photo carries its own voltage, read from the photo file names, so there is no clock to synchronise');
    expect(page).not.toContain('data-figure="syncOffset"');
    expect(summary).toMatch(/^Photos: \d+ of \d+ used; left out: clipped \d+\./m);
    expect(summary).toContain('no clock to synchronise');
  });

  it('put the photos on the time axis the run recorded: photo order, or seconds after the first photo', () => {
    expect(written.index.page).toContain('Intensity and voltage against photo order.');
    expect(written.index.svgs.join('')).toContain('photo order (0 = first photo by name)');
    expect(written.exif.page).toContain('Intensity and voltage against seconds after the first photo.');
    expect(written.exif.svgs.join('')).toContain('seconds after the first photo (s)');
    expect(written.exif.summary).toContain('by capture time (time axis: seconds after the first photo)');
    expect(written.index.summary).toContain('by file name (time axis: photo order)');
  });

  it('draws no synchronisation plot (there is no search curve)', () => {
    expect(written.index.files.syncSvg).toBeUndefined();
  });

  it('label the left-out points of the plots as photos', () => {
    const { result, trace } = stillsRunFixture('photo-index');
    const series = (spec: Record<string, unknown>, set: string) => ((spec.datasets as Record<string, { series?: string }[]>)[set] ?? []).map((p) => p.series);
    expect(series(timeTraceSpec(result, trace).spec, 'excluded')).toContain('excluded photo');
    expect(series(transmissionSpec(result, trace).spec, 'points')).toContain('excluded photo');
  });

  it('leave video runs in video words (the control)', () => {
    const { page, summary } = written.video;
    expect(page).toContain('Video frame with regions');
    expect(page).toContain('Intensity and voltage against video time.');
    expect(page).toContain('Frame rate');
    expect(page).toContain('data-figure="syncOffset"');
    expect(summary).toMatch(/^Frames: \d+ of \d+ used/m);
    expect(summary).toContain('| Sync offset |');
  });
});
