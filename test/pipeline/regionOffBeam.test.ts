/**
 * Issue 12, "impossible inputs accepted": a beam region put on empty background gave B from noise
 * and drift (2.6× the truth here) with a warning that blamed a repeating drive. The run must be
 * marked not valid for the right reason: the fitted curve explains little of what the region shows.
 * Rendered by the project's simulator (test-media/cfr-ramp, beam at 130,90; the region at 5,5 is
 * background).
 */
import { describe, expect, it } from 'vitest';
import { analyzeRun } from '../../src/pipeline/analyze.js';

const dir = 'test-media/cfr-ramp/run';

describe('a beam region on empty background', () => {
  it('is marked not valid by the weak-signal gate (R² of the fit), and the beam itself passes it', async () => {
    const base = { videoPath: `${dir}/clip.mp4`, voltsPath: `${dir}/volts.csv`, lengthMm: 50, gapMm: 5 };
    const hooks = { toolVersion: 'test', ffmpegVersion: null };
    const off = await analyzeRun({ ...base, roi: { x: 5, y: 5, w: 20, h: 20 } }, hooks);
    expect(off.result.validity!.valid).toBe(false);
    expect(off.result.validity!.failures.map((f) => f.gate)).toContain('weak-signal');
    const on = await analyzeRun({ ...base, roi: { x: 110, y: 70, w: 41, h: 41 } }, hooks);
    expect(on.result.validity!.failures.map((f) => f.gate)).not.toContain('weak-signal');
  });
});
