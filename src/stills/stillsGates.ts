/**
 * The gates of a photo run: core/gates/runGates with the inputs a photo series has.
 * - figures-finite, fit-not-converged, not-identifiable, weak-reach: as for video, from the fit
 *   and the budget's combined uncertainties.
 * - residual-excess: the fit's robust residual scale against the photo-to-photo noise, taken as
 *   core/gates/frameNoise of the used intensities ordered by |V| (second differences). Between
 *   photos at different voltages those differences also hold the curve's own bend, so the noise
 *   reads high and the gate is lenient (it never fires on a good series; it still catches a
 *   voltage map that belongs to other photos, whose residuals dwarf the scatter).
 * - sync-ambiguous and compression-starved do not apply (no second clock; photos are single
 *   pictures, not a compressed stream): passed as false and NaN.
 * Warnings: the plausibility of B against the built-in liquid table (data/liquidKerrRange).
 * Pure; throws nothing.
 * @example stillsGates({ fit, kerrStdErr, halfWaveStdErrV, voltageV, intensity }).failures
 */
import type { KerrCurveFit } from '../core/fit/fitKerrCurve.js';
import { frameNoise } from '../core/gates/frameNoise.js';
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

/** Photo-to-photo noise: frameNoise of the intensities ordered by |V| (lenient: see the file comment). */
export function photoNoise(voltageV: Float64Array, intensity: Float64Array): number {
  const order = Array.from(voltageV, (_, k) => k).sort((a, b) => Math.abs(voltageV[a]!) - Math.abs(voltageV[b]!) || a - b);
  return frameNoise(Float64Array.from(order, (k) => intensity[k]!));
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
