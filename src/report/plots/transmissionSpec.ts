/**
 * Vega-Lite spec: measured intensity against voltage with the fitted transmission curve, and the
 * fit residuals beneath on the same voltage axis. The curve is sampled at 401 voltages across the
 * recorded range and evaluated from `result.model` with modelIntensity (i.e. with the physics of
 * src/core/physics/kerr.ts), so the drawn curve is exactly the fitted model. It is kept in the
 * spec's `datasets.curve` as {voltageV, voltageKv, intensity} rows.
 * Points: frames (or photos) used in the fit (circles) and those left out that have a voltage (crosses);
 * thinned with min/max decimation above MAX_POINTS_PER_SERIES. Pure; never throws.
 * Units: voltage shown in kV, intensity in the result's linear (dark-subtracted) units.
 * @example transmissionSpec(result, trace).spec.datasets.curve.length === 401
 */
import type { RunResult, TraceRow } from '../../result/schema.js';
import { sampleWords } from '../sampleWords.js';
import { downsampleMinMax } from './downsampleMinMax.js';
import { modelIntensity } from './modelIntensity.js';
import { INTENSITY_TITLE, MAX_POINTS_PER_SERIES, PLOT_CONFIG, SERIES, VEGA_LITE_SCHEMA, type PlotSpecResult, type VegaLiteSpec } from './plotStyle.js';

export const CURVE_SAMPLES = 401;
const WIDTH = 740;

export function transmissionSpec(result: RunResult, trace: readonly TraceRow[], maxPoints = MAX_POINTS_PER_SERIES): PlotSpecResult {
  const { excludedLabel } = sampleWords(result);
  const withVoltage = trace.filter((r) => r.voltageV !== null && Number.isFinite(r.voltageV));
  const usedRows = withVoltage.filter((r) => r.used);
  const excludedRows = withVoltage.filter((r) => !r.used);
  const usedIdx = downsampleMinMax(usedRows.map((r) => r.intensity), maxPoints);
  const excludedIdx = downsampleMinMax(excludedRows.map((r) => r.intensity), maxPoints);
  const residualRows = usedRows.filter((r) => r.residual !== null && Number.isFinite(r.residual));
  const residualIdx = downsampleMinMax(residualRows.map((r) => r.residual), maxPoints);

  let vMin = 0;
  let vMax = 0;
  for (const r of withVoltage) {
    const v = r.voltageV as number;
    if (v < vMin) vMin = v;
    if (v > vMax) vMax = v;
  }
  const curve: { voltageV: number; voltageKv: number; intensity: number; series: string }[] = [];
  for (let k = 0; k < CURVE_SAMPLES; k++) {
    const voltageV = k === CURVE_SAMPLES - 1 ? vMax : vMin + ((vMax - vMin) * k) / (CURVE_SAMPLES - 1);
    curve.push({ voltageV, voltageKv: voltageV / 1000, intensity: modelIntensity(result.model, voltageV), series: SERIES.model.label });
  }
  const points = [
    ...usedIdx.map((i) => ({ voltageKv: (usedRows[i]!.voltageV as number) / 1000, intensity: usedRows[i]!.intensity, series: SERIES.measured.label })),
    ...excludedIdx.map((i) => ({ voltageKv: (excludedRows[i]!.voltageV as number) / 1000, intensity: excludedRows[i]!.intensity, series: excludedLabel })),
  ];
  const residuals = residualIdx.map((i) => ({ voltageKv: (residualRows[i]!.voltageV as number) / 1000, residual: residualRows[i]!.residual }));

  const domain = [SERIES.measured.label, excludedLabel, SERIES.model.label];
  const colour = { field: 'series', type: 'nominal', title: null, scale: { domain, range: [SERIES.measured.colour, SERIES.excluded.colour, SERIES.model.colour] } };
  const shape = { field: 'series', type: 'nominal', title: null, scale: { domain, range: [SERIES.measured.shape, SERIES.excluded.shape, 'stroke'] } };
  const dash = { field: 'series', type: 'nominal', title: null, scale: { domain, range: [[], [], SERIES.model.dash] } };
  const voltageAxis = { field: 'voltageKv', type: 'quantitative', title: 'voltage (kV)' };

  const spec: VegaLiteSpec = {
    $schema: VEGA_LITE_SCHEMA,
    config: PLOT_CONFIG,
    datasets: { points, curve, residuals },
    vconcat: [
      {
        width: WIDTH,
        height: 260,
        layer: [
          {
            data: { name: 'points' },
            mark: { type: 'point', size: 16, opacity: 0.55, filled: true },
            encoding: {
              x: { ...voltageAxis, axis: { title: null, labels: false } },
              y: { field: 'intensity', type: 'quantitative', title: INTENSITY_TITLE },
              color: colour,
              shape,
              strokeDash: dash,
            },
          },
          {
            data: { name: 'curve' },
            mark: { type: 'line', strokeWidth: 2.2 },
            encoding: {
              x: { field: 'voltageKv', type: 'quantitative' },
              y: { field: 'intensity', type: 'quantitative' },
              color: colour,
              shape,
              strokeDash: dash,
            },
          },
        ],
      },
      {
        width: WIDTH,
        height: 110,
        layer: [
          { mark: { type: 'rule', color: '#7b8494', strokeDash: [3, 3] }, encoding: { y: { datum: 0, type: 'quantitative' } } },
          {
            data: { name: 'residuals' },
            mark: { type: 'point', size: 12, filled: true, opacity: 0.55, color: SERIES.measured.colour },
            encoding: {
              x: voltageAxis,
              y: { field: 'residual', type: 'quantitative', title: 'residual' },
            },
          },
        ],
      },
    ],
    spacing: 6,
    resolve: { scale: { x: 'shared' } },
  };
  const counts = {
    used: { drawn: usedIdx.length, available: usedRows.length },
    excluded: { drawn: excludedIdx.length, available: excludedRows.length },
    residuals: { drawn: residualIdx.length, available: residualRows.length },
  };
  return { spec, thinned: Object.values(counts).some((c) => c.drawn < c.available), counts };
}
