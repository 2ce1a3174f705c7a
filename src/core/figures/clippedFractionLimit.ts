/**
 * Share of clipped pixels in the beam region above which a frame or photo is left out of the Kerr
 * fit (reason "clipped") and named in a warning: 1 %. A clipped pixel reads low (its true value is
 * above full scale), so a region mean that includes many of them understates the light. Common
 * practice; one constant for video and photo runs (docs/analyze.md, docs/stills.md).
 */
export const CLIPPED_FRACTION_LIMIT = 0.01;
