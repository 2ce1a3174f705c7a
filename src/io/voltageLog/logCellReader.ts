/**
 * Reads the number cells of a voltage log's rows with one rule: an empty required cell (time,
 * voltage) is an error, an empty optional cell (current, temperature) is NaN and counted in
 * `emptyOptional`; a cell that is not a number in our CSV dialect (parseCsvNumber) is an error
 * whose hint explains decimal commas when the delimiter is a comma. Which decimal marks occurred
 * is collected in `marks`. Values come back in the column's own unit (the caller scales them).
 *
 * Throws KerrError BAD_CSV (via csvError) naming the line, the column and its header.
 * @example const r = createLogCellReader(true); r.read(['0', '1,5'], voltageColumn, at, false) // 1.5
 */
import { parseCsvNumber, type DecimalMarks } from '../csv/parseCsvNumber.js';
import { unquoteCell } from '../csv/splitCsvCells.js';
import { csvError, type Located } from './csvError.js';
import type { Column } from './logColumns.js';

export interface LogCellReader {
  read(cells: string[], column: Column, here: Located, optional: boolean): number;
  readonly marks: DecimalMarks;
  /** Empty optional cells read so far. */
  readonly emptyOptional: number;
  readonly decimalCommaAllowed: boolean;
}

export function createLogCellReader(decimalCommaAllowed: boolean): LogCellReader {
  const marks: DecimalMarks = { comma: false, point: false };
  let emptyOptional = 0;
  const read = (cells: string[], column: Column, here: Located, optional: boolean): number => {
    const cell = column.index < cells.length ? unquoteCell(cells[column.index]) : '';
    if (cell === '') {
      if (optional) {
        emptyOptional++;
        return Number.NaN;
      }
      throw csvError(here, column.index + 1, `the ${column.role} cell (${column.header}) is empty`, 'fill in or delete the row');
    }
    const parsed = parseCsvNumber(cell, decimalCommaAllowed, marks);
    if (Number.isNaN(parsed)) {
      const commaHint = !decimalCommaAllowed && cell.includes(',')
        ? 'with commas between cells the decimal mark must be a point; export with a semicolon or tab delimiter to keep decimal commas'
        : 'correct the cell or delete the row';
      throw csvError(here, column.index + 1, `${JSON.stringify(cell)} in the ${column.role} column (${column.header}) is not a number`, commaHint);
    }
    return parsed;
  };
  return {
    read,
    marks,
    get emptyOptional() {
      return emptyOptional;
    },
    decimalCommaAllowed,
  };
}
