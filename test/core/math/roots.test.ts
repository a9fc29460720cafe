import { describe, expect, it } from 'vitest';
import { InputError, SolverError } from '../../../core/math/errors.ts';
import { brent, minimize, newtonSafe } from '../../../core/math/roots.ts';

function solverError(f: () => unknown): SolverError {
  try {
    f();
  } catch (e) {
    if (e instanceof SolverError) return e;
    throw e;
  }
  throw new Error('did not throw');
}

describe('brent (root)', () => {
  it('finds √2 as the root of x² − 2 on [0, 2] (analytic)', () => {
    const x = brent((t) => t * t - 2, 0, 2);
    expect(Math.abs(x - Math.SQRT2)).toBeLessThanOrEqual(4 * Number.EPSILON);
  });

  it('finds ln 3 from eˣ = 3 and π from sin on [3, 3.5] (analytic)', () => {
    expect(brent((t) => Math.exp(t) - 3, -5, 5)).toBeCloseTo(Math.log(3), 14);
    expect(brent(Math.sin, 3, 3.5)).toBeCloseTo(Math.PI, 15);
  });

  it('copes with a flat multiple root and with reversed endpoints (analytic root 1)', () => {
    const x = brent((t) => (t - 1) ** 3, 3, -2);
    expect(Math.abs(x - 1)).toBeLessThan(1e-5); // a triple root is determined only to ~ε^(1/3)
  });

  it('honours an absolute tolerance', () => {
    let calls = 0;
    const x = brent(
      (t) => {
        calls++;
        return Math.cos(t) - t;
      },
      0,
      1,
      { tol: 1e-4 },
    );
    // the fixed point of cos (Dottie number) is 0.7390851332151607 (common practice)
    expect(Math.abs(x - 0.7390851332151607)).toBeLessThan(1e-4);
    expect(calls).toBeLessThan(12);
  });

  it('returns an endpoint that is an exact root', () => {
    expect(brent((t) => t - 2, 2, 5)).toBe(2);
  });

  it('reports no-bracket, non-finite and no-convergence as SolverError', () => {
    expect(solverError(() => brent((t) => t * t + 1, -1, 1)).reason).toBe('no-bracket');
    expect(solverError(() => brent((t) => (t > 0.5 ? NaN : -1), 0, 1)).reason).toBe('non-finite');
    expect(solverError(() => brent((t) => Math.cos(t) - t, 0, 1, { maxIter: 2, tol: 0 })).reason).toBe('no-convergence');
    expect(solverError(() => brent((t) => Math.exp(t) - 2, -1, 1, { maxIter: 1 })).solver).toBe('brent');
  });

  it('rejects bad arguments with InputError', () => {
    expect(() => brent((t) => t, NaN, 1)).toThrow(InputError);
    expect(() => brent((t) => t, -1, 1, { tol: -1 })).toThrow(InputError);
    expect(() => brent((t) => t, -1, 1, { maxIter: 0 })).toThrow(InputError);
  });
});

describe('newtonSafe', () => {
  it('solves Kepler’s equation E − 0.9 sin E = 1 to machine precision (residual check)', () => {
    const e = 0.9,
      M = 1;
    const E = newtonSafe(
      (x) => x - e * Math.sin(x) - M,
      (x) => 1 - e * Math.cos(x),
      0,
      Math.PI,
    );
    expect(Math.abs(E - e * Math.sin(E) - M)).toBeLessThan(4e-16);
  });

  it('converges on atan(x) where plain Newton from x0 = 2 diverges (analytic root 0)', () => {
    // plain Newton on atan diverges for |x0| > 1.39 (common practice)
    const x = newtonSafe(Math.atan, (t) => 1 / (1 + t * t), -3, 5, { x0: 2, tol: 1e-14 });
    expect(Math.abs(x)).toBeLessThan(1e-14);
  });

  it('uses the bisection fallback when the derivative vanishes', () => {
    const x = newtonSafe(
      (t) => t * t * t - 8,
      (t) => 3 * t * t,
      0,
      10,
      { x0: 0 },
    );
    expect(x).toBeCloseTo(2, 13);
  });

  it('reports no-bracket and no-convergence', () => {
    expect(
      solverError(() =>
        newtonSafe(
          (t) => t * t + 1,
          (t) => 2 * t,
          -1,
          1,
        ),
      ).reason,
    ).toBe('no-bracket');
    const err = solverError(() =>
      newtonSafe(
        (t) => t - 0.3,
        () => 0,
        0,
        1,
        { maxIter: 3, tol: 0 },
      ),
    );
    expect(err.reason).toBe('no-convergence');
    expect(err.solver).toBe('newton-safe');
    expect(() =>
      newtonSafe(
        (t) => t,
        () => 1,
        -1,
        1,
        { x0: 5 },
      ),
    ).toThrow(InputError);
  });
});

describe('minimize (Brent)', () => {
  it('finds the vertex of (x − 2)² + 1 (analytic)', () => {
    const m = minimize((x) => (x - 2) ** 2 + 1, -10, 10);
    expect(m.x).toBeCloseTo(2, 7);
    expect(m.fx).toBeCloseTo(1, 14);
    expect(m.evaluations).toBeLessThan(20); // parabolic steps finish a quadratic quickly
  });

  it('finds π as the minimum of cos on [2, 5] (analytic)', () => {
    const m = minimize(Math.cos, 2, 5, { tol: 1e-12 });
    expect(m.x).toBeCloseTo(Math.PI, 7); // √ε relative: a minimum is flat to first order
    expect(m.fx).toBeCloseTo(-1, 14);
  });

  it('handles a kink (|x − 0.3|) through its golden-section steps (analytic)', () => {
    const m = minimize((x) => Math.abs(x - 0.3), 0, 1, { tol: 1e-12 });
    expect(Math.abs(m.x - 0.3)).toBeLessThan(1e-7);
  });

  it('ends at the boundary when the function is monotone on the interval', () => {
    const m = minimize((x) => x, 1, 3, { tol: 1e-9 });
    expect(m.x - 1).toBeLessThan(1e-7);
  });

  it('reports no-convergence and bad input', () => {
    expect(solverError(() => minimize((x) => (x - 0.2) ** 2, 0, 1, { maxIter: 2 })).reason).toBe('no-convergence');
    expect(solverError(() => minimize(() => NaN, 0, 1)).reason).toBe('non-finite');
    expect(() => minimize((x) => x, 1, 1)).toThrow(InputError);
  });
});
