/**
 * The gates of a photo run: core/gates/runGates with the inputs a photo series has.
 * - figures-finite, fit-not-converged, not-identifiable, weak-reach: as for video, from the fit
 *   and the budget's combined uncertainties.
 * - residual-excess: the fit's robust residual scale against the photo-to-photo noise. A photo
 *   series has no frame-to-frame sequence to take second differences of (photos at different
 *   voltages differ by the curve itself), so the noise is taken from repeats: photos at the same
 *   voltage, pooled standard deviation about each voltage's mean, √(Σ(I − Ī_V)²/Σ(n_V − 1)), when
 *   the repeats give at least MIN_REPEAT_DOF degrees of freedom. Without repeats the gate does not
 *   apply (noise NaN) and the record says so through fit.residualOverFrameNoise = null.
 * - sync-ambiguous and compression-starved do not apply (no second clock; photos are single
 *   pictures, not a compressed stream): passed as false and NaN.
 * Warnings: the plausibility of B against the built-in liquid table (data/liquidKerrRange).
 * Pure; throws nothing.
 * @example stillsGates({ fit, kerrStdErr, halfWaveStdErrV, voltageV, intensity }).failures
 */
import type { KerrCurveFit } from '../core/fit/fitKerrCurve.js';
import { runGates } from '../core/gates/runGates.js';
import { liquidKerrRangeMPerV2 } from '../data/liquidKerrRange.js';
import type { RunGateFailure, RunWarning } from '../result/schema.js';

export interface StillsGateInput {
  fit: KerrCurveFit;
  /** Combined standard uncertainties from the budget. */
  kerrStdErr: number;
  halfWaveStdErrV: number;
  /** Voltage and intensity of the photos the fit used. */
  voltageV: Float64Array;
  intensity: Float64Array;
}

/** Fewest degrees of freedom of the repeats for a noise estimate (our choice: 3 pooled differences). */
export const MIN_REPEAT_DOF = 3;

/** Photo-to-photo noise from photos repeated at the same voltage (pooled SD); NaN with too few repeats. */
export function photoNoise(voltageV: Float64Array, intensity: Float64Array): number {
  const groups = new Map<number, number[]>();
  voltageV.forEach((v, k) => { if (Number.isFinite(intensity[k]!)) groups.set(v, [...(groups.get(v) ?? []), intensity[k]!]); });
  let ss = 0, dof = 0;
  for (const g of groups.values()) {
    if (g.length < 2) continue;
    const mean = g.reduce((a, x) => a + x, 0) / g.length;
    for (const x of g) ss += (x - mean) ** 2;
    dof += g.length - 1;
  }
  return dof >= MIN_REPEAT_DOF ? Math.sqrt(ss / dof) : NaN;
}

export function stillsGates(g: StillsGateInput): { failures: RunGateFailure[]; warnings: RunWarning[]; noise: number } {
  const { fit } = g;
  const noise = photoNoise(g.voltageV, g.intensity);
  const gates = runGates({
    kerrConstant: fit.kerrConstant.value, kerrConstantStdErr: g.kerrStdErr,
    halfWaveVoltageV: fit.halfWaveVoltage.value, halfWaveStdErrV: g.halfWaveStdErrV,
    converged: fit.converged, fitReason: fit.reason, identifiable: fit.identifiable, maxVoltageOverHalfWave: fit.maxVoltageOverHalfWave,
    ampVpiCorrelation: fit.ampVpiCorrelation, relStdErrB: fit.relStdErrB,
    residualRms: fit.intensityNoise, signalAmplitude: fit.amplitude.value, frameNoise: noise,
    syncAmbiguous: false, bitsPerPixel: NaN, plausibleRangeMPerV2: liquidKerrRangeMPerV2(),
  });
  return { ...gates, noise };
}
