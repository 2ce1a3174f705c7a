import { describe, expect, it } from 'vitest';
import { normalMatrixInverse } from '../../../src/core/linalg/normalMatrixInverse.js';

const binomial = (n: number, k: number): number => {
  let r = 1;
  for (let i = 1; i <= k; i++) r = (r * (n - k + i)) / i;
  return r;
};
/** Exact inverse of the n×n Hilbert matrix H_ij = 1/(i+j−1) (M.-D. Choi, "Tricks or treats with the Hilbert matrix", Amer. Math. Monthly 90, 1983). */
const hilbertInverse = (n: number): number[][] =>
  Array.from({ length: n }, (_, a) =>
    Array.from({ length: n }, (_, b) => {
      const i = a + 1;
      const j = b + 1;
      return (-1) ** (i + j) * (i + j - 1) * binomial(n + i - 1, n - j) * binomial(n + j - 1, n - i) * binomial(i + j - 2, i - 1) ** 2;
    }),
  );

describe('normalMatrixInverse ((JᵀJ)⁻¹ by equilibrated pivoted QR)', () => {
  it('the 3×3 Hilbert inverse formula gives the familiar integers 9, −36, 30 / 192, −180 / 180', () => {
    expect(hilbertInverse(3)).toEqual([[9, -36, 30], [-36, 192, -180], [30, -180, 180]]);
  });

  for (const n of [3, 5]) {
    it(`J = H_${n} (Hilbert, ill-conditioned): (JᵀJ)⁻¹ = (H⁻¹)² to 1e-6 relative`, () => {
      const jac = new Float64Array(n * n);
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) jac[i + j * n] = 1 / (i + j + 1);
      const { inverse, rank } = normalMatrixInverse(jac, n, n);
      expect(rank).toBe(n);
      const hInv = hilbertInverse(n);
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n; j++) {
          let expected = 0;
          for (let k = 0; k < n; k++) expected += hInv[i]![k]! * hInv[k]![j]!;
          expect(Math.abs(inverse[i * n + j]! - expected)).toBeLessThan(1e-6 * Math.abs(expected));
        }
      }
    });
  }

  it('columns of wildly different scale (1e-8 and 1e8) are handled exactly', () => {
    const jac = Float64Array.of(1e-8, 0, 0, 0, 2e8, 0); // 3×2 column-major: diag(1e-8, 2e8)
    const { inverse, rank } = normalMatrixInverse(jac, 3, 2);
    expect(rank).toBe(2);
    expect(inverse[0]! / 1e16).toBeCloseTo(1, 12);
    expect(inverse[3]! / (1 / 4e16)).toBeCloseTo(1, 12);
    expect(inverse[1]).toBe(0);
  });

  it('linearly dependent columns give rank < p and NaN, and J is left unchanged', () => {
    const jac = Float64Array.of(1, 2, 3, 2, 4, 6);
    const copy = Array.from(jac);
    const { inverse, rank } = normalMatrixInverse(jac, 3, 2);
    expect(rank).toBe(1);
    expect(inverse.every(Number.isNaN)).toBe(true);
    expect(Array.from(jac)).toEqual(copy);
  });
});
