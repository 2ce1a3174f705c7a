/**
 * A number cell of our CSV dialect: a plain decimal number ([sign] digits [mark digits]
 * [e [sign] digits], at least one digit before the exponent), padded with spaces or tabs or
 * wrapped in double or single quotes. The decimal mark is a point, or a comma when
 * `decimalCommaAllowed` (a semicolon- or tab-separated file). NaN for anything else: empty, text,
 * hex, infinity, a thousands separator, a unit after the number. Records which mark it met in
 * `marks`, so a reader can warn when a file mixes both.
 * @example parseCsvNumber(' "0,083" ', true) // 0.083; parseCsvNumber('0,083', false) // NaN
 */
export interface DecimalMarks {
  comma: boolean;
  point: boolean;
}

const isSpace = (c: number): boolean => c === 32 || c === 9;
const isDigit = (c: number): boolean => c >= 48 && c <= 57;

export function parseCsvNumber(cell: string, decimalCommaAllowed: boolean, marks?: DecimalMarks): number {
  let start = 0;
  let end = cell.length;
  while (start < end && isSpace(cell.charCodeAt(start))) start++;
  while (end > start && isSpace(cell.charCodeAt(end - 1))) end--;
  if (end - start >= 2) {
    const q = cell.charCodeAt(start);
    if ((q === 34 || q === 39) && cell.charCodeAt(end - 1) === q) {
      start++;
      end--;
      while (start < end && isSpace(cell.charCodeAt(start))) start++;
      while (end > start && isSpace(cell.charCodeAt(end - 1))) end--;
    }
  }
  let i = start;
  let c = cell.charCodeAt(i);
  if (c === 43 || c === 45) i++; // + −
  let digits = 0;
  let mark = 0; // 0 none, 46 point, 44 comma
  for (; i < end; i++) {
    c = cell.charCodeAt(i);
    if (isDigit(c)) digits++;
    else if (mark === 0 && (c === 46 || (c === 44 && decimalCommaAllowed))) mark = c;
    else break;
  }
  if (digits === 0) return Number.NaN;
  if (i < end) {
    if (c !== 101 && c !== 69) return Number.NaN; // e E
    i++;
    c = cell.charCodeAt(i);
    if (c === 43 || c === 45) i++;
    let exponentDigits = 0;
    while (i < end && isDigit(cell.charCodeAt(i))) {
      i++;
      exponentDigits++;
    }
    if (exponentDigits === 0 || i !== end) return Number.NaN;
  }
  const text = cell.slice(start, end);
  const value = Number(mark === 44 ? text.replace(',', '.') : text);
  if (!Number.isFinite(value)) return Number.NaN;
  if (marks !== undefined) {
    if (mark === 44) marks.comma = true;
    else if (mark === 46) marks.point = true;
  }
  return value;
}
