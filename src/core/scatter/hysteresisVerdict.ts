/**
 * Whether a rising/falling difference of B is real, given what the sync offset's uncertainty
 * alone can make of it. An offset error δ shifts the voltage of rising frames one way and of
 * falling frames the other, so it opens an up/down difference in B by itself. With ΔB(±) the
 * difference found with the voltage read at offset ± u(offset):
 *   σ_sync = |ΔB(+) − ΔB(−)|/2,   z = ΔB/√(σ_ΔB² + σ_sync²),
 *   flagged when |z| > zLimit (3) and |ΔB| > minRel (1 %) of the mean B.
 * (σ_ΔB from the branch fits, which are widened for correlated residuals.) Pure; returns the
 * figures unchanged apart from zScore and flagged, plus σ_sync.
 * @example hysteresisVerdict({ up, down, difference, zScore: 4, flagged: true }, 2e-14, 0.7e-14) → flagged false when σ_sync is large
 */
import type { HysteresisFigures } from './hysteresis.js';

export function hysteresisVerdict(h: HysteresisFigures, differencePlus: number, differenceMinus: number, zLimit = 3, minRel = 0.01): HysteresisFigures & { syncStdErr: number } {
  const syncStdErr = Number.isFinite(differencePlus) && Number.isFinite(differenceMinus) ? Math.abs(differencePlus - differenceMinus) / 2 : 0;
  const sigma = Math.hypot(h.difference.stdErr ?? 0, syncStdErr);
  const zScore = sigma > 0 ? h.difference.value / sigma : h.zScore;
  const mean = (h.up.value + h.down.value) / 2;
  const flagged = Math.abs(zScore) > zLimit && Math.abs(h.difference.value) > minRel * Math.abs(mean);
  return { ...h, zScore, flagged, syncStdErr };
}
