/**
 * The least-change Newton iteration against closed forms: for a linear map with more controls than
 * goals the step from x0 is the minimum-norm correction x0 + Aᵀ(AAᵀ)⁻¹(b − A·x0) (the
 * Moore–Penrose solution; Golub & Van Loan, Matrix Computations, 4th ed., §5.6, from memory), reached
 * in one iteration; a smooth nonlinear case converges to a root; a goal no control moves is not met.
 */
import { describe, expect, it } from 'vitest';
import { newtonSolve } from '../../../core/handoff/newton.ts';

describe('newtonSolve', () => {
  it('takes the minimum-norm correction of an underdetermined linear map in one step', () => {
    const A = [
      [2, -1, 0.5, 3],
      [0.25, 4, -2, 1],
    ];
    const b = [7, -3];
    const x0 = [0.3, -0.2, 1.1, 0.4];
    const goals = b.map((w) => ({ wanted: w, tolerance: 1e-9 }));
    const r = newtonSolve((x, out) => A.forEach((row, i) => (out[i] = row.reduce((s, a, j) => s + a * x[j], 0))), goals, x0, {
      scale: 1,
      aim: 1,
      maxIterations: 5,
      step: 1e-3,
    });
    // closed form: y = (AAᵀ)⁻¹(b − A x0), x = x0 + Aᵀ y
    const res = b.map((w, i) => w - A[i].reduce((s, a, j) => s + a * x0[j], 0));
    const M = [0, 1].map((i) => [0, 1].map((k) => A[i].reduce((s, a, j) => s + a * A[k][j], 0)));
    const det = M[0][0] * M[1][1] - M[0][1] * M[1][0];
    const y = [(M[1][1] * res[0] - M[0][1] * res[1]) / det, (-M[1][0] * res[0] + M[0][0] * res[1]) / det];
    const want = x0.map((v, j) => v + A[0][j] * y[0] + A[1][j] * y[1]);
    expect(r.converged).toBe(true);
    expect(r.iterations).toBe(1);
    // forward differences of a linear map are exact to rounding: 1e-9 of values of order 10
    for (let j = 0; j < 4; j++) expect(r.x[j]).toBeCloseTo(want[j], 9);
  });

  it('converges on a smooth nonlinear map from a nearby start', () => {
    const goals = [
      { wanted: 2, tolerance: 1e-10 },
      { wanted: 0.5, tolerance: 1e-10 },
    ];
    const f = (x: Float64Array, out: Float64Array) => {
      out[0] = x[0] * x[0] + x[1];
      out[1] = Math.sin(x[2]) + 0.1 * x[0];
    };
    const r = newtonSolve(f, goals, [1.2, 0.3, 0.4], { scale: 1, aim: 1, maxIterations: 20, step: 1e-7 });
    const out = new Float64Array(2);
    f(r.x, out);
    expect(r.converged).toBe(true);
    // met within the goals' own tolerances
    expect(Math.abs(out[0] - 2)).toBeLessThanOrEqual(1e-10);
    expect(Math.abs(out[1] - 0.5)).toBeLessThanOrEqual(1e-10);
  });

  it('reports a goal no control moves as not converged', () => {
    const goals = [{ wanted: 1, tolerance: 1e-6 }];
    const r = newtonSolve((_x, out) => (out[0] = 0), goals, [0, 0], { scale: 1, aim: 1, maxIterations: 5, step: 1e-3 });
    expect(r.converged).toBe(false);
    expect(Math.abs(r.misses[0])).toBeGreaterThan(1);
  });
});
