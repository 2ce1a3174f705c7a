/**
 * Which column of a voltage log holds what, and in which unit (docs/voltage-log.md, "Columns").
 *
 * Names (case-insensitive, spaces and dashes read as `_`): time `time`, `t`, `seconds`,
 * `elapsed`, `elapsed_time`, `sec`; timestamp `timestamp`, `datetime`, `date_time`; voltage
 * `voltage`, `v`, `volts`, `volt`, `hv`, `u`; current `current`, `i`, `amps`, `ampere`;
 * temperature `temp`, `temperature`, or `t` with a temperature unit (`t_C`). A unit comes from
 * brackets (`U [kV]`, `time(s)`), a slash (`U / kV`) or a known suffix (`_kV`, ` uA`); µ and μ
 * read as u, degree signs are dropped. Scales to SI: time s, ms, us, min; voltage V, kV, mV;
 * current A, mA, uA, nA; temperature °C, K, °F (converted to °C). Defaults: s, V, A, °C; a
 * timestamp column takes s or ms (Unix time) or no unit (ISO-8601 text).
 *
 * `resolveLogColumns` assigns the roles; a unitless time column whose first row holds a date-time
 * becomes the timestamp column. Throws KerrError BAD_CSV (via csvError, at the header line) for a
 * unit that does not fit its column, two columns for one role, no time column or no voltage
 * column (listing the columns found and the accepted names).
 * @example readHeaderCell('U [kV]') → { header: 'U [kV]', name: 'u', unit: 'kv' }; roleOf(that) → 'voltage'
 */
import { unquoteCell } from '../csv/splitCsvCells.js';
import { csvError, type Located } from './csvError.js';
import { parseIsoInstant } from './parseIsoInstant.js';

export type Role = 'time' | 'timestamp' | 'voltage' | 'current' | 'temperature';

export interface HeaderCell {
  /** As written, quotes and padding removed. */
  header: string;
  /** Normalised name without unit. */
  name: string;
  /** Normalised unit. */
  unit: string | null;
}

export interface Column {
  role: Role;
  index: number;
  header: string;
  unit: string | null;
}

const TIME_NAMES = ['time', 't', 'seconds', 'elapsed', 'elapsed_time', 'sec'];
const TIMESTAMP_NAMES = ['timestamp', 'datetime', 'date_time'];
const VOLTAGE_NAMES = ['voltage', 'v', 'volts', 'volt', 'hv', 'u'];
const CURRENT_NAMES = ['current', 'i', 'amps', 'ampere'];
const TEMPERATURE_NAMES = ['temp', 'temperature'];

export const TIME_UNITS: Record<string, number> = { s: 1, sec: 1, secs: 1, second: 1, seconds: 1, ms: 1e-3, msec: 1e-3, us: 1e-6, min: 60 };
export const VOLTAGE_UNITS: Record<string, number> = { v: 1, volt: 1, volts: 1, kv: 1e3, mv: 1e-3 };
export const CURRENT_UNITS: Record<string, number> = { a: 1, amp: 1, amps: 1, ma: 1e-3, ua: 1e-6, na: 1e-9 };
/** Temperature units as conversions to °C. */
export const TEMPERATURE_UNITS: Record<string, (x: number) => number> = {
  c: (x) => x,
  celsius: (x) => x,
  k: (x) => x - 273.15,
  f: (x) => ((x - 32) * 5) / 9,
};

const ACCEPTED_TIME = 'time, t, time_s, time_ms, seconds, elapsed, or an ISO-8601 timestamp column';
const ACCEPTED_VOLTAGE = 'voltage, v, volts, hv or u, with an optional unit such as voltage_kV or U [kV]';

const UNIT_TABLES: Record<Role, { units: string[]; say: string }> = {
  time: { units: Object.keys(TIME_UNITS), say: 's, ms, us or min' },
  timestamp: { units: ['s', 'ms'], say: 's or ms (Unix time), or no unit for ISO-8601 text' },
  voltage: { units: Object.keys(VOLTAGE_UNITS), say: 'V, kV or mV' },
  current: { units: Object.keys(CURRENT_UNITS), say: 'A, mA, uA or nA' },
  temperature: { units: Object.keys(TEMPERATURE_UNITS), say: '°C, K or °F' },
};

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
export function readHeaderCell(raw: string): HeaderCell {
  const header = unquoteCell(raw);
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

export function roleOf(cell: HeaderCell): Role | null {
  const { name, unit } = cell;
  if (name === 't') return unit !== null && unit in TEMPERATURE_UNITS ? 'temperature' : 'time';
  if (TIME_NAMES.includes(name)) return 'time';
  if (TIMESTAMP_NAMES.includes(name)) return 'timestamp';
  if (VOLTAGE_NAMES.includes(name)) return 'voltage';
  if (CURRENT_NAMES.includes(name)) return 'current';
  if (TEMPERATURE_NAMES.includes(name)) return 'temperature';
  return null;
}

export interface LogColumns {
  /** Numeric time column, or null when times come from the timestamp column. */
  time: Column | null;
  stamp: Column | null;
  voltage: Column;
  current: Column | null;
  temperature: Column | null;
  /** Header cells of columns with no role (non-empty ones). */
  ignored: string[];
}

/** Assign roles to the header cells; `firstRowCells` are the first data row's raw cells (or null). */
export function resolveLogColumns(headerCells: HeaderCell[], firstRowCells: string[] | null, at: Located): LogColumns {
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
  let time = columns.find((c) => c.role === 'time') ?? null;
  let stamp = columns.find((c) => c.role === 'timestamp') ?? null;
  // A unitless time column holding date-times ("Time" = "2024-05-01 12:00:00") is a timestamp column.
  if (time !== null && stamp === null && time.unit === null && firstRowCells !== null) {
    if (time.index < firstRowCells.length && parseIsoInstant(firstRowCells[time.index]) !== null) {
      stamp = { ...time, role: 'timestamp' };
      time = null;
    }
  }
  const voltage = columns.find((c) => c.role === 'voltage') ?? null;
  const describe = headerCells.map((c) => JSON.stringify(c.header)).join(', ');
  if (time === null && stamp === null) throw csvError(at, null, `no time column among ${describe}`, `name the time column one of: ${ACCEPTED_TIME}`);
  if (voltage === null) throw csvError(at, null, `no voltage column among ${describe}`, `name the voltage column one of: ${ACCEPTED_VOLTAGE}`);
  const current = columns.find((c) => c.role === 'current') ?? null;
  const temperature = columns.find((c) => c.role === 'temperature') ?? null;
  return { time, stamp, voltage, current, temperature, ignored };
}
