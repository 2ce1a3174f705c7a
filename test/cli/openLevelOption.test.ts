/**
 * `--open-level X[±T]` as parsed by the analyze command (cli/commands/analyze.ts): the optional
 * tolerance follows the same grammar as `--gap-mm D±T` (docs/analyze.md), and a bad one is
 * refused in one line naming the option.
 */
import { describe, expect, it } from 'vitest';
import { toAnalyzeOptions } from '../../cli/commands/analyze.js';
import { KerrError } from '../../src/errors.js';

const base = { volts: 'v.csv', lengthMm: '40', gapMm: '4' };

describe('--open-level with an optional tolerance', () => {
  it('a bare number gives the level and no tolerance (the open-level budget term then says "not given")', () => {
    const o = toAnalyzeOptions('clip.mp4', { ...base, openLevel: '0.42' });
    expect(o.openLevel).toBe(0.42);
    expect(o.openLevelTolerance).toBeUndefined();
  });

  it('0.42±0.01 and 0.42+-0.01 give the level and its ± limit', () => {
    for (const text of ['0.42±0.01', '0.42+-0.01', '0.42 ± 0.01']) {
      const o = toAnalyzeOptions('clip.mp4', { ...base, openLevel: text });
      expect(o.openLevel).toBe(0.42);
      expect(o.openLevelTolerance).toBe(0.01);
    }
  });

  it('a negative or non-numeric tolerance is refused, naming --open-level', () => {
    for (const text of ['0.42±-0.01', '0.42±x']) {
      let err: unknown;
      try { toAnalyzeOptions('clip.mp4', { ...base, openLevel: text }); } catch (e) { err = e; }
      expect(err).toBeInstanceOf(KerrError);
      expect((err as KerrError).oneLine()).toMatch(/--open-level/);
      expect((err as KerrError).oneLine()).not.toMatch(/ mm /);
    }
  });
});
