/**
 * After the analysis: record the inputs' SHA-256, add the scatter products, and write the run
 * folder (result.json, trace.csv, maps, report) in one staged step.
 */
import { sha256File } from '../io/sha256File.js';
import { writeRunDir } from './writeRun.js';
import type { AnalyzeOutput } from './analyze.js';

export interface FinishOptions {
  outDir: string;
  force: boolean;
  report: boolean;
}

export async function finishRun(out: AnalyzeOutput, f: FinishOptions): Promise<string> {
  const o = out.result.options as { videoPath: string; voltsPath: string; openVideoPath?: string };
  out.result.inputs.video = { path: o.videoPath, sha256: await sha256File(o.videoPath) };
  out.result.inputs.volts = { path: o.voltsPath, sha256: await sha256File(o.voltsPath) };
  if (o.openVideoPath) out.result.inputs.openVideo = { path: o.openVideoPath, sha256: await sha256File(o.openVideoPath) };
  return writeRunDir(f.outDir, f.force, { result: out.result, trace: out.trace });
}
