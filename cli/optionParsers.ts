/**
 * The one set of parsers for the text of command-line options. Every command turns its option
 * text into values here, so the same kind of value is read by the same rule everywhere, and a bad
 * value gives one line: `expected <what> for <--flag> but received "<text>"` (KerrError
 * BAD_ARGUMENT through the shared `invalid()` builder, with a hint where one helps).
 *
 * - `parseNumberOption`: a plain decimal or exponent number ("2.4e-12", "35", ".5", padded with
 *   spaces); `rule` finite (default), positive or non-negative. No hex, no "Infinity", no decimal
 *   comma (the hint shows the number with a dot).
 * - `parsePercentOption`: a number with an optional trailing `%` ("1", "0.5 %").
 * - `parseToleranceOption`: a number with an optional ± limit: "40", "40±0.1", "40+-0.1",
 *   "40+/-0.1"; the tolerance must be ≥ 0. The budget takes it as rectangular (docs/uncertainty.md).
 * - `parseWindowOption`: "START:END", two numbers in seconds, END after START.
 * - `parseWholeNumberOption`: an integer (optionally negative) between `lo` and `hi`.
 * - `parseRectOption`: a rectangle "x,y,w,h" in pixels (src/measure/rect.ts: parseRect).
 * - `parseTransferOption`: a camera transfer name (src/core/camera/transfer.ts: parseTransfer).
 *
 * @example parseToleranceOption('4±0.05', '--gap-mm', 'a positive electrode gap in mm') → { value: 4, tolerance: 0.05 }
 * @example parseNumberOption('-4', '--gap-mm', 'a positive electrode gap in mm', 'positive') // throws: expected a positive electrode gap in mm for --gap-mm but received "-4"
 */
import { parseTransfer } from '../src/core/camera/transfer.js';
import { invalid } from '../src/errors.js';
import { parseRect } from '../src/measure/rect.js';

export type NumberRule = 'finite' | 'positive' | 'non-negative';

const NUMBER_PATTERN = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i;

export function parseNumberOption(text: string, option: string, expected: string, rule: NumberRule = 'finite'): number {
  const trimmed = text.trim();
  if (!NUMBER_PATTERN.test(trimmed)) {
    const hint = /^[+-]?\d+,\d+$/.test(trimmed) ? `Write the decimal point as a dot, e.g. ${trimmed.replace(',', '.')}` : 'Give a plain number such as 2.5 or 2.4e-12';
    throw invalid(expected, option, text, hint);
  }
  const value = Number(trimmed);
  const ok = Number.isFinite(value) && (rule === 'finite' || (rule === 'positive' ? value > 0 : value >= 0));
  if (!ok) throw invalid(expected, option, text);
  return value;
}

export function parsePercentOption(text: string, option: string, expected: string, rule: NumberRule = 'finite'): number {
  return parseNumberOption(text.trim().replace(/\s*%$/, ''), option, expected, rule);
}

export function parseToleranceOption(text: string, option: string, expected: string, unit = 'mm'): { value: number; tolerance?: number } {
  const withTolerance = `${expected}, optionally with a tolerance (e.g. 4±0.05)`;
  const m = /^\s*([^±+]+?)\s*(?:(?:±|\+-|\+\/-)\s*(.+))?\s*$/.exec(text);
  if (!m) throw invalid(withTolerance, option, text);
  const value = parseNumberOption(m[1]!, option, withTolerance);
  if (m[2] === undefined) return { value };
  const tolerance = parseNumberOption(m[2], option, `a tolerance in ${unit} after ± (e.g. 4±0.05)`);
  if (!(tolerance >= 0)) throw invalid('a tolerance of 0 or more after ±', option, text);
  return { value, tolerance };
}

export function parseWindowOption(text: string, option: string): [number, number] {
  const expected = 'START:END in seconds of the video, e.g. 1.5:4';
  const parts = text.split(':');
  if (parts.length !== 2) throw invalid(expected, option, text);
  const start = parseNumberOption(parts[0]!, option, expected);
  const end = parseNumberOption(parts[1]!, option, expected);
  if (!(end > start)) throw invalid('START:END with END after START (seconds)', option, text);
  return [start, end];
}

export function parseWholeNumberOption(text: string, option: string, expected: string, lo: number, hi: number, hint?: string): number {
  const trimmed = text.trim();
  const value = Number(trimmed);
  if (!/^-?\d+$/.test(trimmed) || !Number.isSafeInteger(value) || value < lo || value > hi) {
    throw hint === undefined ? invalid(expected, option, text) : invalid(expected, option, text, hint);
  }
  return value;
}

export function parseRectOption(text: string, option: string): ReturnType<typeof parseRect> {
  return parseRect(text, option);
}

export function parseTransferOption(text: string, option = '--transfer'): ReturnType<typeof parseTransfer> {
  return parseTransfer(text, option);
}
