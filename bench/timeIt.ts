/**
 * A small runner for benchmark cases: each case is a named async function that does its work and
 * says how many frames it handled; the runner times it with the monotonic clock and reports frames
 * per second. Cases that fail are reported, never thrown: the benchmark prints, it does not judge.
 *
 * @example
 * const r = await timeIt('decode to null', async () => ({ frames: await decodeToNull(clip) }));
 * console.log(r.fps);
 */
export interface CaseOutcome {
  /** Frames handled by the case. */
  frames: number;
  /** Extra figures the case wants printed (e.g. peak memory), name → value with unit. */
  extra?: Record<string, string>;
  /** Time measured by the case itself (e.g. inside a child process), s; else the runner's clock. */
  seconds?: number;
  /** CPU seconds the work used (all processes involved), when the case can tell. */
  cpuS?: number;
}

export interface CaseResult {
  name: string;
  ok: boolean;
  frames: number;
  seconds: number;
  fps: number;
  /** CPU seconds per frame (NaN when unknown): independent of how busy the machine is. */
  cpuPerFrameS: number;
  extra: Record<string, string>;
  error?: string;
}

export interface BenchCase {
  name: string;
  run: () => Promise<CaseOutcome>;
  /** Run this many times (interleaved with the other cases, round by round) and keep the fastest. */
  repeats?: number;
}

export async function timeIt(name: string, run: () => Promise<CaseOutcome>): Promise<CaseResult> {
  const start = process.hrtime.bigint();
  try {
    const outcome = await run();
    const wallS = Number(process.hrtime.bigint() - start) / 1e9;
    const seconds = outcome.seconds ?? wallS;
    const cpuPerFrameS = outcome.cpuS !== undefined ? outcome.cpuS / outcome.frames : NaN;
    return { name, ok: true, frames: outcome.frames, seconds, fps: outcome.frames / seconds, cpuPerFrameS, extra: outcome.extra ?? {} };
  } catch (e) {
    const seconds = Number(process.hrtime.bigint() - start) / 1e9;
    return { name, ok: false, frames: 0, seconds, fps: NaN, cpuPerFrameS: NaN, extra: {}, error: e instanceof Error ? e.message : String(e) };
  }
}

/**
 * Runs cases one after another (they would compete for the same cores otherwise), in rounds: every
 * case runs in round 1, cases with `repeats` > 1 run again in later rounds, and the fastest run of
 * each case is kept (the least disturbed by other work on the machine), with the smallest CPU time
 * per frame seen in any of its runs. Interleaving the rounds spreads background load over all cases.
 */
export async function runCases(cases: BenchCase[], onResult?: (r: CaseResult, round: number) => void): Promise<CaseResult[]> {
  const best: Array<CaseResult | undefined> = cases.map(() => undefined);
  const rounds = Math.max(1, ...cases.map((c) => c.repeats ?? 1));
  for (let round = 1; round <= rounds; round++) {
    for (let k = 0; k < cases.length; k++) {
      const c = cases[k]!;
      if ((c.repeats ?? 1) < round) continue;
      const r = await timeIt(c.name, c.run);
      onResult?.(r, round);
      const previous = best[k];
      if (previous === undefined || (r.ok && (!previous.ok || r.fps > previous.fps))) {
        // keep the fastest run, and the smallest CPU per frame seen in any run
        const cpu = Math.min(r.cpuPerFrameS, previous?.cpuPerFrameS ?? Infinity);
        best[k] = { ...r, cpuPerFrameS: Number.isFinite(cpu) ? cpu : r.cpuPerFrameS };
      } else if (r.ok && r.cpuPerFrameS < previous.cpuPerFrameS) {
        best[k] = { ...previous, cpuPerFrameS: r.cpuPerFrameS };
      }
    }
  }
  return best.map((r) => r!);
}

export function formatResult(r: CaseResult): string {
  if (!r.ok) return `${r.name.padEnd(52)} FAILED: ${r.error ?? 'unknown error'}`;
  const extra = Object.entries(r.extra).map(([k, v]) => `${k} ${v}`).join(', ');
  const cpu = Number.isFinite(r.cpuPerFrameS) ? ` ${(r.cpuPerFrameS * 1000).toFixed(2).padStart(6)} ms CPU/frame` : '';
  return `${r.name.padEnd(52)} ${String(r.frames).padStart(5)} frames ${r.seconds.toFixed(2).padStart(7)} s ${r.fps.toFixed(1).padStart(8)} fps${cpu}${extra ? `  (${extra})` : ''}`;
}
