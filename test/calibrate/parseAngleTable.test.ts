import { describe, expect, it } from 'vitest';
import { anglesAtTimes, parseAngleTable } from '../../src/calibrate/parseAngleTable.js';
import { angleFromFileName } from '../../src/calibrate/calibrateCamera.js';

describe('angle table and angles in file names', () => {
  it('reads a header, commas or semicolons, and steps; frames while the analyser settles get NaN', () => {
    const t = parseAngleTable('time_s,angle_deg\n0,0\n2;15\n\n# note\n4\t30\n', 'steps.csv');
    expect(t).toEqual({ timeS: [0, 2, 4], angleDeg: [0, 15, 30] });
    const a = anglesAtTimes(t, [0.5, 2.1, 2.5, 5], 0.3);
    expect(Array.from(a)).toEqual([0, NaN, 15, 30]);
  });

  it('interpolates a continuous record (rows under 0.5 s apart) instead of treating it as steps', () => {
    const t = parseAngleTable('0,0\n0.1,9\n0.2,18\n', 'enc.csv');
    const a = anglesAtTimes(t, [0.05, 0.15, 0.2, 0.3], 0.3);
    expect(a[0]).toBeCloseTo(4.5, 12);
    expect(a[1]).toBeCloseTo(13.5, 12);
    expect(a[2]).toBe(18);
    expect(a[3]).toBeNaN();
  });

  it('names the line of a bad row or a time that goes back', () => {
    expect(() => parseAngleTable('0,0\n1,x\n', 'a.csv')).toThrow(/a\.csv:2/);
    expect(() => parseAngleTable('0,0\n2,10\n1,20\n', 'a.csv')).toThrow(/a\.csv:3: the time 1 s/);
  });

  it('reads angles from photo names', () => {
    expect(angleFromFileName('ang030.jpg')).toBe(30);
    expect(angleFromFileName('angle-45.5.jpg')).toBe(45.5);
    expect(angleFromFileName('step3_60deg.jpg')).toBe(60);
    expect(angleFromFileName('photo_12kV.jpg')).toBeNull();
  });
});
