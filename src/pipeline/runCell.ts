/**
 * The cell and optics of a run in SI, from the options in mm and degrees (converted once, here):
 * electrode length, effective length (fringe fields; default the length), gap, polariser angle
 * (default 45°), static retardance (default 0) and the tolerances the budget uses.
 */
export interface RunCell {
  lengthM: number;
  effectiveLengthM: number;
  gapM: number;
  polariserAngleDeg: number;
  staticRetardanceRad: number | undefined;
  lengthToleranceM: number;
  gapToleranceM: number;
  electrodeHeightM: number | null;
}

const MM = 1e-3;

export function runCell(o: {
  lengthMm: number; gapMm: number; effectiveLengthMm?: number; polariserAngleDeg?: number; staticRetardanceRad?: number;
  lengthToleranceMm?: number; gapToleranceMm?: number; electrodeHeightMm?: number;
}): RunCell {
  return {
    lengthM: o.lengthMm * MM,
    effectiveLengthM: (o.effectiveLengthMm ?? o.lengthMm) * MM,
    gapM: o.gapMm * MM,
    polariserAngleDeg: o.polariserAngleDeg ?? 45,
    staticRetardanceRad: o.staticRetardanceRad,
    lengthToleranceM: (o.lengthToleranceMm ?? 0) * MM,
    gapToleranceM: (o.gapToleranceMm ?? 0) * MM,
    electrodeHeightM: o.electrodeHeightMm !== undefined ? o.electrodeHeightMm * MM : null,
  };
}
