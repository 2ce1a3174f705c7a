/**
 * The time of each voltage-log row, in s on the log's own clock.
 *
 * - A numeric time column: the cell times its unit's scale (s, ms, us, min).
 * - A timestamp column of ISO-8601 text: seconds after the first row's time (whole seconds and
 *   fractions subtracted apart, for precision); every row must have a zone or none, like the first.
 * - A numeric timestamp column: Unix time in s (or ms with an `_ms` unit), relative to the first
 *   row. One file may not mix text and numbers.
 * `absoluteStart` is the first row's timestamp as written (ISO text) or as an ISO string (Unix
 * time); null without a timestamp column.
 *
 * Throws KerrError BAD_CSV (via csvError) for an empty timestamp, mixed styles or zones, and a cell
 * that is neither a time nor a number.
 * @example const clock = createLogClock(columns, 1, cells); clock.timeOf(cells, at) // 0.25
 */
import { parseCsvNumber } from '../csv/parseCsvNumber.js';
import { unquoteCell } from '../csv/splitCsvCells.js';
import { csvError, type Located } from './csvError.js';
import type { LogCellReader } from './logCellReader.js';
import type { Column, LogColumns } from './logColumns.js';
import { parseIsoInstant, type IsoInstant } from './parseIsoInstant.js';

export interface LogClock {
  /** The row's time, s, relative to the first row for timestamps. */
  timeOf(cells: string[], here: Located): number;
  /** The first row's timestamp (see above), or null. */
  readonly absoluteStart: string | null;
}

export function createLogClock(columns: LogColumns, timeScale: number, cellReader: LogCellReader): LogClock {
  const { time, stamp } = columns;
  let absoluteStart: string | null = null;
  let firstStamp: IsoInstant | null = null;
  let firstEpochS: number | null = null;

  const stampTime = (column: Column, cells: string[], here: Located): number => {
    const cell = unquoteCell(cells[column.index]);
    if (cell === '') throw csvError(here, column.index + 1, `the timestamp cell (${column.header}) is empty`, 'fill in or delete the row');
    const iso = parseIsoInstant(cell);
    if (iso !== null) {
      if (firstStamp === null) {
        if (firstEpochS !== null) throw csvError(here, column.index + 1, `${JSON.stringify(cell)} mixes ISO-8601 text with numeric timestamps`, 'use one timestamp style for the whole file');
        firstStamp = iso;
      } else if (iso.zoned !== firstStamp.zoned) {
        throw csvError(here, column.index + 1, `${JSON.stringify(cell)} ${iso.zoned ? 'has' : 'lacks'} a time zone, unlike the first row`, 'give every timestamp the same form, e.g. 2024-05-01T12:00:00.250Z');
      }
      return iso.wholeS - firstStamp.wholeS + (iso.fracS - firstStamp.fracS);
    }
    const parsed = parseCsvNumber(cell, cellReader.decimalCommaAllowed, cellReader.marks);
    if (Number.isNaN(parsed) || firstStamp !== null) {
      throw csvError(here, column.index + 1, `${JSON.stringify(cell)} in the timestamp column (${column.header}) is neither an ISO-8601 time nor a number`, 'write timestamps like 2024-05-01T12:00:00.250Z, or use a time_s column');
    }
    const epochS = parsed * timeScale;
    if (firstEpochS === null) firstEpochS = epochS;
    return epochS - firstEpochS;
  };

  const noteStart = (cells: string[]): void => {
    if (absoluteStart !== null || stamp === null || stamp.index >= cells.length) return;
    const cell = unquoteCell(cells[stamp.index]);
    if (cell === '') return;
    const epoch = parseIsoInstant(cell) === null ? parseCsvNumber(cell, cellReader.decimalCommaAllowed) : Number.NaN;
    absoluteStart = Number.isNaN(epoch) ? cell : new Date(epoch * (stamp.unit === 'ms' ? 1 : 1000)).toISOString();
  };

  return {
    timeOf(cells, here) {
      const t = time !== null ? cellReader.read(cells, time, here, false) * timeScale : stampTime(stamp!, cells, here);
      noteStart(cells);
      return t;
    },
    get absoluteStart() {
      return absoluteStart;
    },
  };
}
