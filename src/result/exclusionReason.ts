/**
 * Why a frame (or a photo) was left out of the fit: `TraceRow.excludedReason` in trace.csv and
 * result.json, and the keys of `result.frames.excluded` (frames counted by reason), with the
 * meaning of each in one line. docs/analyze.md ("Frames left out") lists the same reasons; a test
 * checks that every reason the sources assign is here and in that page.
 * @example const why: ExclusionReason = 'spark';
 */
export const EXCLUSION_REASONS = {
  'no-reference': 'the reference region gave no usable exposure gain for this frame',
  spark: 'a flash (spark or breakdown) lit the frame',
  clipped: 'more than 1 % of the beam region is clipped',
  'open-window': 'the frame lies in the open-level window (analyser parallel), measured separately',
  'open-turning': 'the analyser was being turned just before or after the open-level window',
  'log-gap': 'the frame falls in a gap of the voltage log',
  'outside-log': 'the frame lies before or after the voltage log',
  particle: 'a particle crossed the beam',
  'exposure-jump': 'a sudden exposure change the reference region could not correct',
  'not-finite': 'the photo gave no finite intensity or voltage',
  unreadable: 'the photo could not be read',
} as const satisfies Record<string, string>;

/** An exclusion reason: one of the keys of EXCLUSION_REASONS. */
export type ExclusionReason = keyof typeof EXCLUSION_REASONS;
