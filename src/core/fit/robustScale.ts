/**
 * Robust scale of a sample by the median absolute deviation (MAD):
 *
 *   s = 1.482602218505602 · median_i |r_i − median(r)|.
 *
 * The factor 1/Φ⁻¹(3/4) = 1/0.6744897501960817 makes s a consistent estimate of σ for normally
 * distributed data (Hampel, "The influence curve and its role in robust estimation", JASA 1974;
 * Huber & Ronchetti, "Robust Statistics", 2nd ed., 2009, §5.1). Half the sample can be wild before
 * s breaks down. Units: those of the sample.
 *
 * Non-finite entries are skipped (and not counted); an empty (or all non-finite) sample gives NaN.
 * Does not modify `values`. Throws nothing.
 *
 * @example robustScale([1, 2, 3, 4, 100]) // median 3, |deviations| 2,1,0,1,97 → median 1 → 1.4826…
 */
export function robustScale(values: ArrayLike<number>): number {
  const finite = finiteCopy(values);
  if (finite.length === 0) return Number.NaN;
  const centre = medianInPlace(finite);
  for (let i = 0; i < finite.length; i++) finite[i] = Math.abs(finite[i]! - centre);
  return MAD_TO_SIGMA * medianInPlace(finite);
}

/** Median of the finite entries (NaN if none). Does not modify `values`. @example median([3, 1, 2]) // 2 */
export function median(values: ArrayLike<number>): number {
  const finite = finiteCopy(values);
  return finite.length === 0 ? Number.NaN : medianInPlace(finite);
}

/** 1/Φ⁻¹(0.75): the normal-consistency factor of the MAD. */
export const MAD_TO_SIGMA = 1.482602218505602;

function finiteCopy(values: ArrayLike<number>): Float64Array {
  let n = 0;
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i]!)) n++;
  const out = new Float64Array(n);
  for (let i = 0, k = 0; i < values.length; i++) if (Number.isFinite(values[i]!)) out[k++] = values[i]!;
  return out;
}

/** Sorts `a` (a private copy) and returns its median. */
function medianInPlace(a: Float64Array): number {
  a.sort();
  const mid = a.length >> 1;
  return a.length % 2 === 1 ? a[mid]! : 0.5 * (a[mid - 1]! + a[mid]!);
}
