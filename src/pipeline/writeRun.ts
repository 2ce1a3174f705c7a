/**
 * Writes an analyzed run into its folder, whole or not at all: result.json, trace.csv and the
 * report files, staged in a hidden folder and renamed into place at the end (the output policy of
 * src/io/outputDir.ts: never over an input, --force only over a folder kerrtrace wrote, kill-safe).
 * A system error while writing (full disk, permissions) is an ENVIRONMENT KerrError naming outDir.
 *
 * `result.files` says what the folder will hold. When the caller decided it before writing (analyze:
 * runFiles), the files written are checked against it and a difference is a KerrError INTERNAL,
 * raised before the folder is committed; the result is never changed here. When it is empty (the
 * photo-series command, until it decides its files up front too), it is filled from what was written.
 */
import { KerrError } from '../errors.js';
import { environmentError } from '../io/environmentError.js';
import { stageOutputDir } from '../io/outputDir.js';
import { traceCsv } from '../io/traceCsv.js';
import type { RunResult, TraceRow } from '../result/schema.js';
import { fileKey } from './runFiles.js';

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
    const decided = Object.keys(a.result.files).length > 0;
    const files: Record<string, string> = { result: 'result.json', trace: 'trace.csv' };
    staged.write('trace.csv', traceCsv(a.trace));
    for (const [name, data] of Object.entries(a.extraFiles ?? {})) {
      staged.write(name, data);
      files[fileKey(name)] = name;
    }
    if (!decided) a.result.files = files;
    if (a.writeReports) Object.assign(files, await a.writeReports(staged.path, a.result));
    if (decided) checkFiles(a.result.files, files);
    staged.write('result.json', `${JSON.stringify(a.result, jsonSafe, 2)}\n`);
    staged.commit();
    return staged.target;
  } catch (err) {
    staged.abandon();
    throw environmentError(err, outDir, 'writing') ?? err;
  }
}

function checkFiles(decided: Record<string, string>, written: Record<string, string>): void {
  const text = (r: Record<string, string>) => JSON.stringify(Object.entries(r).sort(([a], [b]) => a.localeCompare(b)));
  if (text(decided) !== text(written)) {
    throw new KerrError('INTERNAL', `the run folder would hold ${Object.values(written).join(', ')} but its result lists ${Object.values(decided).join(', ')}`);
  }
}

/** JSON has no Infinity/NaN: write them as null (documented in docs/analyze.md). */
export function jsonSafe(_key: string, value: unknown): unknown {
  if (typeof value === 'number' && !Number.isFinite(value)) return null;
  return value;
}
