/**
 * Renders one coverage-study case with the simulator and analyses it as a user would (beam region
 * given, reference region given when the case has a card), returning each headline figure with its
 * stated standard uncertainty and the planted truth. Writes only into `workDir`, which the caller
 * owns and removes. A refusal (KerrError) is a result too: it is counted, not hidden.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { parseScenario } from '../../src/sim/scenario.js';
import { simulateRun } from '../../src/sim/simulate.js';
import { analyzeRun, type AnalyzeOptions } from '../../src/pipeline/analyze.js';
import { isKerrError } from '../../src/errors.js';
import type { AccuracyCase } from './randomCase.js';

export interface FigureOutcome {
  value: number;
  stdErr: number;
  truth: number;
}

export interface CaseOutcome {
  index: number;
  description: string;
  /** null when the analysis gave figures; else the refusal's code and message. */
  refused: { code: string; message: string } | null;
  /** The run's own verdict (gates passed and B identifiable). */
  valid: boolean;
  warnings: string[];
  /** Gates the run failed. */
  failures: string[];
  /** Residual RMS over frame noise, effective frames, lag-1 autocorrelation (for tuning the gates). */
  diagnostics?: { bitsPerPixel: number; residualOverFrameNoise: number; effectiveFrames: number; rho: number; budgetB: Record<string, number>; responseGamma?: { value: number; stdErr: number; checked: boolean } };
  figures: Partial<Record<'B' | 'Vpi' | 'offset' | 'floor', FigureOutcome>>;
  seconds: number;
}

export async function runCase(c: AccuracyCase, workDir: string): Promise<CaseOutcome> {
  const t0 = Date.now();
  const scenario = parseScenario(c.scenario, `case-${c.index}.json`);
  const sim = await simulateRun(scenario, workDir, { force: true });
  const truth = sim.truth as { B: number; halfWaveVoltageV: number; offsetS: number; floorFraction: number; roi: number[]; referenceRoi?: number[] };
  const voltsPath = join(workDir, 'volts.csv');
  if (c.dropoutS) dropRows(voltsPath, c.dropoutS);
  const cell = c.scenario.cell as { lengthMm: number; gapMm: number };
  const r = truth.roi;
  const o: AnalyzeOptions = {
    videoPath: join(workDir, 'clip.mp4'), voltsPath, lengthMm: cell.lengthMm, gapMm: cell.gapMm,
    roi: { x: r[0]!, y: r[1]!, w: r[2]!, h: r[3]! },
    voltsAccuracyPercent: 0, lengthToleranceMm: 0, gapToleranceMm: 0,
    ...(c.useReference && truth.referenceRoi ? { referenceRoi: { x: truth.referenceRoi[0]!, y: truth.referenceRoi[1]!, w: truth.referenceRoi[2]!, h: truth.referenceRoi[3]! } } : {}),
  };
  const base = { index: c.index, description: c.description };
  try {
    const { result } = await analyzeRun(o, { toolVersion: 'accuracy', ffmpegVersion: null });
    const q = (x: { value: number; stdErr?: number }, t: number): FigureOutcome => ({ value: x.value, stdErr: x.stdErr ?? NaN, truth: t });
    return {
      ...base, refused: null, valid: result.validity?.valid ?? result.identifiable,
      warnings: result.warnings.map((w) => w.code),
      failures: (result.validity?.failures ?? []).map((f) => f.gate),
      diagnostics: {
        bitsPerPixel: result.camera.bitsPerPixel ?? NaN, residualOverFrameNoise: result.fit.residualOverFrameNoise ?? NaN, effectiveFrames: result.fit.effectiveFrames ?? NaN, rho: result.fit.residualAutocorrelation,
        budgetB: Object.fromEntries((result.uncertainty?.kerrConstant.terms ?? []).map((t) => [t.name, t.relative])),
        ...(result.cameraResponse ? { responseGamma: { ...result.cameraResponse.check.gamma, checked: result.cameraResponse.check.checked } } : {}),
      },
      figures: {
        B: q(result.kerrConstant, truth.B), Vpi: q(result.halfWaveVoltage, truth.halfWaveVoltageV),
        offset: q(result.syncOffset, truth.offsetS), floor: q(result.floorFraction, truth.floorFraction),
      },
      seconds: (Date.now() - t0) / 1000,
    };
  } catch (err) {
    if (!isKerrError(err)) throw err;
    return { ...base, refused: { code: err.code, message: err.message }, valid: false, warnings: [], failures: [], figures: {}, seconds: (Date.now() - t0) / 1000 };
  }
}

/** Removes the rows whose log time lies inside the window (a logger dropout). */
function dropRows(path: string, [a, b]: [number, number]): void {
  const lines = readFileSync(path, 'utf8').split('\n');
  const kept = lines.filter((line, i) => {
    if (i === 0 || line.trim() === '') return true;
    const t = Number(line.split(',')[0]);
    return !(t >= a && t <= b);
  });
  writeFileSync(path, kept.join('\n'));
}
