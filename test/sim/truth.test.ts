import { describe, expect, it } from 'vitest';
import { parseScenario } from '../../src/sim/scenario.js';
import { prepareScene } from '../../src/sim/scene.js';
import { makeRng } from '../../src/sim/rng.js';
import { buildTruth, haloBand } from '../../src/sim/truth.js';

/**
 * Mean of exp(−r²/2σ²) over the ring a < r ≤ b (area average, closed form of
 * ∫ e^(−r²/2σ²)·2πr dr / π(b² − a²)).
 */
const ringMean = (a: number, b: number, sigma: number) =>
  (2 * sigma * sigma * (Math.exp(-(a * a) / (2 * sigma * sigma)) - Math.exp(-(b * b) / (2 * sigma * sigma)))) / (b * b - a * a);

/** A scene of our own: 120×100 px, beam at (60, 50), halo σ 50 px. */
function scene(light: Record<string, unknown>) {
  const scenario = parseScenario({
    seed: 1,
    cell: { kerrConstantMPerV2: 2e-12, lengthMm: 40, gapMm: 4 },
    light: { centreXPx: 60, centreYPx: 50, amplitude: 0.5, ...light },
    dirt: { scatterFloor: 0.01, haloPeak: 0.02, haloSigmaPx: 50 },
    camera: { widthPx: 120, heightPx: 100, frameRateHz: 10 },
    drive: { segments: [{ kind: 'hold', durationS: 0.2 }] },
    logger: { sampleRateHz: 10 },
  }, 'truth-test.json');
  const clock = { timesS: Float64Array.of(0, 0.1), ticks: null, tickHz: null };
  return { scenario, scene: prepareScene(scenario, clock, makeRng(1)), clock };
}

describe('haloBand (the truth\'s "just outside the beam")', () => {
  it('is the ring r₅ < r ≤ r₅ + r₅₀ for a top-hat, with the least halo at the far corner', () => {
    const { scene: s } = scene({ profile: 'tophat', radiusPx: 12, edgePx: 1.5 });
    const b = haloBand(s);
    // G = f(r)/f(0), f(r) = 1/(1 + e^((r−R)/e)): G = k at r = R + e·ln((1 + e^(−R/e))/k − 1)
    const rAt = (k: number) => 12 + 1.5 * Math.log((1 + Math.exp(-12 / 1.5)) / k - 1);
    expect(b.widthPx).toBeGreaterThan(rAt(0.5) - 0.3);
    expect(b.widthPx).toBeLessThan(rAt(0.5) + 0.3);
    expect(b.meanHalo / ringMean(rAt(0.05), rAt(0.05) + b.widthPx, 50) - 1).toBeCloseTo(0, 2);
    // farthest pixel from (60, 50) is the corner (0, 0): r² = 60² + 50²
    expect(b.farHalo).toBeCloseTo(Math.exp(-(60 * 60 + 50 * 50) / (2 * 50 * 50)), 6);
    expect(b.pixels).toBeGreaterThan(0.9 * Math.PI * ((rAt(0.05) + b.widthPx) ** 2 - rAt(0.05) ** 2));
  });

  it('is the ring 2.45 σ < r ≤ 2.45 σ + 1.18 σ for a round Gaussian', () => {
    const { scene: s } = scene({ sigmaPx: 7 });
    const b = haloBand(s);
    const r5 = 7 * Math.sqrt(2 * Math.log(20)); // Gaussian at 5 % of its peak (textbook)
    const r50 = 7 * Math.sqrt(2 * Math.log(2)); // half maximum
    expect(Math.abs(b.widthPx - r50)).toBeLessThan(0.3);
    expect(b.meanHalo / ringMean(r5, r5 + r50, 50) - 1).toBeCloseTo(0, 2);
  });

  it('gives truth.haloToCoreRatio = S·(mean H over the band − least H)/A and the levels behind it', () => {
    const { scenario, scene: s, clock } = scene({ profile: 'tophat', radiusPx: 12, edgePx: 1.5 });
    const truth = buildTruth({
      scene: s, clock, frames: [{ voltageV: 0, gain: 1, clippedCount: 0 }, { voltageV: 0, gain: 1, clippedCount: 0 }],
      log: { text: '', rows: 0, columns: ['time_s', 'voltage_V'], firstTimeS: 0, lastTimeS: 0 },
      rawFramesSha256: '0', generator: { name: 'test', version: '0', ffmpegVersion: null },
    });
    const b = haloBand(s);
    expect(truth.haloToCoreRatio as number).toBeCloseTo((0.02 * (b.meanHalo - b.farHalo)) / 0.5, 10);
    const levels = truth.levels as Record<string, number>;
    expect(levels.haloNearBeam).toBeCloseTo(0.02 * b.meanHalo, 10);
    expect(levels.haloFarDark).toBeCloseTo(0.02 * b.farHalo, 10);
    expect(scenario.light.profile.kind).toBe('tophat');
  });
});
