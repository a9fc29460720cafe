import { createRequire } from 'node:module';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError, SolverError } from '../../../core/math/errors.ts';
import { hyperbolicToTrue, meanMotion, meanToEccentric, eccentricToTrue, trueToMean } from '../../../core/orbit/anomaly.ts';
import { elementsToState, stateToElements } from '../../../core/orbit/elements.ts';
import { HYPERBOLIC_ANOMALY_SWITCH, keplerCoefficients, propagateKepler } from '../../../core/orbit/kepler.ts';

const DEG = Math.PI / 180;
const KM = 1e3;
// Curtis uses μ⊕ = 398 600 km³/s²; Vallado, 4th ed., 398 600.4418 km³/s² (from memory)
const MU_CURTIS = 398600e9;
const MU_VALLADO = 398600.4418e9;
const MU = 3.0e14; // an invented home world, for the property tests

type State = number[];
const rOf = (s: ArrayLike<number>): number => Math.hypot(s[0], s[1], s[2]);
const vOf = (s: ArrayLike<number>): number => Math.hypot(s[3], s[4], s[5]);
const energy = (mu: number, s: ArrayLike<number>): number => vOf(s) ** 2 / 2 - mu / rOf(s);
const angMom = (s: ArrayLike<number>): number[] => [s[1] * s[5] - s[2] * s[4], s[2] * s[3] - s[0] * s[5], s[0] * s[4] - s[1] * s[3]];

/** Max relative state difference, positions scaled by |r|, velocities by |v| of `ref`. */
function relDiff(a: ArrayLike<number>, ref: ArrayLike<number>): number {
  const r = rOf(ref),
    v = vOf(ref);
  let m = 0;
  for (let k = 0; k < 3; k++) m = Math.max(m, Math.abs(a[k] - ref[k]) / r, Math.abs(a[k + 3] - ref[k + 3]) / v);
  return m;
}

function expectPrinted(computed: number, printed: number, decimals: number): void {
  expect(Math.abs(computed - printed)).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-12 * Math.abs(printed));
}

function fieldOf(f: () => unknown): string {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return e.field;
    throw e;
  }
  throw new Error('did not throw');
}

// --- an independent reference: odex (Hairer & Wanner's ODEX, Gragg–Bulirsch–Stoer) ----------
interface OdexSolver {
  relativeTolerance: number;
  absoluteTolerance: number;
  maxSteps: number;
  solve(f: (x: number, y: number[]) => number[], x0: number, y0: number[], x1: number): { y: number[]; outcome: number };
}
const odex = createRequire(import.meta.url)('odex') as { Solver: new (n: number) => OdexSolver; Outcome: { Converged: number } };

function odexPropagate(mu: number, s: State, dt: number): number[] {
  const solver = new odex.Solver(6);
  solver.relativeTolerance = 1e-14;
  solver.absoluteTolerance = 1e-14 * rOf(s);
  solver.maxSteps = 1_000_000;
  const res = solver.solve(
    (_t, y) => {
      const r2 = y[0] * y[0] + y[1] * y[1] + y[2] * y[2];
      const k = -mu / (r2 * Math.sqrt(r2));
      return [y[3], y[4], y[5], k * y[0], k * y[1], k * y[2]];
    },
    0,
    s.slice(),
    dt,
  );
  expect(res.outcome).toBe(odex.Outcome.Converged);
  return res.y;
}

describe('published worked examples', () => {
  it('matches Curtis, Orbital Mechanics for Engineering Students, 3rd ed., Example 3.7: χ = 253.53 km^½, r = −3297.8 I + 7413.4 J km after 60 min (from memory)', () => {
    const s0 = [7000 * KM, -12124 * KM, 0, 2.6679 * KM, 4.621 * KM, 0];
    const c = keplerCoefficients(MU_CURTIS, s0, 3600);
    expectPrinted(c[4] / Math.sqrt(KM), 253.53, 2);
    const s = propagateKepler(MU_CURTIS, s0, 3600);
    expectPrinted(s[0] / KM, -3297.8, 1);
    expectPrinted(s[1] / KM, 7413.4, 1);
    expect(s[2]).toBe(0);
    // velocity: no printed digits relied on; energy and angular momentum must be those of r0, v0
    expect(energy(MU_CURTIS, s) / energy(MU_CURTIS, s0)).toBeCloseTo(1, 13);
    expect(angMom(s)[2] / angMom(s0)[2]).toBeCloseTo(1, 13);
  });

  it('matches Curtis, 3rd ed., Example 3.6: r0 = 10 000 km, v0 = 10 km/s, θ0 = 30°, Δt = 1 h → χ = 128.51 km^½, θ = 100.04° (from memory)', () => {
    // the book's orbit: h = 95 154 km²/s, e = 1.4682 (solved here from r0, v0, θ0 via energy and the conic equation)
    const r0 = 10000 * KM,
      v0 = 10 * KM,
      th0 = 30 * DEG;
    const a = 1 / (2 / r0 - (v0 * v0) / MU_CURTIS);
    const c = Math.cos(th0);
    const e = (-r0 * c - Math.sqrt(r0 * r0 * c * c - 4 * a * (r0 - a))) / (2 * a);
    const p = a * (1 - e * e);
    expectPrinted(e, 1.4682, 4);
    expectPrinted(Math.sqrt(p * MU_CURTIS) / 1e6, 95154, 0);
    const s0 = elementsToState(MU_CURTIS, { p, e, i: 0, raan: 0, argp: 0, nu: th0 });
    expectPrinted(keplerCoefficients(MU_CURTIS, s0, 3600)[4] / Math.sqrt(KM), 128.51, 2);
    const s1 = propagateKepler(MU_CURTIS, s0, 3600);
    const el = stateToElements(MU_CURTIS, [s1[0], s1[1], s1[2]], [s1[3], s1[4], s1[5]]);
    expectPrinted(el.nu / DEG, 100.04, 2);
  });

  it('matches Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., Example 2-4 (KEPLER), Δt = 40 min (from memory)', () => {
    const s0 = [1131.34 * KM, -2282.343 * KM, 6672.423 * KM, -5.64305 * KM, 4.30333 * KM, 2.42879 * KM];
    const s = propagateKepler(MU_VALLADO, s0, 40 * 60);
    [-4219.7527, 4363.0292, -3958.7666].forEach((x, k) => expectPrinted(s[k] / KM, x, 4));
    [3.689866, -1.916735, -6.112511].forEach((x, k) => expectPrinted(s[k + 3] / KM, x, 6));
  });
});

describe('analytic checks', () => {
  const a = 7.0e6;
  const vc = Math.sqrt(MU / a);
  const T = 2 * Math.PI * Math.sqrt(a ** 3 / MU);
  const s0 = [a, 0, 0, 0, vc, 0];

  it('a circular orbit moved by a quarter period lands at the rotated point', () => {
    const s = propagateKepler(MU, s0, T / 4);
    expect(relDiff(s, [0, a, 0, -vc, 0, 0])).toBeLessThan(1e-14);
    const back = propagateKepler(MU, s0, -T / 4);
    expect(relDiff(back, [0, -a, 0, vc, 0, 0])).toBeLessThan(1e-14);
  });

  it('an inclined circular orbit turns by n·Δt in its own plane (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: Math.PI, noNaN: true }),
        fc.double({ min: 0, max: 6.28, noNaN: true }),
        fc.double({ min: -3 * T, max: 3 * T, noNaN: true }),
        (i, raan, dt) => {
          const start = elementsToState(MU, { a, e: 0, i, raan, argp: 0, nu: 0 });
          const want = elementsToState(MU, { a, e: 0, i, raan, argp: 0, nu: (2 * Math.PI * dt) / T });
          expect(relDiff(propagateKepler(MU, start, dt), want)).toBeLessThan(1e-13);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('a full period, and 1000 periods, return to the start (period reduction)', () => {
    const el = { a: 2.4e7, e: 0.7, i: 0.4, raan: 1.1, argp: 2.2, nu: 0.3 };
    const s = elementsToState(MU, el);
    const P = (2 * Math.PI) / meanMotion(MU, el.a);
    expect(relDiff(propagateKepler(MU, s, P), s)).toBeLessThan(1e-13);
    expect(relDiff(propagateKepler(MU, s, -P), s)).toBeLessThan(1e-13);
    // after 1000 periods the rounding of P (a few ε, here and inside the propagator) has grown to
    // ~1000·P·ε of time, i.e. ~1e-11 relative at this periapsis speed: allow 1e-10
    expect(relDiff(propagateKepler(MU, s, 1000 * P), s)).toBeLessThan(1e-10);
    expect(relDiff(propagateKepler(MU, s, 1000 * P + 0.25 * P), propagateKepler(MU, s, 0.25 * P))).toBeLessThan(1e-10);
  });

  it('radial free fall from rest matches the analytic cycloid r = (R/2)(1 + cos η), t = √(R³/8μ)(η + sin η)', () => {
    const R = 1.0e7;
    for (const eta of [0.5, 1.5, 2.5]) {
      const t = Math.sqrt(R ** 3 / (8 * MU)) * (eta + Math.sin(eta));
      const r = (R / 2) * (1 + Math.cos(eta));
      const vr = -Math.sqrt(2 * MU * (1 / r - 1 / R));
      const s = propagateKepler(MU, [R, 0, 0, 0, 0, 0], t);
      expect(s[0] / r).toBeCloseTo(1, 12);
      expect(s[3] / vr).toBeCloseTo(1, 12);
    }
  });

  it('a radial escape (r ∥ v, positive energy) stays radial and keeps its energy', () => {
    const s0 = [1.0e7, 0, 0, 1.0e4, 0, 0];
    for (const dt of [10, 1e3, 1e5]) {
      const s = propagateKepler(MU, s0, dt);
      expect(s[1]).toBe(0);
      expect(s[3]).toBeGreaterThan(0);
      expect(energy(MU, s) / energy(MU, s0)).toBeCloseTo(1, 12);
    }
  });

  it('agrees with the element route (Kepler’s equation by anomaly.ts, then elements → state) on ellipses and hyperbolas (property)', () => {
    fc.assert(
      fc.property(
        fc.oneof(fc.double({ min: 0, max: 0.99, noNaN: true }), fc.double({ min: 1.01, max: 10, noNaN: true })),
        fc.double({ min: 6e6, max: 1e8, noNaN: true }),
        fc.double({ min: -0.95, max: 0.95, noNaN: true }),
        fc.double({ min: -20, max: 20, noNaN: true }),
        (e, rp, f, dM) => {
          const p = rp * (1 + e);
          const nu0 = e < 1 ? f * Math.PI : f * Math.acos(-1 / e);
          const el = { p, e, i: 0.7, raan: 0.2, argp: 1.3, nu: nu0 };
          const aa = p / (1 - e * e);
          const n = meanMotion(MU, aa);
          const s = elementsToState(MU, el);
          const M1 = trueToMean(nu0, e) + dM;
          let nu1: number;
          if (e < 1) nu1 = eccentricToTrue(meanToEccentric(M1, e), e);
          else {
            // hyperbolic anomaly by plain Newton (independent of anomaly.ts's solver)
            let H = Math.asinh(M1 / e);
            for (let k = 0; k < 200; k++) {
              const d = (e * Math.sinh(H) - H - M1) / (e * Math.cosh(H) - 1);
              H -= d;
              if (Math.abs(d) < 1e-15 * Math.max(1, Math.abs(H))) break;
            }
            nu1 = hyperbolicToTrue(H, e);
          }
          const want = elementsToState(MU, { ...el, nu: nu1 });
          expect(relDiff(propagateKepler(MU, s, dM / n), want)).toBeLessThan(1e-10);
        },
      ),
      { numRuns: 400 },
    );
  });

  it('agrees with odex integrating the two-body equations (independent library) on an ellipse, a parabola and hyperbolas', () => {
    const cases: { el: { p: number; e: number; i: number; raan: number; argp: number; nu: number }; dt: number }[] = [
      { el: { p: 1.2e7, e: 0.7, i: 0.5, raan: 0.3, argp: 1.0, nu: 2.5 }, dt: 30000 },
      { el: { p: 1.4e7, e: 1, i: 1.2, raan: 2.0, argp: 0.4, nu: -1.5 }, dt: 20000 },
      { el: { p: 2.0e7, e: 3, i: 2.5, raan: 4.0, argp: 5.0, nu: -1.2 }, dt: 8000 },
      { el: { p: 2.0e7, e: 10, i: 0.1, raan: 1.0, argp: 2.0, nu: -1.2 }, dt: -3000 },
    ];
    // odex at rtol 1e-14 over these arcs: measured 2.2e-13
    for (const { el, dt } of cases) {
      const s = Array.from(elementsToState(MU, el));
      expect(relDiff(propagateKepler(MU, s, dt), odexPropagate(MU, s, dt))).toBeLessThan(2e-12);
    }
  });
});

// random conic states: ellipse (including near-circular and e → 1), parabola, hyperbola to e = 10
const conic = fc
  .record({
    kind: fc.integer({ min: 0, max: 4 }),
    u: fc.double({ min: 0, max: 1, noNaN: true }),
    rp: fc.double({ min: 6e6, max: 1e9, noNaN: true }),
    i: fc.double({ min: 0, max: Math.PI, noNaN: true }),
    raan: fc.double({ min: 0, max: 6.28, noNaN: true }),
    argp: fc.double({ min: 0, max: 6.28, noNaN: true }),
    f: fc.double({ min: -0.9, max: 0.9, noNaN: true }),
    lt: fc.double({ min: -2, max: 2, noNaN: true }),
    sign: fc.boolean(),
  })
  .map(({ kind, u, rp, i, raan, argp, f, lt, sign }) => {
    const e = [1e-6 * u, 0.99 * u, 1 - 10 ** (-3 - 6 * u), 1, 1.001 + 9 * u][kind];
    const nu = e < 1 ? f * Math.PI : f * Math.acos(-1 / e);
    const s = Array.from(elementsToState(MU, { p: rp * (1 + e), e, i, raan, argp, nu }));
    // Δt: 1e-2 … 1e2 times the local time scale r/v
    const dt = (sign ? 1 : -1) * (rOf(s) / vOf(s)) * 10 ** lt;
    return { e, s, dt };
  });

describe('propagator properties (fast-check)', () => {
  it('forward then backward returns to the start (relative 1e-9)', () => {
    fc.assert(
      fc.property(conic, ({ s, dt }) => {
        const back = propagateKepler(MU, propagateKepler(MU, s, dt), -dt);
        expect(relDiff(back, s)).toBeLessThan(1e-9);
      }),
      { numRuns: 1000 },
    );
  });

  it('conserves specific energy and angular momentum', () => {
    fc.assert(
      fc.property(conic, ({ s, dt }) => {
        const s1 = propagateKepler(MU, s, dt);
        const E0 = energy(MU, s);
        // energy: relative to the size of its terms (v²/2 and μ/r), which cancel for near-parabolic orbits
        const scale = Math.max(vOf(s) ** 2 / 2, vOf(s1) ** 2 / 2, MU / rOf(s), MU / rOf(s1));
        expect(Math.abs(energy(MU, s1) - E0) / scale).toBeLessThan(1e-12);
        const h0 = angMom(s),
          h1 = angMom(s1);
        const hn = Math.hypot(h0[0], h0[1], h0[2]);
        const hScale = Math.max(rOf(s) * vOf(s), rOf(s1) * vOf(s1));
        for (let k = 0; k < 3; k++) expect(Math.abs(h1[k] - h0[k]) / hScale).toBeLessThan(1e-12);
        expect(hn).toBeGreaterThan(0);
      }),
      { numRuns: 1000 },
    );
  });

  it('Lagrange coefficients satisfy f·ġ − ḟ·g = 1', () => {
    fc.assert(
      fc.property(conic, ({ s, dt }) => {
        const [f, g, fd, gd] = keplerCoefficients(MU, s, dt);
        expect(Math.abs(f * gd - fd * g - 1)).toBeLessThan(1e-11 * Math.max(1, Math.abs(f * gd), Math.abs(fd * g)));
      }),
      { numRuns: 1000 },
    );
  });

  it('composes: propagating t1 then t2 equals propagating t1 + t2', () => {
    fc.assert(
      fc.property(conic, fc.double({ min: -1, max: 1, noNaN: true }), ({ s, dt }, w) => {
        const two = propagateKepler(MU, propagateKepler(MU, s, dt * w), dt * (1 - w));
        const one = propagateKepler(MU, s, dt);
        expect(relDiff(two, one)).toBeLessThan(1e-10);
      }),
      { numRuns: 500 },
    );
  });

  it('starts far out on hyperbolas (r0 ≫ |a|) and flies back through periapsis accurately', () => {
    fc.assert(
      fc.property(fc.double({ min: 1.05, max: 10, noNaN: true }), fc.double({ min: 0.99, max: 0.9999, noNaN: true }), (e, f) => {
        const p = 1e7;
        const nuInf = Math.acos(-1 / e);
        const el = { p, e, i: 0.3, raan: 1, argp: 2, nu: -f * nuInf }; // inbound, far out
        const s = elementsToState(MU, el);
        const a = p / (1 - e * e);
        const dt = (trueToMean(f * nuInf, e) - trueToMean(-f * nuInf, e)) / meanMotion(MU, a);
        expect(rOf(s) / -a).toBeGreaterThan(10); // far out
        expect((Math.sqrt(MU / -a) * dt) / rOf(s)).toBeGreaterThan(HYPERBOLIC_ANOMALY_SWITCH); // exercises the anomaly path
        const want = elementsToState(MU, { ...el, nu: f * nuInf });
        expect(relDiff(propagateKepler(MU, s, dt), want)).toBeLessThan(1e-11);
      }),
      { numRuns: 200 },
    );
  });
});

describe('interface', () => {
  it('writes into out, allows out to alias the state, and returns identity for Δt = 0', () => {
    const s = [7e6, 1e5, -2e5, 100, 7.5e3, 300];
    const ref = Array.from(propagateKepler(MU, s, 1234));
    const buf = Float64Array.from(s);
    expect(propagateKepler(MU, buf, 1234, buf)).toBe(buf);
    expect(Array.from(buf)).toEqual(ref);
    expect(Array.from(propagateKepler(MU, s, 0))).toEqual(s);
  });

  it('raises InputError naming the field for NaN, Infinity, μ ≤ 0, zero position and short state', () => {
    const s = [7e6, 0, 0, 0, 7.5e3, 0];
    expect(fieldOf(() => propagateKepler(0, s, 1))).toBe('mu');
    expect(fieldOf(() => propagateKepler(-MU, s, 1))).toBe('mu');
    expect(fieldOf(() => propagateKepler(NaN, s, 1))).toBe('mu');
    expect(fieldOf(() => propagateKepler(MU, s, Infinity))).toBe('dt');
    expect(fieldOf(() => propagateKepler(MU, s, NaN))).toBe('dt');
    expect(fieldOf(() => propagateKepler(MU, [7e6, NaN, 0, 0, 7.5e3, 0], 1))).toBe('state[1]');
    expect(fieldOf(() => propagateKepler(MU, [7e6, 0, 0, 0, Infinity, 0], 1))).toBe('state[4]');
    expect(fieldOf(() => propagateKepler(MU, [0, 0, 0, 0, 7.5e3, 0], 1))).toBe('state[0..2]');
    expect(fieldOf(() => propagateKepler(MU, [7e6, 0, 0, 0, 7.5e3], 1))).toBe('state');
    expect(fieldOf(() => propagateKepler(MU, s, 1, new Float64Array(3)))).toBe('out');
  });

  it('raises SolverError (not NaN) when a rectilinear fall lands exactly on the centre', () => {
    const R = 1.0e7;
    const tff = (Math.PI / 2) * Math.sqrt(R ** 3 / (2 * MU));
    expect(() => propagateKepler(MU, [R, 0, 0, 0, 0, 0], tff)).toThrow(SolverError);
  });
});
