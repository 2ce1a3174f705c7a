/**
 * Reads the data rows of a voltage log into raw SI samples in file order: time (s, log clock),
 * voltage (V), and when those columns exist current (A, NaN for an empty cell) and temperature
 * (°C, NaN for an empty cell), with each sample's line number. Each row is checked first
 * (checkLogRowShape); times are read by the log clock (logClock), numbers by the cell reader.
 *
 * Throws KerrError BAD_CSV (via csvError) for a bad row or cell, and when time goes backwards
 * (naming both lines).
 * @example readLogRows(layout.rows, plan, 'log.csv').count // number of data rows
 */
import type { CsvLine } from '../csv/readCsvDialect.js';
import { splitCsvCells } from '../csv/splitCsvCells.js';
import { checkLogRowShape, type LogRowShape } from './checkLogRowShape.js';
import { csvError, type Located } from './csvError.js';
import type { LogCellReader } from './logCellReader.js';
import type { LogClock } from './logClock.js';
import type { LogColumns } from './logColumns.js';

export interface RawLogSamples {
  timeS: Float64Array;
  voltageV: Float64Array;
  currentA: Float64Array | null;
  temperatureC: Float64Array | null;
  /** 1-based line of each sample. */
  lineOf: Int32Array;
  /** Samples read (the arrays may be longer). */
  count: number;
}

export interface LogRowPlan {
  columns: LogColumns;
  shape: LogRowShape;
  clock: LogClock;
  cells: LogCellReader;
  voltageScale: number;
  currentScale: number;
  toCelsius: (x: number) => number;
}

export function readLogRows(rows: CsvLine[], plan: LogRowPlan, fileName: string): RawLogSamples {
  const { columns, shape } = plan;
  const capacity = rows.length;
  const out: RawLogSamples = {
    timeS: new Float64Array(capacity),
    voltageV: new Float64Array(capacity),
    currentA: columns.current !== null ? new Float64Array(capacity) : null,
    temperatureC: columns.temperature !== null ? new Float64Array(capacity) : null,
    lineOf: new Int32Array(capacity),
    count: 0,
  };
  for (const row of rows) {
    const here: Located = { file: fileName, line: row.lineNo };
    const cells = splitCsvCells(row.text, shape.delimiter);
    checkLogRowShape(cells, shape, here);
    const t = plan.clock.timeOf(cells, here);
    const count = out.count;
    out.timeS[count] = t;
    out.voltageV[count] = plan.cells.read(cells, columns.voltage, here, false) * plan.voltageScale;
    if (out.currentA !== null) out.currentA[count] = plan.cells.read(cells, columns.current!, here, true) * plan.currentScale;
    if (out.temperatureC !== null) out.temperatureC[count] = plan.toCelsius(plan.cells.read(cells, columns.temperature!, here, true));
    out.lineOf[count] = row.lineNo;
    if (count > 0 && t < out.timeS[count - 1]) {
      throw csvError(here, shape.primaryTime.index + 1, `time goes backwards: ${formatTime(t)} s after ${formatTime(out.timeS[count - 1])} s on line ${out.lineOf[count - 1]}`, 'sort the rows by time, or keep one recording per file');
    }
    out.count++;
  }
  return out;
}

/** Six significant figures, no trailing zeros (for messages). */
export function formatTime(s: number): string {
  return Number(s.toPrecision(6)).toString();
}
