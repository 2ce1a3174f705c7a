/**
 * After the analysis: write the run folder (result.json, trace.csv, the map files and, when the
 * record lists them, the report files) in one staged step. The record is written as it was built
 * (its inputs, hashes and file list are already in it); the folder is checked against every input
 * of the run.
 */
import { writeRunReport } from '../report/writeRunReport.js';
import { writeRunDir } from './writeRun.js';
import type { AnalyzedRun } from './runAnalysis.js';

export interface FinishOptions {
  outDir: string;
  force: boolean;
}

export async function finishRun(run: AnalyzedRun, f: FinishOptions): Promise<string> {
  const { out, products } = run;
  const images = products?.images;
  return writeRunDir(f.outDir, f.force, {
    inputs: out.inputPaths,
    result: out.result,
    trace: out.trace,
    ...(products ? { extraFiles: products.files } : {}),
    ...(out.result.files.report !== undefined
      ? { writeReports: async (dir, result) => (await writeRunReport(dir, { result, trace: out.trace, ...(images ? { images } : {}) })).files }
      : {}),
  });
}
