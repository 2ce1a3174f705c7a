import { describe, expect, it } from 'vitest';
import { driveDurationS, drivePeakV, driveVoltageV, type Drive } from '../../src/sim/drive.js';

describe('drive programme', () => {
  const drive: Drive = {
    kind: 'segments',
    startV: 100,
    segments: [
      { kind: 'hold', durationS: 1 },
      { kind: 'ramp', toV: 1100, durationS: 2 },
      { kind: 'step', toV: 5000, riseTimeS: 0.2, durationS: 3 },
    ],
  };

  it('holds, ramps linearly and holds its last value after the end', () => {
    expect(driveVoltageV(drive, -1)).toBe(100);
    expect(driveVoltageV(drive, 0.5)).toBe(100);
    expect(driveVoltageV(drive, 2)).toBeCloseTo(600, 9);
    expect(driveVoltageV(drive, 3)).toBeCloseTo(1100, 9);
    expect(driveVoltageV(drive, 100)).toBeCloseTo(5000, 6);
    expect(driveDurationS(drive)).toBe(6);
    expect(drivePeakV(drive)).toBe(5000);
  });

  it('steps with a first-order rise whose 10–90 % time is riseTimeS (RC charging, common practice)', () => {
    const from = 1100;
    const to = 5000;
    const crossing = (fraction: number): number => {
      // bisection on the rising edge, which starts at t = 3 s
      let lo = 3;
      let hi = 4;
      for (let i = 0; i < 60; i++) {
        const mid = (lo + hi) / 2;
        if (driveVoltageV(drive, mid) < from + fraction * (to - from)) lo = mid;
        else hi = mid;
      }
      return lo;
    };
    expect(crossing(0.9) - crossing(0.1)).toBeCloseTo(0.2, 9);
  });

  it('joins points with straight lines', () => {
    const pts: Drive = { kind: 'points', points: [{ timeS: 0, voltageV: 0 }, { timeS: 2, voltageV: 2000 }, { timeS: 3, voltageV: -1000 }] };
    expect(driveVoltageV(pts, 1)).toBeCloseTo(1000, 9);
    expect(driveVoltageV(pts, 2.5)).toBeCloseTo(500, 9);
    expect(driveVoltageV(pts, 9)).toBe(-1000);
    expect(drivePeakV(pts)).toBe(2000);
    expect(driveDurationS(pts)).toBe(3);
  });
});
