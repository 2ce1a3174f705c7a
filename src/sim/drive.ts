/**
 * The high-voltage drive of a simulated run: the voltage V_drive(t) across the cell at video time t.
 *
 * Two forms:
 * - segments, starting at `startV` at t = 0 and following each other:
 *   hold (keep the voltage for durationS), ramp (linear to toV over durationS),
 *   step (jump to toV through a first-order RC charge V = V0 + (V1 − V0)·(1 − e^(−t/τ)) with
 *   τ = riseTimeS/ln 9, so riseTimeS is the 10–90 % rise time, then hold until durationS ends);
 * - points: explicit (timeS, voltageV) pairs joined by straight lines.
 * Before the start and after the end the voltage holds its first / last value.
 * Units: seconds and volts. Pure; throws nothing (the scenario parser validates the numbers).
 * @example driveVoltageV({ kind: 'segments', startV: 0, segments: [{ kind: 'ramp', toV: 1000, durationS: 2 }] }, 1) === 500
 */

export type DriveSegment =
  | { kind: 'hold'; durationS: number }
  | { kind: 'ramp'; toV: number; durationS: number }
  | { kind: 'step'; toV: number; riseTimeS: number; durationS: number };

export interface DrivePoint {
  timeS: number;
  voltageV: number;
}

export type Drive =
  | { kind: 'segments'; startV: number; segments: DriveSegment[] }
  | { kind: 'points'; points: DrivePoint[] };

/** Total length of the drive programme in seconds (last point's time for points). */
export function driveDurationS(drive: Drive): number {
  if (drive.kind === 'points') return drive.points.length > 0 ? drive.points[drive.points.length - 1]!.timeS : 0;
  let total = 0;
  for (const s of drive.segments) total += s.durationS;
  return total;
}

/** Largest |V| the drive reaches (segment end points, or points). */
export function drivePeakV(drive: Drive): number {
  if (drive.kind === 'points') return drive.points.reduce((m, p) => Math.max(m, Math.abs(p.voltageV)), 0);
  let peak = Math.abs(drive.startV);
  for (const s of drive.segments) if (s.kind !== 'hold') peak = Math.max(peak, Math.abs(s.toV));
  return peak;
}

/** V_drive(t) in volts at video time t in seconds. */
export function driveVoltageV(drive: Drive, timeS: number): number {
  if (drive.kind === 'points') return pointsVoltageV(drive.points, timeS);
  let level = drive.startV;
  let startS = 0;
  for (const s of drive.segments) {
    const endS = startS + s.durationS;
    if (timeS < endS) {
      const intoS = Math.max(0, timeS - startS);
      if (s.kind === 'hold') return level;
      if (s.kind === 'ramp') return level + ((s.toV - level) * intoS) / s.durationS;
      if (s.riseTimeS <= 0) return s.toV;
      const tauS = s.riseTimeS / Math.log(9);
      return level + (s.toV - level) * (1 - Math.exp(-intoS / tauS));
    }
    if (s.kind === 'ramp') level = s.toV;
    if (s.kind === 'step') {
      // a step that is cut short by its own duration ends where the charge curve got to
      const tauS = s.riseTimeS / Math.log(9);
      level = s.riseTimeS <= 0 ? s.toV : level + (s.toV - level) * (1 - Math.exp(-s.durationS / tauS));
    }
    startS = endS;
  }
  return level;
}

function pointsVoltageV(points: DrivePoint[], timeS: number): number {
  const n = points.length;
  if (n === 0) return 0;
  if (timeS <= points[0]!.timeS) return points[0]!.voltageV;
  if (timeS >= points[n - 1]!.timeS) return points[n - 1]!.voltageV;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (points[mid]!.timeS <= timeS) lo = mid;
    else hi = mid;
  }
  const a = points[lo]!;
  const b = points[hi]!;
  const spanS = b.timeS - a.timeS;
  if (spanS <= 0) return b.voltageV;
  return a.voltageV + ((b.voltageV - a.voltageV) * (timeS - a.timeS)) / spanS;
}
