/**
 * Householder QR factorisation with column pivoting, in place, of an m×n matrix stored
 * column-major in a Float64Array (element (i, j) at a[i + j·m]), m ≥ n.
 *
 * Computes A·P = Q·R: at step k the remaining column of largest Euclidean norm is swapped into
 * place, and a Householder reflector H_k = I − v·vᵀ/v_k zeroes it below the diagonal.
 * After the call:
 * - the strict upper triangle of a (rows 0..n−1) holds R above its diagonal,
 * - `rdiag[k]` holds R's diagonal (|rdiag| is non-increasing thanks to the pivoting),
 * - column k of a at and below row k holds the reflector v_k (so Q is kept implicitly),
 * - `pivot[k]` is the original index of the column now in position k.
 * This is the layout of MINPACK's `qrfac` (Moré, Garbow, Hillstrom, "User guide for MINPACK-1",
 * Argonne ANL-80-74, 1980); the algorithm is Golub & Van Loan, "Matrix Computations", §5.4.1.
 * Householder QR is backward stable, so least-squares problems are solved without forming AᵀA
 * (whose condition number is the square of A's).
 *
 * Allocation-free: the caller supplies `rdiag`, `pivot` (length n) and `colNorm` scratch (length n).
 * Throws nothing; a zero column gives rdiag[k] = 0 (rank deficiency is for the caller to judge).
 *
 * @example
 * // A = [[3], [4]] (2×1): R = [[-5]], |rdiag[0]| = 5
 * const a = Float64Array.of(3, 4); const rdiag = new Float64Array(1);
 * householderQr(a, 2, 1, rdiag, new Int32Array(1), new Float64Array(1)); // rdiag[0] === -5
 */
export function householderQr(
  a: Float64Array,
  rows: number,
  cols: number,
  rdiag: Float64Array,
  pivot: Int32Array,
  colNorm: Float64Array,
): void {
  for (let j = 0; j < cols; j++) pivot[j] = j;
  const steps = Math.min(rows, cols);
  for (let k = 0; k < steps; k++) {
    // Norms of the remaining part (rows k..m-1) of columns k..n-1, recomputed each step:
    // O(m·n) per step, the same order as the reflection itself, and free of downdating error.
    let best = k;
    let bestNorm = -1;
    for (let j = k; j < cols; j++) {
      const norm = columnNorm(a, rows, j, k);
      colNorm[j] = norm;
      if (norm > bestNorm) {
        bestNorm = norm;
        best = j;
      }
    }
    if (best !== k) {
      const offK = k * rows;
      const offB = best * rows;
      for (let i = 0; i < rows; i++) {
        const t = a[offK + i]!;
        a[offK + i] = a[offB + i]!;
        a[offB + i] = t;
      }
      const tp = pivot[k]!;
      pivot[k] = pivot[best]!;
      pivot[best] = tp;
    }
    const off = k * rows;
    let norm = bestNorm;
    if (norm === 0) {
      rdiag[k] = 0;
      continue;
    }
    if (a[off + k]! < 0) norm = -norm;
    for (let i = k; i < rows; i++) a[off + i] = a[off + i]! / norm;
    a[off + k] = a[off + k]! + 1;
    const vkk = a[off + k]!;
    for (let j = k + 1; j < cols; j++) {
      const offJ = j * rows;
      let sum = 0;
      for (let i = k; i < rows; i++) sum += a[off + i]! * a[offJ + i]!;
      const factor = sum / vkk;
      for (let i = k; i < rows; i++) a[offJ + i] = a[offJ + i]! - factor * a[off + i]!;
    }
    rdiag[k] = -norm;
  }
}

/**
 * b ← Qᵀ·b for the Q kept implicitly by `householderQr` (b has length m; in place).
 * The first n entries of the result are Qᵀb's part in the range of A; the rest is the
 * part orthogonal to it (its squared norm is the least-squares residual).
 */
export function applyQrTranspose(a: Float64Array, rows: number, cols: number, b: Float64Array): void {
  const steps = Math.min(rows, cols);
  for (let k = 0; k < steps; k++) {
    const off = k * rows;
    const vkk = a[off + k]!;
    if (vkk === 0) continue;
    let sum = 0;
    for (let i = k; i < rows; i++) sum += a[off + i]! * b[i]!;
    const factor = sum / vkk;
    for (let i = k; i < rows; i++) b[i] = b[i]! - factor * a[off + i]!;
  }
}

/** Euclidean norm of column j from row `from` on, scaled to avoid overflow and underflow. */
function columnNorm(a: Float64Array, rows: number, j: number, from: number): number {
  const off = j * rows;
  let scale = 0;
  for (let i = from; i < rows; i++) {
    const v = Math.abs(a[off + i]!);
    if (v > scale) scale = v;
  }
  if (scale === 0 || !Number.isFinite(scale)) return scale;
  let sum = 0;
  for (let i = from; i < rows; i++) {
    const v = a[off + i]! / scale;
    sum += v * v;
  }
  return scale * Math.sqrt(sum);
}
