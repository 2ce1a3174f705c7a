/**
 * Hysteresis is flagged only beyond what the sync offset's uncertainty explains (issue 12 saw
 * "hysteresis" on cells that have none). Numbers invented for the test; the rule is the doc
 * comment's: z = ΔB/√(σ_ΔB² + σ_sync²), flagged when |z| > 3 and |ΔB| > 1 %.
 */
import { describe, expect, it } from 'vitest';
import { hysteresisVerdict } from '../../../src/core/scatter/hysteresisVerdict.js';

const h = { up: { value: 2.23e-12, stdErr: 5e-15 }, down: { value: 2.17e-12, stdErr: 5e-15 }, difference: { value: 6e-14, stdErr: 7.07e-15 }, zScore: 8.5, flagged: true };

describe('hysteresisVerdict', () => {
  it('withdraws the flag when a 1σ shift of the sync offset opens a difference as large', () => {
    const v = hysteresisVerdict(h, 1.1e-13, 0.1e-13); // σ_sync = 5e-14
    expect(v.syncStdErr).toBeCloseTo(5e-14, 20);
    expect(v.zScore).toBeCloseTo(6e-14 / Math.hypot(7.07e-15, 5e-14), 6);
    expect(v.flagged).toBe(false);
  });
  it('keeps it when the sync cannot explain the difference', () => {
    const v = hysteresisVerdict(h, 6.1e-14, 5.9e-14);
    expect(v.flagged).toBe(true);
    expect(Math.abs(v.zScore)).toBeGreaterThan(3);
  });
});
