import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { GUIDE_FILE, GUIDE_SECTIONS, guideAdvice } from '../../src/report/guide.js';
import { guideLink } from '../../src/report/guideLink.js';
import { packageInfo } from '../../src/report/packageInfo.js';
import { join, resolve } from 'node:path';

const docs = readFileSync(new URL(`../../${GUIDE_FILE}`, import.meta.url), 'utf8');
const flat = (s: string): string => s.replace(/\s+/g, ' ');

describe('recording guide', () => {
  it('has every anchor the brief names, each exactly once, as an explicit id', () => {
    const wanted = ['lock-exposure', 'lock-camera', 'calibrate-camera', 'avoid-clipping', 'open-level', 'sweep', 'voltage-log', 'temperature', 'camera-still', 'sync', 'safety'];
    expect(GUIDE_SECTIONS.map((s) => s.anchor)).toEqual(wanted);
    for (const a of wanted) expect(docs.split(`<a id="${a}"></a>`).length - 1).toBe(1);
  });

  it('quotes the same one-line advice in the docs that the reports show inline', () => {
    for (const s of GUIDE_SECTIONS) {
      expect(flat(docs)).toContain(`**In one line:** ${s.advice[0]!.toLowerCase()}${s.advice.slice(1)}`);
      expect(docs).toContain(`## ${s.title}`);
    }
  });

  it('looks up advice by anchor and returns undefined for unknown anchors', () => {
    expect(guideAdvice('avoid-clipping')?.title).toBe('Keep the spot below clipping');
    expect(guideAdvice('<nope>')).toBeUndefined();
  });

  it('links from a report folder to the installed docs by a relative path that resolves', () => {
    const root = packageInfo().root as string;
    const reportDir = join(root, 'test-output', 'some', 'run');
    const href = guideLink(reportDir, 'sweep');
    expect(href).toBe('../../../docs/recording-a-run.md#sweep');
    const [file] = href.split('#');
    expect(resolve(reportDir, file!)).toBe(join(root, GUIDE_FILE));
  });

  it('asks for a 5 Hz log and warns never to exceed a rating to reach the half-wave voltage', () => {
    expect(flat(docs)).toMatch(/5 samples per second/);
    expect(flat(docs)).toMatch(/Never raise a voltage beyond a rating/);
  });
});
