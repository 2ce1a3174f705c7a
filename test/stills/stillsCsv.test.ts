import { describe, expect, it } from 'vitest';
import { stillsCsv, STILLS_CSV_COLUMNS } from '../../src/stills/stillsCsv.js';
import type { StillsSeries } from '../../src/stills/readStillsSeries.js';

function series(): StillsSeries {
  return {
    voltageV: Float64Array.from([0, 12500, 3000]), intensity: Float64Array.from([0.05, 0.5, NaN]), files: ['a_0V.jpg', 'b "quoted", 12.5kV.jpg', 'c_3kV.jpg'],
    clippedFraction: Float64Array.from([0, 0.0123456, NaN]), exposureRelative: Float64Array.from([1, 0.5, NaN]), warnings: [], width: 10, height: 10, notes: [],
    roi: { x: 0, y: 0, w: 2, h: 2 }, beamAuto: false, surround: null, surroundLinear: null, darkRoi: { x: 5, y: 5, w: 2, h: 2 }, referenceRoi: null,
    roiLinear: Float64Array.from([0.06, 0.26, NaN]), darkLinear: Float64Array.from([0.01, 0.01, NaN]), referenceLinear: null,
    exposureBasis: 'exif', exposureFactors: ['exposure time'], voltageSource: 'file-names', transfers: ['srgb', 'srgb', 'srgb'], bitDepths: [8, 8, null],
    unreadable: [null, null, 'broken'], captureTimeS: null, leftOut: [], openPhoto: null,
  };
}

describe('stillsCsv', () => {
  it('one row per photo in trace order, raw region values and the corrections; empty cells where there is nothing', () => {
    const lines = stillsCsv(series()).trimEnd().split('\n');
    expect(lines[0]).toBe(STILLS_CSV_COLUMNS.join(','));
    expect(lines).toHaveLength(4);
    expect(lines[1]).toBe('0,a_0V.jpg,0,0.06,0.01,,1,0,srgb,8,');
    expect(lines[2]).toBe('1,"b ""quoted"", 12.5kV.jpg",12500,0.26,0.01,,0.5,0.01235,srgb,8,'); // RFC 4180 quoting
    expect(lines[3]).toBe('2,c_3kV.jpg,3000,,,,,,srgb,,');
  });

  it('intensity in trace.csv follows from the columns: (roi − dark) / exposure', () => {
    const s = series();
    const cells = stillsCsv(s).split('\n')[2]!.split(',');
    const [roi, dark, exposure] = [Number(cells.at(-8)), Number(cells.at(-7)), Number(cells.at(-5))];
    expect((roi - dark) / exposure).toBeCloseTo(s.intensity[1]!, 9);
  });
});
