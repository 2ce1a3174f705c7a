import { describe, expect, it } from 'vitest';
import { parseNumberOption } from '../../src/design/parseNumberOption.js';
import { isKerrError } from '../../src/errors.js';

function lineOf(fn: () => unknown): string {
  try {
    fn();
  } catch (e) {
    if (isKerrError(e)) return e.oneLine();
    throw e;
  }
  throw new Error('expected a KerrError');
}

describe('parseNumberOption', () => {
  it('reads decimal and exponent notation', () => {
    expect(parseNumberOption('2.4e-12', '--kerr-constant', 'Kerr constant', 'positive')).toBe(2.4e-12);
    expect(parseNumberOption(' 5 ', '--gap-mm', 'gap in mm', 'positive')).toBe(5);
    expect(parseNumberOption('.5', '--gap-mm', 'gap in mm', 'positive')).toBe(0.5);
    expect(parseNumberOption('0', '--x', 'offset', 'non-negative')).toBe(0);
    expect(parseNumberOption('-3', '--x', 'offset', 'finite')).toBe(-3);
  });

  it('states what was expected, for which option, what was received', () => {
    expect(lineOf(() => parseNumberOption('-4', '--gap-mm', 'gap in mm', 'positive'))).toBe('expected a positive gap in mm for --gap-mm but received "-4"');
    expect(lineOf(() => parseNumberOption('0', '--gap-mm', 'gap in mm', 'positive'))).toMatch(/expected a positive gap in mm/);
    expect(lineOf(() => parseNumberOption('five', '--gap-mm', 'gap in mm', 'positive'))).toMatch(/received "five". Give a plain number/);
    expect(lineOf(() => parseNumberOption('2,5', '--gap-mm', 'gap in mm', 'positive'))).toMatch(/decimal point as a dot, e.g. 2.5/);
    expect(lineOf(() => parseNumberOption('1e999', '--gap-mm', 'gap in mm', 'positive'))).toMatch(/expected a positive/);
  });
});
