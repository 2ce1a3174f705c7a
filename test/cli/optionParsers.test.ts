// The option parsers are our own rules (cli/optionParsers.ts); expected values are worked by hand.
import { describe, expect, it } from 'vitest';
import {
  parseNumberOption,
  parsePercentOption,
  parseRectOption,
  parseToleranceOption,
  parseTransferOption,
  parseWholeNumberOption,
  parseWindowOption,
} from '../../cli/optionParsers.js';
import { isKerrError } from '../../src/errors.js';

/** The one line a bad value gives (code BAD_ARGUMENT, or BAD_REGION for rectangles, naming the flag). */
function lineOf(fn: () => unknown, code = 'BAD_ARGUMENT'): string {
  try {
    fn();
  } catch (e) {
    if (isKerrError(e)) {
      expect(e.code).toBe(code);
      const line = e.oneLine();
      expect(line).not.toContain('\n');
      return line;
    }
    throw e;
  }
  throw new Error('expected a KerrError');
}

describe('parseNumberOption', () => {
  it('reads decimal and exponent notation, padded', () => {
    expect(parseNumberOption('2.4e-12', '--kerr-constant', 'a positive Kerr constant', 'positive')).toBe(2.4e-12);
    expect(parseNumberOption(' 5 ', '--gap-mm', 'a positive gap in mm', 'positive')).toBe(5);
    expect(parseNumberOption('.5', '--gap-mm', 'a positive gap in mm', 'positive')).toBe(0.5);
    expect(parseNumberOption('0', '--x', 'an offset', 'non-negative')).toBe(0);
    expect(parseNumberOption('-3', '--offset-s', 'an offset in seconds')).toBe(-3);
  });

  it('states what was expected, for which flag, what was received', () => {
    expect(lineOf(() => parseNumberOption('-4', '--gap-mm', 'a positive gap in mm', 'positive'))).toBe('expected a positive gap in mm for --gap-mm but received "-4"');
    expect(lineOf(() => parseNumberOption('0', '--gap-mm', 'a positive gap in mm', 'positive'))).toMatch(/expected a positive gap in mm for --gap-mm/);
    expect(lineOf(() => parseNumberOption('-0.1', '--x', 'a non-negative x', 'non-negative'))).toMatch(/for --x/);
    expect(lineOf(() => parseNumberOption('five', '--gap-mm', 'a gap', 'positive'))).toMatch(/received "five". Give a plain number/);
    expect(lineOf(() => parseNumberOption('2,5', '--gap-mm', 'a gap', 'positive'))).toMatch(/decimal point as a dot, e.g. 2.5/);
    expect(lineOf(() => parseNumberOption('1e999', '--gap-mm', 'a positive gap', 'positive'))).toMatch(/expected a positive gap/);
    // Number() would accept these; the shared rule does not.
    for (const bad of ['', '  ', '0x10', 'Infinity', '1_000', '5mm']) {
      expect(lineOf(() => parseNumberOption(bad, '--offset-s', 'an offset in seconds'))).toMatch(/for --offset-s/);
    }
  });
});

describe('parsePercentOption', () => {
  it('takes a number with an optional % sign', () => {
    expect(parsePercentOption('1', '--volts-accuracy', 'a percentage')).toBe(1);
    expect(parsePercentOption('0.5 %', '--volts-accuracy', 'a percentage')).toBe(0.5);
    expect(parsePercentOption('2%', '--volts-accuracy', 'a percentage')).toBe(2);
    expect(lineOf(() => parsePercentOption('%', '--volts-accuracy', 'a percentage'))).toMatch(/for --volts-accuracy/);
    expect(lineOf(() => parsePercentOption('1%%', '--volts-accuracy', 'a percentage'))).toMatch(/for --volts-accuracy/);
  });
});

describe('parseToleranceOption', () => {
  it('reads 40, 40±0.1, 40+-0.1 and 40+/-0.1', () => {
    expect(parseToleranceOption('40', '--length-mm', 'a length')).toEqual({ value: 40 });
    expect(parseToleranceOption('40±0.1', '--length-mm', 'a length')).toEqual({ value: 40, tolerance: 0.1 });
    expect(parseToleranceOption('40 +- 0.1', '--length-mm', 'a length')).toEqual({ value: 40, tolerance: 0.1 });
    expect(parseToleranceOption('40+/-0.1', '--length-mm', 'a length')).toEqual({ value: 40, tolerance: 0.1 });
  });
  it('rejects a bad value or tolerance naming the flag', () => {
    expect(lineOf(() => parseToleranceOption('forty', '--length-mm', 'a length in mm'))).toMatch(/^expected a length in mm, optionally with a tolerance \(e\.g\. 4±0\.05\) for --length-mm/);
    expect(lineOf(() => parseToleranceOption('40±x', '--gap-mm', 'a gap in mm'))).toMatch(/a tolerance in mm after ± .* for --gap-mm/);
    expect(lineOf(() => parseToleranceOption('40±-1', '--gap-mm', 'a gap in mm'))).toMatch(/for --gap-mm/);
    expect(lineOf(() => parseToleranceOption('0.4±x', '--open-level', 'a level', 'linear units'))).toMatch(/a tolerance in linear units after ±/);
  });
});

describe('parseWindowOption', () => {
  it('reads START:END in seconds', () => {
    expect(parseWindowOption('1.5:4', '--open-window')).toEqual([1.5, 4]);
    expect(parseWindowOption(' -1 : 2 ', '--open-window')).toEqual([-1, 2]);
  });
  it('rejects malformed windows and END not after START', () => {
    for (const bad of ['1.5', '1:2:3', 'a:b', '1.2.3:4', ':4']) {
      expect(lineOf(() => parseWindowOption(bad, '--open-window'))).toMatch(/^expected START:END in seconds of the video, e.g. 1.5:4 for --open-window/);
    }
    expect(lineOf(() => parseWindowOption('4:1', '--open-window'))).toMatch(/END after START .* for --open-window/);
  });
});

describe('parseWholeNumberOption', () => {
  it('reads integers inside the range', () => {
    expect(parseWholeNumberOption('8080', '--port', 'a port', 0, 65535)).toBe(8080);
    expect(parseWholeNumberOption('-7', '--seed', 'a whole number', -Number.MAX_SAFE_INTEGER, Number.MAX_SAFE_INTEGER)).toBe(-7);
  });
  it('rejects fractions, text and values out of range, with the hint when given', () => {
    expect(lineOf(() => parseWholeNumberOption('1.5', '--port', 'a port number from 0 to 65535', 0, 65535))).toBe('expected a port number from 0 to 65535 for --port but received "1.5"');
    expect(lineOf(() => parseWholeNumberOption('70000', '--port', 'a port', 0, 65535))).toMatch(/for --port/);
    expect(lineOf(() => parseWholeNumberOption('x', '--seed', 'a whole number', -10, 10, 'Give an integer seed, e.g. --seed 7'))).toMatch(/Give an integer seed/);
    expect(lineOf(() => parseWholeNumberOption('99999999999999999999', '--seed', 'a whole number', -Infinity, Infinity))).toMatch(/for --seed/);
  });
});

describe('parseRectOption and parseTransferOption (the shared region and transfer parsers)', () => {
  it('pass good values through and name the flag on bad ones', () => {
    expect(parseRectOption('10,20,30,40', '--roi')).toEqual({ x: 10, y: 20, w: 30, h: 40 });
    expect(lineOf(() => parseRectOption('10,20,30', '--dark-roi'), 'BAD_REGION')).toMatch(/--dark-roi/);
    expect(parseTransferOption('sRGB')).toBe('srgb');
    expect(parseTransferOption('gamma:2.2', '--transfer')).toBe('gamma:2.2');
    expect(lineOf(() => parseTransferOption('gamma', '--transfer'))).toMatch(/for --transfer/);
  });
});
