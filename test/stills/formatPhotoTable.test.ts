import { describe, expect, it } from 'vitest';
import { formatPhotoTable } from '../../src/stills/formatPhotoTable.js';
import type { StillsSeries } from '../../src/stills/readStillsSeries.js';
import type { TraceRow } from '../../src/result/schema.js';

describe('formatPhotoTable', () => {
  it('one aligned line per photo with what the fit did with it', () => {
    const series = {
      files: ['a_0V.jpg', 'long_name_12kV.jpg'], voltageV: Float64Array.from([0, 12000]), intensity: Float64Array.from([0.0512345, NaN]),
      exposureRelative: Float64Array.from([1, NaN]), clippedFraction: Float64Array.from([0.004, NaN]),
    } as unknown as StillsSeries;
    const trace: TraceRow[] = [
      { frameIndex: 0, timeS: 0, voltageV: 0, intensity: 0.0512345, model: 0.05, residual: 0.0012345, used: true, excludedReason: null },
      { frameIndex: 1, timeS: 1, voltageV: 12000, intensity: NaN, model: 0.3, residual: null, used: false, excludedReason: 'unreadable' },
    ];
    const lines = formatPhotoTable(series, trace).trimEnd().split('\n');
    expect(lines).toEqual([
      'file                voltage  intensity  exposure  clipped  fit',
      'a_0V.jpg            0 V      0.05123    1x        0.4%     used',
      'long_name_12kV.jpg  12000 V  -          -         -        left out (unreadable)',
    ]);
  });
});
