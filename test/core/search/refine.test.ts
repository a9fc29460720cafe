import { describe, expect, it } from 'vitest';
import { InputError, SolverError } from '../../../core/math/errors.ts';
import { nelderMead } from '../../../core/search/refine.ts';

describe('nelderMead', () => {
  it("finds Rosenbrock's minimum at (1, 1) (analytic; Rosenbrock, Computer Journal 3 (1960))", () => {
    const f = (x: number[]): number => 100 * (x[1] - x[0] ** 2) ** 2 + (1 - x[0]) ** 2;
    const r = nelderMead(f, [-1.2, 1], [0.5, 0.5], { fTol: 1e-14, xTol: 1e-9, maxEvaluations: 5000 });
    expect(r.converged).toBe(true);
    // the final simplex fits in xTol × step = 5e-10 per coordinate: within twice that of the
    // minimum (measured 1.1e-10 and 2.2e-10); f there is below about fTol (measured 1.5e-20)
    expect(Math.abs(r.x[0] - 1)).toBeLessThan(1e-9);
    expect(Math.abs(r.x[1] - 1)).toBeLessThan(1e-9);
    expect(r.fx).toBeLessThan(1e-14);
  });

  it('stays in the box: a quadratic with its minimum outside ends on the bound (analytic)', () => {
    const f = (x: number[]): number => (x[0] - 3) ** 2 + (x[1] + 1) ** 2;
    const r = nelderMead(f, [0, 0], [0.3, 0.3], { lower: [-1, -0.5], upper: [2, 1], fTol: 1e-12, xTol: 1e-8 });
    // on the bound to the final simplex's size, xTol × step = 3e-9 (measured: exactly on it)
    expect(Math.abs(r.x[0] - 2)).toBeLessThanOrEqual(3e-9);
    expect(Math.abs(r.x[1] + 0.5)).toBeLessThanOrEqual(3e-9);
  });

  it('backs away from regions without a value and keeps fixed coordinates fixed', () => {
    const f = (x: number[]): number => (x[0] < 0 ? NaN : (x[0] - 0.5) ** 2 + (x[1] - 2) ** 2 + x[2]);
    const r = nelderMead(f, [0.1, 0, 7], [1, 1, 0]);
    // default xTol 1e-4 × step 1 (measured 1.8e-5 and 1.9e-5)
    expect(Math.abs(r.x[0] - 0.5)).toBeLessThan(1e-4);
    expect(Math.abs(r.x[1] - 2)).toBeLessThan(1e-4);
    expect(r.x[2]).toBe(7);
    expect(Number.isFinite(r.fx)).toBe(true);
  });

  it('reports typed errors', () => {
    expect(() => nelderMead(() => Infinity, [0, 0], [1, 1], { maxEvaluations: 20 })).toThrow(SolverError);
    expect(() => nelderMead((x) => x[0], [0], [1, 1])).toThrow(InputError);
    expect(() => nelderMead((x) => x[0], [NaN], [1])).toThrow(InputError);
    expect(() => nelderMead((x) => x[0], [0], [1], { lower: [1], upper: [0] })).toThrow(InputError);
  });
});
