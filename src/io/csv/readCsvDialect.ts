/**
 * Reads the layout of a CSV text in our one dialect, shared by the voltage log and the photo map
 * (user's version: docs/voltage-log.md, "The CSV dialect"). Pure: text in, lines out.
 *
 * Rules:
 * - a UTF-8 byte-order mark at the start is skipped; lines end in LF, CRLF or CR;
 * - blank lines (only spaces) and comment lines (first non-space character `#`) are skipped
 *   anywhere; blank lines between the header and the last row are counted (`blankInside`);
 * - the header is the first line that is neither; a spreadsheet's `sep=X` line before it sets the
 *   delimiter (X a comma, semicolon or tab);
 * - otherwise the delimiter is detected: among tab, semicolon and comma present in the header
 *   (outside quotes), in that order, the first that splits the header and the first 5 rows into
 *   the same number of cells (a row may have extra empty cells); failing that the first present;
 *   a comma when none is;
 * - a decimal comma is allowed in numbers when the delimiter is not a comma;
 * - cells are cut by splitCsvCells (double quotes protect the delimiter, `""` is a quote) and
 *   numbers read by parseCsvNumber.
 * Line numbers are 1-based and count every physical line of the text.
 *
 * Throws KerrError BAD_CSV (naming the file and line) when the `sep=` line asks for another
 * delimiter. An empty text (no header) gives `header: null`; the caller says what it expected.
 * @example readCsvDialect('sep=;\ntime_s;voltage_kV\n0;1,5\n', 'log.csv')
 *   → { header: { lineNo: 2, text: 'time_s;voltage_kV' }, rows: [{ lineNo: 3, text: '0;1,5' }], delimiter: ';', decimalCommaAllowed: true, blankInside: 0 }
 */
import { KerrError } from '../../errors.js';
import { countOutsideQuotes, splitCsvCells, type CsvDelimiter } from './splitCsvCells.js';

export interface CsvLine {
  /** 1-based physical line number. */
  lineNo: number;
  text: string;
}

export interface CsvLayout {
  header: CsvLine | null;
  /** Data lines after the header, blank and comment lines left out. */
  rows: CsvLine[];
  delimiter: CsvDelimiter;
  decimalCommaAllowed: boolean;
  /** Blank lines between the header and the last data row. */
  blankInside: number;
}

const skipped = (line: string): boolean => line.trim() === '' || line.trimStart().startsWith('#');

export function readCsvDialect(text: string, fileName: string): CsvLayout {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const lines = body.split(/\r\n|\n|\r/);
  let index = 0;
  let forced: CsvDelimiter | null = null;
  while (index < lines.length && skipped(lines[index])) index++;
  const sep = index < lines.length ? /^\s*sep=(.)\s*$/i.exec(lines[index]) : null;
  if (sep) {
    const d = sep[1];
    if (d !== ',' && d !== ';' && d !== '\t') {
      throw new KerrError('BAD_CSV', `${fileName} line ${index + 1}: the delimiter line asks for ${JSON.stringify(d)}`, {
        path: `${fileName}:${index + 1}`,
        hint: 'use a comma, a semicolon or a tab between cells',
      });
    }
    forced = d;
    index++;
    while (index < lines.length && skipped(lines[index])) index++;
  }
  if (index >= lines.length) return { header: null, rows: [], delimiter: forced ?? ',', decimalCommaAllowed: forced !== null && forced !== ',', blankInside: 0 };
  const header: CsvLine = { lineNo: index + 1, text: lines[index] };
  const rows: CsvLine[] = [];
  let blankInside = 0;
  let pendingBlank = 0;
  for (let i = index + 1; i < lines.length; i++) {
    if (lines[i].trim() === '') {
      pendingBlank++;
      continue;
    }
    if (lines[i].trimStart().startsWith('#')) continue;
    blankInside += pendingBlank;
    pendingBlank = 0;
    rows.push({ lineNo: i + 1, text: lines[i] });
  }
  const delimiter = forced ?? detectDelimiter(header.text, rows.slice(0, 5).map((r) => r.text));
  return { header, rows, delimiter, decimalCommaAllowed: delimiter !== ',', blankInside };
}

/**
 * Among tab, semicolon and comma present in the header, the one that splits the header and the
 * first data lines into the same number of cells (tab, then semicolon first).
 */
function detectDelimiter(header: string, dataLines: string[]): CsvDelimiter {
  const candidates: CsvDelimiter[] = ['\t', ';', ','];
  const present = candidates.filter((d) => countOutsideQuotes(header, d) > 0);
  for (const d of present) {
    const n = countOutsideQuotes(header, d) + 1;
    const consistent = dataLines.every((l) => {
      const m = countOutsideQuotes(l, d) + 1;
      return m === n || (m > n && splitCsvCells(l, d).slice(n).every((c) => c.trim() === ''));
    });
    if (consistent) return d;
  }
  return present[0] ?? ',';
}
