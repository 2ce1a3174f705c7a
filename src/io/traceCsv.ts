/**
 * trace.csv: one row per frame. Columns (documented in docs/analyze.md):
 * time_s, frame, voltage_V, intensity, model, residual, used, excluded_reason
 */
import type { TraceRow } from '../result/schema.js';

const fmt = (x: number | null, digits = 7): string => (x === null || !Number.isFinite(x) ? '' : Number(x.toPrecision(digits)).toString());

export function traceCsv(rows: TraceRow[]): string {
  const out = ['time_s,frame,voltage_V,intensity,model,residual,used,excluded_reason'];
  for (const r of rows) {
    out.push([
      fmt(r.timeS, 9), r.frameIndex, fmt(r.voltageV, 6), fmt(r.intensity), fmt(r.model), fmt(r.residual),
      r.used ? 1 : 0, r.excludedReason ?? '',
    ].join(','));
  }
  return out.join('\n') + '\n';
}
