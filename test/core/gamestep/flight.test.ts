import { describe, expect, it } from 'vitest';
import type { GameBurn } from '../../../core/gamestep/burns.ts';
import { GameFlight, type GameFlightSetup } from '../../../core/gamestep/flight.ts';
import { InputError } from '../../../core/math/errors.ts';
import { G0 } from '../../../core/plan/rocket.ts';
import { bodyState } from '../../../core/system/ephemeris.ts';
import { testSystem } from '../plan/helpers.ts';

const system = testSystem();
const SUN = 0;
const TERRA = 1;
const MU = system.bodies[TERRA].mu;
const R0 = 7000e3;
const N_MEAN = Math.sqrt(MU / R0 ** 3);
const V0 = R0 * N_MEAN;
const PERIOD = (2 * Math.PI) / N_MEAN;

function setup(over: Partial<GameFlightSetup> = {}): GameFlightSetup {
  return {
    system,
    gravity: 'central',
    integrator: 'verlet',
    precision: 'float64',
    rebase: null,
    burnModel: 'impulsive',
    burns: [],
    guidance: 'open-loop',
    ...over,
  };
}

/** Absolute (star-frame) state from a state relative to body c at time t. */
function abs(rel: number[], t = 0, c = TERRA): Float64Array {
  const b = bodyState(system, c, t, new Float64Array(6));
  return Float64Array.from(b, (x, i) => x + rel[i]);
}

function burn(t: number, dv: [number, number, number], over: Partial<GameBurn> = {}): GameBurn {
  return {
    id: 'b',
    name: 'b',
    t,
    tStart: t,
    duration: 0,
    dv,
    dvMag: Math.hypot(...dv),
    mass0: 1,
    mass1: 1,
    mdot: 0,
    thrust: 0,
    event: null,
    central: TERRA,
    fraction: 1,
    ...over,
  };
}

const circle = [R0, 0, 0, 0, V0, 0];
const none = { checkEvery: Number.MAX_SAFE_INTEGER };

describe('game flight on the step grid', () => {
  it('steps to the first grid time at or after the end, or lands on it exactly', () => {
    const f = new GameFlight(setup());
    f.reset(0, abs(circle), TERRA);
    expect(f.fly(1000.5, 1, none)).toBe('done');
    expect(f.t).toBe(1001);
    expect(f.steps).toBe(1001);
    const g = new GameFlight(setup());
    g.reset(0, abs(circle), TERRA);
    const checks: number[] = [];
    g.fly(1000.5, 1, { checkEvery: 400, land: true, onCheck: (t) => checks.push(t) });
    expect(g.t).toBe(1000.5);
    expect(g.steps).toBe(1001); // 1,000 whole steps and a half step
    expect(checks).toEqual([400, 800, 1000.5]);
  });

  it('holds the step in its precision', () => {
    expect(new GameFlight(setup({ precision: 'float32' })).gameStep(1 / 60)).toBe(Math.fround(1 / 60));
    expect(new GameFlight(setup()).gameStep(1 / 60)).toBe(1 / 60);
  });

  it('applies an impulsive burn at the grid time nearest its centre, adding exactly its Δv', () => {
    const dv: [number, number, number] = [3, -2, 0.5];
    const plain = new GameFlight(setup());
    const early = new GameFlight(setup({ burns: [burn(100.3, dv)] }));
    const late = new GameFlight(setup({ burns: [burn(100.7, dv)] }));
    for (const f of [plain, early, late]) {
      f.reset(0, abs(circle), TERRA);
      f.fly(100, 1, none);
    }
    const p = plain.relState(new Float64Array(6));
    const e = early.relState(new Float64Array(6));
    const l = late.relState(new Float64Array(6));
    // 100.3 is nearest step 100: applied there; 100.7 is nearest 101: not yet
    for (let i = 0; i < 3; i++) {
      expect(e[i]).toBe(p[i]);
      expect(e[3 + i]).toBe(p[3 + i] + dv[i]);
      expect(l[3 + i]).toBe(p[3 + i]);
    }
    expect(early.impulseWindows).toEqual([{ a: 100, b: 100.3 }]);
    expect(early.inImpulseWindow(100.1)).toBe(true);
    expect(early.inImpulseWindow(100.3)).toBe(false);
    late.fly(101, 1, none);
    expect(late.impulseWindows).toEqual([{ a: 100.7, b: 101 }]);
  });

  it('spreads a burn over the Tsiolkovsky duration and delivers exactly its Δv (Curtis, 3rd ed., §11.3)', () => {
    // heliocentric at 1 AU, far from loam: the tidal term 2μ/r³ ≈ 8e-14 s⁻² is negligible over the burn
    const v = Math.sqrt(system.bodies[SUN].mu / 1.6e11);
    const start = [0, 1.6e11, 0, -v, 0, 0];
    const ve = 450 * G0;
    const thrust = 1e6;
    const mass0 = 50000;
    const dv: [number, number, number] = [60, 80, 0]; // 100 m/s
    const duration = (mass0 * (1 - Math.exp(-100 / ve))) / (thrust / ve); // 4.94 s
    const b = burn(20, dv, { central: SUN, tStart: 20 - duration / 2, duration, mass0, mass1: mass0 * Math.exp(-100 / ve), mdot: thrust / ve, thrust });
    const h = 0.05;
    const plain = new GameFlight(setup({ burnModel: 'spread' }));
    const spread = new GameFlight(setup({ burnModel: 'spread', burns: [b] }));
    plain.reset(0, abs(start, 0, SUN), SUN);
    spread.reset(0, abs(start, 0, SUN), SUN);
    const p = new Float64Array(6);
    const s = new Float64Array(6);
    let firstThrust = -1;
    let lastThrust = -1;
    let prev = 0;
    const delivered = [0, 0, 0];
    for (let k = 1; k <= 500; k++) {
      plain.fly(k * h, h, none);
      spread.fly(k * h, h, none);
      plain.relState(p);
      spread.relState(s);
      const dvNow = Math.hypot(s[3] - p[3], s[4] - p[4], s[5] - p[5]);
      // a thrusting step adds ~1 m/s; after the burn the difference drifts by ~1e-12 m/s a step
      if (dvNow > prev + 1e-6) {
        if (firstThrust < 0) firstThrust = k;
        lastThrust = k;
        for (let i = 0; i < 3; i++) delivered[i] = s[3 + i] - p[3 + i];
      }
      prev = dvNow;
    }
    // the first thrusting step starts at the grid time nearest the burn's start, and the steps
    // span the rocket-equation duration to within a step
    expect(Math.abs((firstThrust - 1) * h - b.tStart)).toBeLessThanOrEqual(h / 2 + 1e-9);
    expect(Math.abs((lastThrust - firstThrust + 1) * h - duration)).toBeLessThanOrEqual(h);
    // the delivered Δv is dv: the last step at part throttle makes it whole. What differs: the
    // tidal term over the burn, 8e-14 s⁻² × 250 m × 5 s ≈ 1e-10 m/s, and the rounding of
    // 2.9e4 m/s velocities, 3.6e-12 m/s a step over 100 steps (measured 1.5e-11 m/s)
    for (let i = 0; i < 3; i++) expect(Math.abs(delivered[i] - dv[i])).toBeLessThan(5e-10);
  });
});

describe('floating origin', () => {
  it('moves the frame, not the craft: in float64 a rebased orbit stays within rounding of the plain one', () => {
    for (const integrator of ['verlet', 'rk4'] as const) {
      const plain = new GameFlight(setup({ integrator }));
      const moving = new GameFlight(setup({ integrator, rebase: { distance: 1000, velocity: true } }));
      const fixed = new GameFlight(setup({ integrator, rebase: { distance: 1000, velocity: false } }));
      for (const f of [plain, moving, fixed]) {
        f.reset(0, abs(circle), TERRA);
        f.fly(PERIOD, 1, { ...none, land: true });
      }
      expect(moving.rebases).toBeGreaterThan(300);
      expect(fixed.rebases).toBeGreaterThan(5000);
      const a = plain.relState(new Float64Array(6));
      // a rounding of 7e6 m coordinates (ulp 9.3e-10 m) per step, summed over the steps, bounds the
      // difference (measured 2.8e-7 m for Verlet, 2.4e-7 m for RK4; Verlet's truncation error is 17 m)
      const bound = plain.steps * 2 ** -30;
      for (const f of [moving, fixed]) {
        const b = f.relState(new Float64Array(6));
        expect(Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2])).toBeLessThan(bound);
      }
      // the absolute state is the frame's: star frame = loam + relative
      const s = moving.state(new Float64Array(6));
      const t = bodyState(system, TERRA, moving.t, new Float64Array(6));
      const r = moving.relState(new Float64Array(6));
      for (let i = 0; i < 6; i++) expect(s[i]).toBe(r[i] + t[i]);
    }
  });
});

describe('spheres of influence', () => {
  const soi = system.bodies[TERRA].derived.soiRadius;

  // Flies with a check every step; returns the largest position jump between checks less the
  // distance the craft can travel in a step (a wrong re-expression jumps by up to 2 AU).
  function flyWatching(f: GameFlight, tEnd: number, h: number): number {
    const s = new Float64Array(6);
    const prev = f.state(new Float64Array(6));
    let worst = -Infinity;
    f.fly(tEnd, h, {
      checkEvery: 1,
      onCheck: () => {
        f.state(s);
        const jump = Math.hypot(s[0] - prev[0], s[1] - prev[1], s[2] - prev[2]);
        const reach = h * Math.hypot(s[3], s[4], s[5]) * 1.01;
        worst = Math.max(worst, jump - reach);
        prev.set(s);
      },
    });
    return worst;
  }

  it('leaves the planet for the star past the SOI radius, keeping the absolute path continuous', () => {
    const vEsc = Math.sqrt((2 * MU) / R0);
    const f = new GameFlight(setup());
    f.reset(0, abs([R0, 0, 0, 0, 1.2 * vEsc, 0]), TERRA);
    const worst = flyWatching(f, 2.5 * 86400, 20);
    expect(f.central).toBe(SUN);
    expect(f.soiChanges).toBe(1);
    expect(worst).toBeLessThan(0);
    const s = f.state(new Float64Array(6));
    const t = bodyState(system, TERRA, f.t, new Float64Array(6));
    expect(Math.hypot(s[0] - t[0], s[1] - t[1], s[2] - t[2])).toBeGreaterThan(soi);
  });

  it('enters the planet from the star inside the SOI radius', () => {
    const f = new GameFlight(setup());
    f.reset(0, abs([1.5 * soi, 0, 0, -3000, 0, 0]), SUN);
    const worst = flyWatching(f, 2.5 * 86400, 20);
    expect(f.central).toBe(TERRA);
    expect(f.soiChanges).toBe(1);
    expect(worst).toBeLessThan(0);
    const r = f.relState(new Float64Array(6));
    expect(Math.hypot(r[0], r[1], r[2])).toBeLessThan(soi);
  });
});

describe('failures', () => {
  it('stops as diverged when the state becomes non-finite (a craft at the centre of its body)', () => {
    const f = new GameFlight(setup());
    f.reset(0, abs([0, 0, 0, 0, 0, 0]), TERRA);
    expect(f.fly(10, 1, none)).toBe('diverged');
    expect(f.finite()).toBe(false);
  });

  it('stops when cancelled, and refuses a bad step or rebasing distance', () => {
    const f = new GameFlight(setup());
    f.reset(0, abs(circle), TERRA);
    expect(f.fly(10, 1, { ...none, signal: { aborted: true } })).toBe('cancelled');
    expect(f.steps).toBe(0);
    expect(() => f.fly(10, 0, none)).toThrow(InputError);
    expect(() => f.fly(10, NaN, none)).toThrow(InputError);
    expect(() => new GameFlight(setup({ rebase: { distance: 0, velocity: true } }))).toThrow(InputError);
  });
});
