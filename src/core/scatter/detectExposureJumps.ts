/**
 * Exposure jumps: steps in the background level between consecutive frames that persist, as made
 * by a camera switching its exposure or gain in one go (a spark is a one-frame spike and is not a
 * jump; sparks are skipped by the caller anyway).
 *
 * On the frames kept (skip = 0, level finite), with d_k = L_k − L_{k−1}:
 * - size: |d_k| > `zLimit` (default 8) robust standard deviations of d (1.4826·MAD, Hampel 1974)
 *   and |d_k| > `minRelStep` (default 3 %) of the level before;
 * - persistence: the median of the `settleFrames` (default 3) levels from k on minus the median
 *   of the `settleFrames` levels before k has the sign of d_k and at least half its size.
 * Detections in consecutive frames (a step spread over two frames by a rolling shutter) merge
 * into one jump at the larger step.
 *
 * Units: linear. Pure; throws KerrError INTERNAL for arrays of different length.
 * @example detectExposureJumps({ level: Float64Array.of(0.2,0.2,0.2,0.2,0.3,0.3,0.3,0.3), skip: new Uint8Array(8) })
 *   → [{ frameIndex: 4, relStep: 0.5, size: … }]
 */
import { KerrError } from '../../errors.js';
import { median, robustScale } from '../fit/robustScale.js';

export interface ExposureJumpsInput {
  level: Float64Array;
  /** 1 = leave the frame out (spark, clipped, unknown). */
  skip: Uint8Array;
  zLimit?: number;
  minRelStep?: number;
  settleFrames?: number;
}

export interface ExposureJump {
  frameIndex: number;
  /** Step relative to the level before. */
  relStep: number;
  /** Step in robust standard deviations of the frame-to-frame differences. */
  size: number;
}


export function detectExposureJumps(input: ExposureJumpsInput): ExposureJump[] {
  const { level, skip } = input;
  if (skip.length !== level.length) throw new KerrError('INTERNAL', 'level and skip series must have one entry per frame');
  const zLimit = input.zLimit ?? 8;
  const minRel = input.minRelStep ?? 0.03;
  const settle = input.settleFrames ?? 3;
  const idx: number[] = [];
  for (let f = 0; f < level.length; f++) if (!skip[f] && Number.isFinite(level[f]!)) idx.push(f);
  const m = idx.length;
  if (m < 2 * settle + 2) return [];
  const d = new Float64Array(m);
  for (let k = 1; k < m; k++) d[k] = level[idx[k]!]! - level[idx[k - 1]!]!;
  const scale = Math.max(robustScale(d.subarray(1)), 1e-9);
  const jumps: (ExposureJump & { k: number })[] = [];
  for (let k = 1; k < m; k++) {
    const step = d[k]!;
    const before = level[idx[k - 1]!]!;
    if (!(Math.abs(step) > zLimit * scale) || !(Math.abs(step) > minRel * Math.max(Math.abs(before), 1e-6))) continue;
    const pre: number[] = [];
    const post: number[] = [];
    for (let j = Math.max(0, k - settle); j < k; j++) pre.push(level[idx[j]!]!);
    for (let j = k; j < Math.min(m, k + settle); j++) post.push(level[idx[j]!]!);
    if (pre.length < settle || post.length < settle) continue;
    const persistent = median(post) - median(pre);
    if (Math.sign(persistent) !== Math.sign(step) || Math.abs(persistent) < 0.5 * Math.abs(step)) continue;
    const jump = { k, frameIndex: idx[k]!, relStep: step / Math.max(Math.abs(before), 1e-6), size: step / scale };
    const last = jumps[jumps.length - 1];
    if (last && last.k === k - 1 && Math.sign(last.size) === Math.sign(jump.size)) {
      if (Math.abs(jump.size) > Math.abs(last.size)) jumps[jumps.length - 1] = jump;
      continue;
    }
    jumps.push(jump);
  }
  return jumps.map(({ frameIndex, relStep, size }) => ({ frameIndex, relStep, size }));
}
