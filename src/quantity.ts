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

/**
 * "2.4137e-12 ± 3.2e-15 m/V^2" style text for summaries. With a standard error, the error keeps
 * two significant digits and the value is rounded to the same decimal place (GUM, JCGM 100:2008,
 * §7.2.6), so the printed value never hides or invents digits: 11179.4 ± 6.5 V prints as
 * "11179.4 ± 6.5 V", not "11200". Without one, the value gets `digits` significant digits.
 * @example formatQuantity({ value: 2.41372e-12, stdErr: 3.2e-15, unit: 'm/V^2' }) === '2.4137e-12 ± 3.2e-15 m/V^2'
 */
export function formatQuantity(q: Quantity, digits = 3): string {
  const u = q.unit ? ` ${q.unit}` : '';
  const err = q.stdErr;
  if (err === undefined || !(err > 0) || !Number.isFinite(err) || !Number.isFinite(q.value)) {
    const e = err !== undefined ? ` ± ${formatNumber(err, 2)}` : '';
    return `${formatNumber(q.value, digits)}${e}${u}`;
  }
  const errExp = Math.floor(Math.log10(err));
  const lastPlace = errExp - 1; // the error's second significant digit
  const a = Math.abs(q.value);
  const scientific = Math.max(a, err) < 1e-3 || Math.max(a, err) >= 1e5;
  if (scientific) {
    const valueExp = a > 0 ? Math.floor(Math.log10(a)) : errExp;
    const valueDigits = Math.min(15, Math.max(0, valueExp - lastPlace));
    return `${q.value.toExponential(valueDigits)} ± ${err.toExponential(1)}${u}`;
  }
  const decimals = Math.min(12, Math.max(0, -lastPlace));
  return `${q.value.toFixed(decimals)} ± ${err.toFixed(decimals)}${u}`;
}

export function formatNumber(x: number, digits = 3): string {
  if (!Number.isFinite(x)) return String(x);
  const a = Math.abs(x);
  if (a !== 0 && (a < 1e-3 || a >= 1e5)) return x.toExponential(digits - 1);
  return Number(x.toPrecision(digits)).toString();
}
