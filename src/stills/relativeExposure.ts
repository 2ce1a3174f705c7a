/**
 * Relative exposure of each photo from its EXIF settings, against the first photo:
 *   H_i = t_i·S_i/N_i²,  relative_i = H_i/H_0
 * with t the exposure time (s), S the ISO speed and N the f-number. This is the photographic
 * exposure law (image-plane exposure ∝ t/N², sensor gain ∝ ISO): a linear sensor value is
 * proportional to scene radiance × H (common practice; the basis of the exposure-value system).
 *
 * Rule for missing values: the exposure time must be present in every photo or no EXIF
 * normalisation is done (basis "none"); ISO and f-number are each used only when present in every
 * photo, otherwise taken as constant with a warning. A value present in some photos only is
 * reported (how many lack it), never silently mixed. Pure.
 * @example relativeExposure([{ exposureTimeS: 0.01, iso: 100, fNumber: 2.8 }, { exposureTimeS: 0.02, iso: 100, fNumber: 2.8 }]).relative // [1, 2]
 */

export interface ExifExposure {
  exposureTimeS: number | null;
  iso: number | null;
  fNumber: number | null;
}

export interface RelativeExposure {
  /** Per photo, against the first; all 1 when basis is "none". */
  relative: Float64Array;
  basis: 'exif' | 'none';
  /** Which EXIF factors were used, e.g. ["exposure time", "ISO", "f-number"]. */
  factors: string[];
  /** True when the photos' exposures differ (relative not all 1). */
  varies: boolean;
  warnings: string[];
}

const usable = (x: number | null): x is number => x !== null && Number.isFinite(x) && x > 0;

export function relativeExposure(records: readonly ExifExposure[]): RelativeExposure {
  const n = records.length;
  const relative = new Float64Array(n).fill(1);
  const warnings: string[] = [];
  const countOf = (get: (r: ExifExposure) => number | null): number => records.filter((r) => usable(get(r))).length;
  const withTime = countOf((r) => r.exposureTimeS);
  if (n === 0 || withTime < n) {
    if (withTime > 0) warnings.push(`exposure time is in the EXIF of only ${withTime} of ${n} photos, so exposures cannot be compared from EXIF`);
    return { relative, basis: 'none', factors: [], varies: false, warnings };
  }
  const factors = ['exposure time'];
  const withIso = countOf((r) => r.iso);
  const withF = countOf((r) => r.fNumber);
  const useIso = withIso === n;
  const useF = withF === n;
  if (useIso) factors.push('ISO');
  else if (withIso > 0) warnings.push(`ISO is in the EXIF of only ${withIso} of ${n} photos; it was taken as constant`);
  if (useF) factors.push('f-number');
  else if (withF > 0) warnings.push(`the f-number is in the EXIF of only ${withF} of ${n} photos; it was taken as constant`);

  const exposureOf = (r: ExifExposure): number => {
    let h = r.exposureTimeS!;
    if (useIso) h *= r.iso!;
    if (useF) h /= r.fNumber! * r.fNumber!;
    return h;
  };
  const first = exposureOf(records[0]!);
  let varies = false;
  for (let i = 0; i < n; i++) {
    relative[i] = exposureOf(records[i]!) / first;
    if (Math.abs(relative[i]! - 1) > 1e-9) varies = true;
  }
  return { relative, basis: 'exif', factors, varies, warnings };
}
