import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError, SolverError } from '../../../core/math/errors.ts';
import { rk45, rk45Generic } from '../../../core/integrate/rk45.ts';
import { ODEX_CONVERGED, odexSolve, odexTwoBody } from './odexRef.ts';
import { type Ellipse, period, posError, stateAt, twoBodyOde } from './twoBody.ts';

// Earth's μ (Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., Table D-3, from memory)
// used only as a realistic reference input.
const MU = 3.986004418e14;
const ECC: Ellipse = { mu: MU, a: 8.0e6, e: 0.3, i: 0.5, raan: 1.0, argp: 0.7, M0: 0.3 };
const TOLS = [1e-6, 1e-9, 1e-12];

/** Circular orbit of radius a, inclined by inc about x: exact solution r(t) = R_x(inc)·a(cos nt, sin nt, 0). */
function circular(a: number, inc: number, t: number): Float64Array {
  const n = Math.sqrt(MU / a ** 3);
  const c = Math.cos(n * t),
    s = Math.sin(n * t);
  const ci = Math.cos(inc),
    si = Math.sin(inc);
  const v = a * n;
  return Float64Array.from([a * c, a * s * ci, a * s * si, -v * s, v * c * ci, v * c * si]);
}

function velError(a: ArrayLike<number>, b: ArrayLike<number>): number {
  return Math.hypot(a[3] - b[3], a[4] - b[4], a[5] - b[5]);
}

describe('rk45 against the analytic two-body solution', () => {
  for (const tol of TOLS) {
    it(`circular orbit, 3 revolutions, rtol ${tol}: matches the exact rotation at mean motion (analytic)`, () => {
      const a = 7.0e6,
        inc = 0.9;
      const T = 3 * 2 * Math.PI * Math.sqrt(a ** 3 / MU);
      const r = rk45(twoBodyOde(MU), 0, circular(a, inc, 0), T, { rtol: tol, atol: tol });
      expect(r.status).toBe('done');
      expect(r.t).toBe(T);
      const ex = circular(a, inc, T);
      expect(posError(r.y, ex) / a).toBeLessThan(300 * tol);
      expect(velError(r.y, ex) / (a * Math.sqrt(MU / a ** 3))).toBeLessThan(300 * tol);
      // Radius is a conserved quantity of the exact solution.
      expect(Math.abs(Math.hypot(r.y[0], r.y[1], r.y[2]) - a) / a).toBeLessThan(300 * tol);
    });

    it(`eccentric orbit e=0.3, 3 revolutions, rtol ${tol}: matches Kepler's equation solved by Newton (analytic)`, () => {
      const T = 3 * period(ECC);
      const r = rk45(twoBodyOde(MU), 0, stateAt(ECC, 0), T, { rtol: tol, atol: tol });
      expect(r.status).toBe('done');
      const ex = stateAt(ECC, T);
      expect(posError(r.y, ex) / ECC.a).toBeLessThan(1000 * tol);
      expect(velError(r.y, ex) / Math.sqrt(MU / ECC.a)).toBeLessThan(1000 * tol);
    });
  }

  it('e=0.7 through periapsis, rtol 1e-10 (analytic)', () => {
    const o: Ellipse = { ...ECC, e: 0.7, M0: -0.4 };
    const T = 2 * period(o);
    const r = rk45(twoBodyOde(MU), 0, stateAt(o, 0), T, { rtol: 1e-10, atol: 1e-10 });
    expect(posError(r.y, stateAt(o, T)) / o.a).toBeLessThan(1000 * 1e-10);
  });

  it('integrates backward (tEnd < t0) to the same accuracy (analytic)', () => {
    const T = 2 * period(ECC);
    const r = rk45(twoBodyOde(MU), T, stateAt(ECC, T), -0.25 * period(ECC), { rtol: 1e-10, atol: 1e-10 });
    expect(r.status).toBe('done');
    expect(r.t).toBe(-0.25 * period(ECC));
    expect(posError(r.y, stateAt(ECC, r.t)) / ECC.a).toBeLessThan(1000 * 1e-10);
  });

  it('error shrinks as the tolerance tightens, over random orbits (property, analytic reference)', () => {
    fc.assert(
      fc.property(
        fc.record({
          a: fc.double({ min: 6.6e6, max: 4.2e7, noNaN: true }),
          e: fc.double({ min: 0, max: 0.8, noNaN: true }),
          i: fc.double({ min: 0, max: Math.PI, noNaN: true }),
          raan: fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }),
          argp: fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }),
          M0: fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
          revs: fc.double({ min: 0.3, max: 2, noNaN: true }),
        }),
        ({ revs, ...el }) => {
          const o: Ellipse = { mu: MU, ...el };
          const T = revs * period(o);
          const ex = stateAt(o, T);
          const errs = TOLS.map((tol) => posError(rk45(twoBodyOde(MU), 0, stateAt(o, 0), T, { rtol: tol, atol: tol }).y, ex) / o.a);
          expect(errs[1]).toBeLessThan(errs[0]);
          expect(errs[2]).toBeLessThan(errs[1]);
          TOLS.forEach((tol, k) => expect(errs[k]).toBeLessThan(2000 * tol));
        },
      ),
      { numRuns: 25, seed: 20240601 },
    );
  });
});

describe('rk45 against odex (Hairer & Wanner ODEX, Gragg–Bulirsch–Stoer extrapolation, independent npm solver)', () => {
  for (const tol of TOLS) {
    it(`same two-body problem, rtol = atol = ${tol}: final states agree to the tolerance level`, () => {
      const T = 3 * period(ECC);
      const y0 = stateAt(ECC, 0);
      const mine = rk45(twoBodyOde(MU), 0, y0, T, { rtol: tol, atol: tol });
      const ref = odexSolve(odexTwoBody(MU), 0, y0, T, tol, tol);
      expect(ref.outcome).toBe(ODEX_CONVERGED);
      expect(posError(mine.y, ref.y) / ECC.a).toBeLessThan(1000 * tol);
      expect(velError(mine.y, ref.y) / Math.sqrt(MU / ECC.a)).toBeLessThan(1000 * tol);
    });
  }
});

describe('rk45 unrolled 6-component kernel', () => {
  it('agrees bit for bit with the generic loop: states, stats, events, dense output', () => {
    const opts = () => ({
      rtol: 1e-10,
      atol: [1e-3, 1e-3, 1e-3, 1e-6, 1e-6, 1e-6],
      dense: true,
      events: [{ g: (_t: number, y: Float64Array) => y[0] * y[3] + y[1] * y[4] + y[2] * y[5], name: 'apsis' }],
    });
    const T = 3 * period(ECC);
    const a = rk45(twoBodyOde(MU), 0, stateAt(ECC, 0), T, opts());
    const b = rk45Generic(twoBodyOde(MU), 0, stateAt(ECC, 0), T, opts());
    expect(Array.from(a.y)).toEqual(Array.from(b.y));
    expect(a.stats).toEqual(b.stats);
    expect(a.hNext).toBe(b.hNext);
    expect(a.events.map((e) => [e.t, ...e.y])).toEqual(b.events.map((e) => [e.t, ...e.y]));
    for (const t of [0.1, 0.77, 1.5, 2.99].map((k) => k * period(ECC))) expect(Array.from(a.dense!.at(t))).toEqual(Array.from(b.dense!.at(t)));
    // Backward, terminal event, step budget.
    const ev = { events: [{ g: (_t: number, y: Float64Array) => y[2], terminal: true }] };
    const c = rk45(twoBodyOde(MU), T, stateAt(ECC, T), 0, ev);
    const d = rk45Generic(twoBodyOde(MU), T, stateAt(ECC, T), 0, ev);
    expect(c.status).toBe('event');
    expect([c.t, ...c.y]).toEqual([d.t, ...d.y]);
    const e = rk45(twoBodyOde(MU), 0, stateAt(ECC, 0), T, { maxSteps: 30 });
    const g = rk45Generic(twoBodyOde(MU), 0, stateAt(ECC, 0), T, { maxSteps: 30 });
    expect(e.status).toBe('step-budget');
    expect([e.t, ...e.y, e.message]).toEqual([g.t, ...g.y, g.message]);
  });

  it('non-6 sizes use the generic loop and reach the same accuracy (two craft at once, 12 components)', () => {
    const f6 = twoBodyOde(MU);
    const f12 = (t: number, y: Float64Array, dy: Float64Array) => {
      // Layout [r1, v1, r2, v2]: two independent two-body problems.
      f6(t, y.subarray(0, 6), dy.subarray(0, 6));
      f6(t, y.subarray(6, 12), dy.subarray(6, 12));
    };
    const o2: Ellipse = { ...ECC, a: 1.2e7, e: 0.1, M0: 2 };
    const T = 2 * period(ECC);
    const r = rk45(f12, 0, [...stateAt(ECC, 0), ...stateAt(o2, 0)], T, { rtol: 1e-10, atol: 1e-10 });
    expect(posError(r.y.subarray(0, 6), stateAt(ECC, T)) / ECC.a).toBeLessThan(1e-7);
    expect(posError(r.y.subarray(6, 12), stateAt(o2, T)) / o2.a).toBeLessThan(1e-7);
  });
});

describe('rk45 bookkeeping and failure modes', () => {
  it('counts evaluations: FSAL gives 6 per attempted step, plus the initial point and the initial-step probe', () => {
    const r = rk45(twoBodyOde(MU), 0, stateAt(ECC, 0), period(ECC), { rtol: 1e-9, atol: 1e-9 });
    expect(r.stats.accepted).toBeGreaterThan(10);
    expect(r.stats.fevals).toBe(6 * (r.stats.accepted + r.stats.rejected) + 2);
    // With h0 given there is no probe.
    const r2 = rk45(twoBodyOde(MU), 0, stateAt(ECC, 0), period(ECC), { rtol: 1e-9, atol: 1e-9, h0: 1 });
    expect(r2.stats.fevals).toBe(6 * (r2.stats.accepted + r2.stats.rejected) + 1);
  });

  it('respects maxStep', () => {
    let tPrev = 0,
      widest = 0;
    const f = (_t: number, y: Float64Array, dy: Float64Array) => {
      dy[0] = -y[0];
    };
    const r = rk45(f, 0, [1], 10, {
      maxStep: 0.5,
      rtol: 1e-3,
      events: [
        {
          g: (t) => {
            widest = Math.max(widest, t - tPrev);
            tPrev = t;
            return 1;
          },
        },
      ],
    });
    expect(r.status).toBe('done');
    expect(widest).toBeLessThanOrEqual(0.5 + 1e-12);
    expect(r.stats.accepted).toBeGreaterThanOrEqual(20);
  });

  it("y' = -y: exp(-t) (analytic), scalar problem", () => {
    const r = rk45(
      (_t, y, dy) => {
        dy[0] = -y[0];
      },
      0,
      [1],
      5,
      { rtol: 1e-10, atol: 1e-14 },
    );
    expect(Math.abs(r.y[0] - Math.exp(-5)) / Math.exp(-5)).toBeLessThan(1e-8);
  });

  it('stops with step-budget when maxSteps attempts are used', () => {
    const r = rk45(twoBodyOde(MU), 0, stateAt(ECC, 0), 10 * period(ECC), { rtol: 1e-10, maxSteps: 25 });
    expect(r.status).toBe('step-budget');
    expect(r.stats.accepted + r.stats.rejected).toBe(25);
    expect(r.message).toMatch(/step budget of 25/);
    expect(r.t).toBeGreaterThan(0);
    expect(Array.from(r.y).every(Number.isFinite)).toBe(true);
    expect(Math.abs(r.hNext)).toBeGreaterThan(0);
  });

  it('stops with step-underflow when the step must fall below minStep', () => {
    const r = rk45(twoBodyOde(MU), 0, stateAt(ECC, 0), period(ECC), { rtol: 1e-12, atol: 1e-12, minStep: 200 });
    expect(r.status).toBe('step-underflow');
    expect(r.message).toMatch(/fell below its minimum/);
  });

  it('rejects non-finite derivative values and stops with a message, never a NaN state', () => {
    // Derivative is NaN beyond t = 1 (a hole in the model).
    const f = (t: number, y: Float64Array, dy: Float64Array) => {
      dy[0] = t > 1 ? NaN : -y[0];
    };
    const r = rk45(f, 0, [1], 3, { rtol: 1e-8 });
    expect(r.status).toBe('step-underflow');
    expect(r.message).toMatch(/non-finite/);
    expect(r.t).toBeLessThanOrEqual(1);
    expect(r.t).toBeGreaterThan(0.999);
    expect(Number.isFinite(r.y[0])).toBe(true);
    expect(r.stats.rejected).toBeGreaterThan(0);
  });

  it('throws SolverError non-finite when the derivative is non-finite at the initial point', () => {
    const f = (_t: number, _y: Float64Array, dy: Float64Array) => {
      dy[0] = Infinity;
    };
    expect(() => rk45(f, 0, [1], 1)).toThrow(SolverError);
    expect(() => rk45(f, 0, [1], 1)).toThrow(/non-finite/);
  });

  it('throws SolverError non-finite when an event function returns NaN', () => {
    expect(() =>
      rk45(
        (_t, _y, dy) => {
          dy[0] = 1;
        },
        0,
        [0],
        1,
        { events: [{ g: (t) => (t > 0.5 ? NaN : -1), name: 'bad' }] },
      ),
    ).toThrow(/event function "bad" returned NaN/);
  });

  it('cooperative cancellation stops between steps', () => {
    const signal = { aborted: false };
    let calls = 0;
    const f = twoBodyOde(MU);
    const r = rk45(
      (t, y, dy) => {
        if (++calls === 300) signal.aborted = true;
        f(t, y, dy);
      },
      0,
      stateAt(ECC, 0),
      10 * period(ECC),
      { signal },
    );
    expect(r.status).toBe('cancelled');
    expect(r.t).toBeLessThan(10 * period(ECC));
    expect(posError(r.y, stateAt(ECC, r.t)) / ECC.a).toBeLessThan(1e-6);
  });

  it('t0 = tEnd returns the initial state without steps', () => {
    const r = rk45(twoBodyOde(MU), 5, stateAt(ECC, 0), 5);
    expect(r.status).toBe('done');
    expect(r.stats.fevals).toBe(0);
    expect(Array.from(r.y)).toEqual(Array.from(stateAt(ECC, 0)));
  });

  it('accepts a per-component atol', () => {
    const T = period(ECC);
    const r = rk45(twoBodyOde(MU), 0, stateAt(ECC, 0), T, { rtol: 1e-10, atol: [1e-3, 1e-3, 1e-3, 1e-6, 1e-6, 1e-6] });
    expect(posError(r.y, stateAt(ECC, T)) / ECC.a).toBeLessThan(1e-7);
  });
});

describe('rk45 bad input → InputError with field and rule', () => {
  const f = twoBodyOde(MU);
  const y0 = stateAt(ECC, 0);
  const cases: [string, () => unknown, RegExp][] = [
    ['y0 NaN', () => rk45(f, 0, [1, 2, NaN, 0, 0, 0], 1), /^y0\[2\] must be a finite number \(got NaN\)/],
    ['y0 Infinity', () => rk45(f, 0, [Infinity, 0, 0, 0, 0, 0], 1), /^y0\[0\] must be a finite number/],
    ['y0 empty', () => rk45(f, 0, [], 1), /^y0 must have at least 1 component/],
    ['t0 NaN', () => rk45(f, NaN, y0, 1), /^t0 must be a finite number/],
    ['tEnd Infinity', () => rk45(f, 0, y0, Infinity), /^tEnd must be a finite number/],
    ['rtol 0', () => rk45(f, 0, y0, 1, { rtol: 0 }), /^rtol must be > 0/],
    ['rtol negative', () => rk45(f, 0, y0, 1, { rtol: -1e-9 }), /^rtol must be > 0/],
    ['rtol NaN', () => rk45(f, 0, y0, 1, { rtol: NaN }), /^rtol must be a finite number/],
    ['rtol below 100 ulps', () => rk45(f, 0, y0, 1, { rtol: 1e-16 }), /^rtol must be >= 2\.2\d*e-14/],
    ['atol 0', () => rk45(f, 0, y0, 1, { atol: 0 }), /^atol must be > 0/],
    ['atol negative entry', () => rk45(f, 0, y0, 1, { atol: [1, 1, 1, -1, 1, 1] }), /^atol\[3\] must be > 0/],
    ['atol wrong length', () => rk45(f, 0, y0, 1, { atol: [1, 1] }), /^atol must be a number or have 6 components/],
    ['h0 0', () => rk45(f, 0, y0, 1, { h0: 0 }), /^h0 must be > 0/],
    ['h0 negative', () => rk45(f, 0, y0, 1, { h0: -1 }), /^h0 must be > 0/],
    ['h0 NaN', () => rk45(f, 0, y0, 1, { h0: NaN }), /^h0 must be a finite number/],
    ['maxStep 0', () => rk45(f, 0, y0, 1, { maxStep: 0 }), /^maxStep must be > 0/],
    ['maxStep negative', () => rk45(f, 0, y0, 1, { maxStep: -2 }), /^maxStep must be > 0/],
    ['minStep negative', () => rk45(f, 0, y0, 1, { minStep: -2 }), /^minStep must be >= 0/],
    ['maxSteps 0', () => rk45(f, 0, y0, 1, { maxSteps: 0 }), /^maxSteps must be an integer >= 1/],
    ['maxSteps fractional', () => rk45(f, 0, y0, 1, { maxSteps: 10.5 }), /^maxSteps must be an integer >= 1/],
  ];
  for (const [label, fn, msg] of cases) {
    it(label, () => {
      expect(fn).toThrow(InputError);
      expect(fn).toThrow(msg);
    });
  }
});
