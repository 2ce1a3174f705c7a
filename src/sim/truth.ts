/**
 * truth.json of a simulated run: the planted parameters in SI and the figures an analysis should
 * recover, so tests can compare kerrtrace's results with what was put in.
 *
 * Definitions (linear radiance, A = modulation amplitude, F = scatter floor, leak = A/ratio,
 * T_0 = Jones transmission at zero field, i.e. with the static retardance only):
 * - floorFraction = (F + leak + A·T_0)/A: zero-field beam light above its local surround over A
 *   (the halo lies under beam and surround alike and is not floor).
 * - haloToCoreRatio = S·(H̄_band − H_far)/A: the static forward-scatter light just outside the
 *   beam, above the far dark level, over the core's modulation amplitude (the measurement's
 *   definition, src/core/scatter/haloToCoreRatio.ts). "Just outside the beam" is the band of
 *   pixels where the beam profile G is below 5 % of its peak but within w = r₅₀ = √(N₅₀/π) px of
 *   a pixel where it is not (N₅₀ pixels have G ≥ 0.5: r₅₀ is the half-peak radius); for a round
 *   beam the ring r₅ < r ≤ r₅ + r₅₀. H̄_band is the mean of H over the band, H_far the least H in
 *   the frame (the far dark). Beam, halo and A share the light's colour, so the ratio is the same
 *   in any luma weighting; the grey ambient cancels in the difference.
 * - contrastRatio = highest / lowest beam light above its surround, A·T(V) + F + leak, over the
 *   frames of the clip (Rec. 709 luma weights of the channels, which matters only with dispersion).
 * - halfWaveVoltageV = d/√(2·B·L_eff); maxVoltageOverHalfWave = max |V| at frame times / V_π.
 * Pure; throws nothing.
 */
import type { Rect } from '../media/types.js';
import { halfWaveVoltageV, jonesTransmission } from '../core/physics/kerr.js';
import { drivePeakV } from './drive.js';
import type { FrameClock } from './frameTimes.js';
import { channelTransmission } from './render.js';
import type { Scene } from './scene.js';
import type { VoltageLogText } from './voltageLogWriter.js';

export const TRUTH_SCHEMA_VERSION = 1;

/** Rec. 709 luma coefficients of linear R, G, B (ITU-R BT.709-6). */
const LUMA: [number, number, number] = [0.2126, 0.7152, 0.0722];

export interface FrameRecord {
  voltageV: number;
  gain: number;
  clippedCount: number;
}

export interface TruthInputs {
  scene: Scene;
  clock: FrameClock;
  frames: FrameRecord[];
  log: VoltageLogText;
  rawFramesSha256: string;
  generator: { name: string; version: string; ffmpegVersion: string | null };
}

const round = (x: number, digits = 12): number => Number(x.toPrecision(digits));
const rectArray = (r: Rect): [number, number, number, number] => [r.x, r.y, r.w, r.h];

export interface HaloBand {
  /** Mean of the halo image H (peak 1) over the band just outside the beam. */
  meanHalo: number;
  /** The least H in the frame: the halo left in the far dark. */
  farHalo: number;
  /** Band width w = r₅₀, px. */
  widthPx: number;
  pixels: number;
}

/**
 * The band "just outside the beam" on the pixel grid (see the file comment): G < 0.05, within
 * w = √(N₅₀/π) of a pixel with G ≥ 0.05, and the mean and least of H. Only footprint pixels with a
 * 4-neighbour outside the footprint can be nearest, so only they are searched.
 */
export function haloBand(scene: Pick<Scene, 'width' | 'height' | 'beam' | 'halo'>): HaloBand {
  const { width: w, height: h, beam, halo } = scene;
  const FOOT = 0.05;
  let coreCount = 0;
  let x0 = w, y0 = h, x1 = -1, y1 = -1;
  let farHalo = Infinity;
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const i = y * w + x;
      const g = beam[i]!;
      farHalo = Math.min(farHalo, halo[i]!);
      if (g >= 0.5) coreCount++;
      if (g >= FOOT) { x0 = Math.min(x0, x); x1 = Math.max(x1, x); y0 = Math.min(y0, y); y1 = Math.max(y1, y); }
    }
  }
  const widthPx = Math.sqrt(coreCount / Math.PI);
  if (x1 < 0 || !Number.isFinite(farHalo)) return { meanHalo: 0, farHalo: Number.isFinite(farHalo) ? farHalo : 0, widthPx, pixels: 0 };
  const inside = (x: number, y: number) => x >= 0 && x < w && y >= 0 && y < h && beam[y * w + x]! >= FOOT;
  const edge: number[] = [];
  for (let y = y0; y <= y1; y++) {
    for (let x = x0; x <= x1; x++) {
      if (inside(x, y) && (!inside(x - 1, y) || !inside(x + 1, y) || !inside(x, y - 1) || !inside(x, y + 1))) edge.push(x, y);
    }
  }
  const reach = Math.ceil(widthPx);
  const limit = widthPx * widthPx + 1e-9;
  let sum = 0;
  let pixels = 0;
  for (let y = Math.max(0, y0 - reach); y <= Math.min(h - 1, y1 + reach); y++) {
    for (let x = Math.max(0, x0 - reach); x <= Math.min(w - 1, x1 + reach); x++) {
      if (inside(x, y)) continue;
      let near = false;
      for (let k = 0; k < edge.length && !near; k += 2) near = (x - edge[k]!) ** 2 + (y - edge[k + 1]!) ** 2 <= limit;
      if (!near) continue;
      sum += halo[y * w + x]!;
      pixels++;
    }
  }
  return { meanHalo: pixels > 0 ? sum / pixels : 0, farHalo, widthPx, pixels };
}

export function buildTruth(input: TruthInputs): Record<string, unknown> {
  const { scene, clock, frames, log } = input;
  const scenario = scene.scenario;
  const { cell, light, dirt, camera, logger } = scenario;
  const amplitude = light.amplitude;
  const b = cell.kerrConstantMPerV2;
  const halfWaveV = halfWaveVoltageV(b, cell.effectiveLengthM, cell.gapM);
  const rawZeroFieldT = jonesTransmission(cell.polariserAngleRad, cell.analyserAngleRad, cell.staticRetardanceRad);
  const zeroFieldT = Math.abs(rawZeroFieldT) < 1e-15 ? 0 : rawZeroFieldT; // crossed: cos²(90°) is 1e-33, not a leak
  const staticLight = amplitude * zeroFieldT;
  const floorLevel = dirt.scatterFloor + scene.polariserLeak + staticLight;

  const roi = scene.roi;
  const band = haloBand(scene);
  const haloNear = dirt.haloPeak * band.meanHalo;
  const haloFar = dirt.haloPeak * band.farHalo;

  // beam light above surround, luma-weighted over channels, at every frame
  const w = light.channelWeights;
  const lumaWeight = LUMA[0] * w[0] + LUMA[1] * w[1] + LUMA[2] * w[2];
  let lowest = Infinity;
  let highest = -Infinity;
  let maxAbsV = 0;
  for (const f of frames) {
    const t = channelTransmission(scene, f.voltageV);
    let level = 0;
    for (let c = 0; c < 3; c++) level += LUMA[c]! * w[c]! * (amplitude * t[c]! + dirt.scatterFloor + scene.polariserLeak);
    level /= lumaWeight;
    lowest = Math.min(lowest, level);
    highest = Math.max(highest, level);
    maxAbsV = Math.max(maxAbsV, Math.abs(f.voltageV));
  }
  const contrastRatio = lowest > 0 ? highest / lowest : null;

  const exposure = camera.autoExposure
    ? {
        mode: 'auto',
        formula: 'g_(k+1) = g_k + (1 - exp(-dt/lagS))*(clamp(targetMean/mean radiance of frame k) - g_k); g_0 settled',
        ...camera.autoExposure,
        gainPerFrame: frames.map((f) => round(f.gain, 8)),
      }
    : { mode: 'fixed', gain: camera.gain };

  const timing = camera.timing;
  const durationS = clock.timesS.length > 0 ? scenario.durationS : 0;
  const channelNames = ['r', 'g', 'b'] as const;
  const channels = Object.fromEntries(channelNames.map((name, c) => {
    const bc = scene.kerrConstantPerChannel[c]!;
    return [name, { weight: w[c], kerrConstantMPerV2: bc, halfWaveVoltageV: round(halfWaveVoltageV(bc, cell.effectiveLengthM, cell.gapM)) }];
  }));

  const truth: Record<string, unknown> = {
    kind: 'kerrtrace-sim-truth',
    schemaVersion: TRUTH_SCHEMA_VERSION,
    generator: input.generator,
    label: scenario.label,
    notes: scenario.notes,
    seed: scenario.seed,
    files: { clip: 'clip.mp4', volts: 'volts.csv', scenario: 'scenario.json' },
    rawFramesSha256: input.rawFramesSha256,

    B: b,
    kerrConstantMPerV2: b,
    halfWaveVoltageV: round(halfWaveV),
    quarterWaveVoltageV: round(halfWaveV / Math.SQRT2),
    offsetS: logger.clockOffsetS,
    floorFraction: round(floorLevel / amplitude),
    haloToCoreRatio: round((haloNear - haloFar) / amplitude),
    contrastRatio: contrastRatio === null ? null : round(contrastRatio),
    roi: rectArray(roi),
    ...(scene.referenceRoi ? { referenceRoi: rectArray(scene.referenceRoi), referenceRadiance: camera.referencePatch!.radiance } : {}),
    maxVoltageV: round(maxAbsV),
    maxVoltageOverHalfWave: round(maxAbsV / halfWaveV),
    drivePeakV: drivePeakV(scenario.drive),
    peakFieldVPerM: round(drivePeakV(scenario.drive) / cell.gapM),
    breakdownFieldVPerM: cell.breakdownFieldVPerM,
    breakdownFieldSource: cell.breakdownFieldSource,

    levels: {
      unit: 'linear radiance, fraction of full scale at gain 1',
      amplitude,
      scatterFloor: dirt.scatterFloor,
      polariserLeak: round(scene.polariserLeak),
      staticRetardanceLight: round(staticLight),
      floorTotal: round(floorLevel),
      haloPeak: dirt.haloPeak,
      haloSigmaPx: dirt.haloSigmaPx,
      haloNearBeam: round(haloNear),
      haloFarDark: round(haloFar),
      haloBandWidthPx: round(band.widthPx, 6),
      haloBandPixels: band.pixels,
      ambient: camera.ambient,
    },
    cell: {
      lengthM: cell.lengthM,
      effectiveLengthM: cell.effectiveLengthM,
      gapM: cell.gapM,
      staticRetardanceRad: cell.staticRetardanceRad,
      polariserAngleDeg: round((cell.polariserAngleRad * 180) / Math.PI),
      analyserAngleDeg: round((cell.analyserAngleRad * 180) / Math.PI),
      extinctionRatio: cell.extinctionRatio,
      resistivityOhmM: cell.resistivityOhmM,
      electrodeHeightM: cell.electrodeHeightM,
      electrodeAreaM2: cell.electrodeHeightM === null ? null : round(cell.lengthM * cell.electrodeHeightM),
      temperatureC: cell.temperatureC,
    },
    light: {
      profile: light.profile,
      centrePx: [light.centreXPx, light.centreYPx],
      white: light.white,
      wavelengthM: light.wavelengthM,
      channelWeights: light.channelWeights,
      dispersion: light.dispersion,
    },
    channels,
    camera: {
      widthPx: camera.widthPx,
      heightPx: camera.heightPx,
      variableFrameRate: timing.kind === 'variable',
      frameRateHz: timing.kind === 'constant' ? timing.frameRateHz : null,
      ...(timing.kind === 'variable'
        ? { tickHz: timing.tickHz, minTicks: timing.minTicks, maxTicks: timing.maxTicks, tickWeights: timing.tickWeights }
        : {}),
      meanFrameRateHz: clock.timesS.length > 1 ? round((clock.timesS.length - 1) / clock.timesS[clock.timesS.length - 1]!, 8) : null,
      transfer: camera.transfer,
      range: 'limited',
      matrix: 'bt709',
      photonsPerFullScale: camera.photonsPerFullScale,
      readNoise: camera.readNoise,
      crf: camera.crf,
      framesWithClipping: frames.filter((f) => f.clippedCount > 0).length,
    },
    exposure,
    durationS,
    frameCount: clock.timesS.length,
    frameTimesS: Array.from(clock.timesS, (t) => round(t)),
    frameVoltagesV: frames.map((f) => round(f.voltageV, 9)),
    drive: scenario.drive,
    sparks: scene.sparks.map((s) => ({ timeS: round(s.timeS), frameIndex: s.frameIndex })),
    particles: scene.particles.map((p) => ({
      startS: round(p.startS),
      endS: round(p.endS),
      closestApproachS: round((p.startS + p.endS) / 2),
      closestApproachPx: round(p.closestApproachPx, 6),
      brightness: dirt.particles.brightness,
    })),
    log: {
      file: 'volts.csv',
      columns: log.columns,
      header: logger.header,
      delimiter: logger.delimiter,
      decimalComma: logger.decimalComma,
      lineEnding: logger.lineEnding,
      timeUnit: logger.timeUnit,
      voltageUnit: logger.voltageUnit,
      currentUnit: log.columns.some((c) => c.startsWith('current_')) ? logger.currentUnit : null,
      sampleRateHz: logger.sampleRateHz,
      noiseV: logger.noiseV,
      rows: log.rows,
      firstTimeS: round(log.firstTimeS),
      lastTimeS: round(log.lastTimeS),
      spanInVideoTimeS: [round(log.firstTimeS + logger.clockOffsetS), round(log.lastTimeS + logger.clockOffsetS)],
    },
  };
  return truth;
}
