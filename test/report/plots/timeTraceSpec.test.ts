import { describe, expect, it } from 'vitest';
import { timeTraceSpec } from '../../../src/report/plots/timeTraceSpec.js';
import { syncCurveSpec } from '../../../src/report/plots/syncCurveSpec.js';
import { renderPlot } from '../../../src/report/renderPlot.js';
import { buildRunFixture } from '../../fixtures/results/buildRunFixture.js';

type Row = { timeS: number; value: number; series: string };

describe('timeTraceSpec', () => {
  it('stacks intensity over voltage on one shared time axis', () => {
    const { result, trace } = buildRunFixture();
    const { spec } = timeTraceSpec(result, trace);
    expect((spec.vconcat as unknown[]).length).toBe(2);
    expect(spec.resolve).toEqual({ scale: { x: 'shared' } });
  });

  it('thins a long trace to at most 2000 points per series but keeps the spark spike', () => {
    const { result, trace } = buildRunFixture({ durationS: 300, fps: 30 }); // 9000 frames
    const made = timeTraceSpec(result, trace);
    expect(made.thinned).toBe(true);
    const lines = (made.spec.datasets as { lines: Row[] }).lines;
    const measured = lines.filter((r) => r.series === 'measured');
    expect(measured.length).toBeLessThanOrEqual(2000);
    const spike = Math.max(...trace.map((r) => r.intensity));
    expect(Math.max(...measured.map((r) => r.value))).toBe(spike);
    expect(made.counts.intensity).toEqual({ drawn: measured.length, available: 9000 });
  });

  it('marks every excluded frame and every event', () => {
    const { result, trace } = buildRunFixture();
    const ds = timeTraceSpec(result, trace).spec.datasets as { excluded: { reason: string }[]; events: { series: string }[] };
    expect(ds.excluded.length).toBe(trace.filter((r) => !r.used).length);
    expect(ds.events.map((e) => e.series)).toEqual(['spark', 'particle']);
  });

  it('renders to SVG with units on the axes and without compiler warnings', async () => {
    const { result, trace } = buildRunFixture();
    const { svg, warnings } = await renderPlot(timeTraceSpec(result, trace).spec, 'tt');
    expect(svg.startsWith('<svg')).toBe(true);
    expect(svg).toContain('voltage (kV)');
    expect(svg).toContain('video time (s)');
    expect(warnings).toEqual([]);
  });
});

describe('syncCurveSpec', () => {
  it('marks the chosen offset and returns null without a search curve', () => {
    const { result } = buildRunFixture({ syncOffsetS: 0.75 });
    const made = syncCurveSpec(result);
    expect((made!.spec.datasets as { chosen: { offsetS: number }[] }).chosen[0]!.offsetS).toBe(0.75);
    result.sync.curve = { offsetS: [], score: [] };
    expect(syncCurveSpec(result)).toBeNull();
  });
});
