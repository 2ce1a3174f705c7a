/**
 * The camera-free demo of the live view: renders a short simulated bench clip with its voltage log
 * (the project's simulator, invented numbers) into a temporary folder, and plays the log back into
 * a growing file as the clip plays, so `kerrtrace watch --demo` shows every meter and the running
 * fit without a camera or a logger. Edge module; the caller removes the folder (`cleanup`).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseScenario } from '../sim/scenario.js';
import { simulateRun } from '../sim/simulate.js';

/** Invented demo bench: B = 2.4e-12 m/V², 50 mm long, 5 mm gap, a grey card in view, a sweep past V_π and back. */
export const LIVE_DEMO_SCENARIO = {
  label: 'live demo (invented numbers)',
  notes: 'Closed for 3 s, a slow sweep to 1.15 V_pi and back, closed again. A grey card at the lower left for the exposure meter.',
  seed: 77,
  cell: { kerrConstantMPerV2: 2.4e-12, lengthMm: 50, gapMm: 5, extinctionRatio: 10000, liquidBreakdownKvPerMm: 6 },
  light: { profile: 'gaussian', sigmaPx: 8, centreXPx: 130, centreYPx: 90, wavelengthNm: 532, amplitude: 0.6 },
  dirt: { scatterFloor: 0.004, haloPeak: 0.003, haloSigmaPx: 60 },
  camera: { widthPx: 240, heightPx: 180, frameRateHz: 30, ambient: 0.01, transfer: 'srgb', crf: 18,
    referencePatch: { xPx: 12, yPx: 130, widthPx: 40, heightPx: 36, radiance: 0.18 } },
  drive: { segments: [
    { kind: 'hold', durationS: 3 },
    { kind: 'ramp', toHalfWaveFraction: 1.15, durationS: 6 },
    { kind: 'ramp', toV: 0, durationS: 6 },
    { kind: 'hold', durationS: 3 }] },
  logger: { sampleRateHz: 10, noiseV: 10, clockOffsetS: 0.4 },
} as const;

export interface DemoSource {
  dir: string;
  clip: string;
  /** The finished log, to be played into a growing file. */
  volts: string;
  /** Seconds after the clip starts at which the log's first row belongs. */
  logDelayS: number;
  lengthMm: string;
  gapMm: string;
  referenceRoi: { x: number; y: number; w: number; h: number };
  cleanup(): void;
}

export async function prepareDemoSource(): Promise<DemoSource> {
  const dir = mkdtempSync(join(tmpdir(), 'kerrtrace-live-demo-'));
  try {
    const scenario = parseScenario(JSON.parse(JSON.stringify(LIVE_DEMO_SCENARIO)), 'live demo');
    const out = join(dir, 'source');
    await simulateRun(scenario, out);
    const p = LIVE_DEMO_SCENARIO.camera.referencePatch;
    return {
      dir,
      clip: join(out, 'clip.mp4'),
      volts: join(out, 'volts.csv'),
      logDelayS: scenario.logger.startS + scenario.logger.clockOffsetS,
      lengthMm: String(LIVE_DEMO_SCENARIO.cell.lengthMm),
      gapMm: String(LIVE_DEMO_SCENARIO.cell.gapMm),
      referenceRoi: { x: p.xPx + 4, y: p.yPx + 4, w: p.widthPx - 8, h: p.heightPx - 8 },
      cleanup: () => rmSync(dir, { recursive: true, force: true }),
    };
  } catch (err) {
    rmSync(dir, { recursive: true, force: true });
    throw err;
  }
}
