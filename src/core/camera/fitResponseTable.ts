/**
 * A camera response table from calibration points: each point is a mean code value (0..255
 * scale, one channel) and the relative light it saw, known up to scale and offset (Malus's law:
 * light = a + b·cos²(θ − θ₀), so x = cos²(θ − θ₀) is the light in affine units; the offset takes
 * the polarisers' leak and the camera's black level, the scale the beam's brightness).
 *
 * Steps: sort the points by code; cut them into `bins` groups of equal count (groups never split a
 * run of equal codes); take each group's mean code and mean x; make the means non-decreasing by
 * pool-adjacent-violators (Ayer et al., Ann. Math. Stat. 26, 641 (1955)), pooling groups weighted
 * by their counts; rescale x so the lowest group is 0 and the highest 1. Residual: RMS over the
 * points of x − table(code), in units of the light range. The table is linear between group
 * means and is extended beyond the ends by responseAt.
 *
 * Pure. @throws KerrError NOT_IDENTIFIABLE when the points span fewer than 8 code values or the
 * light does not rise with the code (a calibration with too little range, or the wrong angles).
 * @example fitResponseTable([10, 80, 200], [0, 0.3, 1], 3) // { table: { code: [10, 80, 200], linear: [0, 0.3, 1] }, residualRms: 0, ... }
 */
import { KerrError } from '../../errors.js';
import type { ResponseTable } from './decodingTypes.js';
import { responseAt } from './responseTable.js';

export interface ResponseTableFit {
  table: ResponseTable;
  residualRms: number;
  codeRange: [number, number];
  points: number;
}

export function fitResponseTable(codes: ArrayLike<number>, light: ArrayLike<number>, bins = 32): ResponseTableFit {
  const n = codes.length;
  const order = Array.from({ length: n }, (_v, i) => i).filter((i) => Number.isFinite(codes[i]!) && Number.isFinite(light[i]!));
  order.sort((a, b) => codes[a]! - codes[b]!);
  const m = order.length;
  if (m < 8) throw new KerrError('NOT_IDENTIFIABLE', `only ${m} calibration points`, { hint: 'Record at least a full half-turn of the analyser' });
  const lo = codes[order[0]!]!, hi = codes[order[m - 1]!]!;
  if (!(hi - lo >= 8)) {
    throw new KerrError('NOT_IDENTIFIABLE', `the calibration spans only ${(hi - lo).toFixed(1)} code values`, {
      hint: 'Turn the analyser through at least 90° so the light goes from bright to dark',
    });
  }
  // groups of (about) equal count
  const groups: { code: number; x: number; w: number }[] = [];
  const per = Math.max(1, Math.floor(m / Math.max(3, bins)));
  let start = 0;
  while (start < m) {
    let end = Math.min(m, start + per);
    while (end < m && codes[order[end]!]! === codes[order[end - 1]!]!) end++;
    if (m - end < per / 2) end = m; // fold a short tail into the last group
    let sc = 0, sx = 0;
    for (let k = start; k < end; k++) { sc += codes[order[k]!]!; sx += light[order[k]!]!; }
    groups.push({ code: sc / (end - start), x: sx / (end - start), w: end - start });
    start = end;
  }
  // pool adjacent violators (non-decreasing x)
  const pooled: { code: number; x: number; w: number }[] = [];
  for (const g of groups) {
    pooled.push({ ...g });
    while (pooled.length > 1 && pooled[pooled.length - 2]!.x > pooled[pooled.length - 1]!.x) {
      const b = pooled.pop()!, a = pooled.pop()!;
      const w = a.w + b.w;
      pooled.push({ code: (a.code * a.w + b.code * b.w) / w, x: (a.x * a.w + b.x * b.w) / w, w });
    }
  }
  if (pooled.length < 3) {
    throw new KerrError('NOT_IDENTIFIABLE', 'the light does not rise with the code value over the calibration', {
      hint: 'Check the angles (0 = analyser parallel) and that the beam region is lit',
    });
  }
  const x0 = pooled[0]!.x, x1 = pooled[pooled.length - 1]!.x;
  const table: ResponseTable = {
    code: pooled.map((p) => p.code),
    linear: pooled.map((p) => (p.x - x0) / (x1 - x0)),
  };
  // strictly increasing codes (pooled means of sorted codes are, unless two pools share one code)
  for (let k = 1; k < table.code.length; k++) if (!(table.code[k]! > table.code[k - 1]!)) table.code[k] = table.code[k - 1]! + 1e-6;
  let ss = 0;
  for (const i of order) {
    const r = (light[i]! - x0) / (x1 - x0) - responseAt(table, codes[i]!);
    ss += r * r;
  }
  return { table, residualRms: Math.sqrt(ss / m), codeRange: [lo, hi], points: m };
}
