/**
 * Parse a high-voltage supply's log (CSV text) into SI arrays: time in s, voltage in V, and, when
 * present, current in A and temperature in °C. Pure: takes text, returns data or throws.
 *
 * Accepted format (docs/voltage-log.md is the user's version of this list):
 * - one header line, then one row per sample; LF or CRLF line ends; a UTF-8 byte-order mark is
 *   skipped; blank lines and lines starting with `#` are skipped; an Excel `sep=;` first line sets
 *   the delimiter;
 * - delimiter comma, semicolon or tab, detected from the header and the first rows; a decimal
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

type Delimiter = ',' | ';' | '\t';
type Role = 'time' | 'timestamp' | 'voltage' | 'current' | 'temperature';

const TIME_NAMES = ['time', 't', 'seconds', 'elapsed', 'elapsed_time', 'sec'];
const TIMESTAMP_NAMES = ['timestamp', 'datetime', 'date_time'];
const VOLTAGE_NAMES = ['voltage', 'v', 'volts', 'volt', 'hv', 'u'];
const CURRENT_NAMES = ['current', 'i', 'amps', 'ampere'];
const TEMPERATURE_NAMES = ['temp', 'temperature'];

const TIME_UNITS: Record<string, number> = { s: 1, sec: 1, secs: 1, second: 1, seconds: 1, ms: 1e-3, msec: 1e-3, us: 1e-6, min: 60 };
const VOLTAGE_UNITS: Record<string, number> = { v: 1, volt: 1, volts: 1, kv: 1e3, mv: 1e-3 };
const CURRENT_UNITS: Record<string, number> = { a: 1, amp: 1, amps: 1, ma: 1e-3, ua: 1e-6, na: 1e-9 };
/** Temperature units as conversions to °C. */
const TEMPERATURE_UNITS: Record<string, (x: number) => number> = {
  c: (x) => x,
  celsius: (x) => x,
  k: (x) => x - 273.15,
  f: (x) => ((x - 32) * 5) / 9,
};

const ACCEPTED_TIME = 'time, t, time_s, time_ms, seconds, elapsed, or an ISO-8601 timestamp column';
const ACCEPTED_VOLTAGE = 'voltage, v, volts, hv or u, with an optional unit such as voltage_kV or U [kV]';

const ISO_RE = /^(\d{4})-(\d{2})-(\d{2})[Tt ](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d+))?)?\s*([Zz]|[+-]\d{2}(?::?\d{2})?)?$/;

interface HeaderCell {
  header: string; // as written, quotes and padding removed
  name: string; // normalised name without unit
  unit: string | null; // normalised unit
}

interface Column {
  role: Role;
  index: number;
  header: string;
  unit: string | null;
}

interface Located {
  file: string;
  line: number;
}

function csvError(at: Located, column: number | null, message: string, hint: string): KerrError {
  const where = column === null ? `${at.file} line ${at.line}` : `${at.file} line ${at.line}, column ${column}`;
  const path = column === null ? `${at.file}:${at.line}` : `${at.file}:${at.line}:${column}`;
  return new KerrError('BAD_CSV', `${where}: ${message}`, { path, hint });
}

function unquote(cell: string): string {
  let s = cell.trim();
  if (s.length >= 2 && ((s.startsWith('"') && s.endsWith('"')) || (s.startsWith("'") && s.endsWith("'")))) {
    s = s.slice(1, -1).replace(/""/g, '"').trim();
  }
  return s;
}

/** Split one line into cells, honouring double quotes (a quoted cell may contain the delimiter). */
function splitCells(line: string, delimiter: Delimiter): string[] {
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

function normaliseUnit(unit: string): string {
  return unit
    .toLowerCase()
    .replace(/[µμ]/g, 'u')
    .replace(/[°º]/g, '')
    .replace(/^deg\s*_?/, '')
    .replace(/\s+/g, '');
}

function isKnownUnit(unit: string): boolean {
  const u = normaliseUnit(unit);
  return u in TIME_UNITS || u in VOLTAGE_UNITS || u in CURRENT_UNITS || u in TEMPERATURE_UNITS;
}

/** Split a header cell into a normalised name and unit: `U [kV]`, `time(s)`, `U / kV`, `current_uA`. */
function readHeaderCell(raw: string): HeaderCell {
  const header = unquote(raw);
  const lower = header.toLowerCase().replace(/[µμ]/g, 'u');
  let name = lower;
  let unit: string | null = null;
  const bracket = /^(.*?)\s*[[(]\s*([^\])]*?)\s*[\])]$/.exec(lower);
  const slash = /^(.+?)\s*\/\s*([^\s/]+)$/.exec(lower);
  const suffix = /^(.+?)[_\s-]+([a-z°º]+)$/.exec(lower);
  if (bracket) {
    name = bracket[1];
    unit = bracket[2];
  } else if (slash) {
    name = slash[1];
    unit = slash[2];
  } else if (suffix && isKnownUnit(suffix[2])) {
    name = suffix[1];
    unit = suffix[2];
  }
  name = name.trim().replace(/[\s-]+/g, '_');
  return { header, name, unit: unit === null || unit === '' ? null : normaliseUnit(unit) };
}

function roleOf(cell: HeaderCell): Role | null {
  const { name, unit } = cell;
  if (name === 't') return unit !== null && unit in TEMPERATURE_UNITS ? 'temperature' : 'time';
  if (TIME_NAMES.includes(name)) return 'time';
  if (TIMESTAMP_NAMES.includes(name)) return 'timestamp';
  if (VOLTAGE_NAMES.includes(name)) return 'voltage';
  if (CURRENT_NAMES.includes(name)) return 'current';
  if (TEMPERATURE_NAMES.includes(name)) return 'temperature';
  return null;
}

const UNIT_TABLES: Record<Role, { units: string[]; say: string }> = {
  time: { units: Object.keys(TIME_UNITS), say: 's, ms, us or min' },
  timestamp: { units: ['s', 'ms'], say: 's or ms (Unix time), or no unit for ISO-8601 text' },
  voltage: { units: Object.keys(VOLTAGE_UNITS), say: 'V, kV or mV' },
  current: { units: Object.keys(CURRENT_UNITS), say: 'A, mA, uA or nA' },
  temperature: { units: Object.keys(TEMPERATURE_UNITS), say: '°C, K or °F' },
};

function countOutsideQuotes(line: string, ch: string): number {
  let n = 0;
  let quoted = false;
  for (const c of line) {
    if (c === '"') quoted = !quoted;
    else if (c === ch && !quoted) n++;
  }
  return n;
}

/**
 * Pick the delimiter: among tab, semicolon and comma present in the header, the one that splits
 * the header and the first data lines into the same number of cells (tab, then semicolon first).
 */
function detectDelimiter(header: string, dataLines: string[]): Delimiter {
  const candidates: Delimiter[] = ['\t', ';', ','];
  const present = candidates.filter((d) => countOutsideQuotes(header, d) > 0);
  for (const d of present) {
    const n = countOutsideQuotes(header, d) + 1;
    const consistent = dataLines.slice(0, 5).every((l) => {
      const m = countOutsideQuotes(l, d) + 1;
      return m === n || (m > n && splitCells(l, d).slice(n).every((c) => c.trim() === ''));
    });
    if (consistent) return d;
  }
  return present[0] ?? ',';
}

/** Which decimal marks the numbers read so far used. */
interface DecimalMarks {
  comma: boolean;
  point: boolean;
}

const isSpace = (c: number): boolean => c === 32 || c === 9;
const isDigit = (c: number): boolean => c >= 48 && c <= 57;

/**
 * A plain decimal number ([sign] digits [mark digits] [e [sign] digits]), padded with spaces or
 * wrapped in quotes; the mark is a point, or a comma when `decimalCommaAllowed`. NaN when the cell
 * is anything else (empty, text, hex, infinity, a thousands separator). Records the mark in `marks`.
 */
function parseNumber(cell: string, decimalCommaAllowed: boolean, marks?: DecimalMarks): number {
  let start = 0;
  let end = cell.length;
  while (start < end && isSpace(cell.charCodeAt(start))) start++;
  while (end > start && isSpace(cell.charCodeAt(end - 1))) end--;
  if (end - start >= 2) {
    const q = cell.charCodeAt(start);
    if ((q === 34 || q === 39) && cell.charCodeAt(end - 1) === q) {
      start++;
      end--;
      while (start < end && isSpace(cell.charCodeAt(start))) start++;
      while (end > start && isSpace(cell.charCodeAt(end - 1))) end--;
    }
  }
  let i = start;
  let c = cell.charCodeAt(i);
  if (c === 43 || c === 45) i++; // + −
  let digits = 0;
  let mark = 0; // 0 none, 46 point, 44 comma
  for (; i < end; i++) {
    c = cell.charCodeAt(i);
    if (isDigit(c)) digits++;
    else if (mark === 0 && (c === 46 || (c === 44 && decimalCommaAllowed))) mark = c;
    else break;
  }
  if (digits === 0) return Number.NaN;
  if (i < end) {
    if (c !== 101 && c !== 69) return Number.NaN; // e E
    i++;
    c = cell.charCodeAt(i);
    if (c === 43 || c === 45) i++;
    let exponentDigits = 0;
    while (i < end && isDigit(cell.charCodeAt(i))) {
      i++;
      exponentDigits++;
    }
    if (exponentDigits === 0 || i !== end) return Number.NaN;
  }
  const text = cell.slice(start, end);
  const value = Number(mark === 44 ? text.replace(',', '.') : text);
  if (!Number.isFinite(value)) return Number.NaN;
  if (marks !== undefined) {
    if (mark === 44) marks.comma = true;
    else if (mark === 46) marks.point = true;
  }
  return value;
}

interface IsoInstant {
  wholeS: number; // integer seconds since 1970-01-01 UTC (zone applied)
  fracS: number; // fraction of a second, kept apart for precision
  zoned: boolean;
}

function parseIso(cell: string): IsoInstant | null {
  const m = ISO_RE.exec(unquote(cell));
  if (!m) return null;
  const [year, month, day, hour, minute] = [m[1], m[2], m[3], m[4], m[5]].map(Number);
  const second = m[6] === undefined ? 0 : Number(m[6]);
  if (month < 1 || month > 12 || day < 1 || day > 31 || hour > 24 || minute > 59 || second > 60) return null;
  let zoneS = 0;
  const zone = m[8];
  if (zone !== undefined && zone.toUpperCase() !== 'Z') {
    const digits = zone.replace(':', '');
    const sign = digits.startsWith('-') ? -1 : 1;
    const zh = Number(digits.slice(1, 3));
    const zm = digits.length > 3 ? Number(digits.slice(3, 5)) : 0;
    zoneS = sign * (zh * 3600 + zm * 60);
  }
  const wholeS = Date.UTC(year, month - 1, day, hour, minute, second) / 1000 - zoneS;
  const fracS = m[7] === undefined ? 0 : Number(`0.${m[7]}`);
  return { wholeS, fracS, zoned: zone !== undefined };
}

/** True when the cells of a data line read as column names (a header repeated in the data). */
function looksLikeHeader(cells: string[], headerCells: HeaderCell[], columns: Column[]): boolean {
  const same = headerCells.every((h, i) => i < cells.length && unquote(cells[i]).toLowerCase() === h.header.toLowerCase());
  if (same) return true;
  const time = columns.find((c) => c.role === 'time' || c.role === 'timestamp');
  const voltage = columns.find((c) => c.role === 'voltage');
  if (!time || !voltage || time.index >= cells.length || voltage.index >= cells.length) return false;
  const timeRole = roleOf(readHeaderCell(cells[time.index]));
  const voltageRole = roleOf(readHeaderCell(cells[voltage.index]));
  return (timeRole === 'time' || timeRole === 'timestamp') && voltageRole === 'voltage';
}

function describeColumns(cells: HeaderCell[]): string {
  return cells.map((c) => JSON.stringify(c.header)).join(', ');
}

export function parseVoltageLog(text: string, fileName: string): VoltageLog {
  const warnings: string[] = [];
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const lines = body.split(/\r\n|\n|\r/);

  // Header: the first line that is neither blank nor a comment; an Excel "sep=;" line before it.
  let index = 0;
  let forcedDelimiter: Delimiter | null = null;
  while (index < lines.length && (lines[index].trim() === '' || lines[index].trimStart().startsWith('#'))) index++;
  const sep = index < lines.length ? /^\s*sep=(.)\s*$/i.exec(lines[index]) : null;
  if (sep) {
    const d = sep[1];
    if (d !== ',' && d !== ';' && d !== '\t') {
      throw csvError({ file: fileName, line: index + 1 }, null, `the delimiter line asks for ${JSON.stringify(d)}`, 'use a comma, a semicolon or a tab between cells');
    }
    forcedDelimiter = d;
    index++;
    while (index < lines.length && (lines[index].trim() === '' || lines[index].trimStart().startsWith('#'))) index++;
  }
  if (index >= lines.length) {
    throw new KerrError('BAD_CSV', `${fileName} is empty: no header line and no data`, {
      path: fileName,
      hint: 'export the log as CSV with a header line such as time_s,voltage_kV',
    });
  }
  const headerLineNo = index + 1;
  const headerLine = lines[index];
  const dataStart = index + 1;
  const firstData: string[] = [];
  for (let i = dataStart; i < lines.length && firstData.length < 5; i++) {
    if (lines[i].trim() !== '' && !lines[i].trimStart().startsWith('#')) firstData.push(lines[i]);
  }
  const delimiter = forcedDelimiter ?? detectDelimiter(headerLine, firstData);
  const decimalCommaAllowed = delimiter !== ',';
  const at: Located = { file: fileName, line: headerLineNo };

  const headerCells = splitCells(headerLine, delimiter).map(readHeaderCell);
  while (headerCells.length > 0 && headerCells[headerCells.length - 1].header === '') headerCells.pop();
  if (headerCells.length > 0 && headerCells.every((c) => !Number.isNaN(parseNumber(c.header, decimalCommaAllowed)) || parseIso(c.header) !== null)) {
    throw csvError(at, null, `the first line ${JSON.stringify(headerLine.trim())} holds numbers, not column names`, 'add a header line such as time_s,voltage_kV above the data');
  }

  // Assign roles to columns.
  const columns: Column[] = [];
  const ignored: string[] = [];
  headerCells.forEach((cell, i) => {
    const role = roleOf(cell);
    if (role === null) {
      if (cell.header !== '') ignored.push(cell.header);
      return;
    }
    const table = UNIT_TABLES[role];
    if (cell.unit !== null && !table.units.includes(cell.unit)) {
      throw csvError(at, i + 1, `the unit ${JSON.stringify(cell.unit)} in ${JSON.stringify(cell.header)} does not fit a ${role} column`, `write the ${role} in ${table.say}, e.g. as a suffix (_kV) or in brackets ([kV])`);
    }
    const twin = columns.find((c) => c.role === role);
    if (twin) {
      throw csvError(at, i + 1, `two ${role} columns: ${JSON.stringify(twin.header)} and ${JSON.stringify(cell.header)}`, `keep one ${role} column or rename the other (e.g. ${role}_setpoint)`);
    }
    columns.push({ role, index: i, header: cell.header, unit: cell.unit });
  });
  let timeColumn = columns.find((c) => c.role === 'time') ?? null;
  let stampColumn = columns.find((c) => c.role === 'timestamp') ?? null;
  // A unitless time column holding date-times ("Time" = "2024-05-01 12:00:00") is a timestamp column.
  if (timeColumn !== null && stampColumn === null && timeColumn.unit === null && firstData.length > 0) {
    const firstCells = splitCells(firstData[0], delimiter);
    if (timeColumn.index < firstCells.length && parseIso(firstCells[timeColumn.index]) !== null) {
      stampColumn = { ...timeColumn, role: 'timestamp' };
      timeColumn = null;
    }
  }
  const voltageColumn = columns.find((c) => c.role === 'voltage') ?? null;
  const currentColumn = columns.find((c) => c.role === 'current') ?? null;
  const temperatureColumn = columns.find((c) => c.role === 'temperature') ?? null;
  if (timeColumn === null && stampColumn === null) {
    throw csvError(at, null, `no time column among ${describeColumns(headerCells)}`, `name the time column one of: ${ACCEPTED_TIME}`);
  }
  if (voltageColumn === null) {
    throw csvError(at, null, `no voltage column among ${describeColumns(headerCells)}`, `name the voltage column one of: ${ACCEPTED_VOLTAGE}`);
  }
  if (ignored.length > 0) warnings.push(`${fileName}: ignored column${ignored.length > 1 ? 's' : ''} ${ignored.map((s) => JSON.stringify(s)).join(', ')}`);
  if (currentColumn !== null && currentColumn.unit === null) warnings.push(`${fileName}: the current column ${JSON.stringify(currentColumn.header)} has no unit; read as amperes`);

  const primaryTime = (timeColumn ?? stampColumn) as Column;
  const timeScale = timeColumn !== null ? TIME_UNITS[timeColumn.unit ?? 's'] : stampColumn!.unit === 'ms' ? 1e-3 : 1;
  const voltageScale = VOLTAGE_UNITS[voltageColumn.unit ?? 'v'];
  const currentScale = currentColumn !== null ? CURRENT_UNITS[currentColumn.unit ?? 'a'] : 1;
  const toCelsius = temperatureColumn !== null ? TEMPERATURE_UNITS[temperatureColumn.unit ?? 'c'] : (x: number) => x;
  const needed = Math.max(primaryTime.index, voltageColumn.index) + 1;

  // Data rows.
  const capacity = lines.length - dataStart;
  const rawTime = new Float64Array(capacity);
  const rawVoltage = new Float64Array(capacity);
  const rawCurrent = currentColumn !== null ? new Float64Array(capacity) : null;
  const rawTemperature = temperatureColumn !== null ? new Float64Array(capacity) : null;
  const lineOf = new Int32Array(capacity);
  let count = 0;
  const marks: DecimalMarks = { comma: false, point: false };
  let emptyOptional = 0;
  let blankInside = 0;
  let absoluteStart: string | null = null;
  let firstStamp: IsoInstant | null = null;
  let firstEpochS: number | null = null;
  let pendingBlank = 0;

  const readNumber = (cells: string[], column: Column, here: Located, optional: boolean): number => {
    const cell = column.index < cells.length ? unquote(cells[column.index]) : '';
    if (cell === '') {
      if (optional) {
        emptyOptional++;
        return Number.NaN;
      }
      throw csvError(here, column.index + 1, `the ${column.role} cell (${column.header}) is empty`, 'fill in or delete the row');
    }
    const parsed = parseNumber(cell, decimalCommaAllowed, marks);
    if (Number.isNaN(parsed)) {
      const commaHint = !decimalCommaAllowed && cell.includes(',')
        ? 'with commas between cells the decimal mark must be a point; export with a semicolon or tab delimiter to keep decimal commas'
        : 'correct the cell or delete the row';
      throw csvError(here, column.index + 1, `${JSON.stringify(cell)} in the ${column.role} column (${column.header}) is not a number`, commaHint);
    }
    return parsed;
  };

  for (let i = dataStart; i < lines.length; i++) {
    const line = lines[i];
    if (line.trim() === '') {
      pendingBlank++;
      continue;
    }
    if (line.trimStart().startsWith('#')) continue;
    blankInside += pendingBlank;
    pendingBlank = 0;
    const here: Located = { file: fileName, line: i + 1 };
    const cells = splitCells(line, delimiter);
    const timeCell = primaryTime.index < cells.length ? cells[primaryTime.index] : '';
    const timeReadable = !Number.isNaN(parseNumber(timeCell, decimalCommaAllowed)) || parseIso(timeCell) !== null;
    if (!timeReadable && looksLikeHeader(cells, headerCells, columns)) {
      throw csvError(here, null, `line ${i + 1} looks like a header repeated inside the data`, 'delete that line; if the logger restarted there, keep one run per file');
    }
    if (cells.length < needed) {
      const want = delimiter === '\t' ? 'tab' : JSON.stringify(delimiter);
      throw csvError(here, cells.length + 1, `the row has ${cells.length} cell${cells.length === 1 ? '' : 's'} but the ${cells.length <= primaryTime.index ? 'time' : 'voltage'} column is column ${cells.length <= primaryTime.index ? primaryTime.index + 1 : voltageColumn.index + 1}`, `separate every cell with a ${want} as in the header`);
    }
    for (let extra = headerCells.length; extra < cells.length; extra++) {
      if (unquote(cells[extra]) !== '') {
        const hint = delimiter === ','
          ? 'remove the extra cells or name the column in the header; a decimal comma needs a semicolon or tab between cells'
          : 'remove the extra cells or name the column in the header';
        throw csvError(here, extra + 1, `the row has ${cells.length} cells but the header names ${headerCells.length}`, hint);
      }
    }

    let t: number;
    if (timeColumn !== null) {
      t = readNumber(cells, timeColumn, here, false) * timeScale;
    } else {
      const cell = unquote(cells[stampColumn!.index]);
      if (cell === '') throw csvError(here, stampColumn!.index + 1, `the timestamp cell (${stampColumn!.header}) is empty`, 'fill in or delete the row');
      const iso = parseIso(cell);
      if (iso !== null) {
        if (firstStamp === null) {
          if (firstEpochS !== null) throw csvError(here, stampColumn!.index + 1, `${JSON.stringify(cell)} mixes ISO-8601 text with numeric timestamps`, 'use one timestamp style for the whole file');
          firstStamp = iso;
        } else if (iso.zoned !== firstStamp.zoned) {
          throw csvError(here, stampColumn!.index + 1, `${JSON.stringify(cell)} ${iso.zoned ? 'has' : 'lacks'} a time zone, unlike the first row`, 'give every timestamp the same form, e.g. 2024-05-01T12:00:00.250Z');
        }
        t = iso.wholeS - firstStamp.wholeS + (iso.fracS - firstStamp.fracS);
      } else {
        const parsed = parseNumber(cell, decimalCommaAllowed, marks);
        if (Number.isNaN(parsed) || firstStamp !== null) {
          throw csvError(here, stampColumn!.index + 1, `${JSON.stringify(cell)} in the timestamp column (${stampColumn!.header}) is neither an ISO-8601 time nor a number`, 'write timestamps like 2024-05-01T12:00:00.250Z, or use a time_s column');
        }
        const epochS = parsed * timeScale;
        if (firstEpochS === null) firstEpochS = epochS;
        t = epochS - firstEpochS;
      }
    }
    if (absoluteStart === null && stampColumn !== null && stampColumn.index < cells.length) {
      const cell = unquote(cells[stampColumn.index]);
      if (cell !== '') {
        const epoch = parseIso(cell) === null ? parseNumber(cell, decimalCommaAllowed) : Number.NaN;
        absoluteStart = Number.isNaN(epoch) ? cell : new Date(epoch * (stampColumn.unit === 'ms' ? 1 : 1000)).toISOString();
      }
    }
    const v = readNumber(cells, voltageColumn, here, false) * voltageScale;
    rawTime[count] = t;
    rawVoltage[count] = v;
    if (rawCurrent !== null) rawCurrent[count] = readNumber(cells, currentColumn!, here, true) * currentScale;
    if (rawTemperature !== null) rawTemperature[count] = toCelsius(readNumber(cells, temperatureColumn!, here, true));
    lineOf[count] = i + 1;
    if (count > 0 && t < rawTime[count - 1]) {
      throw csvError(here, primaryTime.index + 1, `time goes backwards: ${formatTime(t)} s after ${formatTime(rawTime[count - 1])} s on line ${lineOf[count - 1]}`, 'sort the rows by time, or keep one recording per file');
    }
    count++;
  }

  // Merge rows with equal times: average each column over the rows that have a value.
  const timeS = new Float64Array(count);
  const voltageV = new Float64Array(count);
  const currentA = rawCurrent !== null ? new Float64Array(count) : null;
  const temperatureC = rawTemperature !== null ? new Float64Array(count) : null;
  const mergedLine = new Int32Array(count);
  let rows = 0;
  let duplicateTimes = 0;
  for (let start = 0; start < count; ) {
    let end = start + 1;
    while (end < count && rawTime[end] === rawTime[start]) end++;
    timeS[rows] = rawTime[start];
    mergedLine[rows] = lineOf[start];
    voltageV[rows] = meanOf(rawVoltage, start, end);
    if (currentA !== null) currentA[rows] = meanOf(rawCurrent!, start, end);
    if (temperatureC !== null) temperatureC[rows] = meanOf(rawTemperature!, start, end);
    duplicateTimes += end - start - 1;
    rows++;
    start = end;
  }
  if (rows < 2) {
    throw csvError({ file: fileName, line: headerLineNo }, null, `only ${rows} sample${rows === 1 ? '' : 's'} with distinct times after the header`, 'a log needs at least 2 rows with different times; check that the right file was chosen');
  }

  if (duplicateTimes > 0) warnings.push(`${fileName}: ${duplicateTimes} row${duplicateTimes > 1 ? 's' : ''} repeated an earlier time; rows with equal times were averaged`);
  if (blankInside > 0) warnings.push(`${fileName}: ${blankInside} blank line${blankInside > 1 ? 's' : ''} inside the data were skipped`);
  if (emptyOptional > 0) warnings.push(`${fileName}: ${emptyOptional} empty current or temperature cell${emptyOptional > 1 ? 's' : ''} read as missing`);
  if (marks.comma && marks.point) warnings.push(`${fileName}: both decimal commas and decimal points occur; both were read as decimal marks`);
  const gap = largestGap(timeS.subarray(0, rows));
  if (gap !== null) {
    warnings.push(`${fileName}: a gap of ${formatTime(gap.gapS)} s in the log ends at line ${mergedLine[gap.index]} (typical interval ${formatTime(gap.medianS)} s); voltages inside it are interpolated linearly`);
  }

  const shrink = (a: Float64Array | null): Float64Array | null => (a === null ? null : a.slice(0, rows));
  return {
    timeS: shrink(timeS)!,
    voltageV: shrink(voltageV)!,
    currentA: shrink(currentA),
    temperatureC: shrink(temperatureC),
    rows,
    duplicateTimes,
    columns: {
      time: primaryTime.header,
      voltage: voltageColumn.header,
      current: currentColumn?.header ?? null,
      temperature: temperatureColumn?.header ?? null,
    },
    delimiter,
    decimalComma: marks.comma,
    absoluteStart,
    warnings,
  };
}

/** Mean of a[start..end) over the finite entries; NaN when none. */
function meanOf(a: Float64Array, start: number, end: number): number {
  if (end - start === 1) return a[start];
  let sum = 0;
  let n = 0;
  for (let i = start; i < end; i++) {
    if (Number.isFinite(a[i])) {
      sum += a[i];
      n++;
    }
  }
  return n > 0 ? sum / n : Number.NaN;
}

/** The largest interval when it exceeds 10× the median interval; index is the sample after the gap (in merged samples). */
function largestGap(timeS: Float64Array): { gapS: number; medianS: number; index: number } | null {
  if (timeS.length < 4) return null;
  const intervals = new Float64Array(timeS.length - 1);
  for (let i = 1; i < timeS.length; i++) intervals[i - 1] = timeS[i] - timeS[i - 1];
  const sorted = intervals.slice().sort();
  const medianS = sorted[Math.floor(sorted.length / 2)];
  let best = 0;
  for (let i = 1; i < intervals.length; i++) if (intervals[i] > intervals[best]) best = i;
  if (!(intervals[best] > 10 * medianS)) return null;
  return { gapS: intervals[best], medianS, index: best + 1 };
}

function formatTime(s: number): string {
  return Number(s.toPrecision(6)).toString();
}
