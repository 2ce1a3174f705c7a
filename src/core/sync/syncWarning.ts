/**
 * A non-fatal finding of the video/log synchronisation search (findSyncOffset), as data: a stable
 * `code` a caller can sort by, a one-line `message` in plain words (no command-line flag names:
 * the command line adds those), and the `facts` behind it (offsets and widths in s, R²
 * dimensionless), so no caller has to read the message to learn what happened.
 *
 * Codes:
 * - `sync-ambiguous`: a distinct other offset scores within the ambiguity margin of the best (a
 *   drive that repeats itself);
 * - `sync-coarse-grid`: the offset range was so long that it was searched at a step coarser than
 *   the frames;
 * - `sync-at-edge`: the best offset lies within one grid step of the edge of the offsets searched;
 * - `sync-not-converged`: the golden-section refinement stopped at its iteration cap;
 * - `sync-broad-peak`: R² changes by less than the sharpness drop over more than the broad-peak
 *   width (or over the whole range).
 *
 * @example { code: 'sync-at-edge', message: 'sync: the best offset 2 s lies at the edge ...', facts: { offsetS: 2, fromS: 2, toS: 4 } }
 */
export type SyncWarningCode = 'sync-ambiguous' | 'sync-coarse-grid' | 'sync-at-edge' | 'sync-not-converged' | 'sync-broad-peak';

export interface SyncWarning {
  code: SyncWarningCode;
  /** One line in plain words, starting with "sync: ". */
  message: string;
  /** The numbers behind the message (s for offsets and widths, R² dimensionless). */
  facts: Record<string, number | null>;
}
