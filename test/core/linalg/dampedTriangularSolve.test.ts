import { describe, expect, it } from 'vitest';
import { dampedTriangularSolve } from '../../../src/core/linalg/dampedTriangularSolve.js';
import { applyQrTranspose, householderQr } from '../../../src/core/linalg/householderQr.js';
import { seededNormal } from '../../helpers/random.js';

/** Solves the small dense system M·z = b by Gaussian elimination with partial pivoting (test oracle). */
function gaussSolve(mat: number[][], rhs: number[]): number[] {
  const n = rhs.length;
  const a = mat.map((row, i) => [...row, rhs[i]!]);
  for (let k = 0; k < n; k++) {
    let best = k;
    for (let i = k + 1; i < n; i++) if (Math.abs(a[i]![k]!) > Math.abs(a[best]![k]!)) best = i;
    [a[k], a[best]] = [a[best]!, a[k]!];
    for (let i = k + 1; i < n; i++) {
      const f = a[i]![k]! / a[k]![k]!;
      for (let j = k; j <= n; j++) a[i]![j] = a[i]![j]! - f * a[k]![j]!;
    }
  }
  const z = new Array<number>(n).fill(0);
  for (let i = n - 1; i >= 0; i--) {
    let s = a[i]![n]!;
    for (let j = i + 1; j < n; j++) s -= a[i]![j]! * z[j]!;
    z[i] = s / a[i]![i]!;
  }
  return z;
}

function setup(seed: number, m: number, n: number) {
  const normal = seededNormal(seed);
  const jac = Float64Array.from({ length: m * n }, () => normal());
  const e = Float64Array.from({ length: m }, () => normal());
  const qr = Float64Array.from(jac);
  const rdiag = new Float64Array(n);
  const pivot = new Int32Array(n);
  householderQr(qr, m, n, rdiag, pivot, new Float64Array(n));
  const qtr = Float64Array.from(e);
  applyQrTranspose(qr, m, n, qtr);
  return { jac, e, qr, rdiag, pivot, qtr };
}

describe('dampedTriangularSolve (MINPACK qrsolv method)', () => {
  it('worked by hand: R = [2], Qᵀe = [−4] gives z = 2 at λ = 0 and z = 1 at λ = 4, d = 1', () => {
    const step = new Float64Array(1);
    const work = new Float64Array(3);
    const args = [Float64Array.of(0), 1, 1, Float64Array.of(2), Int32Array.of(0), Float64Array.of(-4), Float64Array.of(1)] as const;
    dampedTriangularSolve(...args, 0, step, work);
    expect(step[0]).toBeCloseTo(2, 14);
    dampedTriangularSolve(...args, 4, step, work);
    expect(step[0]).toBeCloseTo(1, 14);
  });

  it('equals the solution of the damped normal equations (JᵀJ + λD²)·Δ = −Jᵀe', () => {
    const m = 8;
    const n = 3;
    const { jac, e, qr, rdiag, pivot, qtr } = setup(4, m, n);
    const diag = Float64Array.of(0.5, 2, 1.3);
    for (const lambda of [0, 1e-3, 0.7, 50]) {
      const step = new Float64Array(n);
      dampedTriangularSolve(qr, m, n, rdiag, pivot, qtr, diag, lambda, step, new Float64Array(n * n + 2 * n));
      const normal: number[][] = [];
      const rhs: number[] = [];
      for (let j = 0; j < n; j++) {
        normal.push([]);
        let g = 0;
        for (let i = 0; i < m; i++) g += jac[i + j * m]! * e[i]!;
        rhs.push(-g);
        for (let k = 0; k < n; k++) {
          let s = 0;
          for (let i = 0; i < m; i++) s += jac[i + j * m]! * jac[i + k * m]!;
          normal[j]!.push(s + (j === k ? lambda * diag[j]! * diag[j]! : 0));
        }
      }
      const expected = gaussSolve(normal, rhs);
      expected.forEach((v, j) => expect(step[j]!).toBeCloseTo(v, 11));
    }
  });

  it('larger damping gives a shorter step (the Levenberg–Marquardt trade-off)', () => {
    const m = 10;
    const n = 4;
    const { qr, rdiag, pivot, qtr } = setup(8, m, n);
    const diag = new Float64Array(n).fill(1);
    let previous = Infinity;
    for (const lambda of [0, 0.01, 1, 100]) {
      const step = new Float64Array(n);
      dampedTriangularSolve(qr, m, n, rdiag, pivot, qtr, diag, lambda, step, new Float64Array(n * n + 2 * n));
      const length = Math.hypot(...step);
      expect(length).toBeLessThan(previous);
      previous = length;
    }
  });
});
