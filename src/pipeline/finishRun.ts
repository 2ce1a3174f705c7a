/**
 * After the analysis: record the inputs' SHA-256 and write the run folder (result.json,
 * trace.csv, extra files such as maps, and the report) in one staged step.
 */
import { sha256File } from '../io/sha256File.js';
import { writeRunReport, type RunReportInput } from '../report/writeRunReport.js';
import { writeRunDir } from './writeRun.js';
import type { AnalyzeOutput } from './analyze.js';

export interface FinishOptions {
  outDir: string;
  force: boolean;
  report: boolean;
  extraFiles?: Record<string, Uint8Array | string>;
  images?: RunReportInput['images'];
}

export async function finishRun(out: AnalyzeOutput, f: FinishOptions): Promise<string> {
  const o = out.result.options as { videoPath: string; voltsPath: string; openVideoPath?: string; cameraProfilePath?: string };
  out.result.inputs.video = { path: o.videoPath, sha256: await sha256File(o.videoPath) };
  out.result.inputs.volts = { path: o.voltsPath, sha256: await sha256File(o.voltsPath) };
  if (o.openVideoPath) out.result.inputs.openVideo = { path: o.openVideoPath, sha256: await sha256File(o.openVideoPath) };
  if (o.cameraProfilePath) out.result.inputs.cameraProfile = { path: o.cameraProfilePath, sha256: await sha256File(o.cameraProfilePath) };
  const baseline = out.result.inputs.baseline?.path;
  return writeRunDir(f.outDir, f.force, {
    inputs: [o.videoPath, o.voltsPath, ...(o.openVideoPath ? [o.openVideoPath] : []), ...(baseline ? [baseline] : []), ...(o.cameraProfilePath ? [o.cameraProfilePath] : [])],
    result: out.result,
    trace: out.trace,
    ...(f.extraFiles ? { extraFiles: f.extraFiles } : {}),
    ...(f.report
      ? {
          writeReports: async (dir, result) =>
            (await writeRunReport(dir, { result, trace: out.trace, ...(f.images ? { images: f.images } : {}) })).files,
        }
      : {}),
  });
}
