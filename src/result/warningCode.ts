/**
 * Every warning code a run or a comparison can carry (`RunWarning.code` in result.json and
 * comparison.json), with its meaning in one line. The codes are stable data: reports, the command
 * line and scripts key on them, never on the wording of a message. docs/analyze.md ("Warnings")
 * lists the same codes for users; a test checks that every code the sources use is here and in
 * that page.
 * @example const w: RunWarning = { code: 'clipping' satisfies WarningCode, message: '12 frames ...' };
 */
export const WARNING_CODES = {
  // analyze: regions, decoding, log and sync
  'auto-region': 'the beam region was found automatically; check it in the report or give one',
  'no-surround': 'the beam region leaves no room for a surround ring, so the floor includes background light',
  'reference-dark': 'the reference region is never brighter than the dark level, so exposure was not corrected from it',
  clipping: 'frames or photos with more than 1 % clipped pixels in the beam were left out',
  probe: 'a note from reading the container (timestamps, frame count, frame rate)',
  decoding: 'a guess about how code values become light (untagged transfer, matrix or range)',
  'voltage-log': 'a note from reading the voltage log (units, repeated times, skipped lines)',
  'log-gap': 'frames in gaps of the voltage log were left out rather than bridged',
  'sync-ambiguous': 'two sync offsets fit about equally well',
  'sync-at-edge': 'the best sync offset lies at the edge of the offsets searched',
  'sync-not-converged': 'the refinement of the sync offset stopped before converging',
  'sync-broad-peak': 'the sync score peaks broadly, so the offset is loosely fixed',
  'sync-coarse-grid': 'the offsets were searched on a coarser grid than one frame (a long clip or log)',
  // analyze and stills: the fit
  'not-identifiable': 'the sweep does not separate brightness from the half-wave voltage, so B and V_π are withheld',
  'fit-not-converged': 'the Kerr fit stopped without converging',
  'floor-not-positive': 'the fitted floor is at or below the dark level, so the contrast ratio is unbounded',
  'linearised-disagrees': 'the linearised cross-check of B disagrees with the curve fit',
  'implausible-kerr-constant': 'B is more than 10× outside the range of the built-in liquid table (check units)',
  'camera-profile': 'the camera profile fits its calibration poorly or was made in another camera mode',
  'camera-response': 'the footage departs from the assumed camera response; the difference enters the uncertainty',
  // analyze: maps and scatter figures
  'no-maps': 'no maps or scatter figures, because the half-wave voltage is not identifiable',
  'maps-weak': 'the modulation term spans little of its range, so the maps are noisy',
  'maps-no-beam': 'no beam found on the maps, so the halo-to-core ratio is not reported',
  'exposure-drift': 'the exposure changed during the run (reference region, surround or EXIF)',
  'exposure-jump': 'sudden exposure changes remain after the reference correction; those frames were left out',
  'no-far-dark': 'no dark area far from the beam, so the halo-to-core ratio is not reported',
  'baseline-mismatch': 'the baseline run had another polariser angle, so the floors are not comparable',
  hysteresis: 'B differs between rising and falling voltage beyond its uncertainty',
  'compression-lag': 'B differs between rising and falling voltage in footage starved of bits: likely the codec lagging, not the liquid',
  'hysteresis-not-measured': 'rising and falling sweeps could not be compared',
  'no-electrode-height': 'the log has a current column but no electrode height was given, so no resistivity',
  'reference-candidate': 'a bright steady area on the maps that could serve as the exposure reference region',
  'overlay-frame': 'the regions were drawn on a picture rebuilt from the maps (no frame could be grabbed)',
  // stills: photo series
  'photos-not-in-map': 'photos in the folder but not in the voltage table were left out',
  'mixed-bit-depth': 'the series mixes 8-bit and 16-bit photos',
  'capture-order': 'the EXIF capture times do not follow the order of the file names',
  unreadable: 'photos that could not be read were left out',
  'exposure-exif-partial': 'some photos lack exposure EXIF, so their exposure was not normalised',
  'exposure-exif-mismatch': 'after EXIF normalisation the reference region still changes between photos',
  'exposure-unknown': 'no exposure EXIF and no reference region: exposure changes cannot be detected',
  'mixed-transfer': 'the photos were linearised with different transfer curves',
  'overlay-photo': 'regions.png could not be drawn',
  // compare
  'terms-cancel': 'the runs share one cell, so shared uncertainty terms cancel in the changes',
  'different-cells': 'the runs come from different cells and were compared because that was allowed',
  'run-warnings': 'a compared run carries warnings of its own',
  'different-wavelength': 'the runs used light of different wavelengths',
  'different-temperature': 'the liquid was at different temperatures in the runs',
  'different-camera': 'the camera settings differ between the runs',
  'temperature-missing': 'a run has no recorded temperature',
} as const satisfies Record<string, string>;

/** A warning code: one of the keys of WARNING_CODES. */
export type WarningCode = keyof typeof WARNING_CODES;
