/**
 * Runs the real command line (`node bin/kerrtrace.js`, which loads dist/: run `npx tsc -p
 * tsconfig.json` first; `npm test` does) without blocking the test worker, so independent runs in
 * one file can go side by side. Also reads what a run wrote: result.json and trace.csv.
 * Debug variables that change output are cleared from the child's environment.
 * @example const r = await kerrtraceCli(['analyze', clip, '--volts', log, ...]); expect(r.code).toBe(0);
 */
import { spawn } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { join } from 'node:path';
import { expect } from 'vitest';

export const REPO_ROOT = fileURLToPath(new URL('../../', import.meta.url));
export const BIN = join(REPO_ROOT, 'bin', 'kerrtrace.js');
export const TEST_MEDIA = join(REPO_ROOT, 'test-media');

export interface CliRun {
  code: number | null;
  stdout: string;
  stderr: string;
}

/** Fails with one clear line when dist/ has not been built. */
export function requireBuiltCli(): void {
  if (!existsSync(join(REPO_ROOT, 'dist', 'cli', 'main.js'))) {
    throw new Error('dist/ is missing: run `npx tsc -p tsconfig.json` (npm test does) before the command-line tests');
  }
}

export function kerrtraceCli(args: string[], opts: { cwd?: string; timeoutMs?: number } = {}): Promise<CliRun> {
  const env = { ...process.env };
  for (const k of Object.keys(env)) if (k.startsWith('KERRTRACE_DEBUG')) delete env[k];
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [BIN, ...args], { cwd: opts.cwd ?? REPO_ROOT, env, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.setEncoding('utf8').on('data', (d: string) => { stdout += d; });
    child.stderr.setEncoding('utf8').on('data', (d: string) => { stderr += d; });
    const timer = setTimeout(() => child.kill('SIGKILL'), opts.timeoutMs ?? 240_000);
    child.on('error', (e) => { clearTimeout(timer); reject(e); });
    child.on('close', (code) => { clearTimeout(timer); resolve({ code, stdout, stderr }); });
  });
}

/** Exit non-zero, exactly one line on stderr matching `pattern`, no stack trace. */
export function expectOneLineError(r: CliRun, pattern: RegExp): void {
  expect(r.code, `stdout: ${r.stdout}\nstderr: ${r.stderr}`).not.toBe(0);
  const lines = r.stderr.trim().split('\n');
  expect(lines, r.stderr).toHaveLength(1);
  expect(lines[0]).toMatch(pattern);
  expect(r.stderr).not.toMatch(/\n\s+at |Error:\s*$|node:internal/);
}

/** The parsed result.json of a run folder (any JSON object). */
export function readResultJson(dir: string): any {
  return JSON.parse(readFileSync(join(dir, 'result.json'), 'utf8'));
}

export interface TraceCsvRow {
  timeS: number;
  frame: number;
  voltageV: number | null;
  intensity: number;
  model: number | null;
  residual: number | null;
  used: boolean;
  excludedReason: string;
}

/** trace.csv parsed with our own split (the file is plain comma-separated numbers, see docs/analyze.md). */
export function readTraceCsv(dir: string): TraceCsvRow[] {
  const lines = readFileSync(join(dir, 'trace.csv'), 'utf8').trim().split('\n');
  expect(lines[0]).toBe('time_s,frame,voltage_V,intensity,model,residual,used,excluded_reason');
  const num = (s: string): number | null => (s === '' ? null : Number(s));
  return lines.slice(1).map((line) => {
    const c = line.split(',');
    return {
      timeS: Number(c[0]), frame: Number(c[1]), voltageV: num(c[2]!), intensity: Number(c[3]),
      model: num(c[4]!), residual: num(c[5]!), used: c[6] === '1', excludedReason: c[7] ?? '',
    };
  });
}

/** Runs async jobs at most `limit` at a time (two cores on CI). */
export async function inBatches<T>(jobs: (() => Promise<T>)[], limit = 2): Promise<T[]> {
  const out: T[] = new Array(jobs.length);
  let next = 0;
  const worker = async (): Promise<void> => {
    while (next < jobs.length) {
      const k = next++;
      out[k] = await jobs[k]!();
    }
  };
  await Promise.all(Array.from({ length: Math.min(limit, jobs.length) }, worker));
  return out;
}
