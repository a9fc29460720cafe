import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError, SolverError } from '../../../core/math/errors.ts';
import { dampedLeastSquares, leastSquares, solve, solveInPlace } from '../../../core/math/linalg.ts';

function reason(f: () => unknown): string {
  try {
    f();
  } catch (e) {
    if (e instanceof SolverError) return e.reason;
    throw e;
  }
  throw new Error('did not throw');
}

describe('solve (Gaussian elimination, scaled partial pivoting)', () => {
  it('solves the classic 3×3 system 2x+y−z=8, −3x−y+2z=−11, −2x+y+2z=−3 → (2, 3, −1) (checkable by hand)', () => {
    const x = solve([2, 1, -1, -3, -1, 2, -2, 1, 2], [8, -11, -3]);
    expect(Array.from(x).map((v) => Math.round(v * 1e12) / 1e12)).toEqual([2, 3, -1]);
  });

  it('needs the row exchange for a zero leading pivot ([[0,1],[1,0]]·x = (2,3) → (3,2))', () => {
    expect(Array.from(solve([0, 1, 1, 0], [2, 3]))).toEqual([3, 2]);
  });

  it('is independent of the units of the unknowns (columns scaled by 1e-20, analytic)', () => {
    // x1 + 1e-20·x2 = 1, x1 + 2e-20·x2 = 2  →  x2 = 1e20, x1 = 0
    const x = solve([1, 1e-20, 1, 2e-20], [1, 2]);
    expect(Math.abs(x[0])).toBeLessThan(1e-14);
    expect(x[1] / 1e20).toBeCloseTo(1, 14);
  });

  it('leaves A and b untouched; solveInPlace overwrites b with x', () => {
    const A = [4, 1, 2, 3];
    const b = [1, 2];
    const x = solve(A, b);
    expect(A).toEqual([4, 1, 2, 3]);
    expect(b).toEqual([1, 2]);
    const A2 = Float64Array.from(A);
    const b2 = Float64Array.from(b);
    expect(solveInPlace(2, A2, b2)).toBe(b2);
    expect(Array.from(b2)).toEqual(Array.from(x));
    // 4x + y = 1, 2x + 3y = 2 → x = 1/10, y = 3/5 (by hand)
    expect(x[0]).toBeCloseTo(0.1, 15);
    expect(x[1]).toBeCloseTo(0.6, 15);
  });

  it('recovers x from b = A·x for random diagonally dominant systems up to 8×8 (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 8 }), fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 72, maxLength: 72 }), (n, vals) => {
        const A = new Float64Array(n * n);
        const x = new Float64Array(n);
        for (let i = 0; i < n; i++) {
          x[i] = vals[64 + (i % 8)] * 10;
          for (let j = 0; j < n; j++) A[i * n + j] = vals[(i * 8 + j) % 64] + (i === j ? n + 1 : 0);
        }
        const b = new Float64Array(n);
        for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) b[i] += A[i * n + j] * x[j];
        const y = solve(A, b);
        for (let i = 0; i < n; i++) expect(Math.abs(y[i] - x[i])).toBeLessThan(1e-12 * 10 * n);
      }),
      { numRuns: 200 },
    );
  });

  it('raises SolverError(no-solution) on singular and numerically singular matrices', () => {
    expect(reason(() => solve([1, 2, 2, 4], [1, 2]))).toBe('no-solution');
    expect(reason(() => solve([1, 2, 1, 2 + 1e-15], [1, 2]))).toBe('no-solution');
    expect(reason(() => solve([1, 0, 0, 0], [1, 2]))).toBe('no-solution');
    expect(reason(() => solve([1, 2, 3, 4, 5, 6, 7, 8, 9], [1, 2, 3]))).toBe('no-solution');
  });

  it('rejects wrong shapes and non-finite entries with InputError naming the field', () => {
    expect(() => solve([1, 2, 3], [1, 2])).toThrow(InputError);
    try {
      solve([1, NaN, 0, 1], [1, 2]);
    } catch (e) {
      expect((e as InputError).field).toBe('A[1]');
    }
    expect(() => solve([1, 0, 0, 1], [1, Infinity])).toThrow(InputError);
  });
});

describe('least squares', () => {
  it('fits a line exactly through collinear points (y = 2 + 3t)', () => {
    const t = [0, 1, 2, 3, 4];
    const J = t.flatMap((x) => [1, x]);
    const r = t.map((x) => 2 + 3 * x);
    const c = leastSquares(J, r, 5, 2);
    expect(c[0]).toBeCloseTo(2, 13);
    expect(c[1]).toBeCloseTo(3, 13);
  });

  it('matches the closed-form simple linear regression slope Sxy/Sxx and intercept (analytic)', () => {
    const t = [0.5, 1.1, 2.3, 2.9, 4.2, 5.0, 6.7];
    const y = [1.2, 2.9, 4.1, 6.2, 7.9, 10.4, 12.8];
    const n = t.length;
    const tm = t.reduce((a, b) => a + b) / n;
    const ym = y.reduce((a, b) => a + b) / n;
    let sxy = 0,
      sxx = 0;
    for (let k = 0; k < n; k++) {
      sxy += (t[k] - tm) * (y[k] - ym);
      sxx += (t[k] - tm) ** 2;
    }
    const slope = sxy / sxx;
    const c = leastSquares(
      t.flatMap((x) => [1, x]),
      y,
      n,
      2,
    );
    expect(c[1]).toBeCloseTo(slope, 13);
    expect(c[0]).toBeCloseTo(ym - slope * tm, 13);
  });

  it('damped solution equals (JᵀJ + λI)⁻¹Jᵀr from the explicitly formed normal equations (property)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 6 }),
        fc.integer({ min: 1, max: 4 }),
        fc.array(fc.double({ min: -2, max: 2, noNaN: true }), { minLength: 30, maxLength: 30 }),
        fc.double({ min: 0.01, max: 10, noNaN: true }),
        (m, n, vals, lambda) => {
          const J = Float64Array.from({ length: m * n }, (_, k) => vals[k % 24]);
          const r = Float64Array.from({ length: m }, (_, k) => vals[24 + (k % 6)]);
          const N = new Float64Array(n * n);
          const g = new Float64Array(n);
          for (let i = 0; i < n; i++) {
            for (let j = 0; j < n; j++) {
              let s = i === j ? lambda : 0;
              for (let k = 0; k < m; k++) s += J[k * n + i] * J[k * n + j];
              N[i * n + j] = s;
            }
            for (let k = 0; k < m; k++) g[i] += J[k * n + i] * r[k];
          }
          const ref = solve(N, g);
          const x = dampedLeastSquares(J, r, m, n, lambda);
          for (let i = 0; i < n; i++) expect(Math.abs(x[i] - ref[i])).toBeLessThan(1e-9 * (1 + Math.abs(ref[i])));
        },
      ),
      { numRuns: 200 },
    );
  });

  it('one equation, three unknowns: x = Jᵀr/(|J|² + λ) for every λ (push-through identity, analytic)', () => {
    const J = [1, 2, 3];
    for (const lambda of [1e-6, 1, 1e8]) {
      const x = dampedLeastSquares(J, [6], 1, 3, lambda);
      // conditioning of the stacked system grows like |J|/√λ, hence the looser bound at small λ
      [1, 2, 3].forEach((j, k) => expect(x[k] / ((6 * j) / (14 + lambda))).toBeCloseTo(1, 9));
    }
  });

  it('raises SolverError on rank deficiency and InputError on bad shapes', () => {
    expect(reason(() => leastSquares([1, 1, 2, 2, 3, 3], [1, 2, 3], 3, 2))).toBe('no-solution');
    expect(() => leastSquares([1, 2, 3], [1], 1, 3)).toThrow(InputError);
    expect(() => dampedLeastSquares([1, 2], [1, 2], 2, 1, -1)).toThrow(InputError);
  });
});
