/**
 * Helpers for the fault suite: run the real command line (dist/, built by `npm test` or
 * `npx tsc -p tsconfig.json`), kill it at a chosen step or time, hash input trees, and check that
 * an output folder holds one complete result.
 *
 * The step hook KERRTRACE_TEST_STEP_DELAY_MS (src/io/outputDir.ts) is test-only: it makes the
 * tool print `kerrtrace-step: NAME` on stderr and pause that long at each step of writing and
 * replacing, so that a kill can land on every step of the replace, which otherwise lasts
 * microseconds.
 */
import { spawn, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { expect } from 'vitest';

export const ROOT = join(__dirname, '..', '..');
export const BIN = join(ROOT, 'bin', 'kerrtrace.js');
/**
 * True once the command line is compiled. The fault suites run the real CLI, so without dist/
 * they fail with one line saying how to build it (never skip in silence).
 */
export const BUILT = existsSync(join(ROOT, 'dist', 'cli', 'main.js'));
if (!BUILT) throw new Error('the fault tests run the compiled command line: run `npx tsc -p tsconfig.json` (npm test does it first)');
export const MEDIA = join(ROOT, 'test-media');
export const FIXTURE_RESULTS = join(ROOT, 'test', 'fixtures', 'results');

export interface CliRun {
  code: number | null;
  signal: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
}

/** Runs the command line to the end. */
export function kerrtrace(args: string[], opts: { cwd?: string; env?: NodeJS.ProcessEnv; stdio?: 'full' | 'pipe'; timeoutMs?: number } = {}): CliRun {
  const r = spawnSync(process.execPath, [BIN, ...args], {
    encoding: 'utf8',
    timeout: opts.timeoutMs ?? 180_000,
    cwd: opts.cwd ?? ROOT,
    env: { ...process.env, ...opts.env },
  });
  return { code: r.status, signal: r.signal, stdout: r.stdout, stderr: r.stderr };
}

/** Asserts one line on stderr (ignoring step announcements), the exit code, no stack trace. */
export function expectOneLine(r: CliRun, code: number, pattern: RegExp): void {
  const lines = r.stderr.split('\n').filter((l) => l.trim() !== '' && !l.startsWith('kerrtrace-step:') && !l.startsWith('kerrtrace: note:'));
  expect(lines, r.stderr).toHaveLength(1);
  expect(lines[0]).toMatch(pattern);
  expect(r.stderr).not.toMatch(/\n\s+at |internal error/);
  expect(r.code, r.stderr).toBe(code);
}

export interface KillPlan {
  /** Kill when this step is announced (after `jitterMs`), or ... */
  atStep?: string;
  /** ... as soon as one of these paths disappears (polled every millisecond; needs no hook), or ... */
  whenGone?: string[];
  /** ... this long after the start. */
  afterMs?: number;
  jitterMs?: number;
  signal: NodeJS.Signals;
  env?: NodeJS.ProcessEnv;
  cwd?: string;
}

/** Runs the command line and kills it as planned; `killed` says whether the signal was sent before it ended. */
export function runAndKill(args: string[], plan: KillPlan): Promise<CliRun & { killed: boolean; steps: string[] }> {
  return new Promise((resolvePromise) => {
    const child = spawn(process.execPath, [BIN, ...args], {
      cwd: plan.cwd ?? ROOT,
      env: { ...process.env, ...plan.env },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let stdout = '';
    let stderr = '';
    let killed = false;
    let exited = false;
    const steps: string[] = [];
    const kill = (): void => {
      if (exited || killed) return;
      killed = child.kill(plan.signal);
    };
    child.stdout.on('data', (d: Buffer) => (stdout += d.toString()));
    let pending = '';
    child.stderr.on('data', (d: Buffer) => {
      stderr += d.toString();
      pending += d.toString();
      let nl;
      while ((nl = pending.indexOf('\n')) >= 0) {
        const line = pending.slice(0, nl);
        pending = pending.slice(nl + 1);
        const m = /^kerrtrace-step: (.*)$/.exec(line);
        if (m) {
          steps.push(m[1]!);
          if (plan.atStep !== undefined && m[1] === plan.atStep) setTimeout(kill, plan.jitterMs ?? 0);
        }
      }
    });
    if (plan.afterMs !== undefined) setTimeout(kill, plan.afterMs);
    const poll = plan.whenGone
      ? setInterval(() => {
          if (plan.whenGone!.some((p) => !existsSync(p))) kill();
        }, 1)
      : undefined;
    child.on('exit', (code, signal) => {
      exited = true;
      if (poll) clearInterval(poll);
      // Let the pipes drain.
      setTimeout(() => resolvePromise({ code, signal, stdout, stderr, killed: killed && (signal !== null || code === 143 || code === 130), steps }), 20);
    });
  });
}

/** SHA-256 of every file under `dir` (or of the file), keyed by relative path. */
export function hashTree(path: string): Record<string, string> {
  const out: Record<string, string> = {};
  const walk = (p: string, rel: string): void => {
    const st = statSync(p);
    if (st.isDirectory()) {
      for (const e of readdirSync(p).sort()) walk(join(p, e), rel === '' ? e : `${rel}/${e}`);
    } else {
      out[rel] = createHash('sha256').update(readFileSync(p)).digest('hex');
    }
  };
  walk(path, '');
  return out;
}

/** The label of the complete comparison in `dir`, or throws when it is not complete. */
export function completeComparisonLabel(dir: string): string {
  for (const f of ['.kerrtrace-output', 'comparison.html', 'comparison.csv', 'summary.md']) {
    if (!existsSync(join(dir, f))) throw new Error(`${dir} lacks ${f}: ${readdirSync(dir).join(', ')}`);
  }
  const json = JSON.parse(readFileSync(join(dir, 'comparison.json'), 'utf8')) as { runs: { label: string }[] };
  const html = readFileSync(join(dir, 'comparison.html'), 'utf8');
  if (!html.includes('</html>')) throw new Error(`${dir}/comparison.html is cut short`);
  return json.runs.map((r) => r.label).join('+');
}

/** The label of the complete analyze run in `dir` (every listed file present), or throws. */
export function completeRunLabel(dir: string): string {
  if (!existsSync(join(dir, '.kerrtrace-output'))) throw new Error(`${dir} lacks its marker`);
  const result = JSON.parse(readFileSync(join(dir, 'result.json'), 'utf8')) as { label: string; files: Record<string, string> };
  for (const f of Object.values(result.files)) if (!existsSync(join(dir, f))) throw new Error(`${dir} lacks ${f}`);
  const rows = readFileSync(join(dir, 'trace.csv'), 'utf8').trim().split('\n');
  if (rows.length < 10) throw new Error(`${dir}/trace.csv is cut short`);
  return result.label;
}

/** Names beside `dir` left by kerrtrace (staging and backup folders or files). */
export function leftovers(dir: string): string[] {
  const parent = join(dir, '..');
  const name = dir.split('/').pop()!;
  return readdirSync(parent).filter((e) => e.startsWith(`.${name}.`));
}
