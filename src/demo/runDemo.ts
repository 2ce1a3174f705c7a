/**
 * The demo a newcomer runs first: simulate the before/after purification runs from the built-in
 * scenarios, analyse both, compare them and write everything under one folder.
 */
import { existsSync, mkdirSync, writeFileSync } from 'node:fs';
import sharp from 'sharp';
import { renderStillPhotos } from '../sim/renderStillPhotos.js';
import { join, resolve } from 'node:path';
import { environmentError } from '../io/environmentError.js';
import { openOutputDirInPlace } from '../io/outputDir.js';
import { sha256File } from '../io/sha256File.js';
import { parseScenario } from '../sim/scenario.js';
import { simulateRun } from '../sim/simulate.js';
import type { AnalyzeOutput } from '../pipeline/analyze.js';
import { analyzeWithProducts } from '../pipeline/analyzeWithProducts.js';
import { finishRun } from '../pipeline/finishRun.js';
import { compareRuns } from '../compare/compareRuns.js';
import { writeComparison } from '../compare/writeComparison.js';
import type { Comparison } from '../compare/comparison.js';
import { DEMO_AFTER, DEMO_BEFORE, DEMO_CELL, DEMO_REFERENCE_ROI } from './demoScenarios.js';

const MARKER = '.kerrtrace-demo';

export interface DemoOptions {
  outDir: string;
  force: boolean;
  toolVersion: string;
  ffmpegVersion: string | null;
  onStage?: (stage: string) => void;
  onProgress?: (stage: string, done: number, total: number) => void;
}

export interface DemoOutput {
  outDir: string;
  runs: { name: string; dir: string; out: AnalyzeOutput }[];
  comparison: Comparison;
  comparisonDir: string;
  /** JPEG photos of the after run at twelve voltages (voltages in the file names). */
  photosDir: string;
}

/**
 * Writes under the output policy (src/io/outputDir.ts), in place because the demo's files name
 * each other by absolute path: a folder holding an earlier demo (its marker file) is replaced, with
 * or without `force`; `force` extends that to any folder kerrtrace wrote; a folder kerrtrace did
 * not write, the current folder (`--out .`) or a folder above it is never replaced. The old demo
 * is moved to a backup first and deleted only when the new one is complete, so a kill at any
 * moment leaves the old demo or the new one (the next run restores the backup).
 */
export async function runDemo(o: DemoOptions): Promise<DemoOutput> {
  const earlierDemo = existsSync(join(resolve(o.outDir), MARKER));
  const dir = openOutputDirInPlace(o.outDir, { force: o.force || earlierDemo });
  try {
    const result = await writeDemo(o, dir.path);
    dir.commit();
    return result;
  } catch (err) {
    dir.abandon();
    throw environmentError(err, o.outDir, 'writing') ?? err;
  }
}

async function writeDemo(o: DemoOptions, outDir: string): Promise<DemoOutput> {
  writeFileSync(join(outDir, MARKER), 'This folder was written by `kerrtrace demo` and is replaced when the demo runs again.\n');
  const runs: DemoOutput['runs'] = [];
  for (const [name, scenarioJson] of [['before', DEMO_BEFORE], ['after', DEMO_AFTER]] as const) {
    const simDir = join(outDir, name, 'recording');
    o.onStage?.(`simulating the ${name} run`);
    const scenario = parseScenario(scenarioJson, `built-in demo scenario "${name}"`);
    await simulateRun(scenario, simDir, { force: true, ...(o.onProgress ? { onProgress: (d: number, t: number) => o.onProgress!(`render ${name}`, d, t) } : {}) });
    o.onStage?.(`analysing the ${name} run`);
    const run = await analyzeWithProducts(
      {
        videoPath: join(simDir, 'clip.mp4'),
        voltsPath: join(simDir, 'volts.csv'),
        lengthMm: DEMO_CELL.lengthMm,
        gapMm: DEMO_CELL.gapMm,
        electrodeHeightMm: DEMO_CELL.electrodeHeightMm,
        referenceRoi: DEMO_REFERENCE_ROI,
        wavelengthNm: DEMO_CELL.wavelengthNm,
        label: scenarioJson.label,
      },
      { toolVersion: o.toolVersion, ffmpegVersion: o.ffmpegVersion, ...(o.onProgress ? { onProgress: (s: string, d: number, t: number) => o.onProgress!(`analyse ${name}`, d, t) } : {}) },
    );
    const dir = await finishRun(run, { outDir: join(outDir, name, 'analysis'), force: true });
    const { out } = run;
    runs.push({ name, dir, out });
  }
  // A photo series of the purified liquid, for `kerrtrace stills` (printed as the next command).
  o.onStage?.('photographing the after run at twelve voltages');
  const photosDir = join(outDir, 'after', 'photos');
  mkdirSync(photosDir, { recursive: true });
  const vpi = runs[1]!.out.result.halfWaveVoltage.value;
  const voltages = Array.from({ length: 12 }, (_, i) => Math.round((1.1 * vpi * i) / 11 / 50) * 50);
  const photos = renderStillPhotos(DEMO_AFTER, voltages, 'built-in demo scenario "after" (photos)');
  for (const [i, p] of photos.entries()) {
    const name = `step${String(i + 1).padStart(2, '0')}_${(p.voltageV / 1000).toFixed(2)}kV.jpg`;
    await sharp(p.rgb, { raw: { width: p.width, height: p.height, channels: 3 } }).jpeg({ quality: 95 }).toFile(join(photosDir, name));
  }

  o.onStage?.('comparing the runs');
  const comparison = compareRuns(runs.map((r) => r.out.result), ['before purification', 'after purification'], {
    sources: await Promise.all(runs.map(async (r) => ({ path: join(r.dir, 'result.json'), sha256: await sha256File(join(r.dir, 'result.json')) }))),
  });
  const comparisonDir = join(outDir, 'comparison');
  await writeComparison(comparisonDir, comparison, { force: true, toolVersion: o.toolVersion });
  return { outDir, runs, comparison, comparisonDir, photosDir };
}
