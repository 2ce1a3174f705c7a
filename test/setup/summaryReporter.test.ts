import { describe, expect, it } from 'vitest';
import { summaryLines } from './summaryReporter.js';
import { OUTSIDE, OUTSIDE_SOURCES } from './outsideSources.js';

describe('the outside-sources summary', () => {
  it('says checked only for sources whose tests ran and passed, FAILED for any failure, not run otherwise', () => {
    const lines = summaryLines(new Map([
      [OUTSIDE.nist, { passed: 35, failed: 0, skipped: 0 }],
      [OUTSIDE.vfr, { passed: 2, failed: 1, skipped: 0 }],
      [OUTSIDE.srgb, { passed: 0, failed: 0, skipped: 3 }],
    ]), {});
    const line = (name: string) => lines.find((l) => l.includes(OUTSIDE_SOURCES.find((s) => s.name === name)!.description))!;
    expect(line(OUTSIDE.nist)).toMatch(/^\s+checked\s.*\(35 passed\)$/);
    expect(line(OUTSIDE.vfr)).toMatch(/^\s+FAILED\s.*\(2 passed, 1 failed\)$/);
    expect(line(OUTSIDE.srgb)).toMatch(/^\s+not run\s.*\(0 passed, 3 skipped\)$/);
    expect(line(OUTSIDE.jimp)).toMatch(/^\s+not run\s/);
    expect(lines.filter((l) => /skipped on request/.test(l))).toEqual([]);
  });

  it('prints the browser opt-out when KERRTRACE_SKIP_BROWSER=1 was used', () => {
    const lines = summaryLines(new Map([[OUTSIDE.browser, { passed: 0, failed: 0, skipped: 5 }]]), { KERRTRACE_SKIP_BROWSER: '1' });
    expect(lines.at(-1)).toBe(' Browser tests skipped on request (KERRTRACE_SKIP_BROWSER=1): 5 tests; unset it to run them.');
  });

  it('lists every source once, each with a description', () => {
    const names = OUTSIDE_SOURCES.map((s) => s.name);
    expect(new Set(names).size).toBe(names.length);
    expect(Object.values(OUTSIDE).sort()).toEqual([...names].sort());
    for (const s of OUTSIDE_SOURCES) expect(s.description.length).toBeGreaterThan(10);
  });
});
