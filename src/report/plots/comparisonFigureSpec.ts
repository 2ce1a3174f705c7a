/**
 * Vega-Lite spec of one figure across compared runs: the value of each run as a point with its
 * ±1σ error bar, runs in the order given along x, in the figure's display unit. Runs whose value
 * is missing or withheld are left out of the points but keep their place on the axis. Run labels
 * are data (Vega escapes text in its SVG output), never markup. Pure; never throws.
 * @example comparisonFigureSpec({ title: 'Kerr constant B', unitLabel: '10⁻¹² m/V²', runs: [...] }).spec.width === 230
 */
import { OKABE_ITO, PLOT_CONFIG, VEGA_LITE_SCHEMA, type PlotSpecResult, type VegaLiteSpec } from './plotStyle.js';

export interface ComparisonPoint {
  run: string;
  order: number;
  /** In display units; null when the run does not report the figure. */
  value: number | null;
  stdErr: number | null;
}

export interface ComparisonFigureInput {
  title: string;
  /** Axis unit text, e.g. "kV" or "%". */
  unitLabel: string;
  points: ComparisonPoint[];
}

export function comparisonFigureSpec(input: ComparisonFigureInput): PlotSpecResult {
  const rows = input.points.map((p) => ({
    run: p.run,
    order: p.order,
    value: p.value,
    lo: p.value !== null && p.stdErr !== null ? p.value - p.stdErr : p.value,
    hi: p.value !== null && p.stdErr !== null ? p.value + p.stdErr : p.value,
  }));
  const present = rows.filter((r) => r.value !== null && Number.isFinite(r.value));
  const runAxis = {
    field: 'run', type: 'nominal', title: null, sort: input.points.map((p) => p.run),
    scale: { domain: input.points.map((p) => p.run) },
    axis: { labelAngle: 0, labelLimit: 110 },
  };
  const title = input.unitLabel === '' ? input.title : `${input.title} (${input.unitLabel})`;
  const spec: VegaLiteSpec = {
    $schema: VEGA_LITE_SCHEMA,
    config: PLOT_CONFIG,
    datasets: { runs: present },
    data: { name: 'runs' },
    title: { text: title, fontSize: 12 },
    width: 230,
    height: 170,
    layer: [
      { mark: { type: 'line', color: '#9aa3b2', strokeDash: [3, 3], strokeWidth: 1 }, encoding: { x: runAxis, y: { field: 'value', type: 'quantitative' } } },
      { mark: { type: 'rule', color: OKABE_ITO.blue, strokeWidth: 1.6 }, encoding: { x: runAxis, y: { field: 'lo', type: 'quantitative' }, y2: { field: 'hi' } } },
      { mark: { type: 'tick', color: OKABE_ITO.blue, thickness: 1.6, size: 10, orient: 'horizontal' }, encoding: { x: runAxis, y: { field: 'lo', type: 'quantitative' } } },
      { mark: { type: 'tick', color: OKABE_ITO.blue, thickness: 1.6, size: 10, orient: 'horizontal' }, encoding: { x: runAxis, y: { field: 'hi', type: 'quantitative' } } },
      {
        mark: { type: 'point', filled: true, size: 60, shape: 'circle', color: OKABE_ITO.blue, stroke: '#ffffff', strokeWidth: 1 },
        encoding: { x: runAxis, y: { field: 'value', type: 'quantitative', title: null, scale: { zero: false } } },
      },
    ],
  };
  return { spec, thinned: false, counts: { runs: { drawn: present.length, available: rows.length } } };
}
