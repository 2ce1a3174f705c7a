/**
 * Sparks and flashes: single frames whose overall brightness jumps above their neighbours on
 * both sides. d_t = m_t − max(median(m_{t−k..t−1}), median(m_{t+1..t+k})), so that a lasting
 * step (a drive step, an exposure change) is not a flash; a frame is a flash when d_t exceeds
 * `zLimit` robust standard deviations of d (1.4826·MAD, the normal-consistent scale) and also a
 * small absolute floor, so that a perfectly still clip does not flag quantisation steps.
 * Pure. Returns per-frame flags and the robust z of each flagged frame.
 */
import { median } from '../fit/robustScale.js';

export interface FlashDetection {
  flags: Uint8Array;
  z: Float64Array;
  count: number;
}


export function detectFlashes(frameMean: ArrayLike<number>, options: { halfWindow?: number; zLimit?: number; minJump?: number } = {}): FlashDetection {
  const n = frameMean.length;
  const k = options.halfWindow ?? 3;
  const zLimit = options.zLimit ?? 8;
  const minJump = options.minJump ?? 0.01;
  const d = new Float64Array(n);
  for (let t = 0; t < n; t++) {
    const before: number[] = [];
    const after: number[] = [];
    for (let j = Math.max(0, t - k); j < t; j++) before.push(frameMean[j]!);
    for (let j = t + 1; j <= Math.min(n - 1, t + k); j++) after.push(frameMean[j]!);
    const level = Math.max(before.length ? median(before) : -Infinity, after.length ? median(after) : -Infinity);
    d[t] = Number.isFinite(level) ? frameMean[t]! - level : 0;
  }
  const absDev = Array.from(d, (x) => Math.abs(x));
  const scale = 1.4826 * median(absDev) || 1e-12;
  const flags = new Uint8Array(n);
  const z = new Float64Array(n);
  let count = 0;
  for (let t = 0; t < n; t++) {
    z[t] = d[t]! / scale;
    if (z[t]! > zLimit && d[t]! > minJump * Math.max(1e-6, Math.abs(frameMean[t]! - d[t]!)) ) {
      flags[t] = 1;
      count++;
    }
  }
  return { flags, z, count };
}
