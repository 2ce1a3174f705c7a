/**
 * Capture times of a photo series from EXIF, in seconds since the earliest photo:
 *   t_i = DateTimeOriginal_i + SubSecTimeOriginal_i − OffsetTimeOriginal_i − min_j(same for j)
 * DateTimeOriginal is "YYYY:MM:DD HH:MM:SS" (EXIF 2.32, tag 0x9003), SubSecTimeOriginal the
 * digits of the fraction of a second ("345" = 0.345 s, tag 0x9291), OffsetTimeOriginal the
 * time zone as "+HH:MM" (tag 0x9011, EXIF 2.31 and later).
 *
 * Rule for missing values: every photo must carry a readable DateTimeOriginal, otherwise the
 * result is null (the caller then numbers the photos 0, 1, 2 ...). Fractions are added where
 * present. Offsets are applied only when every photo carries one: applying them to some photos
 * only would shift those by hours. Pure.
 * @example captureTimesS([{ dateTimeOriginal: '2024:03:05 10:11:12', subSecTimeOriginal: '5', offsetTimeOriginal: null },
 *   { dateTimeOriginal: '2024:03:05 10:11:20', subSecTimeOriginal: null, offsetTimeOriginal: null }]) // Float64Array [0, 7.5]
 */

export interface ExifCaptureTime {
  dateTimeOriginal: string | null;
  subSecTimeOriginal: string | null;
  offsetTimeOriginal: string | null;
}

const DATE_TIME = /^\s*(\d{4}):(\d{2}):(\d{2})[ T](\d{2}):(\d{2}):(\d{2})/;
const OFFSET = /^\s*([+-])(\d{2}):?(\d{2})\s*$/;

/** Seconds since 1970 of a DateTimeOriginal read as UTC (the zone is handled separately), or null. */
function wallClockS(text: string | null): number | null {
  const m = text === null ? null : DATE_TIME.exec(text);
  if (!m) return null;
  const [year, month, day, hour, minute, second] = m.slice(1).map(Number) as [number, number, number, number, number, number];
  if (month < 1 || month > 12 || day < 1 || day > 31 || hour > 23 || minute > 59 || second > 60) return null;
  return Date.UTC(year, month - 1, day, hour, minute, second) / 1000;
}

function fractionS(text: string | null): number {
  const digits = text === null ? '' : text.trim();
  return /^\d{1,9}$/.test(digits) ? Number(`0.${digits}`) : 0;
}

function offsetS(text: string | null): number | null {
  const m = text === null ? null : OFFSET.exec(text);
  if (!m) return null;
  const sign = m[1] === '-' ? -1 : 1;
  return sign * (Number(m[2]) * 3600 + Number(m[3]) * 60);
}

export function captureTimesS(records: readonly ExifCaptureTime[]): Float64Array | null {
  const n = records.length;
  if (n === 0) return null;
  const wall: number[] = [];
  for (const r of records) {
    const t = wallClockS(r.dateTimeOriginal);
    if (t === null) return null;
    wall.push(t + fractionS(r.subSecTimeOriginal));
  }
  const offsets = records.map((r) => offsetS(r.offsetTimeOriginal));
  const useOffsets = offsets.every((o) => o !== null);
  const absolute = wall.map((t, i) => (useOffsets ? t - offsets[i]! : t));
  const earliest = Math.min(...absolute);
  return Float64Array.from(absolute, (t) => t - earliest);
}
