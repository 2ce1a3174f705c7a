/**
 * A progress bar on stderr for long commands, shown only when stderr is a terminal and the user
 * did not ask for quiet; otherwise every call is a no-op (pipes, logs and tests stay clean).
 * stdout is never touched, so data written there (CSV, JSON) is not disturbed.
 *
 * The bar starts on the first update (when the total is known), follows total changes, redraws at
 * most 10 times a second and clears itself on stop.
 *
 * @example
 * const progress = makeProgress('decoding', opts.quiet === true);
 * try { await work({ onProgress: (done, total) => progress.update(done, total) }); } finally { progress.stop(); }
 */
import cliProgress from 'cli-progress';

export interface Progress {
  update(done: number, total: number): void;
  stop(): void;
}

export function makeProgress(label: string, quiet: boolean, stream: NodeJS.WriteStream = process.stderr): Progress {
  if (quiet || !stream.isTTY) return { update: () => {}, stop: () => {} };
  let bar: cliProgress.SingleBar | undefined;
  let total = 0;
  return {
    update(done: number, newTotal: number): void {
      if (!bar) {
        bar = new cliProgress.SingleBar({
          stream,
          format: `${label} [{bar}] {percentage}% | {value}/{total} frames | {eta_formatted} left`,
          hideCursor: true,
          clearOnComplete: true,
          fps: 10,
        }, cliProgress.Presets.shades_classic);
        total = Math.max(1, newTotal);
        bar.start(total, 0);
      }
      if (newTotal !== total && newTotal > 0) {
        total = newTotal;
        bar.setTotal(total);
      }
      bar.update(Math.min(done, total));
    },
    stop(): void {
      bar?.stop();
      bar = undefined;
    },
  };
}
