import { describe, expect, it } from 'vitest';
import { InputError, SolverError } from '../../../core/math/errors.ts';
import { type FixedMethod, integrateFixed } from '../../../core/integrate/fixed.ts';
import { type Ellipse, posError, slope, specificEnergy, stateAt, twoBodyAccel } from './twoBody.ts';

/*
 * Energy behaviour on a Kepler orbit at a 60 Hz fixed step (common practice in game loops).
 * A small orbit: a = 100 m, period 10 s of game time, so 10⁴ orbits (6·10⁶ steps) stay quick.
 * The energy error is averaged over 20 windows of 500 orbits each; the drift is the
 * least-squares slope of those window means times the run length. Expected behaviour (Hairer,
 * Lubich & Wanner, Geometric Numerical Integration, 2nd ed., §I.1 and Theorem IX.8.1): the
 * symplectic methods keep the energy error bounded with no drift; explicit Euler gains energy
 * and spirals out; classic RK4 loses energy secularly.
 */
const H = 1 / 60;
const PERIOD = 10;
const A = 100;
const MU_SMALL = (4 * Math.PI ** 2 * A ** 3) / PERIOD ** 2;
const SMALL: Ellipse = { mu: MU_SMALL, a: A, e: 0.1, i: 0, raan: 0, argp: 0, M0: 0 };

interface EnergyRun {
  windowMeans: number[];
  drift: number; // slope × run length, relative energy
  amplitude: number; // max |relative energy error|
  finalRadius: number;
}

const runs = new Map<string, EnergyRun>();

function energyRun(method: FixedMethod, orbits: number): EnergyRun {
  const key = `${method}:${orbits}`;
  let run = runs.get(key);
  if (!run) {
    run = flyEnergy(method, orbits);
    runs.set(key, run);
  }
  return run;
}

function flyEnergy(method: FixedMethod, orbits: number, windows = 20): EnergyRun {
  const s0 = stateAt(SMALL, 0);
  const E0 = specificEnergy(MU_SMALL, s0.subarray(0, 3), s0.subarray(3));
  const total = Math.round((orbits * PERIOD) / H);
  const perWindow = total / windows;
  const tw: number[] = [];
  const ew: number[] = [];
  let acc = 0,
    cnt = 0,
    amp = 0;
  const r = integrateFixed(method, twoBodyAccel(MU_SMALL), 0, s0.subarray(0, 3), s0.subarray(3), {
    h: H,
    steps: total,
    onStep: (t, x, v) => {
      const dE = (specificEnergy(MU_SMALL, x, v) - E0) / Math.abs(E0);
      acc += dE;
      if (Math.abs(dE) > amp) amp = Math.abs(dE);
      if (++cnt === perWindow) {
        tw.push(t);
        ew.push(acc / cnt);
        acc = 0;
        cnt = 0;
      }
    },
  });
  expect(r.steps).toBe(total);
  expect(r.status).toBe('done');
  return { windowMeans: ew, drift: slope(tw, ew) * orbits * PERIOD, amplitude: amp, finalRadius: Math.hypot(r.x[0], r.x[1], r.x[2]) };
}

describe('energy behaviour on a Kepler orbit at 60 Hz (common practice; Hairer, Lubich & Wanner, GNI)', () => {
  it('explicit Euler: energy rises secularly and the orbit spirals out (20 orbits)', () => {
    const run = energyRun('explicit-euler', 20);
    expect(run.drift).toBeGreaterThan(0.1); // > 10 % of |E| gained in 20 orbits
    for (let k = 1; k < run.windowMeans.length; k++) expect(run.windowMeans[k]).toBeGreaterThan(run.windowMeans[k - 1]);
    expect(run.finalRadius).toBeGreaterThan(1.5 * A);
  });

  for (const method of ['symplectic-euler', 'verlet'] as const) {
    it(`${method}: energy error bounded, no drift over 10⁴ orbits`, () => {
      const run = energyRun(method, 10_000);
      expect(run.amplitude).toBeLessThan(method === 'verlet' ? 1e-4 : 1e-2);
      // Drift over the whole run is a tiny fraction of the bounded oscillation.
      expect(Math.abs(run.drift)).toBeLessThan(0.01 * run.amplitude);
      const first = run.windowMeans[0],
        last = run.windowMeans[run.windowMeans.length - 1];
      expect(Math.abs(last - first)).toBeLessThan(0.01 * run.amplitude);
    });
  }

  it('classic RK4: energy error grows secularly over 10⁴ orbits while Verlet’s does not', () => {
    const rk4 = energyRun('rk4', 10_000);
    const verlet = energyRun('verlet', 10_000);
    expect(rk4.drift).toBeLessThan(0); // RK4 is dissipative on Kepler orbits
    // Every window loses more than the one before.
    for (let k = 1; k < rk4.windowMeans.length; k++) expect(rk4.windowMeans[k]).toBeLessThan(rk4.windowMeans[k - 1]);
    // The error of the last window is many times that of the first: growth, not oscillation.
    expect(Math.abs(rk4.windowMeans[19])).toBeGreaterThan(10 * Math.abs(rk4.windowMeans[0]));
    // Relative to its own error level, RK4 drifts; Verlet does not.
    expect(Math.abs(rk4.drift) / rk4.amplitude).toBeGreaterThan(0.5);
    expect(Math.abs(verlet.drift) / verlet.amplitude).toBeLessThan(0.01);
  });
});

// Earth's μ (Vallado, 4th ed., Table D-3, from memory) as a realistic reference input.
const MU = 3.986004418e14;
const O: Ellipse = { mu: MU, a: 8.0e6, e: 0.3, i: 0.5, raan: 1.0, argp: 0.7, M0: 0.3 };
const P = 2 * Math.PI * Math.sqrt(O.a ** 3 / MU);

describe('integrateFixed interface', () => {
  const s0 = stateAt(O, 0);
  const x0 = s0.subarray(0, 3),
    v0 = s0.subarray(3);
  const accel = twoBodyAccel(MU);

  it('lands on tEnd exactly with a shortened last step, forward and backward', () => {
    const h = P / 1000 + 0.123;
    const r = integrateFixed('yoshida4', accel, 0, x0, v0, { h, tEnd: P });
    expect(r.t).toBe(P);
    expect(r.steps).toBe(Math.ceil(P / h));
    expect(posError(r.x, stateAt(O, P)) / O.a).toBeLessThan(1e-6);
    const back = integrateFixed('yoshida4', accel, P, r.x, r.v, { h, tEnd: 0 });
    expect(back.t).toBe(0);
    expect(posError(back.x, x0) / O.a).toBeLessThan(1e-6);
  });

  it('a span that is a whole number of steps takes exactly that many (no rounding sliver)', () => {
    const r = integrateFixed('verlet', accel, 0, x0, v0, { h: 1 / 60, tEnd: 10 });
    expect(r.steps).toBe(600);
    expect(r.t).toBe(10);
  });

  it('counts acceleration evaluations per method', () => {
    const n = 50;
    const evals = (m: FixedMethod) => integrateFixed(m, accel, 0, x0, v0, { h: 1, steps: n }).fevals;
    expect(evals('explicit-euler')).toBe(n);
    expect(evals('symplectic-euler')).toBe(n);
    expect(evals('verlet')).toBe(n + 1);
    expect(evals('yoshida4')).toBe(3 * n + 1);
    expect(evals('rk4')).toBe(4 * n);
  });

  it('onStep returning false stops; a signal cancels', () => {
    let calls = 0;
    const r = integrateFixed('rk4', accel, 0, x0, v0, { h: 1, steps: 100, onStep: () => ++calls < 7 });
    expect(r.status).toBe('stopped');
    expect(r.steps).toBe(7);
    expect(r.t).toBe(7);
    const signal = { aborted: false };
    const c = integrateFixed('verlet', accel, 0, x0, v0, {
      h: 1,
      steps: 100,
      signal,
      onStep: (t) => {
        if (t >= 3) signal.aborted = true;
      },
    });
    expect(c.status).toBe('cancelled');
    expect(c.steps).toBe(3);
  });

  it('flies many particles at once (3N components): each matches its own solo run', () => {
    const s1 = stateAt({ ...O, e: 0.1, M0: 2 }, 0);
    const both = integrateFixed('yoshida4', twoBodyAccelMany(MU), 0, [...x0, ...s1.subarray(0, 3)], [...v0, ...s1.subarray(3)], { h: 10, steps: 200 });
    const solo0 = integrateFixed('yoshida4', accel, 0, x0, v0, { h: 10, steps: 200 });
    const solo1 = integrateFixed('yoshida4', accel, 0, s1.subarray(0, 3), s1.subarray(3), { h: 10, steps: 200 });
    expect(Array.from(both.x.subarray(0, 3))).toEqual(Array.from(solo0.x));
    expect(Array.from(both.x.subarray(3, 6))).toEqual(Array.from(solo1.x));
  });

  it('throws SolverError non-finite instead of returning NaN', () => {
    const bad = (_t: number, _x: Float64Array, _v: Float64Array, out: Float64Array) => out.fill(NaN);
    expect(() => integrateFixed('verlet', bad, 0, x0, v0, { h: 1, steps: 3 })).toThrow(SolverError);
    expect(() => integrateFixed('rk4', bad, 0, x0, v0, { h: 1, steps: 3 })).toThrow(/non-finite at t=1/);
  });

  it('bad input → InputError with field and rule', () => {
    const cases: [string, () => unknown, RegExp][] = [
      ['h zero', () => integrateFixed('verlet', accel, 0, x0, v0, { h: 0, steps: 1 }), /^h must be > 0/],
      ['h negative', () => integrateFixed('verlet', accel, 0, x0, v0, { h: -1, steps: 1 }), /^h must be > 0/],
      ['h NaN', () => integrateFixed('verlet', accel, 0, x0, v0, { h: NaN, steps: 1 }), /^h must be a finite number/],
      ['no steps or tEnd', () => integrateFixed('verlet', accel, 0, x0, v0, { h: 1 }), /^steps or tEnd must be given/],
      ['both', () => integrateFixed('verlet', accel, 0, x0, v0, { h: 1, steps: 1, tEnd: 2 }), /^steps must not be given together with tEnd/],
      ['steps fractional', () => integrateFixed('verlet', accel, 0, x0, v0, { h: 1, steps: 1.5 }), /^steps must be an integer >= 0/],
      ['tEnd Infinity', () => integrateFixed('verlet', accel, 0, x0, v0, { h: 1, tEnd: Infinity }), /^tEnd must be a finite number/],
      ['t0 NaN', () => integrateFixed('verlet', accel, NaN, x0, v0, { h: 1, steps: 1 }), /^t0 must be a finite number/],
      ['x0 length', () => integrateFixed('verlet', accel, 0, [1, 2], [1, 2], { h: 1, steps: 1 }), /^x0 must have a positive multiple of 3/],
      ['v0 length', () => integrateFixed('verlet', accel, 0, x0, [1, 2, 3, 4, 5, 6], { h: 1, steps: 1 }), /^v0 must have 3 components/],
      ['x0 NaN', () => integrateFixed('verlet', accel, 0, [1, NaN, 3], v0, { h: 1, steps: 1 }), /^x0\[1\] must be a finite number/],
      ['method', () => integrateFixed('leapfrog' as never, accel, 0, x0, v0, { h: 1, steps: 1 }), /^method must be one of/],
    ];
    for (const [label, fn, msg] of cases) {
      expect(fn, label).toThrow(InputError);
      expect(fn, label).toThrow(msg);
    }
  });
});

function twoBodyAccelMany(mu: number) {
  return (_t: number, x: Float64Array, _v: Float64Array, out: Float64Array): void => {
    for (let c = 0; c < x.length; c += 3) {
      const r2 = x[c] ** 2 + x[c + 1] ** 2 + x[c + 2] ** 2;
      const k = -mu / (r2 * Math.sqrt(r2));
      out[c] = k * x[c];
      out[c + 1] = k * x[c + 1];
      out[c + 2] = k * x[c + 2];
    }
  };
}
