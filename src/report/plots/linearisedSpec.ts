/**
 * Vega-Lite spec for the classic linear reduction: V² against δ = 2·arcsin√T on the first
 * branch (δ ≤ π, |V| ≤ V_π), where T = (I − I_floor)/(I_amp·sin²2θ) is the measured normalised
 * transmission (clamped to [0, 1]). The Kerr law makes this a straight line through the origin,
 * V² = d²/(2π·B·L_eff)·δ; the drawn line uses B from `result.linearised.kerrConstant` (the
 * regression the analysis did), so its slope is d²/(2π·B_lin·L_eff) in V²/rad.
 * Returns null when the run has no linearised reduction. Pure; never throws.
 * Units: δ in rad, V² shown in kV².
 * @example linearisedSpec(result, trace)?.spec.datasets.line.length === 2
 */
import type { RunResult, TraceRow } from '../../result/schema.js';
import { DEG } from '../../core/physics/kerr.js';
import { downsampleMinMax } from './downsampleMinMax.js';
import { MAX_POINTS_PER_SERIES, PLOT_CONFIG, SERIES, VEGA_LITE_SCHEMA, type PlotSpecResult, type VegaLiteSpec } from './plotStyle.js';

export function linearisedSpec(result: RunResult, trace: readonly TraceRow[], maxPoints = MAX_POINTS_PER_SERIES): PlotSpecResult | null {
  const lin = result.linearised;
  if (lin === null) return null;
  const m = result.model;
  const sin2theta = Math.sin(2 * m.polariserAngleDeg * DEG);
  const scale = m.amplitude.value * sin2theta * sin2theta;
  const halfWave = result.halfWaveVoltage.value;
  const rows: { retardanceRad: number; voltageSqKv2: number }[] = [];
  for (const r of trace) {
    if (!r.used || r.voltageV === null || !Number.isFinite(r.voltageV)) continue;
    if (Number.isFinite(halfWave) && Math.abs(r.voltageV) > halfWave) continue;
    if (!(scale > 0)) continue;
    const transmission = Math.min(1, Math.max(0, (r.intensity - m.floorLevel.value) / scale));
    rows.push({ retardanceRad: 2 * Math.asin(Math.sqrt(transmission)), voltageSqKv2: (r.voltageV / 1000) ** 2 });
  }
  const idx = downsampleMinMax(rows.map((r) => r.voltageSqKv2), maxPoints);
  const points = idx.map((i) => ({ ...rows[i]!, series: SERIES.measured.label }));
  const slopeV2PerRad = (m.gapM * m.gapM) / (2 * Math.PI * lin.kerrConstant.value * m.effectiveLengthM);
  let maxRetardance = 0;
  for (const r of rows) if (r.retardanceRad > maxRetardance) maxRetardance = r.retardanceRad;
  const lineEnd = maxRetardance > 0 ? maxRetardance : Math.PI;
  const line = [0, lineEnd].map((d) => ({ retardanceRad: d, voltageSqKv2: (slopeV2PerRad * d) / 1e6, series: SERIES.regression.label }));
  const domain = [SERIES.measured.label, SERIES.regression.label];
  const colour = { field: 'series', type: 'nominal', title: null, scale: { domain, range: [SERIES.measured.colour, SERIES.regression.colour] } };
  const shape = { field: 'series', type: 'nominal', title: null, scale: { domain, range: [SERIES.measured.shape, 'stroke'] } };
  const dash = { field: 'series', type: 'nominal', title: null, scale: { domain, range: [[], SERIES.regression.dash] } };

  const spec: VegaLiteSpec = {
    $schema: VEGA_LITE_SCHEMA,
    config: PLOT_CONFIG,
    datasets: { points, line },
    width: 600,
    height: 300,
    layer: [
      {
        data: { name: 'points' },
        mark: { type: 'point', size: 16, filled: true, opacity: 0.55 },
        encoding: {
          x: { field: 'retardanceRad', type: 'quantitative', title: 'retardance 2·arcsin√T (rad)', scale: { domain: [0, Math.PI], nice: false } },
          y: { field: 'voltageSqKv2', type: 'quantitative', title: 'V² (kV²)' },
          color: colour,
          shape,
          strokeDash: dash,
        },
      },
      {
        data: { name: 'line' },
        mark: { type: 'line', strokeWidth: 2.2 },
        encoding: {
          x: { field: 'retardanceRad', type: 'quantitative' },
          y: { field: 'voltageSqKv2', type: 'quantitative' },
          color: colour,
          shape,
          strokeDash: dash,
        },
      },
    ],
  };
  return { spec, thinned: idx.length < rows.length, counts: { points: { drawn: idx.length, available: rows.length } } };
}
