/**
 * The shell shared by the frame and region streams: probe once (or take the caller's probe), make
 * an ffmpeg plan from it, run it on the first read, hand each frame set to `shape`, and report the
 * child's exit. A stream can be read once. `layout()` gives the plan's geometry without starting
 * ffmpeg.
 */
import { KerrError } from '../errors.js';
import { probeMedia, type ProbeResult } from './probe.js';
import { runRawPipes, type ChildExit, type RawFrameSet, type RawPipesPlan, type RawPipesRun } from './rawVideoPipes.js';

export interface PlannedStream<L, T> extends AsyncIterable<T> {
  /** Probe result and output geometry (runs the probe if needed; the iteration uses the same). */
  layout(): Promise<L>;
  /** Resolves when the ffmpeg child has exited and been reaped; null if it was never started. */
  closed(): Promise<ChildExit | null>;
  /** Frames delivered so far. */
  readonly framesRead: number;
  /** Process id of the ffmpeg child once started. */
  readonly pid: number | undefined;
  /** Remarks about timing made while streaming (e.g. more frames than timestamps). */
  readonly notes: readonly string[];
}

export interface PlannedStreamOptions {
  probe?: ProbeResult;
  signal?: AbortSignal;
  onProgress?: (done: number, total: number) => void;
}

export function plannedStream<L, T>(
  path: string,
  opts: PlannedStreamOptions,
  planFor: (probe: ProbeResult) => { layout: L; plan: RawPipesPlan },
  shape: (set: RawFrameSet, layout: L) => T,
  what: string,
): PlannedStream<L, T> {
  let planned: Promise<{ layout: L; plan: RawPipesPlan }> | undefined;
  let run: RawPipesRun | undefined;
  let started = false;
  let framesRead = 0;

  const plan = (): Promise<{ layout: L; plan: RawPipesPlan }> => {
    planned ??= (async () => {
      const probe = opts.probe ?? (await probeMedia(path, opts.signal === undefined ? {} : { signal: opts.signal }));
      return planFor(probe);
    })();
    return planned;
  };

  async function* frames(): AsyncGenerator<T, void, undefined> {
    const { layout, plan: rawPlan } = await plan();
    opts.signal?.throwIfAborted();
    const pipeOptions: Parameters<typeof runRawPipes>[1] = {};
    if (opts.onProgress) pipeOptions.onProgress = opts.onProgress;
    if (opts.signal) pipeOptions.signal = opts.signal;
    run = runRawPipes(rawPlan, pipeOptions);
    for await (const set of run.frames) {
      framesRead = set.index + 1;
      yield shape(set, layout);
    }
  }

  return {
    [Symbol.asyncIterator](): AsyncIterator<T> {
      if (started) throw new KerrError('INTERNAL', `a ${what} can be read only once; open a new one`);
      started = true;
      return frames();
    },
    layout: async () => (await plan()).layout,
    closed: async () => {
      if (!started) return null;
      try { await plan(); } catch { return null; }
      return run ? run.exited : null;
    },
    get framesRead() { return framesRead; },
    get pid() { return run?.pid; },
    get notes() { return run?.notes ?? []; },
  };
}
