/**
 * Auto-exposure with a lag, like a phone camera: the gain it wants is target/mean (mean linear
 * radiance of the scene, all pixels and channels), clamped to [minGain, maxGain]; the gain it uses
 * follows that wish through a first-order lag with time constant τ = lagS:
 *   g_(k+1) = g_k + (1 − e^(−Δt/τ))·(g_wanted,k − g_k),  Δt = t_(k+1) − t_k  (τ = 0: no lag).
 * The first frame starts settled: g_0 = g_wanted,0. Fixed exposure is a constant gain.
 * Pure; throws nothing.
 * @example wantedGain({ targetMean: 0.18, lagS: 0.5, minGain: 0.05, maxGain: 20 }, 0.09) === 2
 */
import type { ScenarioCamera } from './scenario.js';

export type AutoExposure = NonNullable<ScenarioCamera['autoExposure']>;

/** The gain that would bring the mean radiance to the target, clamped. */
export function wantedGain(auto: AutoExposure, meanRadiance: number): number {
  const wanted = meanRadiance > 0 ? auto.targetMean / meanRadiance : auto.maxGain;
  return Math.min(auto.maxGain, Math.max(auto.minGain, wanted));
}

/** The gain for the next frame, Δt seconds later, after metering `meanRadiance` in this one. */
export function nextGain(auto: AutoExposure, gain: number, meanRadiance: number, dtS: number): number {
  const wanted = wantedGain(auto, meanRadiance);
  const follow = auto.lagS > 0 ? 1 - Math.exp(-dtS / auto.lagS) : 1;
  return gain + follow * (wanted - gain);
}
