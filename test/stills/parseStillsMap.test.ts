import { describe, expect, it } from 'vitest';
import { parseStillsMap } from '../../src/stills/parseStillsMap.js';
import { isKerrError } from '../../src/errors.js';

function lineOf(fn: () => unknown): string {
  try {
    fn();
  } catch (e) {
    if (isKerrError(e)) {
      expect(e.code).toBe('BAD_CSV');
      return e.oneLine();
    }
    throw e;
  }
  throw new Error('expected a KerrError');
}

describe('parseStillsMap', () => {
  it('accepts every voltage header spelling of the voltage log, with units', () => {
    const headers: Array<[string, number]> = [
      ['voltage', 1], ['v', 1], ['volts', 1], ['hv', 1], ['u', 1], ['Voltage_V', 1], ['voltage_kV', 1000], ['U (kV)', 1000], ['hv [kV]', 1000], ['V [V]', 1], ['volts kV', 1000],
    ];
    for (const [h, scale] of headers) {
      const m = parseStillsMap(`file,${h}\na.jpg,1.5\n`, 'volts.csv');
      expect(m.voltageByFile.get('a.jpg')!.voltageV).toBeCloseTo(1.5 * scale, 9);
      expect(m.voltageUnit).toBe(scale === 1000 ? 'kV' : 'V');
    }
  });

  it('semicolon with decimal comma, tab, BOM, CRLF, quotes, blank lines and a note column', () => {
    const semi = parseStillsMap('\uFEFFFile;U [kV];note\r\n"step 1.jpg";0,5;first\r\n\r\nstep2.jpg;1,25;\r\n', 'm.csv');
    expect(semi.delimiter).toBe(';');
    expect(semi.decimalComma).toBe(true);
    expect([...semi.voltageByFile.entries()].map(([f, e]) => [f, e.voltageV, e.line])).toEqual([['step 1.jpg', 500, 2], ['step2.jpg', 1250, 4]]);
    const tab = parseStillsMap('photo\tvolts\nx.png\t300\n', 't.tsv');
    expect(tab.delimiter).toBe('\t');
    expect(tab.voltageByFile.get('x.png')!.voltageV).toBe(300);
  });

  it('follows the one CSV dialect shared with the voltage log: comments, a sep= line, CR line ends', () => {
    // Our own dialect (src/io/csv/readCsvDialect, docs/voltage-log.md "The CSV dialect").
    const m = parseStillsMap('# shot list\rsep=;\rfile;voltage_kV\r# first\ra.jpg;1,5\r', 'm.csv');
    expect(m.delimiter).toBe(';');
    expect([...m.voltageByFile.entries()].map(([f, e]) => [f, e.voltageV, e.line])).toEqual([['a.jpg', 1500, 5]]);
  });

  it('accepts a file repeated with the same voltage and counts it', () => {
    const m = parseStillsMap('file,voltage\na.jpg,100\na.jpg,100\nb.jpg,200\n', 'm.csv');
    expect(m.duplicates).toBe(1);
    expect(m.voltageByFile.size).toBe(2);
  });

  it('errors name the file, line and column', () => {
    expect(lineOf(() => parseStillsMap('file,voltage\na.jpg,100\na.jpg,150\n', 'm.csv'))).toMatch(/^m\.csv:3: a\.jpg is given two different voltages, 100 V \(line 2\) and 150 V \(line 3\)/);
    expect(lineOf(() => parseStillsMap('file,voltage\na.jpg,12kV\n', 'm.csv'))).toMatch(/^m\.csv:2:2: the voltage "12kV" for a\.jpg is not a number/);
    expect(lineOf(() => parseStillsMap('name,voltage\na.jpg,1\n', 'm.csv'))).toMatch(/^m\.csv:1:1: unknown column "name". Accepted columns/);
    expect(lineOf(() => parseStillsMap('file,time\na.jpg,1\n', 'm.csv'))).toMatch(/unknown column "time"/);
    expect(lineOf(() => parseStillsMap('file\na.jpg\n', 'm.csv'))).toMatch(/no voltage column among the columns found \("file"\)/);
    expect(lineOf(() => parseStillsMap('file,voltage\n', 'm.csv'))).toMatch(/has a header but no rows/);
    expect(lineOf(() => parseStillsMap('', 'm.csv'))).toMatch(/is empty/);
    expect(lineOf(() => parseStillsMap('file,voltage\n,5\n', 'm.csv'))).toMatch(/^m\.csv:2:1: empty file name/);
  });
});
