/**
 * A photo series from a scenario: one picture per voltage, as a bench that photographs each step
 * of a stepped drive would take (the camera of the scenario, its noise, transfer and dirt). The
 * drive of the scenario is replaced by steps to the given voltages, held one second each; each
 * photo is rendered in the middle of its hold. Pure: returns 8-bit RGB buffers (row-major, 3 bytes
 * a pixel) for the caller to encode.
 */
import { KerrError } from '../errors.js';
import { parseScenario } from './scenario.js';
import { makeRng } from './rng.js';
import { frameTimes } from './frameTimes.js';
import { frameIndexAt, prepareScene } from './scene.js';
import { makeCodeEncoder } from './transfer.js';
import { renderFrame } from './render.js';

export interface StillPhoto {
  voltageV: number;
  width: number;
  height: number;
  rgb: Uint8Array;
}

/** `scenarioJson`: a scenario as written in a file (its drive and logger are ignored). */
export function renderStillPhotos(scenarioJson: Record<string, unknown>, voltagesV: readonly number[], sourceName: string): StillPhoto[] {
  const holdS = 1;
  const json = {
    ...scenarioJson,
    dirt: { ...(scenarioJson.dirt as Record<string, unknown> | undefined), particles: { count: 0 }, sparks: { count: 0 } },
    camera: { ...(scenarioJson.camera as Record<string, unknown> | undefined), frameRateHz: 10 },
    drive: { startV: 0, segments: voltagesV.map((v) => ({ kind: 'step', toV: v, durationS: holdS, riseTimeS: 0.01 })) },
    logger: {},
  };
  delete (json as Record<string, unknown>).durationS;
  const scenario = parseScenario(json, sourceName);
  const root = makeRng(scenario.seed);
  const clock = frameTimes(scenario.camera.timing, scenario.durationS, root.split('clock'));
  const scene = prepareScene(scenario, clock, root);
  const { transfer, toneCurve } = scenario.camera;
  if (transfer === 'hlg' || transfer === 'pq') {
    throw new KerrError('BAD_SCENARIO', `photos are rendered as 8-bit pictures, not with the HDR transfer ${transfer}`, { path: `camera.transfer in ${sourceName}`, hint: 'Use srgb or bt709 (with camera.toneCurve for a phone curve)' });
  }
  const codes = makeCodeEncoder(toneCurve ?? transfer);
  const { widthPx: width, heightPx: height } = scenario.camera;
  return voltagesV.map((voltageV, i) => {
    const timeS = i * holdS + holdS / 2;
    const rgb = new Uint8Array(width * height * 3);
    renderFrame(scene, frameIndexAt(clock.timesS, timeS), timeS, scenario.camera.gain, root.split('photo', i), codes, rgb);
    return { voltageV, width, height, rgb };
  });
}

export interface CalibrationPhoto {
  analyserDeg: number;
  width: number;
  height: number;
  rgb: Uint8Array;
}

/**
 * A calibration photo set from a scenario: the drive off, the analyser turned to each angle
 * (degrees from parallel to the polariser), one photo each, with the scenario's camera (noise,
 * transfer or tone curve). Pure: returns 8-bit RGB buffers for the caller to encode.
 */
export function renderCalibrationPhotos(scenarioJson: Record<string, unknown>, analyserDegs: readonly number[], sourceName: string): CalibrationPhoto[] {
  const cell = { ...(scenarioJson.cell as Record<string, unknown> | undefined) };
  const polariserDeg = typeof cell.polariserAngleDeg === 'number' ? cell.polariserAngleDeg : 45;
  return analyserDegs.map((deg, i) => {
    const json = { ...scenarioJson, seed: ((scenarioJson.seed as number | undefined) ?? 1) + i, cell: { ...cell, analyserAngleDeg: ((polariserDeg + deg + 270) % 360) - 270, analyserTurnPeriodS: 0 } };
    const [photo] = renderStillPhotos(json, [0], sourceName);
    return { analyserDeg: deg, width: photo!.width, height: photo!.height, rgb: photo!.rgb };
  });
}
