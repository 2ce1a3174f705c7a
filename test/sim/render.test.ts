import { describe, expect, it } from 'vitest';
import { parseScenario } from '../../src/sim/scenario.js';
import { prepareScene } from '../../src/sim/scene.js';
import { frameTimes } from '../../src/sim/frameTimes.js';
import { makeRng } from '../../src/sim/rng.js';
import { exposeFrame, renderFrame, renderRadiance } from '../../src/sim/render.js';
import { makeCodeEncoder } from '../../src/sim/transfer.js';
import { OUTSIDE } from '../setup/outsideSources.js';

const W = 64;
const H = 48;
const CX = 32;
const CY = 24;

/** A dark, noiseless bench: only the beam, so the centre pixel is w_G·A·T (+ a stated leak). */
function bench(cell: Record<string, unknown>, voltageV: number, extra: { ambient?: number; amplitude?: number } = {}) {
  const json = {
    cell: { extinctionRatio: 1e12, ...cell },
    light: { sigmaPx: 6, centreXPx: CX, centreYPx: CY, channelWeights: [0.5, 1, 0.25], amplitude: extra.amplitude ?? 0.8 },
    dirt: { scatterFloor: 0, haloPeak: 0 },
    camera: { widthPx: W, heightPx: H, frameRateHz: 10, ambient: extra.ambient ?? 0, photonsPerFullScale: 0, readNoise: 0 },
    drive: { points: [{ timeS: 0, voltageV }, { timeS: 1, voltageV }] },
  };
  const scenario = parseScenario(json, 'test.json');
  const clock = frameTimes(scenario.camera.timing, scenario.durationS, makeRng(1));
  return prepareScene(scenario, clock, makeRng(1));
}

/** T = cos²(α−β) − sin2α·sin2β·sin²(δ/2), δ = 2π·B·L·V²/d² (Jones calculus, any optics text). */
function jones(alphaDeg: number, betaDeg: number, b: number, lengthM: number, gapM: number, voltageV: number): number {
  const a = (alphaDeg * Math.PI) / 180;
  const c = (betaDeg * Math.PI) / 180;
  const delta = 2 * Math.PI * b * lengthM * (voltageV / gapM) ** 2;
  return Math.cos(a - c) ** 2 - Math.sin(2 * a) * Math.sin(2 * c) * Math.sin(delta / 2) ** 2;
}

function centreRadiance(scene: ReturnType<typeof bench>): [number, number, number] {
  const work = new Float32Array(W * H * 3);
  renderRadiance(scene, 0, 0.5, work);
  const j = (CY * W + CX) * 3;
  return [work[j]!, work[j + 1]!, work[j + 2]!];
}

describe('renderer beam centre against the Jones transmission (any optics text; docs/references.md)', { tags: [OUTSIDE.workedExamples] }, () => {
  const cell = { kerrConstantMPerV2: 2.4e-12, lengthMm: 50, gapMm: 5 };
  const halfWaveV = 0.005 / Math.sqrt(2 * 2.4e-12 * 0.05); // d/√(2BL) ≈ 10206 V

  for (const fraction of [0, 0.3, 0.6, 1 / Math.SQRT2, 0.9, 1, 1.2]) {
    it(`crossed at 45°, V = ${fraction.toFixed(3)}·V_π: radiance = w·A·T with T from the closed form`, () => {
      const v = fraction * halfWaveV;
      const t = jones(45, -45, 2.4e-12, 0.05, 0.005, v);
      const [r, g, b] = centreRadiance(bench(cell, v));
      expect(g).toBeCloseTo(0.8 * t, 6);
      expect(r).toBeCloseTo(0.5 * 0.8 * t, 6);
      expect(b).toBeCloseTo(0.25 * 0.8 * t, 6);
    });
  }

  it('gives T = 1 at the half-wave voltage and T = 1/2 at the quarter-wave voltage (crossed at 45°: T = sin²(δ/2))', () => {
    expect(centreRadiance(bench(cell, halfWaveV))[1]).toBeCloseTo(0.8, 6);
    expect(centreRadiance(bench(cell, halfWaveV / Math.SQRT2))[1]).toBeCloseTo(0.4, 6);
  });

  it('follows Malus’s law T = cos²θ at zero field for analyser angles θ from the polariser (any optics text)', () => {
    for (const thetaDeg of [0, 30, 45, 60, 90, 120]) {
      const [, g] = centreRadiance(bench({ ...cell, polariserAngleDeg: 45, analyserAngleDeg: 45 - thetaDeg }, 0));
      expect(g).toBeCloseTo(0.8 * Math.cos((thetaDeg * Math.PI) / 180) ** 2, 6);
    }
  });

  it('matches the closed form for uncrossed polarisers under field (α = 20°, β = 80°)', () => {
    const v = 0.7 * halfWaveV;
    const [, g] = centreRadiance(bench({ ...cell, polariserAngleDeg: 20, analyserAngleDeg: 80 }, v));
    expect(g).toBeCloseTo(0.8 * jones(20, 80, 2.4e-12, 0.05, 0.005, v), 6);
  });

  it('nitrobenzene worked example: B = 2.4e-10 cm/V² at 30 kV/cm over L ≈ 2.3 cm is about half-wave (Lux notes)', () => {
    // E = 3 MV/m: 6 kV across 2 mm; L = 1/(2·B·E²) = 23.1 mm
    const [, g] = centreRadiance(bench({ kerrConstantMPerV2: 2.4e-12, lengthMm: 23.1, gapMm: 2 }, 6000));
    expect(g / 0.8).toBeGreaterThan(0.9999);
  });

  it('quarter-wave worked problem: B = 2.2e-10 cm/V², l = 10 cm, E = 1/(2√(B·l)) makes circular light, so T = 1/2 for any analyser (Irodov)', () => {
    const fieldVPerM = 1 / (2 * Math.sqrt(2.2e-12 * 0.1)); // ≈ 1.07e6 V/m (≈ 1.1e4 V/cm)
    expect(fieldVPerM / 100).toBeCloseTo(1.066e4, -2);
    const v = fieldVPerM * 0.002;
    for (const analyserDeg of [-45, 0, 30, 90]) {
      const [, g] = centreRadiance(bench({ kerrConstantMPerV2: 2.2e-12, lengthMm: 100, gapMm: 2, analyserAngleDeg: analyserDeg }, v));
      expect(g).toBeCloseTo(0.4, 6);
    }
  });

  it('adds the static retardance to the Kerr retardance and the polariser leak A/ratio to the floor', () => {
    const v = 0.5 * halfWaveV;
    const staticRad = 0.3;
    const scene = bench({ ...cell, staticRetardanceRad: staticRad, extinctionRatio: 1000 }, v);
    const kerrRad = 2 * Math.PI * 2.4e-12 * 0.05 * (v / 0.005) ** 2;
    const [, g] = centreRadiance(scene);
    expect(g).toBeCloseTo(0.8 * Math.sin((staticRad + kerrRad) / 2) ** 2 + 0.8 / 1000, 6);
  });

  it('writes code round(255·(ambient + w·A·T)) at the centre through a linear transfer with no noise', () => {
    const v = 0.8 * halfWaveV;
    const scene = bench(cell, v, { ambient: 0.05, amplitude: 0.7 });
    const out = new Uint8Array(W * H * 3);
    renderFrame(scene, 0, 0.5, 1, makeRng(9), makeCodeEncoder('linear'), out);
    const t = jones(45, -45, 2.4e-12, 0.05, 0.005, v);
    const j = (CY * W + CX) * 3;
    expect(out[j + 1]).toBe(Math.round(255 * (0.05 + 0.7 * t)));
    expect(out[j]).toBe(Math.round(255 * (0.05 + 0.5 * 0.7 * t)));
    expect(out[0]).toBe(Math.round(255 * 0.05)); // a far corner: ambient only (beam e^(-(32²+24²)/72) ≈ 0)
  });
});

describe('camera stage', () => {
  it('adds noise with variance s/N + σ_read² and clips at full scale', () => {
    const n = 60_000;
    const level = 0.25;
    const radiance = new Float32Array(n).fill(level);
    const out = new Uint8Array(n);
    const linear = makeCodeEncoder('linear');
    exposeFrame(radiance, 1, { photonsPerFullScale: 1000, readNoise: 0.01 }, makeRng(5), linear, out);
    let sum = 0;
    let sumSq = 0;
    for (const c of out) {
      sum += c / 255;
      sumSq += (c / 255) ** 2;
    }
    const mean = sum / n;
    const sd = Math.sqrt(sumSq / n - mean * mean);
    const expectedSd = Math.sqrt(level / 1000 + 0.01 ** 2); // 0.0176; 8-bit rounding adds 1/(255·√12) in quadrature
    expect(mean).toBeCloseTo(level, 3);
    expect(sd).toBeCloseTo(Math.sqrt(expectedSd ** 2 + 1 / (255 * 255 * 12)), 3);

    const bright = new Float32Array(1000).fill(0.9);
    const info = exposeFrame(bright, 2, { photonsPerFullScale: 0, readNoise: 0 }, makeRng(5), linear, new Uint8Array(1000));
    expect(info.clippedCount).toBe(1000);
  });

  it('applies the exposure gain before the transfer', () => {
    const radiance = new Float32Array([0.1, 0.2]);
    const out = new Uint8Array(2);
    exposeFrame(radiance, 1.5, { photonsPerFullScale: 0, readNoise: 0 }, makeRng(1), makeCodeEncoder('srgb'), out);
    expect(out[0]).toBe(makeCodeEncoder('srgb').encode(0.15));
    expect(out[1]).toBe(makeCodeEncoder('srgb').encode(0.3));
  });
});
