/**
 * A bench scenario for `kerrtrace simulate`: the physical cell, the light, the dirt, the camera,
 * the drive and the voltage logger, parsed from JSON into SI units with every default filled in.
 * docs/scenario.md is the reference for every key (unit, default, meaning).
 *
 * Rules: keys carry their units in their names; unknown keys are errors naming the key and the close
 * valid ones; required keys (cell.kerrConstantMPerV2, cell.lengthMm, cell.gapMm, drive) missing are
 * errors; sizes must be positive; a drive whose peak field |V|/d exceeds the breakdown field
 * (default 3 MV/m for air, common practice, or cell.liquidBreakdownKvPerMm) is refused with code
 * UNSAFE and a high-voltage caution.
 *
 * Throws KerrError BAD_SCENARIO (bad values) or UNSAFE (field above breakdown).
 * @example parseScenario({ cell: { kerrConstantMPerV2: 2.4e-12, lengthMm: 50, gapMm: 5 },
 *   drive: { segments: [{ kind: 'ramp', toKv: 10, durationS: 5 }] } }, 'run.json').durationS === 5
 */
import { KerrError } from '../errors.js';
import type { Rect } from '../media/types.js';
import { DEG, halfWaveVoltageV } from '../core/physics/kerr.js';
import { ScenarioReader } from './scenarioReader.js';
import { channelWeightsForWavelength } from './cameraResponse.js';
import { drivePeakV, driveDurationS, type Drive, type DrivePoint, type DriveSegment } from './drive.js';
import type { SimToneCurve, SimTransfer } from './transfer.js';

export type Rgb = [number, number, number];

export interface ScenarioCell {
  kerrConstantMPerV2: number;
  lengthM: number;
  /** Optical (effective) length including fringe fields, ≥ lengthM; used for the retardance. */
  effectiveLengthM: number;
  gapM: number;
  staticRetardanceRad: number;
  polariserAngleRad: number;
  analyserAngleRad: number;
  /** Time for one full turn of the analyser, s (a calibration recording; 0 = the analyser stays put). */
  analyserTurnPeriodS: number;
  extinctionRatio: number;
  breakdownFieldVPerM: number;
  breakdownFieldSource: string;
  resistivityOhmM: number | null;
  electrodeHeightM: number | null;
  temperatureC: number | null;
}

export type BeamProfile =
  | { kind: 'gaussian'; sigmaXPx: number; sigmaYPx: number }
  | { kind: 'tophat'; radiusPx: number; edgePx: number };

export interface ScenarioLight {
  profile: BeamProfile;
  centreXPx: number;
  centreYPx: number;
  /** null for white light. */
  wavelengthM: number | null;
  white: boolean;
  channelWeights: Rgb;
  /** Per-channel factor on B (white light only; 1 elsewhere). */
  dispersion: Rgb;
  /** Modulation amplitude A: linear radiance (fraction of full scale) that full half-wave adds. */
  amplitude: number;
}

export interface ScenarioDirt {
  scatterFloor: number;
  haloPeak: number;
  haloSigmaPx: number;
  particles: { count: number; durationS: number; brightness: number; sizePx: number };
  sparks: { timesS: number[] | null; count: number; brightness: number };
}

export type FrameTiming =
  | { kind: 'constant'; frameRateHz: number; rational: [number, number] }
  | { kind: 'variable'; tickHz: number; minTicks: number; maxTicks: number; tickWeights: number[] };

export interface ScenarioCamera {
  widthPx: number;
  heightPx: number;
  timing: FrameTiming;
  gain: number;
  autoExposure: { targetMean: number; lagS: number; minGain: number; maxGain: number } | null;
  ambient: number;
  /** The transfer the clip is tagged with; hlg and pq render 10-bit HEVC with the BT.2020 matrix. */
  transfer: Exclude<SimTransfer, 'linear'>;
  /** A phone tone curve applied instead of the tagged transfer (the tags then lie), or null. */
  toneCurve: SimToneCurve | null;
  /** 0 switches shot noise off. */
  photonsPerFullScale: number;
  readNoise: number;
  crf: number;
  referencePatch: { rect: Rect; radiance: number } | null;
}

export interface ScenarioLogger {
  sampleRateHz: number;
  noiseV: number;
  /** Video time − log time of the same instant, s. */
  clockOffsetS: number;
  startS: number;
  durationS: number;
  timeUnit: 's' | 'ms';
  voltageUnit: 'V' | 'kV';
  delimiter: ',' | ';' | '\t';
  decimalComma: boolean;
  lineEnding: 'lf' | 'crlf';
  header: boolean;
  currentUnit: 'A' | 'mA' | 'uA';
  currentNoiseA: number;
  temperatureNoiseC: number;
}

export interface Scenario {
  /** A deep copy of the JSON this scenario was parsed from (written beside the outputs as scenario.json). */
  sourceJson: unknown;
  label: string;
  notes: string;
  seed: number;
  durationS: number;
  cell: ScenarioCell;
  light: ScenarioLight;
  dirt: ScenarioDirt;
  camera: ScenarioCamera;
  drive: Drive;
  logger: ScenarioLogger;
}

/** Every key each section accepts (docs/scenario.md documents each one; a test checks that). */
export const SCENARIO_KEYS = {
  '': ['label', 'notes', 'seed', 'durationS', 'cell', 'light', 'dirt', 'camera', 'drive', 'logger'],
  cell: [
    'kerrConstantMPerV2', 'lengthMm', 'effectiveLengthMm', 'gapMm', 'staticRetardanceRad', 'polariserAngleDeg',
    'analyserAngleDeg', 'analyserTurnPeriodS', 'extinctionRatio', 'liquidBreakdownKvPerMm', 'resistivityOhmM', 'electrodeHeightMm', 'temperatureC',
  ],
  light: [
    'profile', 'sigmaPx', 'sigmaYPx', 'radiusPx', 'edgePx', 'centreXPx', 'centreYPx', 'wavelengthNm', 'white',
    'channelWeights', 'dispersion', 'amplitude',
  ],
  dirt: ['scatterFloor', 'haloPeak', 'haloSigmaPx', 'particles', 'sparks'],
  'dirt.particles': ['count', 'durationS', 'brightness', 'sizePx'],
  'dirt.sparks': ['count', 'timesS', 'brightness'],
  camera: [
    'widthPx', 'heightPx', 'frameRateHz', 'variableFrameRate', 'gain', 'autoExposure', 'ambient', 'transfer',
    'toneCurve', 'photonsPerFullScale', 'readNoise', 'crf', 'referencePatch',
  ],
  'camera.toneCurve': ['exponent', 'midContrast'],
  'camera.variableFrameRate': ['tickHz', 'minTicks', 'maxTicks', 'tickWeights'],
  'camera.autoExposure': ['targetMean', 'lagS', 'minGain', 'maxGain'],
  'camera.referencePatch': ['xPx', 'yPx', 'widthPx', 'heightPx', 'radiance'],
  drive: ['startV', 'startKv', 'segments', 'points'],
  'drive.segments[]': ['kind', 'durationS', 'toV', 'toKv', 'toHalfWaveFraction', 'riseTimeS'],
  'drive.points[]': ['timeS', 'voltageV', 'voltageKv'],
  logger: [
    'sampleRateHz', 'noiseV', 'clockOffsetS', 'startS', 'durationS', 'timeUnit', 'voltageUnit', 'delimiter',
    'decimalComma', 'lineEnding', 'header', 'currentUnit', 'currentNoiseA', 'temperatureNoiseC',
  ],
} as const satisfies Record<string, readonly string[]>;

/** Breakdown field of air at sea level, about 3 MV/m (30 kV/cm): common practice. */
export const AIR_BREAKDOWN_V_PER_M = 3e6;

const MAX_DURATION_S = 3600;
const MAX_SIDE_PX = 4096;

export function parseScenario(json: unknown, sourceName: string): Scenario {
  const top = new ScenarioReader(json, '', sourceName, SCENARIO_KEYS['']);
  const label = top.string('label', 'a short name for the run', '');
  const notes = top.string('notes', 'free text', '');
  const seed = top.integer('seed', 'the random seed', 1, -Number.MAX_SAFE_INTEGER, Number.MAX_SAFE_INTEGER);

  if (!top.has('cell')) throw top.missing('cell', 'the cell: Kerr constant, length and gap');
  const cell = parseCell(new ScenarioReader(top.raw('cell'), 'cell', sourceName, SCENARIO_KEYS.cell));
  const camera = parseCamera(new ScenarioReader(top.raw('camera') ?? {}, 'camera', sourceName, SCENARIO_KEYS.camera), sourceName);
  const light = parseLight(new ScenarioReader(top.raw('light') ?? {}, 'light', sourceName, SCENARIO_KEYS.light), camera);
  const dirt = parseDirt(new ScenarioReader(top.raw('dirt') ?? {}, 'dirt', sourceName, SCENARIO_KEYS.dirt), sourceName);

  if (!top.has('drive')) throw top.missing('drive', 'the voltage programme: segments or points');
  const halfWaveV = halfWaveVoltageV(cell.kerrConstantMPerV2, cell.effectiveLengthM, cell.gapM);
  const drive = parseDrive(new ScenarioReader(top.raw('drive'), 'drive', sourceName, SCENARIO_KEYS.drive), sourceName, halfWaveV);

  const driveS = driveDurationS(drive);
  const durationS = top.positive('durationS', 'the video length in s', driveS > 0 ? driveS : undefined, MAX_DURATION_S);

  const logger = parseLogger(new ScenarioReader(top.raw('logger') ?? {}, 'logger', sourceName, SCENARIO_KEYS.logger), durationS);

  checkBreakdown(cell, drive, sourceName);
  checkGeometry(light, camera, sourceName);
  if (camera.timing.kind === 'variable' && camera.readNoise === 0 && camera.photonsPerFullScale === 0) {
    throw new KerrError('BAD_SCENARIO', `a variable frame rate needs camera noise in ${sourceName}: without it, frames during a hold are identical and cannot be told apart in the clip`, {
      path: `camera.readNoise in ${sourceName}`,
      hint: 'Set camera.readNoise above 0 (e.g. 0.001) or camera.photonsPerFullScale above 0',
    });
  }
  const sparkLateS = dirt.sparks.timesS?.find((t) => t >= durationS);
  if (sparkLateS !== undefined) {
    throw new KerrError('BAD_SCENARIO', `dirt.sparks.timesS has ${sparkLateS} s, after the video ends (${durationS} s) in ${sourceName}`, {
      path: `dirt.sparks.timesS in ${sourceName}`,
      hint: 'Give spark times inside the video, in video seconds',
    });
  }
  const sourceJson: unknown = JSON.parse(JSON.stringify(json));
  return { sourceJson, label, notes, seed, durationS, cell, light, dirt, camera, drive, logger };
}

function parseCell(r: ScenarioReader): ScenarioCell {
  const kerrConstantMPerV2 = r.positive('kerrConstantMPerV2', 'the Kerr constant B in m/V²');
  if (kerrConstantMPerV2 > 1e-8) {
    throw r.fail('a Kerr constant in m/V² (liquids are about 1e-14 to 1e-11)', 'kerrConstantMPerV2', kerrConstantMPerV2,
      'Tables in cm/V² need multiplying by 1e-2 to give m/V²');
  }
  const lengthMm = r.positive('lengthMm', 'the electrode length along the beam in mm', undefined, 10_000);
  const effectiveLengthMm = r.positive('effectiveLengthMm', 'the effective (optical) length in mm', lengthMm, 10_000);
  if (effectiveLengthMm < lengthMm) {
    throw r.fail(`an effective length of at least cell.lengthMm (${lengthMm} mm); fringe fields lengthen, never shorten, the cell`, 'effectiveLengthMm', effectiveLengthMm);
  }
  const gapMm = r.positive('gapMm', 'the electrode gap in mm', undefined, 1000);
  const staticRetardanceRad = r.number('staticRetardanceRad', 'the static retardance in rad', 0, { min: 0, max: 2 * Math.PI });
  const polariserAngleDeg = r.number('polariserAngleDeg', 'the polariser angle to the field in degrees', 45, { min: -180, max: 180 });
  const analyserAngleDeg = r.number('analyserAngleDeg', 'the analyser angle to the field in degrees', polariserAngleDeg - 90, { min: -270, max: 270 });
  const extinctionRatio = r.number('extinctionRatio', 'the polariser pair extinction ratio', 10_000, { min: 1 });
  const hasLiquidBreakdown = r.has('liquidBreakdownKvPerMm');
  const liquidKvPerMm = r.positive('liquidBreakdownKvPerMm', 'the liquid breakdown field in kV/mm', AIR_BREAKDOWN_V_PER_M / 1e6, 1000);
  const resistivityOhmM = r.has('resistivityOhmM') ? r.positive('resistivityOhmM', 'the liquid resistivity in Ω·m') : null;
  let electrodeHeightM: number | null = null;
  if (resistivityOhmM !== null) {
    electrodeHeightM = r.positive('electrodeHeightMm', 'the electrode height in mm, needed with resistivityOhmM for the current column', undefined, 10_000) * 1e-3;
  } else if (r.has('electrodeHeightMm')) {
    electrodeHeightM = r.positive('electrodeHeightMm', 'the electrode height in mm', undefined, 10_000) * 1e-3;
  }
  const temperatureC = r.has('temperatureC') ? r.number('temperatureC', 'the liquid temperature in °C', 20, { min: -100, max: 300 }) : null;
  return {
    kerrConstantMPerV2,
    lengthM: lengthMm * 1e-3,
    effectiveLengthM: effectiveLengthMm * 1e-3,
    gapM: gapMm * 1e-3,
    staticRetardanceRad,
    polariserAngleRad: polariserAngleDeg * DEG,
    analyserAngleRad: analyserAngleDeg * DEG,
    analyserTurnPeriodS: r.nonNegative('analyserTurnPeriodS', 'the time for one full turn of the analyser in s (0 = fixed)', 0, 3600),
    extinctionRatio,
    breakdownFieldVPerM: liquidKvPerMm * 1e6,
    breakdownFieldSource: hasLiquidBreakdown ? 'cell.liquidBreakdownKvPerMm' : 'air, common practice',
    resistivityOhmM,
    electrodeHeightM,
    temperatureC,
  };
}

function parseCamera(r: ScenarioReader, source: string): ScenarioCamera {
  const widthPx = r.integer('widthPx', 'the frame width in pixels', 320, 16, MAX_SIDE_PX);
  const heightPx = r.integer('heightPx', 'the frame height in pixels', 240, 16, MAX_SIDE_PX);
  if (widthPx % 2 !== 0) throw r.fail('an even frame width in pixels (H.264 4:2:0 needs even sizes)', 'widthPx', widthPx);
  if (heightPx % 2 !== 0) throw r.fail('an even frame height in pixels (H.264 4:2:0 needs even sizes)', 'heightPx', heightPx);
  let timing: FrameTiming;
  if (r.has('variableFrameRate')) {
    if (r.has('frameRateHz')) {
      throw new KerrError('BAD_SCENARIO', `camera.frameRateHz and camera.variableFrameRate both given in ${source}`, {
        path: r.where('frameRateHz'),
        hint: 'Keep one: frameRateHz for a constant rate or variableFrameRate for phone-like timing',
      });
    }
    const v = new ScenarioReader(r.raw('variableFrameRate'), 'camera.variableFrameRate', source, SCENARIO_KEYS['camera.variableFrameRate']);
    const tickHz = v.positive('tickHz', 'the timestamp tick rate in Hz', 60, 1000);
    const minTicks = v.integer('minTicks', 'the shortest frame interval in ticks', 1, 1, 100);
    const maxTicks = v.integer('maxTicks', 'the longest frame interval in ticks', Math.max(3, minTicks), minTicks, 100);
    const span = maxTicks - minTicks + 1;
    const tickWeights = v.numberList('tickWeights', `weights of intervals ${minTicks}..${maxTicks} ticks`, new Array<number>(span).fill(1), span);
    if (!tickWeights.some((w) => w > 0)) throw v.fail('at least one positive weight', 'tickWeights', tickWeights);
    timing = { kind: 'variable', tickHz, minTicks, maxTicks, tickWeights };
  } else {
    const frameRateHz = r.positive('frameRateHz', 'the frame rate in Hz', 30, 240);
    timing = { kind: 'constant', frameRateHz, rational: rationalRate(frameRateHz) };
  }
  const gain = r.positive('gain', 'the exposure gain', 1, 100);
  let autoExposure: ScenarioCamera['autoExposure'] = null;
  if (r.has('autoExposure')) {
    const a = new ScenarioReader(r.raw('autoExposure'), 'camera.autoExposure', source, SCENARIO_KEYS['camera.autoExposure']);
    const minGain = a.positive('minGain', 'the lowest gain auto-exposure may set', 0.05, 100);
    const maxGain = a.positive('maxGain', 'the highest gain auto-exposure may set', 20, 100);
    if (maxGain < minGain) throw a.fail(`a maximum gain of at least minGain (${minGain})`, 'maxGain', maxGain);
    autoExposure = {
      targetMean: a.positive('targetMean', 'the mean linear frame brightness auto-exposure aims at', 0.18, 1),
      lagS: a.nonNegative('lagS', 'the auto-exposure time constant in s', 0.5, 60),
      minGain,
      maxGain,
    };
  }
  const ambient = r.nonNegative('ambient', 'the ambient light level (linear, fraction of full scale)', 0.01, 1);
  const transfer = r.choice('transfer', 'the camera transfer function', ['srgb', 'bt709', 'hlg', 'pq'] as const, 'srgb');
  let toneCurve: SimToneCurve | null = null;
  if (r.has('toneCurve')) {
    const t = new ScenarioReader(r.raw('toneCurve'), 'camera.toneCurve', source, SCENARIO_KEYS['camera.toneCurve']);
    toneCurve = {
      exponent: t.positive('exponent', 'the power-law exponent of the phone curve (2.2 is sRGB-like)', 2.2, 5),
      midContrast: t.nonNegative('midContrast', 'the mid-tone S-curve strength (0 none, below 0.9)', 0.3, 0.9),
    };
    if (transfer === 'hlg' || transfer === 'pq') throw t.fail('a tone curve on an SDR clip (transfer srgb or bt709)', '', transfer);
  }
  const photonsPerFullScale = r.nonNegative('photonsPerFullScale', 'photons per full-scale pixel for shot noise (0 = off)', 10_000, 1e9);
  const readNoise = r.nonNegative('readNoise', 'the read-noise standard deviation (linear)', 0.0015, 0.5);
  const crf = r.integer('crf', 'the H.264 constant rate factor (0 best, 51 worst)', 18, 0, 51);
  let referencePatch: ScenarioCamera['referencePatch'] = null;
  if (r.has('referencePatch')) {
    const p = new ScenarioReader(r.raw('referencePatch'), 'camera.referencePatch', source, SCENARIO_KEYS['camera.referencePatch']);
    const rect: Rect = {
      x: p.integer('xPx', 'the patch left edge in pixels', undefined, 0, widthPx - 1),
      y: p.integer('yPx', 'the patch top edge in pixels', undefined, 0, heightPx - 1),
      w: p.integer('widthPx', 'the patch width in pixels', undefined, 4, widthPx),
      h: p.integer('heightPx', 'the patch height in pixels', undefined, 4, heightPx),
    };
    if (rect.x + rect.w > widthPx || rect.y + rect.h > heightPx) {
      throw p.fail(`a patch inside the ${widthPx}×${heightPx} frame`, '', `x ${rect.x}, y ${rect.y}, ${rect.w}×${rect.h}`);
    }
    referencePatch = { rect, radiance: p.positive('radiance', 'the patch radiance (linear, fraction of full scale)', 0.2, 1) };
  }
  return { widthPx, heightPx, timing, gain, autoExposure, ambient, transfer, toneCurve, photonsPerFullScale, readNoise, crf, referencePatch };
}

/** A rate in Hz as a fraction ffmpeg can take exactly: the smallest denominator up to 1001 that fits. */
export function rationalRate(frameRateHz: number): [number, number] {
  for (let den = 1; den <= 1001; den++) {
    const num = Math.round(frameRateHz * den);
    if (Math.abs(num / den - frameRateHz) < 1e-9 * frameRateHz) return [num, den];
  }
  return [Math.round(frameRateHz * 1001), 1001];
}

function parseLight(r: ScenarioReader, camera: ScenarioCamera): ScenarioLight {
  const kind = r.choice('profile', 'the beam profile', ['gaussian', 'tophat'] as const, 'gaussian');
  let profile: BeamProfile;
  const maxPx = Math.max(camera.widthPx, camera.heightPx);
  if (kind === 'gaussian') {
    for (const k of ['radiusPx', 'edgePx']) if (r.has(k)) throw r.fail('no top-hat size with profile "gaussian" (use sigmaPx, or set profile "tophat")', k, r.raw(k));
    const sigmaXPx = r.positive('sigmaPx', 'the beam Gaussian sigma in pixels', 10, maxPx);
    profile = { kind, sigmaXPx, sigmaYPx: r.positive('sigmaYPx', 'the vertical beam sigma in pixels', sigmaXPx, maxPx) };
  } else {
    for (const k of ['sigmaPx', 'sigmaYPx']) if (r.has(k)) throw r.fail('no Gaussian sigma with profile "tophat" (use radiusPx and edgePx)', k, r.raw(k));
    profile = {
      kind,
      radiusPx: r.positive('radiusPx', 'the top-hat radius in pixels', 16, maxPx),
      edgePx: r.positive('edgePx', 'the top-hat soft-edge width in pixels', 1.5, maxPx),
    };
  }
  const centreXPx = r.number('centreXPx', 'the beam centre x in pixels', (camera.widthPx - 1) / 2, { min: 0, max: camera.widthPx - 1 });
  const centreYPx = r.number('centreYPx', 'the beam centre y in pixels', (camera.heightPx - 1) / 2, { min: 0, max: camera.heightPx - 1 });
  const white = r.boolean('white', 'white light instead of one wavelength', false);
  if (white && r.has('wavelengthNm')) throw r.fail('no wavelength with white light (remove one of the two)', 'wavelengthNm', r.raw('wavelengthNm'));
  if (!white && r.has('dispersion')) throw r.fail('dispersion only with "white": true (one wavelength has one B)', 'dispersion', r.raw('dispersion'));
  const wavelengthNm = white ? null : r.number('wavelengthNm', 'the light wavelength in nm', 532, { min: 350, max: 800 });
  const defaultWeights: Rgb = wavelengthNm === null ? [1, 1, 1] : channelWeightsForWavelength(wavelengthNm);
  const weights = r.numberList('channelWeights', 'R, G, B weights of the light', defaultWeights, 3);
  if (!weights.some((w) => w > 0)) throw r.fail('at least one positive channel weight', 'channelWeights', weights);
  const dispersion = r.numberList('dispersion', 'R, G, B factors on B', [1, 1, 1], 3);
  if (dispersion.some((d) => d <= 0)) throw r.fail('positive dispersion factors', 'dispersion', dispersion);
  return {
    profile,
    centreXPx,
    centreYPx,
    wavelengthM: wavelengthNm === null ? null : wavelengthNm * 1e-9,
    white,
    channelWeights: [weights[0]!, weights[1]!, weights[2]!],
    dispersion: [dispersion[0]!, dispersion[1]!, dispersion[2]!],
    amplitude: r.positive('amplitude', 'the modulation amplitude (linear, fraction of full scale)', 0.6, 4),
  };
}

function parseDirt(r: ScenarioReader, source: string): ScenarioDirt {
  const p = new ScenarioReader(r.raw('particles') ?? {}, 'dirt.particles', source, SCENARIO_KEYS['dirt.particles']);
  const s = new ScenarioReader(r.raw('sparks') ?? {}, 'dirt.sparks', source, SCENARIO_KEYS['dirt.sparks']);
  let timesS: number[] | null = null;
  if (s.has('timesS')) {
    if (s.has('count')) throw s.fail('either sparks.count or sparks.timesS, not both', 'count', s.raw('count'));
    timesS = s.numberList('timesS', 'spark times in video seconds', []).sort((a, b) => a - b);
  }
  return {
    scatterFloor: r.nonNegative('scatterFloor', 'the depolarised scatter floor F (linear)', 0.004, 1),
    haloPeak: r.nonNegative('haloPeak', 'the forward-scatter halo peak S (linear)', 0.003, 1),
    haloSigmaPx: r.positive('haloSigmaPx', 'the halo Gaussian sigma in pixels', 100, 10 * MAX_SIDE_PX),
    particles: {
      count: p.integer('count', 'how many particles cross the beam', 0, 0, 10_000),
      durationS: p.positive('durationS', 'how long one particle takes to cross the beam in s', 0.4, 60),
      brightness: p.nonNegative('brightness', 'the particle peak radiance (linear)', 0.15, 4),
      sizePx: p.positive('sizePx', 'the particle blur sigma in pixels', 1.5, 100),
    },
    sparks: {
      timesS,
      count: timesS === null ? s.integer('count', 'how many sparks flash', 0, 0, 10_000) : timesS.length,
      brightness: s.nonNegative('brightness', 'the spark flash radiance added to the whole frame (linear)', 0.5, 4),
    },
  };
}

function parseDrive(r: ScenarioReader, source: string, halfWaveV: number): Drive {
  if (r.has('segments') === r.has('points')) {
    throw new KerrError('BAD_SCENARIO', `drive needs exactly one of segments or points in ${source}`, {
      path: r.where(''),
      hint: 'Give "segments" (hold/ramp/step) or "points" ([{timeS, voltageV}...]); docs/scenario.md shows both',
    });
  }
  if (r.has('points')) {
    if (r.has('startV') || r.has('startKv')) throw r.fail('no start voltage with points (the first point sets it)', r.has('startV') ? 'startV' : 'startKv', r.raw(r.has('startV') ? 'startV' : 'startKv'));
    const list = r.raw('points');
    if (!Array.isArray(list) || list.length < 1) throw r.fail('a list of at least one {timeS, voltageV} point', 'points', list);
    const points: DrivePoint[] = list.map((item, i) => {
      const p = new ScenarioReader(item, `drive.points[${i}]`, source, SCENARIO_KEYS['drive.points[]']);
      const timeS = p.number('timeS', 'the point time in video seconds', undefined, { min: 0, max: MAX_DURATION_S });
      return { timeS, voltageV: voltageOf(p, 'voltage', undefined) };
    });
    for (let i = 1; i < points.length; i++) {
      if (points[i]!.timeS < points[i - 1]!.timeS) {
        throw new KerrError('BAD_SCENARIO', `drive.points must be in time order in ${source}: point ${i} (${points[i]!.timeS} s) comes before point ${i - 1} (${points[i - 1]!.timeS} s)`, {
          path: `drive.points[${i}].timeS in ${source}`,
          hint: 'Sort the points by timeS',
        });
      }
    }
    return { kind: 'points', points };
  }
  if (r.has('startV') && r.has('startKv')) throw r.fail('either startV or startKv, not both', 'startKv', r.raw('startKv'));
  const startV = r.has('startKv') ? r.number('startKv', 'the start voltage in kV', 0) * 1e3 : r.number('startV', 'the start voltage in V', 0);
  const list = r.raw('segments');
  if (!Array.isArray(list) || list.length < 1) throw r.fail('a list of at least one segment', 'segments', list);
  const segments: DriveSegment[] = list.map((item, i) => {
    const s = new ScenarioReader(item, `drive.segments[${i}]`, source, SCENARIO_KEYS['drive.segments[]']);
    if (!s.has('kind')) throw s.missing('kind', '"hold", "ramp" or "step"');
    const kind = s.choice('kind', 'the segment kind', ['hold', 'ramp', 'step'] as const, 'hold');
    const durationS = s.positive('durationS', 'the segment duration in s', undefined, MAX_DURATION_S);
    if (kind === 'hold') {
      for (const k of ['toV', 'toKv', 'toHalfWaveFraction', 'riseTimeS']) if (s.has(k)) throw s.fail('no target voltage or rise time on a hold', k, s.raw(k));
      return { kind, durationS };
    }
    const toV = targetOf(s, halfWaveV);
    if (kind === 'ramp') {
      if (s.has('riseTimeS')) throw s.fail('no rise time on a ramp (its duration sets the slope)', 'riseTimeS', s.raw('riseTimeS'));
      return { kind, toV, durationS };
    }
    return { kind, toV, durationS, riseTimeS: s.nonNegative('riseTimeS', 'the 10–90 % rise time in s', 0.05, MAX_DURATION_S) };
  });
  return { kind: 'segments', startV, segments };
}

function targetOf(s: ScenarioReader, halfWaveV: number): number {
  const given = ['toV', 'toKv', 'toHalfWaveFraction'].filter((k) => s.has(k));
  if (given.length === 0) throw s.missing('toV', 'the target voltage: toV, toKv or toHalfWaveFraction');
  if (given.length > 1) throw s.fail('one target voltage (toV, toKv or toHalfWaveFraction)', given[1]!, s.raw(given[1]!));
  if (s.has('toHalfWaveFraction')) return s.number('toHalfWaveFraction', 'the target as a fraction of the half-wave voltage', 0, { min: -10, max: 10 }) * halfWaveV;
  if (s.has('toKv')) return s.number('toKv', 'the target voltage in kV', 0, { min: -1e4, max: 1e4 }) * 1e3;
  return s.number('toV', 'the target voltage in V', 0, { min: -1e7, max: 1e7 });
}

function voltageOf(p: ScenarioReader, stem: string, fallback: number | undefined): number {
  const v = `${stem}V`;
  const kv = `${stem}Kv`;
  if (p.has(v) && p.has(kv)) throw p.fail(`either ${v} or ${kv}, not both`, kv, p.raw(kv));
  if (p.has(kv)) return p.number(kv, 'the voltage in kV', undefined, { min: -1e4, max: 1e4 }) * 1e3;
  if (!p.has(v) && fallback === undefined) throw p.missing(v, `the voltage in V (or ${kv} in kV)`);
  return p.number(v, 'the voltage in V', fallback, { min: -1e7, max: 1e7 });
}

function parseLogger(r: ScenarioReader, videoDurationS: number): ScenarioLogger {
  const delimiterRaw = r.choice('delimiter', 'the column separator', [',', ';', '\t', 'tab'] as const, ',');
  const delimiter = delimiterRaw === 'tab' ? '\t' : delimiterRaw;
  const decimalComma = r.boolean('decimalComma', 'write numbers with a decimal comma', false);
  if (decimalComma && delimiter === ',') {
    throw r.fail('a delimiter other than "," with decimal commas (use ";" or "tab")', 'decimalComma', true);
  }
  const sampleRateHz = r.positive('sampleRateHz', 'the logger sampling rate in Hz', 10, 10_000);
  const startS = r.number('startS', 'the log time of the first sample in s', 0, { min: -MAX_DURATION_S, max: MAX_DURATION_S });
  const durationS = r.positive('durationS', 'how long the logger records in s', videoDurationS, MAX_DURATION_S);
  if (durationS * sampleRateHz > 2_000_000) throw r.fail('at most 2 000 000 log rows (durationS × sampleRateHz)', 'sampleRateHz', sampleRateHz);
  return {
    sampleRateHz,
    noiseV: r.nonNegative('noiseV', 'the logger noise standard deviation in V', 0, 1e5),
    clockOffsetS: r.number('clockOffsetS', 'video time − log time of the same instant in s', 0, { min: -MAX_DURATION_S, max: MAX_DURATION_S }),
    startS,
    durationS,
    timeUnit: r.choice('timeUnit', 'the time column unit', ['s', 'ms'] as const, 's'),
    voltageUnit: r.choice('voltageUnit', 'the voltage column unit', ['V', 'kV'] as const, 'V'),
    delimiter,
    decimalComma,
    lineEnding: r.choice('lineEnding', 'the line ending', ['lf', 'crlf'] as const, 'lf'),
    header: r.boolean('header', 'write a header row', true),
    currentUnit: r.choice('currentUnit', 'the current column unit', ['A', 'mA', 'uA'] as const, 'uA'),
    currentNoiseA: r.nonNegative('currentNoiseA', 'the current noise standard deviation in A', 0, 1),
    temperatureNoiseC: r.nonNegative('temperatureNoiseC', 'the temperature noise standard deviation in °C', 0, 100),
  };
}

/** Refuses a drive whose peak field |V|/d exceeds the breakdown field, with a safety caution. */
function checkBreakdown(cell: ScenarioCell, drive: Drive, source: string): void {
  const peakV = drivePeakV(drive);
  const peakFieldVPerM = peakV / cell.gapM;
  if (peakFieldVPerM <= cell.breakdownFieldVPerM) return;
  const mvPerM = (x: number): string => `${Number((x / 1e6).toPrecision(3))} MV/m`;
  throw new KerrError('UNSAFE',
    `refused: the drive reaches ${Number((peakV / 1e3).toPrecision(4))} kV across a ${Number((cell.gapM * 1e3).toPrecision(4))} mm gap in ${source}, a peak field of ${mvPerM(peakFieldVPerM)}, above the breakdown field ${mvPerM(cell.breakdownFieldVPerM)} (${cell.breakdownFieldSource})`,
    {
      path: `drive in ${source}`,
      hint: 'Lower the drive or widen the gap; set cell.liquidBreakdownKvPerMm only to a tested rating of your liquid. ' +
        'Caution: kilovolt supplies and charged cells can kill and arcs start fires; follow local high-voltage rules and never exceed a rating',
      details: { peakV, peakFieldVPerM, breakdownFieldVPerM: cell.breakdownFieldVPerM },
    });
}

/** The beam centre must be in the frame and the reference patch must keep clear of the beam region. */
function checkGeometry(light: ScenarioLight, camera: ScenarioCamera, source: string): void {
  const patch = camera.referencePatch;
  if (!patch) return;
  const reachPx = light.profile.kind === 'gaussian'
    ? 3 * Math.max(light.profile.sigmaXPx, light.profile.sigmaYPx)
    : light.profile.radiusPx + 4 * light.profile.edgePx;
  const nearestX = Math.max(patch.rect.x, Math.min(light.centreXPx, patch.rect.x + patch.rect.w));
  const nearestY = Math.max(patch.rect.y, Math.min(light.centreYPx, patch.rect.y + patch.rect.h));
  if (Math.hypot(nearestX - light.centreXPx, nearestY - light.centreYPx) < reachPx) {
    throw new KerrError('BAD_SCENARIO', `camera.referencePatch overlaps the beam in ${source} (it comes within ${reachPx.toFixed(0)} px of the beam centre)`, {
      path: `camera.referencePatch in ${source}`,
      hint: `Move the patch away from (${light.centreXPx.toFixed(0)}, ${light.centreYPx.toFixed(0)}), e.g. into a corner of the frame`,
    });
  }
}
