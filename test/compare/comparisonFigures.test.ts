/**
 * The comparison figures end to end: runs whose B and floor fraction are the mean ± standard error
 * of sample sets made here, compared and written by writeComparison; then
 *  - the changes against simple-statistics (difference of means; for equal sample sizes the
 *    pooled two-sample t statistic equals Δ/√(σ_a² + σ_b²), the z of the comparison);
 *  - the plotted SVGs read back: the y axis calibrated from its own tick labels, each run's point
 *    and ±1σ bar decoded into numbers and compared with the runs' values in display units;
 *  - comparisonFigureSpec directly: error bars, the run order, withheld runs kept on the axis.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { mean, sampleStandardDeviation, tTestTwoSample } from 'simple-statistics';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { compareRuns } from '../../src/compare/compareRuns.js';
import type { Comparison } from '../../src/compare/comparison.js';
import { writeComparison } from '../../src/compare/writeComparison.js';
import { comparisonFigureSpec } from '../../src/report/plots/comparisonFigureSpec.js';
import type { RunResult } from '../../src/result/schema.js';
import { buildRunFixture } from '../fixtures/results/buildRunFixture.js';
import { seededNormal } from '../helpers/random.js';

const N = 25;

function samples(seed: number, centre: number, spread: number): number[] {
  const g = seededNormal(seed);
  return Array.from({ length: N }, () => centre + spread * g());
}

/** mean ± standard error of the mean (s/√n) */
function meanQuantity(xs: number[], unit?: string) {
  return { value: mean(xs), stdErr: sampleStandardDeviation(xs) / Math.sqrt(xs.length), ...(unit ? { unit } : {}) };
}

const bSamples = { a: samples(1, 2.4e-12, 0.03e-12), b: samples(2, 2.43e-12, 0.03e-12), c: samples(3, 2.41e-12, 0.03e-12) };
const fSamples = { a: samples(4, 0.012, 0.001), b: samples(5, 0.0046, 0.0006), c: samples(6, 0.005, 0.0006) };
const LABELS = ['raw', 'filtered', 'distilled'];

function runs(): RunResult[] {
  return (['a', 'b', 'c'] as const).map((k, i) => {
    const r = buildRunFixture({ label: LABELS[i]!, seed: 10 + i, identifiable: k !== 'c' }).result;
    r.kerrConstant = meanQuantity(bSamples[k], 'm/V^2');
    r.floorFraction = meanQuantity(fSamples[k]);
    return r;
  });
}

let dir: string;
let comparison: Comparison;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'kerrtrace-cmp-figures-'));
  comparison = compareRuns(runs(), LABELS);
  await writeComparison(join(dir, 'out'), comparison, { createdAt: '2025-03-15T12:00:00.000Z', toolVersion: '0.0.0-test' });
}, 120_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('comparison of sample means against simple-statistics', () => {
  it('the change, relative change and z of B and floor fraction match the two-sample t-test and the means', () => {
    for (const [key, s] of [['kerrConstant', bSamples], ['floorFraction', fSamples]] as const) {
      const ch = comparison.changes.find((c) => c.key === key && c.fromRun === 0 && c.toRun === 1)!;
      expect(ch.change!.value).toBeCloseTo(mean(s.b) - mean(s.a), 20);
      expect(ch.relativeChange!.value).toBeCloseTo(mean(s.b) / mean(s.a) - 1, 12);
      // equal n: pooled t = (x̄_a − x̄_b)/√(s_p²·2/n), s_p² = (s_a² + s_b²)/2, i.e. −z
      expect(ch.zScore!).toBeCloseTo(-tTestTwoSample(s.a, s.b, 0)!, 9);
      const expectedVerdict = Math.abs(ch.zScore!) < 2 ? 'no-change' : ch.change!.value > 0 ? 'rose' : 'fell';
      expect(ch.verdict).toBe(expectedVerdict);
    }
    expect(comparison.changes.find((c) => c.key === 'floorFraction' && c.toRun === 1)!.verdict).toBe('fell');
  });

  it('a run that could not separate B from brightness is not compared on B or the floor fraction', () => {
    for (const key of ['kerrConstant', 'floorFraction']) {
      expect(comparison.changes.find((c) => c.key === key && c.toRun === 2)!.verdict).toBe('not-comparable');
    }
  });
});

/** Reads a comparison plot back into numbers. */
function decodePlot(svg: string) {
  // y-axis labels: <text text-anchor="end" transform="translate(-7,Y)">VALUE</text>, Y = tick + 3
  const ticks = [...svg.matchAll(/<text text-anchor="end" transform="translate\(-7,([\d.]+)\)"[^>]*>([−\-\d.]+)<\/text>/g)]
    .map((m) => ({ y: Number(m[1]) - 3, v: Number(m[2]!.replace('−', '-')) }));
  expect(ticks.length).toBeGreaterThanOrEqual(2);
  const first = ticks[0]!, last = ticks[ticks.length - 1]!;
  const perPx = (last.v - first.v) / (last.y - first.y);
  const toValue = (y: number) => first.v + (y - first.y) * perPx;
  const symbolGroup = /<g class="mark-symbol role-mark[^"]*"[^>]*>(.*?)<\/g>/s.exec(svg)![1]!;
  const points = [...symbolGroup.matchAll(/<path transform="translate\(([\d.]+),([\d.]+)\)"/g)].map((m) => ({ x: Number(m[1]), value: toValue(Number(m[2])) }));
  const ruleGroup = /<g class="mark-rule role-mark[^"]*"[^>]*>(.*?)<\/g>/s.exec(svg)![1]!;
  const bars = [...ruleGroup.matchAll(/<line transform="translate\(([\d.]+),([\d.]+)\)" x2="0" y2="(-?[\d.]+)"/g)].map((m) => {
    const y1 = Number(m[2]);
    const y2 = y1 + Number(m[3]);
    return { x: Number(m[1]), lo: toValue(Math.max(y1, y2)), hi: toValue(Math.min(y1, y2)) };
  });
  const axisLabels = [...svg.matchAll(/<text text-anchor="middle" transform="translate\(([\d.]+),16\)"[^>]*>([^<]*)<\/text>/g)].map((m) => ({ x: Number(m[1]), text: m[2]! }));
  return { points, bars, axisLabels, pxTolerance: Math.abs(perPx) * 0.6 }; // coordinates are rounded to 0.01 px; ticks to ~0.5 px
}

describe('the comparison plots, read back from the SVG', () => {
  for (const [key, s, scale] of [['kerrConstant', bSamples, 1e12], ['floorFraction', fSamples, 100]] as const) {
    it(`${key}: one point per comparable run at its value, with a ±1σ bar, in run order; the withheld run keeps its place`, () => {
      const svg = readFileSync(join(dir, 'out', 'plots', `compare-${key}.svg`), 'utf8');
      const { points, bars, axisLabels, pxTolerance } = decodePlot(svg);
      expect(points).toHaveLength(2); // the third run is withheld
      expect(bars).toHaveLength(2);
      expect(axisLabels.map((l) => l.text)).toEqual(LABELS);
      for (const [i, k] of (['a', 'b'] as const).entries()) {
        const q = meanQuantity(s[k]);
        const p = points[i]!;
        expect(Math.abs(p.x - axisLabels[i]!.x)).toBeLessThan(1);
        expect(Math.abs(p.value - q.value * scale), `${key} run ${i}`).toBeLessThanOrEqual(pxTolerance);
        const bar = bars.find((b) => Math.abs(b.x - p.x) < 1)!;
        expect(Math.abs(bar.lo - (q.value - q.stdErr) * scale)).toBeLessThanOrEqual(pxTolerance);
        expect(Math.abs(bar.hi - (q.value + q.stdErr) * scale)).toBeLessThanOrEqual(pxTolerance);
      }
      expect(svg).toContain(key === 'kerrConstant' ? 'Kerr constant B (10⁻¹² m/V²)' : 'Floor fraction (%)');
    });
  }
});

describe('the comparison summary.md table', () => {
  it('shows each run\'s B and floor fraction as its sample mean ± standard error (to the shown digits), and the withheld run as not separable', () => {
    const md = readFileSync(join(dir, 'out', 'summary.md'), 'utf8');
    expect(md).toContain(`| figure | ${LABELS.join(' | ')} |`);
    for (const [name, s, unitScale] of [['Kerr constant B', bSamples, 1e12], ['Floor fraction', fSamples, 100]] as const) {
      const row = md.split('\n').find((l) => l.startsWith(`| ${name} |`))!;
      const cells = row.split('|').slice(2, -1).map((c) => c.trim());
      expect(cells).toHaveLength(3);
      expect(cells[2]).toBe('not separable');
      for (const [i, k] of (['a', 'b'] as const).entries()) {
        const m = /^(-?[\d.]+) ± ([\d.]+)/.exec(cells[i]!)!;
        const decimals = m[1]!.split('.')[1]?.length ?? 0;
        const half = 0.5 * 10 ** -decimals * 1.0001;
        const q = meanQuantity(s[k]);
        expect(Math.abs(Number(m[1]) - q.value * unitScale), `${name} ${cells[i]}`).toBeLessThanOrEqual(half);
        expect(Math.abs(Number(m[2]) - q.stdErr * unitScale)).toBeLessThanOrEqual(half);
      }
    }
  });
});

describe('comparisonFigureSpec', () => {
  it('bars are value ∓ σ, runs keep the given order and a run without a value keeps its place on the axis', () => {
    const made = comparisonFigureSpec({
      title: 'Half-wave voltage Vπ', unitLabel: 'kV',
      points: [
        { run: 'b', order: 0, value: 9.5, stdErr: 0.2 },
        { run: 'a', order: 1, value: null, stdErr: null },
        { run: 'c', order: 2, value: 9.1, stdErr: null },
      ],
    });
    const spec = made.spec as unknown as { datasets: { runs: { run: string; value: number; lo: number; hi: number }[] }; title: { text: string }; layer: { encoding: { x: { scale: { domain: string[] } } } }[] };
    expect(spec.datasets.runs).toEqual([
      { run: 'b', order: 0, value: 9.5, lo: 9.3, hi: 9.7 },
      { run: 'c', order: 2, value: 9.1, lo: 9.1, hi: 9.1 },
    ]);
    for (const layer of spec.layer) expect(layer.encoding.x.scale.domain).toEqual(['b', 'a', 'c']);
    expect(spec.title.text).toBe('Half-wave voltage Vπ (kV)');
    expect(made.counts).toEqual({ runs: { drawn: 2, available: 3 } });
  });
});
