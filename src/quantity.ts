/**
 * Every reported number travels as a Quantity: value, optional standard error (1 sigma, same
 * unit), optional unit string. SI units throughout ("m/V^2", "V", "s"); dimensionless ratios
 * carry no unit.
 */
export interface Quantity {
  value: number;
  stdErr?: number;
  unit?: string;
}

export function quantity(value: number, stdErr?: number, unit?: string): Quantity {
  const q: Quantity = { value };
  if (stdErr !== undefined && Number.isFinite(stdErr)) q.stdErr = stdErr;
  if (unit !== undefined) q.unit = unit;
  return q;
}

/** "2.41e-12 ± 0.03e-12 m/V^2" style text for summaries. */
export function formatQuantity(q: Quantity, digits = 3): string {
  const v = formatNumber(q.value, digits);
  const e = q.stdErr !== undefined ? ` ± ${formatNumber(q.stdErr, 2)}` : '';
  const u = q.unit ? ` ${q.unit}` : '';
  return `${v}${e}${u}`;
}

export function formatNumber(x: number, digits = 3): string {
  if (!Number.isFinite(x)) return String(x);
  const a = Math.abs(x);
  if (a !== 0 && (a < 1e-3 || a >= 1e5)) return x.toExponential(digits - 1);
  return Number(x.toPrecision(digits)).toString();
}
