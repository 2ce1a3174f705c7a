/**
 * Share of clipped pixels in the beam region above which a photo is named in a warning and left
 * out of the Kerr fit: 1 %. A clipped pixel reads low (its true value is above full scale), so a
 * region mean that includes many of them understates the light. Common practice; stated in
 * docs/stills.md.
 */
export const CLIPPED_WARNING_FRACTION = 0.01;
