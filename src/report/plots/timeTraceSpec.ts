/**
 * Vega-Lite spec: measured intensity (with the fitted model) and the logged voltage against video
 * time, as two stacked panels sharing one time axis. Frames left out of the fit are drawn as
 * crosses; detected events (sparks, particles, clipping, exposure jumps) as marker shapes above
 * the trace with a dotted line through both panels.
 * Series longer than MAX_POINTS_PER_SERIES are thinned with min/max decimation; the returned
 * `thinned` flag lets the caption say so. Pure; never throws.
 * Units: time in s (video clock), voltage shown in kV, intensity in the result's linear units.
 * A photo series (result.source "stills") is drawn against its own axis (sampleWords): seconds
 * after the first photo when the photos carry EXIF capture times, else photo order; its left-out
 * points are labelled "excluded photo".
 * @example timeTraceSpec(result, trace).spec.vconcat.length === 2
 */
import type { RunEvent, RunResult, TraceRow } from '../../result/schema.js';
import { sampleWords } from '../sampleWords.js';
import { downsampleMinMax } from './downsampleMinMax.js';
import { EVENT_STYLE, INTENSITY_TITLE, MAX_POINTS_PER_SERIES, PLOT_CONFIG, SERIES, VEGA_LITE_SCHEMA, type PlotSpecResult, type VegaLiteSpec } from './plotStyle.js';

const WIDTH = 740;

export function timeTraceSpec(result: RunResult, trace: readonly TraceRow[], maxPoints = MAX_POINTS_PER_SERIES): PlotSpecResult {
  const intensityIdx = downsampleMinMax(trace.map((r) => r.intensity), maxPoints);
  const voltageRows = trace.filter((r) => r.voltageV !== null && Number.isFinite(r.voltageV));
  const voltageIdx = downsampleMinMax(voltageRows.map((r) => r.voltageV), maxPoints);
  const modelRows = trace.filter((r) => r.model !== null && Number.isFinite(r.model));
  const modelIdx = downsampleMinMax(modelRows.map((r) => r.model), maxPoints);
  const excludedRows = trace.filter((r) => !r.used);
  const excludedIdx = downsampleMinMax(excludedRows.map((r) => r.intensity), maxPoints);
  const events = result.events.slice(0, maxPoints);
  const words = sampleWords(result);
  const excludedLabel = words.excludedLabel;

  const lines = [
    ...intensityIdx.map((i) => ({ timeS: trace[i]!.timeS, value: trace[i]!.intensity, series: SERIES.measured.label })),
    ...modelIdx.map((i) => ({ timeS: modelRows[i]!.timeS, value: modelRows[i]!.model, series: SERIES.model.label })),
  ];
  const excluded = excludedIdx.map((i) => ({
    timeS: excludedRows[i]!.timeS,
    value: excludedRows[i]!.intensity,
    reason: excludedRows[i]!.excludedReason ?? 'excluded',
    series: excludedLabel,
  }));
  const voltage = voltageIdx.map((i) => ({ timeS: voltageRows[i]!.timeS, voltageKv: (voltageRows[i]!.voltageV as number) / 1000 }));
  const eventRows = events.map((e: RunEvent) => ({ timeS: e.timeS, series: e.kind, frameIndex: e.frameIndex, size: e.size }));

  // One legend for everything drawn in the intensity panel: colour, marker shape and dash all
  // follow the same `series` field, so Vega-Lite merges them into a single legend.
  const eventKindsShown = [...new Set(events.map((e) => e.kind))];
  const domain = [SERIES.measured.label, SERIES.model.label, excludedLabel, ...eventKindsShown];
  const colour = { field: 'series', type: 'nominal', title: null, scale: { domain, range: [SERIES.measured.colour, SERIES.model.colour, SERIES.excluded.colour, ...eventKindsShown.map((k) => EVENT_STYLE[k]?.colour ?? '#000000')] } };
  const shape = { field: 'series', type: 'nominal', title: null, scale: { domain, range: ['stroke', 'stroke', SERIES.excluded.shape, ...eventKindsShown.map((k) => EVENT_STYLE[k]?.shape ?? 'circle')] } };
  const dash = { field: 'series', type: 'nominal', title: null, scale: { domain, range: [SERIES.measured.dash, SERIES.model.dash, [], ...eventKindsShown.map(() => [])] } };
  const timeField = { field: 'timeS', type: 'quantitative', title: words.axisTitle };
  const eventRule = {
    data: { name: 'events' },
    mark: { type: 'rule', strokeDash: [2, 3], strokeWidth: 1, color: '#7b8494' },
    encoding: { x: { field: 'timeS', type: 'quantitative' } },
  };

  const intensityPanel = {
    width: WIDTH,
    height: 210,
    layer: [
      ...(events.length > 0 ? [eventRule] : []),
      {
        data: { name: 'lines' },
        mark: { type: 'line', strokeWidth: 1.4, clip: true },
        encoding: {
          x: { ...timeField, axis: { title: null, labels: false } },
          y: { field: 'value', type: 'quantitative', title: INTENSITY_TITLE },
          color: colour,
          strokeDash: dash,
          shape,
        },
      },
      ...(excluded.length > 0
        ? [{
            data: { name: 'excluded' },
            mark: { type: 'point', size: 22, filled: true, opacity: 0.6, clip: true },
            encoding: { x: { field: 'timeS', type: 'quantitative' }, y: { field: 'value', type: 'quantitative' }, color: colour, shape, strokeDash: dash },
          }]
        : []),
      ...(events.length > 0
        ? [{
            data: { name: 'events' },
            mark: { type: 'point', filled: true, size: 80, y: 0, yOffset: 7, stroke: '#ffffff', strokeWidth: 0.6 },
            encoding: { x: { field: 'timeS', type: 'quantitative' }, color: colour, shape, strokeDash: dash },
          }]
        : []),
    ],
  };

  const voltagePanel = {
    width: WIDTH,
    height: 130,
    layer: [
      ...(events.length > 0 ? [eventRule] : []),
      {
        data: { name: 'voltage' },
        mark: { type: 'line', color: SERIES.voltage.colour, strokeWidth: 1.6, clip: true },
        encoding: {
          x: timeField,
          y: { field: 'voltageKv', type: 'quantitative', title: 'voltage (kV)' },
        },
      },
    ],
  };

  const spec: VegaLiteSpec = {
    $schema: VEGA_LITE_SCHEMA,
    config: PLOT_CONFIG,
    datasets: { lines, excluded, voltage, events: eventRows },
    vconcat: [intensityPanel, voltagePanel],
    spacing: 6,
    resolve: { scale: { x: 'shared' } },
  };
  const counts = {
    intensity: { drawn: intensityIdx.length, available: trace.length },
    model: { drawn: modelIdx.length, available: modelRows.length },
    voltage: { drawn: voltageIdx.length, available: voltageRows.length },
    excluded: { drawn: excludedIdx.length, available: excludedRows.length },
    events: { drawn: events.length, available: result.events.length },
  };
  const thinned = Object.values(counts).some((c) => c.drawn < c.available);
  return { spec, thinned, counts };
}
