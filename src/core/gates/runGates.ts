/**
 * The gates a run must pass before its figures are printed as numbers (issue: "a confident wrong
 * number is the worst defect"). Each failed gate gives a stable code and a one-line reason; the
 * run is then written but marked not valid, and `analyze` exits 3.
 *
 * Gates (thresholds are this tool's choices, checked by the coverage study in docs/uncertainty.md):
 * - figures-finite: B, V_π and their uncertainties are finite numbers.
 * - fit-not-converged: the fit stopped without converging (after refining starts that ran out of
 *   iterations).
 * - not-identifiable: the sweep does not separate brightness from V_π (fit's own test).
 * - weak-reach: with the amplitude fitted (no open level), amplitude and V_π are correlated beyond
 *   WEAK_REACH_CORRELATION and B's relative error exceeds WEAK_REACH_REL_ERROR: the sweep shows
 *   only the foot of the curve (a clip cut to the start of a sweep gave B 15× too large with
 *   correlation 0.975 and 17 % error while passing the fit's own, looser test).
 * - residual-excess: the fit's robust residual scale (median-based, so a few frames at a step or a
 *   spark do not count) exceeds RESIDUAL_EXCESS_LIMIT × the frame-to-frame noise (frameNoise) — the model does not describe the data: a log from another recording, a
 *   wrong sync, a wrong branch. Compression-correlated residuals stay well below this limit.
 * - weak-signal: the fitted Kerr curve explains less than WEAK_SIGNAL_SHARE of the variation of
 *   the beam intensity over the frames used (R², explainedShare): the region shows little that
 *   follows the drive — a region on empty background, a beam blocked or out of frame. Such a fit
 *   can still report a tight B from noise and drift (a region on the background of a test clip
 *   gave B 2.6× the truth at R² 0.08); on a real beam R² is above 0.9 even at 0.6·V_π reach.
 * - sync-ambiguous: the sync search found a runner-up as good as the best offset.
 * - compression-starved: the file holds fewer than STARVED_BITS_PER_PIXEL bits per pixel per
 *   frame. Starved H.264 flattens a dim spot, lets it brighten frames late and makes the dark level
 *   depend on history: in the coverage study (docs/uncertainty.md) runs below this rate were off
 *   by up to 7σ while the rest were covered.
 * Warnings (not gates): a Kerr constant outside the range of the built-in liquid table by more than
 * 10× either way (`implausibleRangeMPerV2`).
 * Pure; throws nothing.
 */
import type { RunGateFailure, RunWarning } from '../../result/schema.js';
import type { InputName } from '../inputName.js';

export const RESIDUAL_EXCESS_LIMIT = 4;
export const STARVED_BITS_PER_PIXEL = 0.025;
export const RESIDUAL_SIGNAL_FRACTION = 0.02;
export const WEAK_REACH_CORRELATION = 0.95;
export const WEAK_REACH_REL_ERROR = 0.1;
/** Least share of the beam intensity's variation (R²) the fitted curve must explain; this tool's choice. */
export const WEAK_SIGNAL_SHARE = 0.5;

export interface GateInput {
  kerrConstant: number;
  kerrConstantStdErr: number;
  halfWaveVoltageV: number;
  halfWaveStdErrV: number;
  converged: boolean;
  fitReason: string;
  identifiable: boolean;
  maxVoltageOverHalfWave: number;
  /** Fit correlation of amplitude and V_π (0 when the amplitude was held at an open level). */
  ampVpiCorrelation?: number;
  /** Relative standard error of B from the fit (statistical). */
  relStdErrB?: number;
  /** Robust scale of the fit's residuals (same units as the intensity). */
  residualRms: number;
  /** Fitted modulation amplitude (same units), the size of the signal. */
  signalAmplitude: number;
  frameNoise: number;
  /** R² of the fitted curve over the frames used (explainedShare); omitted: not checked. */
  explainedShare?: number;
  syncAmbiguous: boolean;
  /** File bits per pixel per frame. */
  bitsPerPixel: number;
  /** [lowest, highest] Kerr constant of the built-in liquid table, m/V². */
  plausibleRangeMPerV2: [number, number];
}

export function runGates(g: GateInput): { failures: RunGateFailure[]; warnings: RunWarning[] } {
  const failures: RunGateFailure[] = [];
  const warnings: RunWarning[] = [];
  const fail = (gate: string, message: string, inputs?: InputName[]) => failures.push(inputs ? { gate, message, inputs } : { gate, message });
  if (![g.kerrConstant, g.kerrConstantStdErr, g.halfWaveVoltageV, g.halfWaveStdErrV].every(Number.isFinite)) {
    fail('figures-finite', 'the fit gave no finite Kerr constant or uncertainty');
  }
  if (!g.converged) fail('fit-not-converged', `the fit stopped without converging (${g.fitReason})`);
  if (!g.identifiable) fail('not-identifiable', 'the sweep does not reach far enough to separate brightness from the half-wave voltage (which is therefore unknown); record an open level or sweep higher if the cell allows it', ['openLevel']);
  if (g.identifiable && g.ampVpiCorrelation !== undefined && g.relStdErrB !== undefined && Math.abs(g.ampVpiCorrelation) > WEAK_REACH_CORRELATION && g.relStdErrB > WEAK_REACH_REL_ERROR) {
    fail('weak-reach', `the sweep shows only the foot of the curve: brightness and half-wave voltage trade off (correlation ${g.ampVpiCorrelation.toFixed(3)}, B uncertain by ${(g.relStdErrB * 100).toFixed(0)} %), so the half-wave voltage is not measured; record an open level or sweep higher if the cell allows it`, ['openLevel']);
  }
  if (Number.isFinite(g.frameNoise) && g.frameNoise > 0 && g.residualRms > RESIDUAL_EXCESS_LIMIT * g.frameNoise && g.residualRms > RESIDUAL_SIGNAL_FRACTION * Math.abs(g.signalAmplitude)) {
    fail('residual-excess', `the fit leaves residuals ${(g.residualRms / g.frameNoise).toFixed(1)}× the frame-to-frame noise, so the model does not describe the data (a log from another recording, a wrong sync offset or a wrong region?)`);
  }
  if (g.explainedShare !== undefined && Number.isFinite(g.explainedShare) && g.explainedShare < WEAK_SIGNAL_SHARE) {
    fail('weak-signal', `the fitted Kerr curve explains only ${Math.max(0, g.explainedShare * 100).toFixed(0)} % of how the brightness in the beam region varies, so the region shows little that follows the drive (on empty background, or the beam blocked); check the beam region on the report's picture`, ['beamRegion']);
  }
  if (g.syncAmbiguous) fail('sync-ambiguous', 'two sync offsets fit about equally well, so the voltage at each frame is not known; give the sync offset or record a drive without repeats', ['syncOffset']);
  if (Number.isFinite(g.bitsPerPixel) && g.bitsPerPixel < STARVED_BITS_PER_PIXEL) {
    fail('compression-starved', `the clip holds only ${g.bitsPerPixel.toFixed(3)} bits per pixel per frame, so compression flattens the spot and delays its changes; record at a higher bitrate or quality setting`);
  }
  const [lo, hi] = g.plausibleRangeMPerV2;
  if (Number.isFinite(g.kerrConstant) && g.kerrConstant > 0 && (g.kerrConstant < lo / 10 || g.kerrConstant > hi * 10)) {
    warnings.push({ code: 'implausible-kerr-constant', message: `B = ${g.kerrConstant.toExponential(2)} m/V² is more than 10× outside the range of the built-in liquid table (${lo.toExponential(1)}–${hi.toExponential(1)} m/V²); check the units of the log (V, kV) and of the cell's length and gap`, inputs: ['length', 'gap'] });
  }
  return { failures, warnings };
}
