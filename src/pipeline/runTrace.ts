/**
 * The per-frame record of a run from its one fit: trace.csv rows (voltage, intensity, model,
 * residual, used or the reason left out), the modulation term
 *   m_t = sin²(2θ)·sin²((π/2)(V_t/V_π)² + δ/2)   (θ polariser angle, δ static retardance)
 * (the one term the fits use, src/core/physics/modulationTerm.ts) with the fitted V_π (NaN outside the log), the used flags, and the count of frames per reason.
 */
import type { KerrCurveFit } from '../core/fit/fitKerrCurve.js';
import { modulationTerm, polariserAngleFactor } from '../core/physics/modulationTerm.js';
import type { TraceRow } from '../result/schema.js';
import type { RunCell } from './runCell.js';

export interface RunTrace {
  trace: TraceRow[];
  modulation: Float64Array;
  used: Uint8Array;
  excludedCounts: Record<string, number>;
  usedCount: number;
}

export function runTrace(i: { fit: KerrCurveFit; cell: RunCell; times: Float64Array; voltage: Float64Array; intensity: Float64Array; excluded: readonly (string | null)[] }): RunTrace {
  const n = i.times.length;
  const trace: TraceRow[] = [];
  const modulation = new Float64Array(n);
  const used = new Uint8Array(n);
  const vpi = i.fit.halfWaveVoltage.value;
  const staticRad = i.cell.staticRetardanceRad ?? 0;
  const angleFactor = polariserAngleFactor(i.cell.polariserAngleDeg);
  const excludedCounts: Record<string, number> = {};
  let usedCount = 0;
  for (let f = 0; f < n; f++) {
    const v = i.voltage[f]!;
    const has = Number.isFinite(v);
    const model = has ? i.fit.predict(v) : null;
    const why = i.excluded[f] ?? null;
    modulation[f] = has ? modulationTerm(v, vpi, angleFactor, staticRad) : NaN;
    used[f] = why ? 0 : 1;
    if (why) excludedCounts[why] = (excludedCounts[why] ?? 0) + 1;
    else usedCount++;
    trace.push({
      frameIndex: f, timeS: i.times[f]!, voltageV: has ? v : null, intensity: i.intensity[f]!, model,
      residual: model === null ? null : i.intensity[f]! - model, used: !why, excludedReason: why,
    });
  }
  return { trace, modulation, used, excludedCounts, usedCount };
}
