import { describe, expect, it } from 'vitest';
import { captureTimesS, type ExifCaptureTime } from '../../src/stills/captureTimes.js';

const at = (dateTimeOriginal: string | null, subSecTimeOriginal: string | null = null, offsetTimeOriginal: string | null = null): ExifCaptureTime =>
  ({ dateTimeOriginal, subSecTimeOriginal, offsetTimeOriginal });

// Tag formats from the EXIF 2.32 specification (CIPA DC-008-2019): DateTimeOriginal "YYYY:MM:DD HH:MM:SS",
// SubSecTimeOriginal the fraction's digits, OffsetTimeOriginal "+HH:MM".
describe('captureTimesS', () => {
  it('seconds after the earliest photo (not necessarily the first), with the sub-second digits', () => {
    const t = captureTimesS([at('2024:03:05 10:11:12', '5'), at('2024:03:05 10:11:20'), at('2024:03:05 10:11:12', '125')]);
    // 12.5 s, 20 s and 12.125 s past the minute: the third photo is the earliest
    expect(Array.from(t!)).toEqual([expect.closeTo(0.375, 12), expect.closeTo(7.875, 12), 0]);
  });

  it('crosses midnight and month ends (calendar arithmetic, not string arithmetic)', () => {
    const t = captureTimesS([at('2024:02:29 23:59:50'), at('2024:03:01 00:00:10')]); // 2024 is a leap year
    expect(Array.from(t!)).toEqual([0, 20]);
  });

  it('applies time-zone offsets only when every photo has one', () => {
    // the same instant written in two zones
    expect(Array.from(captureTimesS([at('2024:06:01 12:00:00', null, '+02:00'), at('2024:06:01 11:00:30', null, '+01:00')])!)).toEqual([0, 30]);
    // one offset missing: offsets ignored, wall clocks compared
    expect(Array.from(captureTimesS([at('2024:06:01 12:00:00', null, '+02:00'), at('2024:06:01 12:00:30')])!)).toEqual([0, 30]);
  });

  it('null when any photo lacks a readable capture time', () => {
    expect(captureTimesS([at('2024:03:05 10:11:12'), at(null)])).toBeNull();
    expect(captureTimesS([at('2024:03:05 10:11:12'), at('    :  :     :  :  ')])).toBeNull(); // blank, as some cameras write it
    expect(captureTimesS([at('2024:13:05 10:11:12')])).toBeNull();
    expect(captureTimesS([])).toBeNull();
  });
});
