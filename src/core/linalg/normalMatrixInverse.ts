import { householderQr } from './householderQr.js';

export interface NormalMatrixInverse {
  /** (JᵀJ)⁻¹, p×p row-major; NaN in every entry when rank < p. */
  inverse: Float64Array;
  /** Numerical rank of J found by the pivoted QR of the column-equilibrated matrix. */
  rank: number;
}

/**
 * (JᵀJ)⁻¹ for an m×p matrix J (column-major, element (i, j) at j[i + j·m]), computed without
 * forming JᵀJ: the columns are first equilibrated (J_s = J·C⁻¹, C = diag of column norms), then
 * J_s·P = Q·R by pivoted Householder QR, and
 *
 *   (JᵀJ)⁻¹ = C⁻¹ · P · R⁻¹ · R⁻ᵀ · Pᵀ · C⁻¹.
 *
 * Equilibration makes the rank test independent of the parameters' units (a polynomial in x with
 * x up to 10³ has columns differing by 10⁹). The rank is the number of diagonal entries of R with
 * |R_kk| > rankTol·|R_00|, rankTol defaulting to m·ε (the usual numerical-rank rule, Golub & Van
 * Loan, "Matrix Computations", §5.5.8). This is the covariance factor of a least-squares fit:
 * Cov = (JᵀJ)⁻¹·RSS/(n−p) (Bates & Watts, "Nonlinear Regression Analysis", 1988, §2.3).
 *
 * Does not modify `jacobian`. Throws nothing: a zero column or rank < p gives rank < p and NaN.
 *
 * @example
 * // J = [[1, 0], [0, 2]] (column-major [1, 0, 0, 2]) → inverse = [[1, 0], [0, 0.25]], rank 2
 */
export function normalMatrixInverse(
  jacobian: ArrayLike<number>,
  rows: number,
  cols: number,
  rankTol: number = rows * Number.EPSILON,
): NormalMatrixInverse {
  const p = cols;
  const a = new Float64Array(rows * p);
  const colScale = new Float64Array(p);
  const inverse = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    let scale = 0;
    for (let i = 0; i < rows; i++) scale = Math.max(scale, Math.abs(jacobian[i + j * rows]!));
    let sum = 0;
    if (scale > 0) {
      for (let i = 0; i < rows; i++) {
        const v = jacobian[i + j * rows]! / scale;
        sum += v * v;
      }
    }
    const norm = scale * Math.sqrt(sum);
    colScale[j] = norm;
    for (let i = 0; i < rows; i++) a[i + j * rows] = norm > 0 ? jacobian[i + j * rows]! / norm : 0;
  }
  const rdiag = new Float64Array(p);
  const pivot = new Int32Array(p);
  householderQr(a, rows, p, rdiag, pivot, new Float64Array(p));

  const steps = Math.min(rows, p);
  let rank = 0;
  const lead = Math.abs(rdiag[0] ?? 0);
  for (let k = 0; k < steps; k++) {
    const d = Math.abs(rdiag[k]!);
    if (lead > 0 && d > rankTol * lead && Number.isFinite(d)) rank++;
    else break;
  }
  if (rank < p) {
    inverse.fill(Number.NaN);
    return { inverse, rank };
  }

  // Rinv: inverse of the upper triangular R (row-major p×p), by column back substitution.
  const rinv = new Float64Array(p * p);
  const rAt = (i: number, j: number): number => (i === j ? rdiag[i]! : a[i + j * rows]!);
  for (let col = 0; col < p; col++) {
    for (let i = col; i >= 0; i--) {
      let sum = i === col ? 1 : 0;
      for (let k = i + 1; k <= col; k++) sum -= rAt(i, k) * rinv[k * p + col]!;
      rinv[i * p + col] = sum / rAt(i, i);
    }
  }
  // (RᵀR)⁻¹ = Rinv·Rinvᵀ, then undo the pivoting and the equilibration.
  for (let i = 0; i < p; i++) {
    for (let j = i; j < p; j++) {
      let sum = 0;
      for (let k = j; k < p; k++) sum += rinv[i * p + k]! * rinv[j * p + k]!;
      const oi = pivot[i]!;
      const oj = pivot[j]!;
      const value = sum / (colScale[oi]! * colScale[oj]!);
      inverse[oi * p + oj] = value;
      inverse[oj * p + oi] = value;
    }
  }
  return { inverse, rank };
}
