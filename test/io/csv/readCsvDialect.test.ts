// The rules checked here are our own dialect (docs/voltage-log.md, "The CSV dialect"); the quoting
// rule ("" inside quotes is one quote, quotes protect the delimiter) is RFC 4180's, and `sep=X`
// is the spreadsheet convention (common practice). Expected values are worked by hand.
import { describe, expect, it } from 'vitest';
import { readCsvDialect } from '../../../src/io/csv/readCsvDialect.js';
import { countOutsideQuotes, splitCsvCells, unquoteCell } from '../../../src/io/csv/splitCsvCells.js';
import { parseCsvNumber, type DecimalMarks } from '../../../src/io/csv/parseCsvNumber.js';
import { KerrError } from '../../../src/errors.js';

describe('readCsvDialect', () => {
  it('skips a BOM, blank and comment lines; numbers lines physically across LF, CRLF and CR', () => {
    const layout = readCsvDialect('\uFEFF# logger v2\r\n\r\ntime_s,voltage_V\r\n0,1\n\n# note\r2,3\n\n', 'a.csv');
    expect(layout.header).toEqual({ lineNo: 3, text: 'time_s,voltage_V' });
    expect(layout.rows).toEqual([
      { lineNo: 4, text: '0,1' },
      { lineNo: 7, text: '2,3' },
    ]);
    expect(layout.delimiter).toBe(',');
    expect(layout.decimalCommaAllowed).toBe(false);
    expect(layout.blankInside).toBe(1); // line 5; the trailing blank lines are not inside the data
  });

  it('detects tab, then semicolon, then comma, from the header and the first rows', () => {
    expect(readCsvDialect('t\tv\n0\t1\n', 'a').delimiter).toBe('\t');
    const semi = readCsvDialect('t;v\n0,5;1,25\n', 'a');
    expect(semi.delimiter).toBe(';');
    expect(semi.decimalCommaAllowed).toBe(true);
    // The header holds both ';' and ',', but only ',' splits the rows like the header.
    expect(readCsvDialect('time;s,voltage\n0,1\n1,2\n', 'a').delimiter).toBe(',');
    // A row may end in extra empty cells and still agree with the header.
    expect(readCsvDialect('t;v\n0;1;;\n', 'a').delimiter).toBe(';');
    // None present (a one-column header): a comma.
    expect(readCsvDialect('file\nx\n', 'a').delimiter).toBe(',');
  });

  it('takes the delimiter from a sep= line and rejects one it does not know', () => {
    const layout = readCsvDialect('sep=;\nt,x;v\n0,1;2\n', 'a.csv');
    expect(layout.delimiter).toBe(';');
    expect(layout.header!.lineNo).toBe(2);
    let caught: unknown;
    try {
      readCsvDialect('sep=|\nt|v\n', 'a.csv');
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(KerrError);
    expect((caught as KerrError).code).toBe('BAD_CSV');
    expect((caught as KerrError).message).toBe('a.csv line 1: the delimiter line asks for "|"');
  });

  it('gives no header for an empty text or one of blanks and comments only', () => {
    expect(readCsvDialect('', 'a').header).toBeNull();
    expect(readCsvDialect('\n  \n# only a comment\n', 'a').header).toBeNull();
  });
});

describe('splitCsvCells and unquoteCell', () => {
  it('keeps a quoted delimiter inside its cell and "" as a quote (RFC 4180)', () => {
    expect(splitCsvCells('"a,b", 2,"say ""hi"""', ',')).toEqual(['"a,b"', ' 2', '"say ""hi"""']);
    expect(splitCsvCells('"a,b", 2,"say ""hi"""', ',').map(unquoteCell)).toEqual(['a,b', '2', 'say "hi"']);
    expect(unquoteCell(" 'x.jpg' ")).toBe('x.jpg');
    expect(countOutsideQuotes('a;"b;c";d', ';')).toBe(2);
  });
});

describe('parseCsvNumber', () => {
  it('reads plain numbers, padded or quoted, and a decimal comma only when allowed', () => {
    const marks: DecimalMarks = { comma: false, point: false };
    expect(parseCsvNumber(' "0,083" ', true, marks)).toBe(0.083);
    expect(marks).toEqual({ comma: true, point: false });
    expect(parseCsvNumber('1.5e3', false, marks)).toBe(1500);
    expect(marks.point).toBe(true);
    expect(parseCsvNumber('-.5', false)).toBe(-0.5);
    expect(parseCsvNumber('0,083', false)).toBeNaN();
  });
  it('rejects anything else: empty, text, a unit, hex, infinity, a thousands separator, a bare exponent', () => {
    for (const bad of ['', ' ', 'abc', '12kV', '0x10', 'Infinity', '1,234.5', '1e', '.', '+', '1.2.3']) {
      expect(parseCsvNumber(bad, true), bad).toBeNaN();
    }
  });
});
