/**
 * Presentation times of the simulated frames.
 * - Constant rate f (as the fraction num/den): t_k = k·den/num for k = 0 … ⌈duration·f⌉ − 1.
 * - Variable rate, like a phone: each interval is n ticks of 1/tickHz with n drawn from
 *   minTicks … maxTicks (weights tickWeights); t_0 = 0 and frames continue while t < duration.
 * Units: seconds. Pure (the RNG is passed in). Throws nothing.
 * @example frameTimes({ kind: 'constant', frameRateHz: 30, rational: [30, 1] }, 1, rng).timesS.length === 30
 */
import type { FrameTiming } from './scenario.js';
import type { Rng } from './rng.js';

export interface FrameClock {
  timesS: Float64Array;
  /** For variable timing: each frame's start in ticks; null for a constant rate. */
  ticks: Int32Array | null;
  tickHz: number | null;
}

export function frameTimes(timing: FrameTiming, durationS: number, rng: Rng): FrameClock {
  if (timing.kind === 'constant') {
    const [num, den] = timing.rational;
    const count = Math.max(1, Math.ceil((durationS * num) / den - 1e-9));
    const timesS = new Float64Array(count);
    for (let k = 0; k < count; k++) timesS[k] = (k * den) / num;
    return { timesS, ticks: null, tickHz: null };
  }
  const { tickHz, minTicks, tickWeights } = timing;
  let totalWeight = 0;
  for (const w of tickWeights) totalWeight += w;
  const ticks: number[] = [];
  const endTicks = durationS * tickHz - 1e-9;
  for (let t = 0; t < endTicks && ticks.length < 1_000_000; ) {
    ticks.push(t);
    let pick = rng.uniform() * totalWeight;
    let n = minTicks;
    for (let i = 0; i < tickWeights.length; i++) {
      pick -= tickWeights[i]!;
      if (pick < 0) {
        n = minTicks + i;
        break;
      }
      if (tickWeights[i]! > 0) n = minTicks + i; // rounding guard: the last positive weight wins
    }
    t += n;
  }
  const tickArr = Int32Array.from(ticks);
  const timesS = new Float64Array(tickArr.length);
  for (let k = 0; k < tickArr.length; k++) timesS[k] = tickArr[k]! / tickHz;
  return { timesS, ticks: tickArr, tickHz };
}
