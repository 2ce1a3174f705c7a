/**
 * Writes an analyzed run into its folder, whole or not at all: result.json, trace.csv and the
 * report files, staged in a hidden folder and renamed into place at the end (the output policy of
 * src/io/outputDir.ts: never over an input, --force only over a folder kerrtrace wrote, kill-safe).
 * A system error while writing (full disk, permissions) is an ENVIRONMENT KerrError naming outDir.
 */
import { environmentError } from '../io/environmentError.js';
import { stageOutputDir } from '../io/outputDir.js';
import { traceCsv } from '../io/traceCsv.js';
import type { RunResult, TraceRow } from '../result/schema.js';

export interface RunArtifacts {
  result: RunResult;
  trace: TraceRow[];
  /** Extra files (relative name → bytes), e.g. maps and overlays. */
  extraFiles?: Record<string, Uint8Array | string>;
  /** Called with the staging folder to write reports; returns the names it wrote. */
  writeReports?: (stagingDir: string, result: RunResult) => Promise<Record<string, string>>;
  /** Every input of the run: the folder may never be, hold or lie inside one of them. */
  inputs?: string[];
}

export async function writeRunDir(outDir: string, force: boolean, a: RunArtifacts): Promise<string> {
  const staged = stageOutputDir(outDir, force, a.inputs ?? []);
  try {
    const files: Record<string, string> = { result: 'result.json', trace: 'trace.csv' };
    staged.write('trace.csv', traceCsv(a.trace));
    for (const [name, data] of Object.entries(a.extraFiles ?? {})) {
      staged.write(name, data);
      files[name.replace(/\.[^.]+$/, '').replace(/[^A-Za-z0-9]+(.)/g, (_m, c: string) => c.toUpperCase())] = name;
    }
    a.result.files = files;
    if (a.writeReports) Object.assign(files, await a.writeReports(staged.path, a.result));
    staged.write('result.json', `${JSON.stringify(a.result, jsonSafe, 2)}\n`);
    staged.commit();
    return staged.target;
  } catch (err) {
    staged.abandon();
    throw environmentError(err, outDir, 'writing') ?? err;
  }
}

/** JSON has no Infinity/NaN: write them as null (documented in docs/analyze.md). */
export function jsonSafe(_key: string, value: unknown): unknown {
  if (typeof value === 'number' && !Number.isFinite(value)) return null;
  return value;
}
