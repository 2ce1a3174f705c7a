/**
 * Turns the text of a numeric command-line option into a number, checked where it enters:
 * plain decimal or exponent notation ("2.4e-12", "35", "0.5"); the rule says which values are
 * allowed. Throws KerrError BAD_ARGUMENT through the shared `invalid()` builder, so every message
 * reads "expected a positive gap in mm for --gap-mm but received -4".
 * @example parseNumberOption('5', '--gap-mm', 'gap in mm', 'positive') === 5
 */
import { invalid } from '../errors.js';

export type NumberRule = 'positive' | 'non-negative' | 'finite';

const NUMBER_PATTERN = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i;

export function parseNumberOption(text: string, option: string, what: string, rule: NumberRule): number {
  const trimmed = text.trim();
  const article = rule === 'finite' ? 'a' : rule === 'positive' ? 'a positive' : 'a non-negative';
  const expected = `${article} ${what}`;
  if (!NUMBER_PATTERN.test(trimmed)) {
    const hint = /^\d+,\d+$/.test(trimmed) ? `Write the decimal point as a dot, e.g. ${trimmed.replace(',', '.')}` : 'Give a plain number such as 2.5 or 2.4e-12';
    throw invalid(expected, option, text, hint);
  }
  const value = Number(trimmed);
  const ok = Number.isFinite(value) && (rule === 'finite' || (rule === 'positive' ? value > 0 : value >= 0));
  if (!ok) throw invalid(expected, option, text);
  return value;
}
