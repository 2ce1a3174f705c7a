/**
 * What a run folder will hold, decided before anything is written (RunResult.files): result.json,
 * trace.csv, the map files when maps were made, and with the report its plots (time trace,
 * transmission, linearised, sync; SVG and PNG each, when the run has data for them), summary.md
 * and report.html. Keys as writeRunReport names them; extra files get the camel-case of their
 * name without extension ("maps/static.png" → "mapsStatic"). writeRunDir checks the folder
 * against this list before it commits it.
 */
import type { RunResult, TraceRow } from '../result/schema.js';

/** "maps/static.png" → "mapsStatic". */
export function fileKey(name: string): string {
  return name.replace(/\.[^.]+$/, '').replace(/[^A-Za-z0-9]+(.)/g, (_m, c: string) => c.toUpperCase());
}

export interface RunFilesInput {
  extraFiles: readonly string[];
  report: boolean;
  trace: readonly TraceRow[];
  linearised: RunResult['linearised'];
  syncCurvePoints: number;
}

export function runFiles(i: RunFilesInput): Record<string, string> {
  const files: Record<string, string> = { result: 'result.json', trace: 'trace.csv' };
  for (const name of i.extraFiles) files[fileKey(name)] = name;
  if (!i.report) return files;
  const hasTrace = i.trace.length > 0;
  const plots: [string, string, boolean][] = [
    ['timeTrace', 'time-trace', hasTrace],
    ['transmission', 'transmission', hasTrace && i.trace.some((r) => r.voltageV !== null)],
    ['linearised', 'linearised', hasTrace && i.linearised !== null],
    ['sync', 'sync', i.syncCurvePoints > 0],
  ];
  for (const [key, name, made] of plots) {
    if (!made) continue;
    files[`${key}Svg`] = `plots/${name}.svg`;
    files[`${key}Png`] = `plots/${name}.png`;
  }
  files.summary = 'summary.md';
  files.report = 'report.html';
  return files;
}
