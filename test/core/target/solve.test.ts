import { describe, expect, it } from 'vitest';
import { InputError, SolverError } from '../../../core/math/index.ts';
import { propagateKepler, solveLambert } from '../../../core/orbit/index.ts';
import type { Control, Flight, Goal } from '../../../core/target/index.ts';
import { solveTargets } from '../../../core/target/index.ts';

const free = (names: string[], scale = 1): Control[] => names.map((name) => ({ name, scale }));

// Rosenbrock's function as a system of two residuals (Moré, Garbow & Hillstrom, ACM TOMS 7 (1981),
// problem 1): f1 = 10(x2 − x1²), f2 = 1 − x1, the only root (1, 1), standard start (−1.2, 1).
const rosenbrock: Flight = (x, out) => {
  out[0] = 10 * (x[1] - x[0] * x[0]);
  out[1] = 1 - x[0];
};
const rosenbrockJ = (x: Float64Array, J: Float64Array): void => {
  J[0] = -20 * x[0];
  J[1] = 10;
  J[2] = -1;
  J[3] = 0;
};
// 1e-10 on each residual: far below anything a designer asks, well above the ~1e-15 rounding of the
// residuals near the root, so convergence is reached by the method, not by luck.
const zeroGoals = (tol: number): Goal[] => [
  { name: 'f1', wanted: 0, tolerance: tol },
  { name: 'f2', wanted: 0, tolerance: tol },
];

describe('solveTargets: analytic problems with known roots', () => {
  it("converges on Rosenbrock's system to (1, 1) from (−1.2, 1) (Moré, Garbow & Hillstrom 1981, problem 1)", () => {
    for (const difference of ['forward', 'central'] as const) {
      const res = solveTargets(free(['x1', 'x2']), zeroGoals(1e-10), rosenbrock, { x0: [-1.2, 1], difference });
      expect(res.status).toBe('converged');
      // |f2| = |1 − x1| ≤ 1e-10 and |f1| ≤ 1e-10 give |x2 − 1| ≤ 2·1e-10 + 1e-11: the goal tolerances themselves
      expect(Math.abs(res.x[0] - 1)).toBeLessThanOrEqual(1e-10);
      expect(Math.abs(res.x[1] - 1)).toBeLessThanOrEqual(2.1e-10);
      expect(res.goals.every((g) => g.met)).toBe(true);
      // flights: one at the start, then per iteration one Jacobian (n or 2n flights) and at least one trial
      const perJacobian = difference === 'forward' ? 2 : 4;
      expect(res.flights).toBeGreaterThanOrEqual(1 + res.iterations * (perJacobian + 1));
      // a damped Newton method needs a handful of iterations here (15 measured); 25 leaves room, 50 is the budget
      expect(res.iterations).toBeLessThanOrEqual(25);
      expect(res.history.length).toBe(res.iterations);
      expect(res.history.at(-1)?.residualNorm).toBeLessThanOrEqual(Math.SQRT2);
      // only steps that lower the misses are taken: the residual norm falls at every iteration,
      // and the flights counted in the history rise to the total
      for (let k = 1; k < res.history.length; k++) {
        expect(res.history[k].residualNorm).toBeLessThan(res.history[k - 1].residualNorm);
        expect(res.history[k].flights).toBeGreaterThan(res.history[k - 1].flights);
        expect(res.history[k].damping).toBeGreaterThan(0);
      }
      expect(res.history.at(-1)?.flights).toBe(res.flights);
    }
  });

  it("with Broyden's secant updates reaches the same root of Rosenbrock's system, differencing only when a secant step fails", () => {
    const plain = solveTargets(free(['x1', 'x2']), zeroGoals(1e-10), rosenbrock, { x0: [-1.2, 1] });
    const res = solveTargets(free(['x1', 'x2']), zeroGoals(1e-10), rosenbrock, { x0: [-1.2, 1], jacobianUpdate: 'broyden' });
    expect(res.status).toBe('converged');
    // the goal tolerances themselves, as above
    expect(Math.abs(res.x[0] - 1)).toBeLessThanOrEqual(1e-10);
    expect(Math.abs(res.x[1] - 1)).toBeLessThanOrEqual(2.1e-10);
    for (let k = 1; k < res.history.length; k++) expect(res.history[k].residualNorm).toBeLessThan(res.history[k - 1].residualNorm);
    // a secant iteration costs one flight, a differenced one n + 1 = 3: some iterations must have been secant ones
    expect(res.flights).toBeLessThan(1 + res.iterations * 3);
    expect(plain.status).toBe('converged');
    expect(() => solveTargets(free(['x1', 'x2']), zeroGoals(1e-10), rosenbrock, { x0: [-1.2, 1], jacobianUpdate: 'secant' as never })).toThrow(
      /jacobianUpdate/,
    );
  });

  it('with a supplied Jacobian flies once per trial only (no differencing)', () => {
    const res = solveTargets(free(['x1', 'x2']), zeroGoals(1e-10), rosenbrock, { x0: [-1.2, 1], jacobian: rosenbrockJ });
    expect(res.status).toBe('converged');
    // every flight after the first is a trial step: at least one per iteration, and rejections add more
    expect(res.flights).toBeGreaterThanOrEqual(1 + res.iterations);
    expect(res.flights).toBeLessThanOrEqual(1 + 2 * res.iterations);
    expect(Math.abs(res.x[0] - 1)).toBeLessThanOrEqual(1e-10);
  });

  it('solves a linear 3×3 system to the exact solution x* chosen in the test (b = A·x*)', () => {
    const A = [
      [4, -2, 1],
      [3, 6, -4],
      [2, 1, 8],
    ];
    const xs = [1.5, -2, 0.25];
    const b = A.map((row) => row[0] * xs[0] + row[1] * xs[1] + row[2] * xs[2]);
    // 1e-9 on b (entries of order 10): a residual that small bounds |x − x*| by ‖A⁻¹‖·1e-9 < 1e-9 here
    const goals = b.map((w, i) => ({ name: `row ${i + 1}`, wanted: w, tolerance: 1e-9 }));
    let flights = 0;
    const res = solveTargets(
      free(['x1', 'x2', 'x3']),
      goals,
      (x, out) => {
        flights++;
        for (let i = 0; i < 3; i++) out[i] = A[i][0] * x[0] + A[i][1] * x[1] + A[i][2] * x[2];
      },
      { x0: [0, 0, 0] },
    );
    expect(res.status).toBe('converged');
    for (let j = 0; j < 3; j++) expect(Math.abs(res.x[j] - xs[j])).toBeLessThanOrEqual(1e-9);
    // the count the solver reports is the count the flight saw
    expect(res.flights).toBe(flights);
    // forward differences on a linear map are exact; the damping (λ₀ = 1e-3·max diag JᵀJ, shrinking
    // by 3 per good step) costs a few iterations: 4 measured, 6 allowed, each 3 + 1 flights
    expect(res.iterations).toBeLessThanOrEqual(6);
    expect(res.flights).toBeLessThanOrEqual(1 + 6 * 4);
  });

  it('reports a local minimum that is not a root as stalled (Freudenstein–Roth, MGH 1981 problem 2)', () => {
    // f1 = −13 + x1 + ((5 − x2)x2 − 2)x2, f2 = −29 + x1 + ((x2 + 1)x2 − 14)x2: root (5, 4), and a
    // local minimum of f1² + f2² = 48.9842… at (11.41…, −0.8968…) that Newton-type methods reach from (0.5, −2).
    const res = solveTargets(
      free(['x1', 'x2']),
      zeroGoals(1e-8),
      (x, out) => {
        out[0] = -13 + x[0] + ((5 - x[1]) * x[1] - 2) * x[1];
        out[1] = -29 + x[0] + ((x[1] + 1) * x[1] - 14) * x[1];
      },
      { x0: [0.5, -2] },
    );
    expect(res.status).toBe('stalled');
    // 48.9842 is the published value to six figures
    expect(res.values[0] ** 2 + res.values[1] ** 2).toBeCloseTo(48.9842, 3);
    expect(res.x[0]).toBeCloseTo(11.41, 2);
    expect(res.x[1]).toBeCloseTo(-0.8968, 4);
    expect(res.message).toContain('"f1" is');
    expect(res.message).toContain('"f2" is');
    expect(res.goals.every((g) => !g.met)).toBe(true);
  });

  it('stops at the iteration budget with status max-iterations and names the goals still missed', () => {
    const res = solveTargets(free(['x1', 'x2']), zeroGoals(1e-10), rosenbrock, { x0: [-1.2, 1], maxIterations: 3 });
    expect(res.status).toBe('max-iterations');
    expect(res.iterations).toBe(3);
    expect(res.message).toMatch(/within 3 iterations/);
    expect(res.message).toMatch(/"f[12]" is/);
  });

  it('stops at the flight budget', () => {
    const res = solveTargets(free(['x1', 'x2']), zeroGoals(1e-10), rosenbrock, { x0: [-1.2, 1], maxFlights: 10 });
    expect(res.status).toBe('max-iterations');
    expect(res.flights).toBeLessThanOrEqual(10);
    expect(res.message).toMatch(/within 10 flights/);
  });

  it('meets one goal with more controls than goals (underdetermined: x1 + x2 + x3 = 3)', () => {
    const res = solveTargets(
      free(['a', 'b', 'c']),
      [{ name: 'sum', wanted: 3, tolerance: 1e-9 }],
      (x, out) => {
        out[0] = x[0] + x[1] + x[2];
      },
      { x0: [0, 0, 0] },
    );
    expect(res.status).toBe('converged');
    expect(Math.abs(res.values[0] - 3)).toBeLessThanOrEqual(1e-9);
    // from the origin every step is along the gradient (1, 1, 1): the three controls stay equal (rounding only)
    expect(Math.abs(res.x[0] - res.x[1])).toBeLessThanOrEqual(1e-12);
    expect(Math.abs(res.x[1] - res.x[2])).toBeLessThanOrEqual(1e-12);
  });
});

describe('solveTargets: a two-body shooting problem against Lambert', () => {
  it('finds the departure velocity that reaches r2 after tof, equal to Lambert v1', () => {
    // an invented star (μ = 1.2e20 m³/s²) and two points about 1 au out, 150 days apart
    const mu = 1.2e20;
    const r1 = [1.4e11, 0.2e11, 0.05e11];
    const r2 = [-0.9e11, 1.7e11, -0.1e11];
    const tof = 150 * 86400;
    const v1 = solveLambert(mu, r1, r2, tof)[0].v1;
    const s = new Float64Array(6);
    const out = new Float64Array(6);
    const fly: Flight = (x, g) => {
      s.set(r1, 0);
      s.set(x, 3);
      propagateKepler(mu, s, tof, out);
      g[0] = out[0];
      g[1] = out[1];
      g[2] = out[2];
    };
    // how far Lambert's own arc, flown by the Kepler propagator, lands from r2 (Lambert's x tolerance)
    fly(Float64Array.from(v1), s.subarray(0, 3));
    const lambertMiss = Math.hypot(s[0] - r2[0], s[1] - r2[1], s[2] - r2[2]);
    const controls: Control[] = ['x', 'y', 'z'].map((c) => ({ name: `departure v${c}`, scale: 1000, units: 'm/s' }));
    // 1 m on a 1.5e11 m position: ~1e-11 relative, above the ~1e-13 agreement of the two methods
    const goals: Goal[] = ['x', 'y', 'z'].map((c, i) => ({ name: `arrival ${c}`, wanted: r2[i], tolerance: 1, units: 'm' }));
    for (const difference of ['forward', 'central'] as const) {
      // start 3% off Lambert's answer in every component
      const res = solveTargets(controls, goals, fly, { x0: Array.from(v1, (v) => v * 1.03), difference });
      expect(res.status).toBe('converged');
      for (let i = 0; i < 3; i++) expect(Math.abs(res.values[i] - r2[i])).toBeLessThanOrEqual(1);
      // the shot and Lambert's v1 differ by what each misses r2 by, over a sensitivity ∂r/∂v of order
      // tof (1.3e7 s): (1 m + Lambert's miss) / 1.3e7 s ≈ 1e-7 m/s (4.5e-8 m/s measured)
      const dv = Math.hypot(res.x[0] - v1[0], res.x[1] - v1[1], res.x[2] - v1[2]);
      expect(dv).toBeLessThanOrEqual((1 + lambertMiss) / 1.3e7);
      // Newton from 3% off a smooth two-body map: a few iterations (4 measured)
      expect(res.iterations).toBeLessThanOrEqual(6);
    }
  });
});

describe('solveTargets: bounds', () => {
  it('a root beyond a bound: stalled at the bound, the message names the goal, its units and the bound', () => {
    // a linear stand-in: 200 km plus 10 km of apoapsis per m/s, so the wanted 500 km needs 30 m/s
    const res = solveTargets(
      [{ name: 'burn 1 Δv prograde', scale: 10, upper: 30, units: 'm/s' }],
      [{ name: 'apoapsis altitude', wanted: 500e3, tolerance: 1e3, units: 'km', unitScale: 1000 }],
      (x, out) => {
        out[0] = 200e3 + 10e3 * x[0];
      },
      { x0: [5] },
    );
    // a root on the bound itself is reached
    expect(res.status).toBe('converged');
    // with the bound at 25 m/s the root (30 m/s) lies beyond it: the best is 450 km
    const beyond = solveTargets(
      [{ name: 'burn 1 Δv prograde', scale: 10, upper: 25, units: 'm/s' }],
      [{ name: 'apoapsis altitude', wanted: 500e3, tolerance: 1e3, units: 'km', unitScale: 1000 }],
      (x, out) => {
        out[0] = 200e3 + 10e3 * x[0];
      },
      { x0: [5] },
    );
    expect(beyond.status).toBe('stalled');
    expect(beyond.x[0]).toBe(25);
    expect(beyond.atBound).toEqual(['burn 1 Δv prograde']);
    expect(beyond.message).toContain('"apoapsis altitude" is 450 km, wanted 500 km within ±1 km');
    expect(beyond.message).toContain('"burn 1 Δv prograde" at its upper bound 25 m/s');
    expect(beyond.goals[0].met).toBe(false);
  });

  it('holds a control at its bound and meets the goal with the others', () => {
    // x1 + x2 = 10 with x1 ≤ 2: the first step wants x1 ≈ 5, is clamped to 2, then x2 does the rest
    const res = solveTargets(
      [
        { name: 'x1', scale: 1, upper: 2 },
        { name: 'x2', scale: 1 },
      ],
      [{ name: 'sum', wanted: 10, tolerance: 1e-9 }],
      (x, out) => {
        out[0] = x[0] + x[1];
      },
      { x0: [0, 0] },
    );
    expect(res.status).toBe('converged');
    expect(res.x[0]).toBe(2);
    expect(Math.abs(res.x[1] - 8)).toBeLessThanOrEqual(1e-9);
    expect(res.atBound).toEqual(['x1']);
  });

  it('differences away from a bound it sits on (the flight is never asked outside the bounds)', () => {
    let outside = 0;
    const res = solveTargets(
      [{ name: 'x', scale: 1, lower: 0, upper: 1 }],
      [{ name: 'x²', wanted: 0.25, tolerance: 1e-12 }],
      (x, out) => {
        if (x[0] < 0 || x[0] > 1) outside++;
        out[0] = x[0] * x[0];
      },
      { x0: [1], difference: 'central' },
    );
    expect(res.status).toBe('converged');
    expect(outside).toBe(0);
    // |x² − 0.25| ≤ 1e-12 near x = 0.5 gives |x − 0.5| ≤ 1e-12 / (2·0.5)
    expect(Math.abs(res.x[0] - 0.5)).toBeLessThanOrEqual(1e-12 + 1e-15);
  });
});

describe('solveTargets: failing flights', () => {
  it('a flight that throws at the start: flight-failed, with the error and its words', () => {
    const err = new SolverError('kepler', 'no-convergence', 'universal anomaly did not converge');
    const res = solveTargets(
      free(['a']),
      [{ name: 'g', wanted: 0, tolerance: 1 }],
      () => {
        throw err;
      },
      { x0: [1] },
    );
    expect(res.status).toBe('flight-failed');
    expect(res.error).toBe(err);
    expect(res.message).toContain('universal anomaly did not converge');
    expect(res.flights).toBe(1);
    expect(Number.isNaN(res.values[0])).toBe(false);
    // no value came out of the flight: the goal is not met, even though its wanted 0 ± 1 covers the placeholder
    expect(res.goals[0].met).toBe(false);
  });

  it('a flight that gives NaN counts as failed (no NaN leaves the solver)', () => {
    const res = solveTargets(
      free(['a']),
      [{ name: 'periapsis', wanted: 0, tolerance: 1 }],
      (_x, out) => {
        out[0] = Number.NaN;
      },
      { x0: [1] },
    );
    expect(res.status).toBe('flight-failed');
    expect(res.error).toBeInstanceOf(InputError);
    expect(res.message).toContain('periapsis');
    expect(res.values.every((v) => Number.isFinite(v))).toBe(true);
  });

  it('a flight that fails while differencing: flight-failed naming that stage', () => {
    // flyable only for x ≤ 1; the start sits on that edge with no bound to tell the solver
    const res = solveTargets(
      free(['a']),
      [{ name: 'g', wanted: 0, tolerance: 1e-9 }],
      (x, out) => {
        if (x[0] > 1) throw new SolverError('flight', 'no-solution', 'no arrival');
        out[0] = x[0];
      },
      { x0: [1] },
    );
    expect(res.status).toBe('flight-failed');
    expect(res.message).toMatch(/measuring how the goals respond/);
    expect(res.x[0]).toBe(1);
  });

  it('a trial point where the flight fails is rejected and the solve continues (arctan from 1.5, where plain Newton diverges)', () => {
    // Newton on arctan x = 0 diverges for |x0| > 1.3917 (x1 ≈ −1.69 from 1.5); the flight refuses x < −1
    let refused = 0;
    const res = solveTargets(
      free(['x']),
      [{ name: 'atan', wanted: 0, tolerance: 1e-12 }],
      (x, out) => {
        if (x[0] < -1) {
          refused++;
          throw new SolverError('flight', 'no-solution', 'out of range');
        }
        out[0] = Math.atan(x[0]);
      },
      { x0: [1.5], damping: 1e-9 },
    );
    expect(refused).toBeGreaterThan(0);
    expect(res.status).toBe('converged');
    // |atan x| ≤ 1e-12 near 0 means |x| ≤ 1e-12 (slope 1)
    expect(Math.abs(res.x[0])).toBeLessThanOrEqual(1e-12 + 1e-18);
  });

  it('an exception that is not a WaymarkError is a bug and propagates', () => {
    expect(() =>
      solveTargets(
        free(['a']),
        [{ name: 'g', wanted: 0, tolerance: 1 }],
        () => {
          throw new TypeError('bug');
        },
        { x0: [1] },
      ),
    ).toThrow(TypeError);
  });
});

describe('solveTargets: input checks', () => {
  const fly: Flight = (x, out) => {
    out[0] = x[0];
  };
  const goal: Goal[] = [{ name: 'g', wanted: 0, tolerance: 1 }];
  const field = (f: () => unknown): string => {
    try {
      f();
    } catch (e) {
      if (e instanceof InputError) return e.field;
      throw e;
    }
    return 'no error';
  };
  it('refuses malformed problems with InputError naming the field', () => {
    expect(field(() => solveTargets([], goal, fly, { x0: [] }))).toBe('controls');
    expect(field(() => solveTargets(free(['a']), [], fly, { x0: [0] }))).toBe('goals');
    expect(field(() => solveTargets(free(['a']), goal, fly, { x0: [0, 1] }))).toBe('x0');
    expect(field(() => solveTargets([{ name: 'a', scale: 0 }], goal, fly, { x0: [0] }))).toBe('controls[0].scale');
    expect(field(() => solveTargets([{ name: 'a', scale: 1, lower: 2, upper: 1 }], goal, fly, { x0: [1.5] }))).toBe('controls[0].upper');
    expect(field(() => solveTargets([{ name: 'a', scale: 1, upper: 1 }], goal, fly, { x0: [2] }))).toBe('x0[0]');
    expect(field(() => solveTargets(free(['a']), [{ name: 'g', wanted: 0, tolerance: 0 }], fly, { x0: [0] }))).toBe('goals[0].tolerance');
    expect(field(() => solveTargets(free(['a']), [{ name: 'g', wanted: Number.NaN, tolerance: 1 }], fly, { x0: [0] }))).toBe('goals[0].wanted');
    expect(field(() => solveTargets(free(['a']), goal, fly, { x0: [Number.NaN] }))).toBe('x0[0]');
    expect(field(() => solveTargets(free(['a']), goal, fly, { x0: [0], maxIterations: 0 }))).toBe('maxIterations');
  });
});
