/**
 * truth.json of a simulated run: the planted parameters in SI and the figures an analysis should
 * recover, so tests can compare kerrtrace's results with what was put in.
 *
 * Definitions (linear radiance, A = modulation amplitude, F = scatter floor, leak = A/ratio,
 * T_0 = Jones transmission at zero field, i.e. with the static retardance only):
 * - floorFraction = (F + leak + A·T_0)/A: zero-field beam light above its local surround over A
 *   (the halo lies under beam and surround alike and is not floor).
 * - haloToCoreRatio = S·exp(−r²/2σh²)/A with r the distance from the beam centre to the nearest
 *   ROI edge: the halo light just outside the beam over A.
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

  const cx = light.centreXPx;
  const cy = light.centreYPx;
  const roi = scene.roi;
  const edgeDistancePx = Math.min(cx - roi.x, roi.x + roi.w - 1 - cx, cy - roi.y, roi.y + roi.h - 1 - cy);
  const haloEdge = dirt.haloPeak * Math.exp(-(edgeDistancePx * edgeDistancePx) / (2 * dirt.haloSigmaPx * dirt.haloSigmaPx));

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
    haloToCoreRatio: round(haloEdge / amplitude),
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
      haloAtRoiEdge: round(haloEdge),
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
