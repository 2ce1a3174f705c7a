/**
 * The coverage table of the study: for each figure, over the runs that gave it, the median
 * relative bias (value/truth − 1; for the offset the median error in ms), the share of runs whose
 * |error| is below 1σ and 2σ of their own stated standard uncertainty, and the largest
 * |z| = |value − truth|/σ. For a Gaussian error with an honest σ the shares are 68.3 % and 95.4 %
 * (the goal set in issue 12: 60–76 % and at least 92 %, no |z| above 4). Pure.
 */
import type { CaseOutcome } from './runCase.js';

export interface CoverageRow {
  figure: 'B' | 'Vpi' | 'offset' | 'floor';
  runs: number;
  medianBias: number;
  within1: number;
  within2: number;
  maxAbsZ: number;
  worstIndex: number | null;
}

export function coverageTable(outcomes: CaseOutcome[], onlyValid: boolean): CoverageRow[] {
  const figures = ['B', 'Vpi', 'offset', 'floor'] as const;
  return figures.map((figure) => {
    const z: { z: number; bias: number; index: number }[] = [];
    for (const o of outcomes) {
      if (o.refused || (onlyValid && !o.valid)) continue;
      const f = o.figures[figure];
      if (!f || !Number.isFinite(f.value) || !(f.stdErr > 0)) continue;
      const err = f.value - f.truth;
      z.push({ z: err / f.stdErr, bias: figure === 'offset' ? err * 1000 : err / f.truth, index: o.index });
    }
    const n = z.length;
    const biases = z.map((x) => x.bias).sort((a, b) => a - b);
    let worst: { z: number; index: number } | null = null;
    for (const x of z) if (!worst || Math.abs(x.z) > Math.abs(worst.z)) worst = x;
    return {
      figure, runs: n,
      medianBias: n ? biases[n >> 1]! : NaN,
      within1: n ? z.filter((x) => Math.abs(x.z) < 1).length / n : NaN,
      within2: n ? z.filter((x) => Math.abs(x.z) < 2).length / n : NaN,
      maxAbsZ: worst ? Math.abs(worst.z) : NaN,
      worstIndex: worst ? worst.index : null,
    };
  });
}

/** The table as Markdown (docs/uncertainty.md carries a copy). */
export function formatCoverageTable(rows: CoverageRow[]): string {
  const pct = (x: number) => (Number.isFinite(x) ? `${(100 * x).toFixed(0)} %` : '–');
  const lines = ['| figure | runs | median bias | within 1σ | within 2σ | max \\|z\\| (case) |', '| --- | ---: | ---: | ---: | ---: | ---: |'];
  for (const r of rows) {
    const bias = r.figure === 'offset' ? `${r.medianBias.toFixed(1)} ms` : `${(100 * r.medianBias).toFixed(2)} %`;
    lines.push(`| ${r.figure} | ${r.runs} | ${bias} | ${pct(r.within1)} | ${pct(r.within2)} | ${r.maxAbsZ.toFixed(2)} (${r.worstIndex ?? '–'}) |`);
  }
  return lines.join('\n');
}
