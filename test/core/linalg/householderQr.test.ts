import { describe, expect, it } from 'vitest';
import { applyQrTranspose, householderQr } from '../../../src/core/linalg/householderQr.js';
import { seededNormal } from '../../helpers/random.js';

/** Column-major copy of a row-major nested array. */
const columnMajor = (rows: number[][]): Float64Array => {
  const m = rows.length;
  const n = rows[0]!.length;
  const a = new Float64Array(m * n);
  rows.forEach((row, i) => row.forEach((v, j) => (a[i + j * m] = v)));
  return a;
};

describe('householderQr (pivoted, MINPACK layout)', () => {
  it('a 3-4-5 column gives R = −5 (Pythagoras)', () => {
    const a = Float64Array.of(3, 4);
    const rdiag = new Float64Array(1);
    householderQr(a, 2, 1, rdiag, new Int32Array(1), new Float64Array(1));
    expect(rdiag[0]).toBeCloseTo(-5, 14);
  });

  it('Qᵀ applied to the pivoted columns of A reproduces R (zeros below the diagonal), with non-increasing |R_kk|', () => {
    const normal = seededNormal(1);
    const m = 7;
    const n = 4;
    const rows = Array.from({ length: m }, () => Array.from({ length: n }, () => normal()));
    rows.forEach((r) => (r[2] = r[2]! * 100)); // a dominant column must be pivoted first
    const original = columnMajor(rows);
    const a = Float64Array.from(original);
    const rdiag = new Float64Array(n);
    const pivot = new Int32Array(n);
    householderQr(a, m, n, rdiag, pivot, new Float64Array(n));
    expect(pivot[0]).toBe(2);
    expect(Array.from(pivot).sort()).toEqual([0, 1, 2, 3]);
    for (let k = 1; k < n; k++) expect(Math.abs(rdiag[k]!)).toBeLessThanOrEqual(Math.abs(rdiag[k - 1]!) * (1 + 1e-12));
    for (let k = 0; k < n; k++) {
      const column = original.slice(pivot[k]! * m, (pivot[k]! + 1) * m);
      applyQrTranspose(a, m, n, column);
      for (let i = 0; i < m; i++) {
        const expected = i < k ? a[i + k * m]! : i === k ? rdiag[k]! : 0;
        expect(Math.abs(column[i]! - expected)).toBeLessThan(1e-11 * Math.abs(rdiag[0]!));
      }
    }
  });

  it('applyQrTranspose preserves the Euclidean norm (Q is orthogonal)', () => {
    const normal = seededNormal(2);
    const m = 9;
    const n = 3;
    const a = Float64Array.from({ length: m * n }, () => normal());
    householderQr(a, m, n, new Float64Array(n), new Int32Array(n), new Float64Array(n));
    const b = Float64Array.from({ length: m }, () => normal());
    const norm = Math.hypot(...b);
    applyQrTranspose(a, m, n, b);
    expect(Math.hypot(...b)).toBeCloseTo(norm, 12);
  });

  it('a zero column gives a zero diagonal entry, pivoted last', () => {
    const a = columnMajor([[1, 0, 2], [3, 0, 1], [1, 0, 1]]);
    const rdiag = new Float64Array(3);
    const pivot = new Int32Array(3);
    householderQr(a, 3, 3, rdiag, pivot, new Float64Array(3));
    expect(pivot[2]).toBe(1);
    expect(rdiag[2]).toBe(0);
  });
});
