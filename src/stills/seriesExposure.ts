/**
 * The relative exposure of each photo of a series, against the first readable photo, and its
 * basis: EXIF (relativeExposure: t·ISO/N²), else a reference region (grey card; its level minus
 * the dark region's, measure/exposure exposureGains), else none (all 1, with a warning that
 * nothing can tell). With EXIF and a reference region the region checks the EXIF: a spread above
 * 5 % after normalisation is warned about; without EXIF a reference spread above
 * EXPOSURE_SPREAD_WARNING (2 %) warns that the exposure seems to vary.
 * Pure. @throws KerrError BAD_REGION when the reference region is not brighter than the dark level
 *   in the first readable photo.
 * @example seriesExposure({ exif, readable: [0, 1, 2], referenceLinear: null, darkLinear: null, photos }).basis
 */
import { KerrError } from '../errors.js';
import type { RunWarning } from '../result/schema.js';
import { exposureGains } from '../measure/exposure.js';
import { relativeExposure, type ExifExposure } from './relativeExposure.js';

/** Relative spread of the reference region above which exposure "seems to vary". */
export const EXPOSURE_SPREAD_WARNING = 0.02;
/** Spread of the reference region after EXIF normalisation above which the EXIF is doubted. */
const EXIF_MISMATCH_SPREAD = 0.05;

export interface SeriesExposureInput {
  exif: readonly ExifExposure[];
  /** Indices of the readable photos, in order (the first is the exposure reference). */
  readable: readonly number[];
  referenceLinear: Float64Array | null;
  darkLinear: Float64Array | null;
  photos: readonly string[];
}

export interface SeriesExposure {
  exposureRelative: Float64Array;
  basis: 'exif' | 'reference' | 'none';
  /** EXIF factors used; empty unless the basis is exif. */
  factors: string[];
  warnings: RunWarning[];
  notes: string[];
}

export const percent = (x: number): string => `${Number((x * 100).toPrecision(2))}%`;

function spreadOf(values: Float64Array): number {
  let lo = Infinity, hi = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  return lo > 0 ? hi / lo - 1 : Infinity;
}

export function seriesExposure(i: SeriesExposureInput): SeriesExposure {
  const n = i.photos.length;
  const warnings: RunWarning[] = [];
  const notes: string[] = [];
  const warn = (code: string, message: string): void => { warnings.push({ code, message, guideSection: 'lock-exposure' }); };
  const fromExif = relativeExposure(i.readable.map((k) => i.exif[k]!));
  for (const m of fromExif.warnings) warn('exposure-exif-partial', m);
  let exposureRelative = new Float64Array(n).fill(NaN);
  i.readable.forEach((k, j) => (exposureRelative[k] = fromExif.relative[j]!));
  const dark = (k: number): number => (i.darkLinear ? i.darkLinear[k]! : 0);
  if (fromExif.basis === 'exif') {
    notes.push(`exposure normalised from EXIF (${fromExif.factors.join(', ')})${fromExif.varies ? '' : ': identical in every photo'}`);
    if (i.referenceLinear) {
      const check = Float64Array.from(exposureRelative, (e, k) => (i.referenceLinear![k]! - dark(k)) / e);
      const spread = spreadOf(check);
      if (spread > EXIF_MISMATCH_SPREAD) warn('exposure-exif-mismatch', `after the EXIF exposure normalisation the reference region still changes by ${percent(spread)} between photos: the light itself may have changed, or the EXIF values are not the ones used`);
    }
    return { exposureRelative, basis: 'exif', factors: fromExif.factors, warnings, notes };
  }
  if (!i.referenceLinear) {
    warn('exposure-unknown', 'the photos carry no exposure EXIF and no --reference-roi was given: kerrtrace cannot tell whether the exposure changed between photos; lock exposure and ISO (manual mode), or give --reference-roi on a grey card in view');
    return { exposureRelative, basis: 'none', factors: [], warnings, notes };
  }
  const refPhoto = i.readable[0]!;
  const gains = exposureGains(i.referenceLinear, i.darkLinear ?? undefined).gains;
  const firstGain = gains[refPhoto]!;
  if (!(firstGain > 0)) {
    throw new KerrError('BAD_REGION', `the reference region is not brighter than the dark level in ${i.photos[refPhoto]}`, { path: '--reference-roi', hint: 'Put the reference region on a lit grey card that stays in view in every photo' });
  }
  exposureRelative = gains.map((g) => g / firstGain);
  const spread = spreadOf(exposureRelative);
  if (spread > EXPOSURE_SPREAD_WARNING) {
    warn('exposure-drift', `the photos carry no exposure EXIF and the reference region changes by ${percent(spread)}: the exposure seems to vary; intensities were normalised by the reference region (lock exposure and ISO next time)`);
  } else notes.push(`no exposure EXIF; the reference region is steady within ${percent(EXPOSURE_SPREAD_WARNING)}, intensities normalised by it`);
  return { exposureRelative, basis: 'reference', factors: [], warnings, notes };
}
