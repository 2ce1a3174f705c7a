import { describe, expect, it } from 'vitest';
import { compareRuns } from '../../src/compare/compareRuns.js';
import { KerrError } from '../../src/errors.js';
import { buildRunFixture } from '../fixtures/results/buildRunFixture.js';

const before = () => buildRunFixture({ label: 'before', floorFraction: 0.012, floorFractionRelErr: 0.7 / 12, kerrConstant: 2.40e-12 }).result;
const after = () => buildRunFixture({ label: 'after', floorFraction: 0.0046, floorFractionRelErr: 0.3 / 4.6, kerrConstant: 2.43e-12, warnings: [] }).result;

describe('compareRuns', () => {
  it('reports each figure per run and the change between consecutive runs, checked by hand', () => {
    const c = compareRuns([before(), after()], ['before', 'after']);
    const floor = c.changes.find((x) => x.key === 'floorFraction')!;
    // Hand calculation as in changeBetween.test.ts: r = −61.67% ± 3.35%, z = −9.72.
    expect(floor.relativeChange!.value).toBeCloseTo(-0.616667, 5);
    expect(floor.relativeChange!.stdErr).toBeCloseTo(0.0335413, 5);
    expect(floor.zScore).toBeCloseTo(-9.7167, 3);
    expect(floor.verdict).toBe('fell');
    expect(floor.text).toBe('the floor fraction fell by 61.7 ± 3.4% (z = -9.7)');
    // B: 2.40 → 2.43 (×1e-12), σ = 1.2% each: σΔ = √(0.0288² + 0.02916²)·1e-12 = 0.04098e-12; z = 0.03/0.04098 = 0.732.
    const b = c.changes.find((x) => x.key === 'kerrConstant')!;
    expect(b.zScore).toBeCloseTo(0.732, 3);
    expect(b.verdict).toBe('no-change');
    expect(c.verdicts[0]).toContain('the Kerr constant did not change within its uncertainty (z = 0.7)');
    expect(c.verdicts[0]).toMatch(/^From before to after: /);
    const fig = c.figures.find((f) => f.key === 'floorFraction')!;
    expect(fig.values.map((q) => q!.value)).toEqual([0.012, 0.0046]);
  });

  it('hedges a change between 2 and 3 standard errors as "probably"', () => {
    const a = before();
    const b = before();
    b.kerrConstant = { value: a.kerrConstant.value * 1.1, stdErr: a.kerrConstant.stdErr! * 3, unit: 'm/V^2' };
    const ch = compareRuns([a, b], ['a', 'b']).changes.find((x) => x.key === 'kerrConstant')!;
    expect(Math.abs(ch.zScore!)).toBeGreaterThan(2);
    expect(Math.abs(ch.zScore!)).toBeLessThan(3);
    expect(ch.text).toMatch(/^the Kerr constant probably rose by/);
  });

  it('compares three runs pairwise in order', () => {
    const c = compareRuns([before(), after(), before()], ['one', 'two', 'three']);
    expect(c.verdicts.length).toBe(2);
    expect(c.verdicts[1]).toMatch(/^From two to three: .*the floor fraction rose by/);
  });

  it('refuses runs of different cells unless allowed, and then warns', () => {
    const other = buildRunFixture({ gapM: 0.004 }).result;
    expect(() => compareRuns([before(), other], ['a', 'b'])).toThrow(KerrError);
    expect(() => compareRuns([before(), other], ['a', 'b'])).toThrow(/different cells: gap 5.00 mm in a but 4.00 mm in b/);
    const c = compareRuns([before(), other], ['a', 'b'], { allowDifferentCells: true });
    expect(c.warnings.map((w) => w.code)).toContain('different-cells');
  });

  it('warns about different wavelength, temperature and camera, and a missing temperature', () => {
    const a = before();
    const b = buildRunFixture({ wavelengthNm: 633, temperatureC: 27, cameraWidth: 640, transfer: 'srgb' }).result;
    const codes = compareRuns([a, b], ['a', 'b']).warnings.map((w) => w.code);
    expect(codes).toEqual(expect.arrayContaining(['different-wavelength', 'different-temperature', 'different-camera']));
    const c = buildRunFixture({ temperatureC: null }).result;
    expect(compareRuns([a, c], ['a', 'c']).warnings.find((w) => w.code === 'temperature-missing')?.message).toMatch(/for c,/);
    const same = compareRuns([before(), after()], ['a', 'b']).warnings.map((w) => w.code);
    expect(same).not.toContain('different-temperature'); // 21.5 vs 21.5 °C
  });

  it('withholds B-dependent figures of a run that could not separate B from brightness', () => {
    const weak = buildRunFixture({ identifiable: false }).result;
    const c = compareRuns([before(), weak], ['a', 'b']);
    const b = c.changes.find((x) => x.key === 'kerrConstant')!;
    expect(b.verdict).toBe('not-comparable');
    expect(b.change).toBeNull();
    expect(c.figures.find((f) => f.key === 'kerrConstant')!.withheld).toEqual([false, true]);
    expect(c.changes.find((x) => x.key === 'contrastRatio')!.verdict).not.toBe('not-comparable');
    expect(c.warnings.map((w) => w.code)).toContain('not-identifiable');
  });

  it('rejects fewer than two runs and labels that do not fit', () => {
    expect(() => compareRuns([before()], ['a'])).toThrow(/at least two/);
    expect(() => compareRuns([before(), after()], ['a'])).toThrow(/one label per run/);
    expect(() => compareRuns([before(), after()], ['a', 'a'])).toThrow(/twice/);
    expect(() => compareRuns([before(), after()], ['a', ' '])).toThrow(/non-empty/);
  });
});
