/**
 * A number rounded to `digits` significant figures, for the sync messages (display only; the
 * figures themselves are never rounded). Trailing zeros are dropped when printed.
 * @example roundTo(19.96666, 6) // 19.9667
 */
export function roundTo(x: number, digits: number): number {
  return Number(x.toPrecision(digits));
}
