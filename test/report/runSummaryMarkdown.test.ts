import { describe, expect, it } from 'vitest';
import { runSummaryMarkdown } from '../../src/report/runSummaryMarkdown.js';
import { buildRunFixture } from '../fixtures/results/buildRunFixture.js';
import { stillsRunFixture } from './stillsFixture.js';

// Markdown escaping per CommonMark 0.31 §2.4 (backslash escapes); an apostrophe needs none.
describe('runSummaryMarkdown', () => {
  it("writes an apostrophe as itself: a label \"Ann's cell\" appears as Ann's cell, not as an HTML entity", () => {
    const { result } = buildRunFixture({
      label: "Ann's cell",
      warnings: [{ code: 'exposure-drift', message: "the card's brightness rose by 3 %" }],
      videoPath: "runs/Ann's cell/run.mp4",
    });
    const md = runSummaryMarkdown(result);
    expect(md.startsWith("# Ann's cell: Kerr cell run\n")).toBe(true);
    expect(md).toContain("- the card's brightness rose by 3 % (code exposure-drift)");
    expect(md).toContain("| video | runs/Ann's cell/run.mp4 |");
    expect(md).not.toMatch(/&\\?#39;|&#x27;|&apos;/);
  });

  it('still escapes what Markdown would read as structure or raw HTML in a label', () => {
    const { result } = buildRunFixture({ label: "Ann's cell | *run #2* <b>" });
    expect(runSummaryMarkdown(result)).toContain("# Ann's cell \\| \\*run \\#2\\* &lt;b&gt;: Kerr cell run");
  });

  it('counts photos and shows no sync offset for a photo series; frames and the offset for a video', () => {
    const { result, trace } = stillsRunFixture('photo-index');
    const clipped = trace.filter((row) => !row.used).length;
    expect(clipped).toBeGreaterThan(0);
    const stills = runSummaryMarkdown(result);
    expect(stills).toContain(`\nPhotos: ${trace.length - clipped} of ${trace.length} used; left out: clipped ${clipped}.`);
    expect(stills).not.toMatch(/sync offset|video|frames?\b/i);
    const video = runSummaryMarkdown(buildRunFixture().result);
    expect(video).toMatch(/^\| Sync offset \| 0\.4/m);
    expect(video).toMatch(/^Frames: \d+ of \d+ used/m);
  });
});
