/**
 * Checks one data row of a voltage log against its header before any cell is read:
 * - a row whose time cell is neither a number nor a date-time and whose cells read as column names
 *   (the whole header again, or a time and a voltage name in those columns) is a header repeated
 *   inside the data (a logger restarted);
 * - the row must reach the time and voltage columns;
 * - cells beyond the header's columns must be empty (a decimal comma in a comma-separated file
 *   shows up here).
 * Throws KerrError BAD_CSV (via csvError) naming the line and, where it helps, the column.
 * @example checkLogRowShape(['0', '1.5'], shape, { file: 'log.csv', line: 2 }) // returns nothing
 */
import { parseCsvNumber } from '../csv/parseCsvNumber.js';
import { unquoteCell, type CsvDelimiter } from '../csv/splitCsvCells.js';
import { csvError, type Located } from './csvError.js';
import { readHeaderCell, roleOf, type Column, type HeaderCell } from './logColumns.js';
import { parseIsoInstant } from './parseIsoInstant.js';

export interface LogRowShape {
  headerCells: HeaderCell[];
  /** The time (or timestamp) column and the voltage column. */
  primaryTime: Column;
  /** The leftmost time or timestamp column (the repeated-header test looks there). */
  firstTimeIndex: number;
  voltage: Column;
  delimiter: CsvDelimiter;
  decimalCommaAllowed: boolean;
}

export function checkLogRowShape(cells: string[], shape: LogRowShape, here: Located): void {
  const { headerCells, primaryTime, voltage, delimiter } = shape;
  const timeCell = primaryTime.index < cells.length ? cells[primaryTime.index] : '';
  const timeReadable = !Number.isNaN(parseCsvNumber(timeCell, shape.decimalCommaAllowed)) || parseIsoInstant(timeCell) !== null;
  if (!timeReadable && looksLikeHeader(cells, shape)) {
    throw csvError(here, null, `line ${here.line} looks like a header repeated inside the data`, 'delete that line; if the logger restarted there, keep one run per file');
  }
  const needed = Math.max(primaryTime.index, voltage.index) + 1;
  if (cells.length < needed) {
    const want = delimiter === '\t' ? 'tab' : JSON.stringify(delimiter);
    const missingTime = cells.length <= primaryTime.index;
    throw csvError(here, cells.length + 1, `the row has ${cells.length} cell${cells.length === 1 ? '' : 's'} but the ${missingTime ? 'time' : 'voltage'} column is column ${missingTime ? primaryTime.index + 1 : voltage.index + 1}`, `separate every cell with a ${want} as in the header`);
  }
  for (let extra = headerCells.length; extra < cells.length; extra++) {
    if (unquoteCell(cells[extra]) !== '') {
      const hint = delimiter === ','
        ? 'remove the extra cells or name the column in the header; a decimal comma needs a semicolon or tab between cells'
        : 'remove the extra cells or name the column in the header';
      throw csvError(here, extra + 1, `the row has ${cells.length} cells but the header names ${headerCells.length}`, hint);
    }
  }
}

/** True when the cells of a data line read as column names (a header repeated in the data). */
function looksLikeHeader(cells: string[], shape: LogRowShape): boolean {
  const same = shape.headerCells.every((h, i) => i < cells.length && unquoteCell(cells[i]).toLowerCase() === h.header.toLowerCase());
  if (same) return true;
  const timeIndex = shape.firstTimeIndex;
  const voltage = shape.voltage;
  if (timeIndex >= cells.length || voltage.index >= cells.length) return false;
  const timeRole = roleOf(readHeaderCell(cells[timeIndex]));
  const voltageRole = roleOf(readHeaderCell(cells[voltage.index]));
  return (timeRole === 'time' || timeRole === 'timestamp') && voltageRole === 'voltage';
}
