/**
 * An ISO-8601 date-time cell of a voltage log ("2024-05-01T12:00:00.250Z", a space instead of the
 * T, seconds and fraction optional, a point or comma before the fraction, an optional zone Z or
 * ±hh[:mm]), as whole seconds since 1970-01-01 UTC (zone applied; a time without zone is read as
 * UTC, which cancels out when times are taken relative to the first row) plus the fraction of a
 * second kept apart for precision. Null when the cell is not such a time or a field is out of
 * range. Quotes and padding around the cell are removed first.
 * @example parseIsoInstant('2024-05-01T12:00:00.25+02:00') → { wholeS: 1714557600, fracS: 0.25, zoned: true }
 */
import { unquoteCell } from '../csv/splitCsvCells.js';

export interface IsoInstant {
  /** Integer seconds since 1970-01-01 UTC (zone applied). */
  wholeS: number;
  /** Fraction of a second, kept apart for precision. */
  fracS: number;
  zoned: boolean;
}

const ISO_RE = /^(\d{4})-(\d{2})-(\d{2})[Tt ](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d+))?)?\s*([Zz]|[+-]\d{2}(?::?\d{2})?)?$/;

export function parseIsoInstant(cell: string): IsoInstant | null {
  const m = ISO_RE.exec(unquoteCell(cell));
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
