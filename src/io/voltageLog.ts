/**
 * Parse a high-voltage supply's log (CSV text) into SI arrays: time in s, voltage in V, and, when
 * present, current in A and temperature in °C. Pure: takes text, returns data or throws.
 *
 * Accepted format (docs/voltage-log.md is the user's version of this list):
 * - our one CSV dialect, shared with the photo map (csv/readCsvDialect): one header line, then one
 *   row per sample; LF, CRLF or CR line ends; a UTF-8 byte-order mark is skipped; blank lines and
 *   lines starting with `#` are skipped; a spreadsheet's `sep=;` first line sets the delimiter;
 *   otherwise comma, semicolon or tab, detected from the header and the first rows; a decimal
 *   comma is accepted when the delimiter is not a comma ("0,083;1,1364");
 * - time column `time`, `t`, `seconds`, `elapsed` (or `elapsed_time`, `sec`), or an ISO-8601
 *   `timestamp` (also `datetime`) column, whose times are then taken relative to the first row
 *   (the first row's text is kept as `absoluteStart`); a numeric timestamp column is read as Unix
 *   time in seconds (or ms with a `_ms` suffix); a unitless time column holding date-times is read
 *   as a timestamp column;
 * - voltage column `voltage`, `v`, `volts`, `hv` or `u`; optional current (`current`, `i`, `amps`)
 *   and temperature (`temp`, `temperature`, or `t` with a temperature unit such as `t_C`);
 * - units from a suffix (`_s`, `_ms`, `_kV`, `_uA`), brackets (`(s)`, `[kV]`) or a slash
 *   (`U / kV`); defaults s, V, A, °C; names and units are case-insensitive; cells may be padded
 *   with spaces and wrapped in quotes.
 * Code layout: the dialect in `csv/`, the column rules in voltageLog/logColumns, the rows in
 * voltageLog/readLogRows (row checks, log clock, cell reader), then voltageLog/mergeEqualTimes.
 *
 * Rows with equal times are averaged into one sample (counted in `duplicateTimes`); times that go
 * backwards are an error. Other columns are ignored with a warning.
 *
 * Throws KerrError BAD_CSV naming the file, the line (1-based, counting every physical line of the
 * text) and the column for: non-numeric cells, empty time or voltage cells, times that go
 * backwards, a header repeated inside the data, rows with too few cells, a missing time or voltage
 * column (the message lists the columns found and the accepted names), two columns for one
 * quantity, a unit that does not fit its column, fewer than 2 samples.
 *
 * @example parseVoltageLog('time_s,voltage_kV\n0,0\n0.1,1.5\n', 'volts.csv')
 *   → { timeS: [0, 0.1], voltageV: [0, 1500], rows: 2, delimiter: ',', ... }
 */
import { KerrError } from '../errors.js';
import { parseCsvNumber } from './csv/parseCsvNumber.js';
import { readCsvDialect, type CsvLayout } from './csv/readCsvDialect.js';
import { splitCsvCells } from './csv/splitCsvCells.js';
import { csvError, type Located } from './voltageLog/csvError.js';
import { largestGap } from './voltageLog/largestGap.js';
import { createLogCellReader } from './voltageLog/logCellReader.js';
import { createLogClock } from './voltageLog/logClock.js';
import { CURRENT_UNITS, readHeaderCell, resolveLogColumns, TEMPERATURE_UNITS, TIME_UNITS, VOLTAGE_UNITS, type HeaderCell, type LogColumns } from './voltageLog/logColumns.js';
import { mergeEqualTimes, type MergedLogSamples } from './voltageLog/mergeEqualTimes.js';
import { parseIsoInstant } from './voltageLog/parseIsoInstant.js';
import { formatTime, readLogRows } from './voltageLog/readLogRows.js';

export interface VoltageLog {
  /** Sample times, s, strictly increasing (log clock). */
  timeS: Float64Array;
  voltageV: Float64Array;
  /** A; NaN where the cell was empty. */
  currentA: Float64Array | null;
  /** °C; NaN where the cell was empty. */
  temperatureC: Float64Array | null;
  /** Samples after averaging rows with equal times (= timeS.length). */
  rows: number;
  /** Rows merged into an earlier row because they repeated its time. */
  duplicateTimes: number;
  /** Header cells as written (quotes and padding removed). */
  columns: { time: string; voltage: string; current: string | null; temperature: string | null };
  delimiter: ',' | ';' | '\t';
  decimalComma: boolean;
  /** The first row's timestamp text when the log has a timestamp column, else null. */
  absoluteStart: string | null;
  warnings: string[];
}

export function parseVoltageLog(text: string, fileName: string): VoltageLog {
  const layout = readCsvDialect(text, fileName);
  if (layout.header === null) {
    throw new KerrError('BAD_CSV', `${fileName} is empty: no header line and no data`, {
      path: fileName,
      hint: 'export the log as CSV with a header line such as time_s,voltage_kV',
    });
  }
  const at: Located = { file: fileName, line: layout.header.lineNo };
  const headerCells = readHeaderCells(layout, at);
  const firstRowCells = layout.rows.length > 0 ? splitCsvCells(layout.rows[0]!.text, layout.delimiter) : null;
  const columns = resolveLogColumns(headerCells, firstRowCells, at);
  const warnings = columnWarnings(columns, fileName);
  const { time, stamp, voltage, current, temperature } = columns;
  const cells = createLogCellReader(layout.decimalCommaAllowed);
  const timeScale = time !== null ? TIME_UNITS[time.unit ?? 's']! : stamp!.unit === 'ms' ? 1e-3 : 1;
  const clock = createLogClock(columns, timeScale, cells);
  const primaryTime = (time ?? stamp)!;
  const firstTimeIndex = Math.min(time?.index ?? Infinity, stamp?.index ?? Infinity);
  const raw = readLogRows(layout.rows, {
    columns,
    shape: { headerCells, primaryTime, firstTimeIndex, voltage, delimiter: layout.delimiter, decimalCommaAllowed: layout.decimalCommaAllowed },
    clock,
    cells,
    voltageScale: VOLTAGE_UNITS[voltage.unit ?? 'v']!,
    currentScale: current !== null ? CURRENT_UNITS[current.unit ?? 'a']! : 1,
    toCelsius: temperature !== null ? TEMPERATURE_UNITS[temperature.unit ?? 'c']! : (x: number) => x,
  }, fileName);
  const merged = mergeEqualTimes(raw);
  if (merged.rows < 2) {
    throw csvError(at, null, `only ${merged.rows} sample${merged.rows === 1 ? '' : 's'} with distinct times after the header`, 'a log needs at least 2 rows with different times; check that the right file was chosen');
  }
  warnings.push(...dataWarnings(merged, layout, cells.emptyOptional, cells.marks.comma && cells.marks.point, fileName));
  return {
    timeS: merged.timeS,
    voltageV: merged.voltageV,
    currentA: merged.currentA,
    temperatureC: merged.temperatureC,
    rows: merged.rows,
    duplicateTimes: merged.duplicateTimes,
    columns: { time: primaryTime.header, voltage: voltage.header, current: current?.header ?? null, temperature: temperature?.header ?? null },
    delimiter: layout.delimiter,
    decimalComma: cells.marks.comma,
    absoluteStart: clock.absoluteStart,
    warnings,
  };
}

/** The header's cells without trailing empty ones; BAD_CSV when they all read as numbers or times (no header). */
function readHeaderCells(layout: CsvLayout, at: Located): HeaderCell[] {
  const headerLine = layout.header!.text;
  const headerCells = splitCsvCells(headerLine, layout.delimiter).map(readHeaderCell);
  while (headerCells.length > 0 && headerCells[headerCells.length - 1]!.header === '') headerCells.pop();
  if (headerCells.length > 0 && headerCells.every((c) => !Number.isNaN(parseCsvNumber(c.header, layout.decimalCommaAllowed)) || parseIsoInstant(c.header) !== null)) {
    throw csvError(at, null, `the first line ${JSON.stringify(headerLine.trim())} holds numbers, not column names`, 'add a header line such as time_s,voltage_kV above the data');
  }
  return headerCells;
}

/** Warnings about the header: ignored columns, a current column without a unit. */
function columnWarnings(columns: LogColumns, fileName: string): string[] {
  const warnings: string[] = [];
  const { ignored, current } = columns;
  if (ignored.length > 0) warnings.push(`${fileName}: ignored column${ignored.length > 1 ? 's' : ''} ${ignored.map((s) => JSON.stringify(s)).join(', ')}`);
  if (current !== null && current.unit === null) warnings.push(`${fileName}: the current column ${JSON.stringify(current.header)} has no unit; read as amperes`);
  return warnings;
}

/** Warnings about the rows: repeated times, blank lines, empty optional cells, mixed decimal marks, a large gap. */
function dataWarnings(merged: MergedLogSamples, layout: CsvLayout, emptyOptional: number, mixedMarks: boolean, fileName: string): string[] {
  const warnings: string[] = [];
  const { duplicateTimes } = merged;
  const blankInside = layout.blankInside;
  if (duplicateTimes > 0) warnings.push(`${fileName}: ${duplicateTimes} row${duplicateTimes > 1 ? 's' : ''} repeated an earlier time; rows with equal times were averaged`);
  if (blankInside > 0) warnings.push(`${fileName}: ${blankInside} blank line${blankInside > 1 ? 's' : ''} inside the data were skipped`);
  if (emptyOptional > 0) warnings.push(`${fileName}: ${emptyOptional} empty current or temperature cell${emptyOptional > 1 ? 's' : ''} read as missing`);
  if (mixedMarks) warnings.push(`${fileName}: both decimal commas and decimal points occur; both were read as decimal marks`);
  const gap = largestGap(merged.timeS);
  if (gap !== null) {
    warnings.push(`${fileName}: a gap of ${formatTime(gap.gapS)} s in the log ends at line ${merged.lineOf[gap.index]} (typical interval ${formatTime(gap.medianS)} s); voltages inside it are interpolated linearly`);
  }
  return warnings;
}
