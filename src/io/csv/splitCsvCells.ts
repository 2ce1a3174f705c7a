/**
 * Cell splitting for our CSV dialect (docs/voltage-log.md, "The CSV dialect"): a line is cut at
 * each delimiter outside double quotes; a quoted cell may hold the delimiter, and `""` inside
 * quotes stands for one quote. The cells come back raw (padding and quotes kept), so a caller can
 * still tell an empty cell from `""`; `unquoteCell` then trims the padding and removes one pair of
 * surrounding double or single quotes (turning `""` inside back into `"`).
 * `countOutsideQuotes` counts a character outside double quotes (for delimiter detection).
 * @example splitCsvCells('"a,b", 2', ',') // ['"a,b"', ' 2']; unquoteCell(' "a,b" ') // 'a,b'
 */
export type CsvDelimiter = ',' | ';' | '\t';

export function splitCsvCells(line: string, delimiter: CsvDelimiter): string[] {
  if (!line.includes('"')) return line.split(delimiter);
  const cells: string[] = [];
  let current = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i];
    if (ch === '"') {
      if (quoted && line[i + 1] === '"') {
        current += '""';
        i++;
      } else {
        quoted = !quoted;
        current += ch;
      }
    } else if (ch === delimiter && !quoted) {
      cells.push(current);
      current = '';
    } else {
      current += ch;
    }
  }
  cells.push(current);
  return cells;
}

export function unquoteCell(cell: string): string {
  let s = cell.trim();
  if (s.length >= 2 && ((s.startsWith('"') && s.endsWith('"')) || (s.startsWith("'") && s.endsWith("'")))) {
    s = s.slice(1, -1).replace(/""/g, '"').trim();
  }
  return s;
}

export function countOutsideQuotes(line: string, ch: string): number {
  let n = 0;
  let quoted = false;
  for (const c of line) {
    if (c === '"') quoted = !quoted;
    else if (c === ch && !quoted) n++;
  }
  return n;
}
