/**
 * Vega-Lite spec of the synchronisation search: agreement between measured and modelled light
 * against the trial offset (video time − log time), with the chosen offset as a dashed rule and,
 * when known, its ±1σ width as a shaded band. Returns null when the run has no search curve
 * (e.g. the offset was given by hand). Pure; never throws.
 * Units: offset in s; agreement as the analysis reports it (higher is better).
 * @example syncCurveSpec(result)?.spec.datasets.chosen[0].offsetS === result.sync.offsetS
 */
import type { RunResult } from '../../result/schema.js';
import { downsampleMinMax } from './downsampleMinMax.js';
import { MAX_POINTS_PER_SERIES, OKABE_ITO, PLOT_CONFIG, SERIES, VEGA_LITE_SCHEMA, type PlotSpecResult, type VegaLiteSpec } from './plotStyle.js';

export function syncCurveSpec(result: RunResult, maxPoints = MAX_POINTS_PER_SERIES): PlotSpecResult | null {
  const { offsetS, score } = result.sync.curve;
  const n = Math.min(offsetS.length, score.length);
  if (n === 0) return null;
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => offsetS[a]! - offsetS[b]!);
  const sortedScore = order.map((i) => score[i]!);
  const idx = downsampleMinMax(sortedScore, maxPoints);
  const curve = idx.map((k) => ({ offsetS: offsetS[order[k]!]!, score: sortedScore[k]!, series: 'agreement' })).filter((p) => Number.isFinite(p.offsetS) && Number.isFinite(p.score));
  const chosen = [{ offsetS: result.sync.offsetS, series: SERIES.chosen.label }];
  const domain = ['agreement', SERIES.chosen.label];
  const colour = { field: 'series', type: 'nominal', title: null, scale: { domain, range: [SERIES.measured.colour, SERIES.chosen.colour] } };
  const dash = { field: 'series', type: 'nominal', title: null, scale: { domain, range: [[], SERIES.chosen.dash] } };
  const shape = { field: 'series', type: 'nominal', title: null, scale: { domain, range: ['stroke', 'stroke'] } };
  const sharp = result.sync.sharpnessS;
  const band = sharp !== null && Number.isFinite(sharp) && sharp > 0 ? [{ lo: result.sync.offsetS - sharp, hi: result.sync.offsetS + sharp }] : [];
  const offsetAxis = { field: 'offsetS', type: 'quantitative', title: 'offset: video time − log time (s)' };

  const spec: VegaLiteSpec = {
    $schema: VEGA_LITE_SCHEMA,
    config: PLOT_CONFIG,
    datasets: { curve, chosen, band },
    width: 600,
    height: 220,
    layer: [
      ...(band.length > 0
        ? [{ data: { name: 'band' }, mark: { type: 'rect', color: OKABE_ITO.orange, opacity: 0.25 }, encoding: { x: { field: 'lo', type: 'quantitative' }, x2: { field: 'hi' } } }]
        : []),
      {
        data: { name: 'curve' },
        mark: { type: 'line', strokeWidth: 1.8, point: { filled: true, size: 14, color: SERIES.measured.colour } },
        encoding: { x: offsetAxis, y: { field: 'score', type: 'quantitative', title: 'agreement (higher is better)', scale: { zero: false } }, color: colour, strokeDash: dash, shape },
      },
      {
        data: { name: 'chosen' },
        mark: { type: 'rule', strokeWidth: 2, strokeDash: SERIES.chosen.dash },
        encoding: {
          x: { field: 'offsetS', type: 'quantitative' },
          color: colour,
          strokeDash: dash,
          shape,
        },
      },
    ],
  };
  return { spec, thinned: idx.length < n, counts: { curve: { drawn: idx.length, available: n } } };
}
