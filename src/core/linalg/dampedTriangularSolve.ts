/**
 * Solves the damped (Tikhonov) least-squares problem that one Levenberg–Marquardt step needs,
 * starting from a pivoted QR factorisation J·P = Q·R (see `householderQr`):
 *
 *   minimise ‖R·z + qtr‖² + λ·Σ_k (d_{P(k)}·z_k)²,   z = Pᵀ·step,
 *
 * i.e. the least-squares solution of the stacked system [R; √λ·D_P]·z ≅ [−qtr; 0].
 * The √λ·D rows are folded into a copy of R one at a time by Givens rotations, leaving an upper
 * triangular S with SᵀS = RᵀR + λ·D_P², then S·z = rotated right-hand side is back-substituted.
 * This is the method of MINPACK's `qrsolv` (Moré, "The Levenberg–Marquardt algorithm:
 * implementation and theory", Springer LNM 630, 1978, §3); it never forms JᵀJ,
 * so it stays accurate on ill-conditioned problems.
 *
 * Inputs: `qr`, `rows`, `rdiag`, `pivot` exactly as left by `householderQr` (n = cols columns);
 * `qtr` = first n entries of Qᵀ·r; `diag` = scaling d_j (by original column index, > 0);
 * `lambda` ≥ 0. Output: `step` (original column order, length n) receives the minimiser
 * step = P·z. `work` is scratch of length n·n + 2·n. Components of a singular S (λ = 0 and a zero
 * diagonal of R) are set to zero, as a minimum-norm-like fallback. Throws nothing.
 *
 * @example
 * // R = [[2]], qtr = [−4], λ = 0 → z = 2 (the Gauss–Newton step); with λ = 4, d = 1 → z = 8/8 = 1.
 */
export function dampedTriangularSolve(
  qr: Float64Array,
  rows: number,
  cols: number,
  rdiag: Float64Array,
  pivot: Int32Array,
  qtr: Float64Array,
  diag: Float64Array,
  lambda: number,
  step: Float64Array,
  work: Float64Array,
): void {
  const n = cols;
  // work layout: s (n×n row-major upper triangle), rhs (n), extra row (n)
  const s = work;
  const rhsOff = n * n;
  const rowOff = rhsOff + n;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      s[i * n + j] = j < i ? 0 : j === i ? rdiag[i]! : qr[i + j * rows]!;
    }
    work[rhsOff + i] = -qtr[i]!;
  }
  const sqrtLambda = Math.sqrt(lambda);
  for (let j = 0; j < n; j++) {
    const damping = sqrtLambda * diag[pivot[j]!]!;
    if (damping === 0) continue;
    for (let k = j; k < n; k++) work[rowOff + k] = 0;
    work[rowOff + j] = damping;
    let rowRhs = 0;
    for (let k = j; k < n; k++) {
      const e = work[rowOff + k]!;
      if (e === 0) continue;
      const skk = s[k * n + k]!;
      // Givens rotation (c, sn) with c·skk + sn·e = hypot and −sn·skk + c·e = 0,
      // computed in the overflow-safe way of Golub & Van Loan §5.1.8.
      let c: number;
      let sn: number;
      if (Math.abs(skk) < Math.abs(e)) {
        const cot = skk / e;
        sn = 1 / Math.sqrt(1 + cot * cot);
        c = sn * cot;
      } else {
        const tan = e / skk;
        c = 1 / Math.sqrt(1 + tan * tan);
        sn = c * tan;
      }
      s[k * n + k] = c * skk + sn * e;
      const bk = work[rhsOff + k]!;
      work[rhsOff + k] = c * bk + sn * rowRhs;
      rowRhs = -sn * bk + c * rowRhs;
      for (let i = k + 1; i < n; i++) {
        const ski = s[k * n + i]!;
        const ei = work[rowOff + i]!;
        s[k * n + i] = c * ski + sn * ei;
        work[rowOff + i] = -sn * ski + c * ei;
      }
    }
  }
  // Back substitution; a zero pivot (only possible when λ·d = 0) truncates the solution there.
  let nsing = n;
  for (let j = 0; j < n; j++) {
    if (s[j * n + j] === 0 && nsing === n) nsing = j;
  }
  for (let j = nsing; j < n; j++) work[rhsOff + j] = 0;
  for (let j = nsing - 1; j >= 0; j--) {
    let sum = work[rhsOff + j]!;
    for (let i = j + 1; i < nsing; i++) sum -= s[j * n + i]! * work[rhsOff + i]!;
    work[rhsOff + j] = sum / s[j * n + j]!;
  }
  for (let j = 0; j < n; j++) step[pivot[j]!] = work[rhsOff + j]!;
}
