import { describe, expect, it } from 'vitest';
import { ShipForces } from '../../../core/dynamics/shipForces.ts';
import { rk45 } from '../../../core/integrate/rk45.ts';
import { propagate } from '../../../core/integrate/propagate.ts';
import { InputError } from '../../../core/math/errors.ts';
import { elementsToState } from '../../../core/orbit/elements.ts';
import { propagateKepler } from '../../../core/orbit/kepler.ts';
import { evaluate } from '../../../core/conic/evaluate.ts';
import { NBodyModel, burnActions, conicStart, flyNBody, type NBodyState } from '../../../core/nbody/verify.ts';
import { bodyPosition, bodyState } from '../../../core/system/ephemeris.ts';
import { demoPlan } from '../../fixtures/demoPlan.ts';
import { demoSystem } from '../plan/helpers.ts';
import { ephemerisAccel, flyStarCentred, starCentredAccel } from './starCentred.ts';

const sys = demoSystem();
const id = sys.indexById;
const HOUR = 3600;
const DAY = 86400;

/** Star-relative [x, v] of an n-body state. */
function toStar(s: NBodyState): number[] {
  const b = new Float64Array(6);
  bodyState(sys, s.origin, s.t, b, 0);
  return [0, 1, 2, 3, 4, 5].map((i) => (i < 3 ? s.x[i] : s.v[i - 3]) + b[i]);
}

/** Flies star-relative state s0 from t0 to t1 relative to origin body o with the force model; returns the star-relative end state. */
function flyAbout(f: ShipForces, o: number, t0: number, s0: ArrayLike<number>, t1: number, rtol: number): number[] {
  const b = new Float64Array(6);
  bodyState(sys, o, t0, b, 0);
  f.origin = o;
  const x = Float64Array.from([0, 1, 2], (i) => s0[i] - b[i]);
  const v = Float64Array.from([3, 4, 5], (i) => s0[i] - b[i]);
  // atol a thousandth of rtol·|x| keeps the relative tolerance in charge of the step
  const res = propagate({ accel: f.accel, t0, x0: x, v0: v, tEnd: t1, rtol, atol: 1e-3 * rtol * Math.hypot(x[0], x[1], x[2]) });
  expect(res.status).toBe('done');
  bodyState(sys, o, t1, b, 0);
  return [0, 1, 2, 3, 4, 5].map((i) => (i < 3 ? res.x[i] : res.v[i - 3]) + b[i]);
}

const dist = (a: ArrayLike<number>, b: ArrayLike<number>): number => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);

// the demo's n-body flight: the state after the departure burn, and an hour before the conic SOI exit
const conic = evaluate(sys, demoPlan, { samplesPerSegment: 0 });
const tDep = conic.budget.rows[0].t;
const tExit = conic.events.find((e) => e.kind === 'soi-exit')!.t;
const { actions } = burnActions(demoPlan, conic);
const demoFlight = flyNBody(
  new NBodyModel(sys, { rtol: 1e-12 }),
  conicStart(conic),
  [...actions.filter((a) => a.t <= tDep), { kind: 'checkpoint', t: tExit - HOUR, id: 'hour' }],
  tExit - HOUR,
);
// a burn at the flight's end time is flown: this is the state just after the departure burn
const afterDeparture = flyNBody(
  new NBodyModel(sys, { rtol: 1e-12 }),
  conicStart(conic),
  actions.filter((a) => a.t <= tDep),
  tDep,
).state;
const hourBeforeExit = demoFlight.checkpoints.get('hour')!;

describe('ShipForces: the acceleration is the star-centred definition, relative to any origin', () => {
  // a_model(x) = a_S(R_o + x) − R̈_o, the right side written plainly (starCentred.ts). The plain
  // side works in star-centred numbers: its positions carry ~|R_o|·2.2e-16 m of rounding, which
  // each body's tidal gradient 2μ_k/d_k³ turns into acceleration (up to 4e-15 m/s² at Skerry,
  // 7e11 m out, 1e9 m from Moravel); the bound is four times that, plus 1e-12 of |a| for the
  // rounding of the sums — far below any force that moves a ship a metre in a year.
  const t = 14.1e6;
  const bound = (tt: number, o: number, x: ArrayLike<number>, want: number[], pull?: readonly string[]): number => {
    const Ro = bodyPosition(sys, o, tt, [0, 0, 0], 0);
    let grad = 0;
    const p = [0, 0, 0];
    for (const b of sys.bodies) {
      if (pull && !pull.includes(b.id)) continue;
      bodyPosition(sys, b.index, tt, p, o);
      grad += (2 * b.mu) / Math.hypot(p[0] - x[0], p[1] - x[1], p[2] - x[2]) ** 3;
    }
    return 4 * 2.2e-16 * Math.hypot(Ro[0], Ro[1], Ro[2]) * grad + 1e-12 * Math.hypot(want[0], want[1], want[2]);
  };
  const cases: { origin: string; x: number[] }[] = [
    { origin: 'ilmar', x: [1.4e11, -3e10, 2e9] },
    { origin: 'tessel', x: [6.5e6, 1e6, -2e5] }, // low orbit
    { origin: 'tessel', x: [4e8, -5e8, 1e8] }, // near the SOI edge
    { origin: 'quill', x: [-3e6, 2e6, 1e6] }, // a moon: a chain of two
    { origin: 'moravel', x: [9e8, 3e8, 0] },
    { origin: 'skerry', x: [4e6, 0, 2e6] },
    { origin: 'ochre', x: [4e6, 1e5, -3e5] },
  ];
  for (const pull of [undefined, ['ilmar', 'tessel', 'moravel'], ['quill', 'skerry'], ['ilmar']]) {
    it(`pull ${pull ? pull.join(', ') : 'all'}: every origin, near and far`, () => {
      const f = new ShipForces(sys, { pull });
      const got = new Float64Array(3);
      for (const c of cases) {
        const o = id[c.origin];
        f.origin = o;
        f.accel(t, Float64Array.from(c.x), new Float64Array(3), got);
        const Ro = bodyPosition(sys, o, t, [0, 0, 0], 0);
        const aS = starCentredAccel(sys, t, [Ro[0] + c.x[0], Ro[1] + c.x[1], Ro[2] + c.x[2]], pull);
        const ao = ephemerisAccel(sys, o, t);
        const want = [0, 1, 2].map((i) => aS[i] - ao[i]);
        expect(dist(got, want)).toBeLessThan(bound(t, o, c.x, want, pull));
      }
    });
  }

  it('near a child body the grouped terms stay exact (the ship 20,000 km from Tessel, flown about the star; 3,000 km from Quill, about Tessel)', () => {
    const f = new ShipForces(sys);
    const got = new Float64Array(3);
    for (const [origin, near, off] of [
      ['ilmar', 'tessel', 2e7],
      ['tessel', 'quill', 3e6],
    ] as const) {
      const o = id[origin];
      f.origin = o;
      const p = bodyPosition(sys, id[near], t, [0, 0, 0], o);
      const x = Float64Array.from([p[0] + off, p[1], p[2] - 0.5 * off]);
      f.accel(t, x, new Float64Array(3), got);
      const Ro = bodyPosition(sys, o, t, [0, 0, 0], 0);
      const aS = starCentredAccel(sys, t, [Ro[0] + x[0], Ro[1] + x[1], Ro[2] + x[2]]);
      const ao = ephemerisAccel(sys, o, t);
      const want = [0, 1, 2].map((i) => aS[i] - ao[i]);
      expect(dist(got, want)).toBeLessThan(bound(t, o, x, want));
    }
  });

  it("frameAcceleration is the origin's ephemeris acceleration and starAcceleration the star's pull towards the pulling bodies", () => {
    const f = new ShipForces(sys, { pull: ['tessel', 'moravel'] });
    const out = new Float64Array(3);
    for (const o of ['ilmar', 'tessel', 'quill', 'lough']) {
      f.origin = id[o];
      const want = ephemerisAccel(sys, id[o], t);
      // the same conics summed in another order and with another power: a few roundings
      expect(dist(f.frameAcceleration(t, out), want)).toBeLessThanOrEqual(1e-14 * Math.hypot(want[0], want[1], want[2]));
    }
    // the star's acceleration is minus a_S at the star's own position less its own pull: Σ μ_k R_k/|R_k|³
    const p = [0, 0, 0];
    const want = [0, 0, 0];
    for (const k of [id.tessel, id.moravel]) {
      bodyPosition(sys, k, t, p, 0);
      const r3 = Math.hypot(p[0], p[1], p[2]) ** 3;
      for (let i = 0; i < 3; i++) want[i] += (sys.bodies[k].mu * p[i]) / r3;
    }
    expect(dist(f.starAcceleration(t, out), want)).toBeLessThanOrEqual(1e-14 * Math.hypot(want[0], want[1], want[2]));
  });
});

describe('ShipForces: the same flight whichever body is the origin', () => {
  it('analytic: with only the star pulling, flights about Tessel, Quill (a chain of two) and Skerry are Kepler orbits about the star (universal-variable Kepler, Vallado, 4th ed., §2.3)', () => {
    // the frames fall with their bodies' conics; the ship, pulled by the star alone, does not feel them
    const f = new ShipForces(sys, { pull: ['ilmar'] });
    const mu0 = sys.bodies[0].mu;
    const t0 = 14.0e6;
    for (const o of ['tessel', 'quill', 'skerry']) {
      const b = new Float64Array(6);
      bodyState(sys, id[o], t0, b, 0);
      const s0 = [b[0] + 3e7, b[1] - 1e7, b[2] + 5e6, b[3] + 300, b[4] - 200, b[5] + 100];
      const got = flyAbout(f, id[o], t0, s0, t0 + 2 * DAY, 1e-12);
      const want = propagateKepler(mu0, s0, 2 * DAY);
      // the integration error at rtol 1e-12 on planet-centred numbers (~1e8 m after two days) is
      // ~1e-4 m per step; a metre bounds it over ~100 steps with room, and the frame's fall
      // (~0.5·6e-3 m/s²·(2 d)² ≈ 9e7 m) is eight orders larger
      expect(dist(got, want)).toBeLessThan(1);
      expect(dist(got.slice(3), want.slice(3))).toBeLessThan(1e-5);
    }
  });

  it("one hour near Tessel's SOI exit: flown about Tessel, about the star and by odex on the star-centred equations, the three agree to 1 cm", () => {
    const s0 = toStar(hourBeforeExit);
    const t0 = hourBeforeExit.t;
    const f = new ShipForces(sys);
    const aboutTessel = flyAbout(f, id.tessel, t0, s0, tExit, 1e-13);
    const aboutStar = flyAbout(f, 0, t0, s0, tExit, 1e-13);
    const odex = flyStarCentred(sys, t0, s0, [], tExit, 1e-14);
    // star-centred positions of 1.5e11 m at rtol 1e-13 carry ~1.5 cm of tolerance per step and
    // an hour is a few steps; measured ~0.1 mm. (The formulation that accelerated the origin by
    // the gravity sums instead of its ephemeris parted by 226 m here: ½·μ_Quill/q²·t².)
    expect(dist(aboutTessel, aboutStar)).toBeLessThan(0.01);
    expect(dist(aboutTessel, odex)).toBeLessThan(0.01);
    expect(dist(aboutStar, odex)).toBeLessThan(0.01);
  });

  it("the demo's 1.8-day departure leg (the departure burn to the conic SOI exit): about Tessel, about the star and odex agree to 10 cm", () => {
    const s0 = toStar(afterDeparture);
    const f = new ShipForces(sys);
    const aboutTessel = flyAbout(f, id.tessel, tDep, s0, tExit, 1e-13);
    const aboutStar = flyAbout(f, 0, tDep, s0, tExit, 1e-13);
    const odex = flyStarCentred(sys, tDep, s0, [], tExit, 1e-15);
    // the two star-centred flights set the floor: positions of 1.1e11 m hold 1.5e-5 m per
    // rounding, over hundreds of steps of an escape from a 300 km orbit that grows early errors
    // a hundredfold; measured 2.6 cm (RK45 about the star, rtol 1e-13) and 4 cm (odex at 1e-15,
    // 18 cm at 1e-14) from the flight about Tessel. (The formulation that accelerated the origin
    // by the gravity sums parted by 424 km here.)
    expect(dist(aboutTessel, aboutStar)).toBeLessThan(0.1);
    expect(dist(aboutTessel, odex)).toBeLessThan(0.1);
    expect(dist(aboutStar, odex)).toBeLessThan(0.1);
  });
});

describe('ShipForces: two-body mode and thrust', () => {
  it('two-body mode about Tessel is a Kepler orbit (Vallado, 4th ed., §2.3), whatever the other bodies do', () => {
    const f = new ShipForces(sys, { gravity: 'two-body' });
    f.origin = id.tessel;
    const mu = sys.bodies[id.tessel].mu;
    const s0 = Array.from(elementsToState(mu, { p: 7e6, e: 0.1, i: 0.5, raan: 1, argp: 2, nu: 0.3 }));
    const res = rk45(f.deriv, 1e7, Float64Array.from(s0), 1e7 + 20000, { rtol: 1e-12, atol: 1e-9 });
    const want = propagateKepler(mu, s0, 20000);
    // rtol 1e-12 on 7e6 m over ~3 revolutions: ~1e-4 m
    expect(dist(res.y, want)).toBeLessThan(1e-3);
    const lone = ShipForces.centralBody(mu);
    const res2 = rk45(lone.deriv, 1e7, Float64Array.from(s0), 1e7 + 20000, { rtol: 1e-12, atol: 1e-9 });
    expect(Array.from(res2.y)).toEqual(Array.from(res.y)); // the same arithmetic
  });

  it('thrust with the mass falling linearly matches the rocket equation in free space (Tsiolkovsky, analytic), along a fixed direction and along the velocity (VNB [1, 0, 0])', () => {
    // x(t) = x0 + v0 t + û c [t − (m/ṁ) ln(m0/m)], v(t) = v0 + û c ln(m0/m), m = m0 − ṁ t
    const F = 2e4,
      c = 3200,
      m0 = 5000,
      dur = 400;
    const mdot = F / c;
    const m = m0 - mdot * dur;
    const v0 = [0, 0, 0];
    const x0 = [1e7, 0, 0];
    for (const vnb of [null, [1, 0, 0]]) {
      const f = ShipForces.centralBody(0);
      const u = [0.6, 0, 0.8];
      // with VNB [1, 0, 0] the thrust follows the velocity: start moving along û so it stays there
      const v = vnb ? [u[0] * 10, 0, u[2] * 10] : v0;
      f.setThrust({ duration: dur, thrust: F, exhaust: c, mass0: m0 }, 0, u, vnb);
      const y = Float64Array.from([...x0, ...v]);
      const res = rk45(f.deriv, 0, y, dur, { rtol: 1e-12, atol: 1e-9 });
      const gain = c * Math.log(m0 / m);
      const s = c * (dur - (m / mdot) * Math.log(m0 / m));
      const want = [0, 1, 2].map((i) => x0[i] + v[i] * dur + u[i] * s).concat([0, 1, 2].map((i) => v[i] + u[i] * gain));
      // rtol 1e-12 on ~1e7 m: 1e-5 m
      expect(dist(res.y, want)).toBeLessThan(1e-4);
      expect(dist(res.y.subarray(3), want.slice(3))).toBeLessThan(1e-8);
    }
    // no mass flow (exhaust Infinity): constant acceleration F/m0, x = x0 + ½ a t²
    const f = ShipForces.centralBody(0);
    f.setThrust({ duration: 10, thrust: 3, exhaust: Infinity, mass0: 1 }, 5, [0, 1, 0], null);
    const res = rk45(f.deriv, 5, new Float64Array(6), 15, { rtol: 1e-12, atol: 1e-12 });
    expect(res.y[1]).toBeCloseTo(150, 9);
    expect(res.y[4]).toBeCloseTo(30, 10);
    // off again: free flight
    f.setThrust(null, 0, [0, 1, 0], null);
    const out = new Float64Array(3);
    f.accel(0, Float64Array.from([1, 0, 0]), Float64Array.from([0, 1, 0]), out);
    expect(Array.from(out)).toEqual([0, 0, 0]);
  });

  it('rejects bad options with typed errors', () => {
    expect(() => new ShipForces(sys, { gravity: 'two-body', pull: ['ilmar'] })).toThrow(/options.pull/);
    expect(() => new ShipForces(sys, { gravity: 'sun' as never })).toThrow(/options.gravity/);
    expect(() => new ShipForces(sys, { pull: ['nowhere'] })).toThrow(InputError);
    const f = new ShipForces(sys);
    expect(() => {
      f.origin = 99;
    }).toThrow(/origin/);
    expect(() => f.setThrust({ duration: 1, thrust: 1, exhaust: 300, mass0: 0 }, 0, [1, 0, 0], null)).toThrow(/mass0/);
    expect(() => f.setThrust({ duration: 1, thrust: 1, exhaust: 0, mass0: 1 }, 0, [1, 0, 0], null)).toThrow(/exhaust/);
    expect(() => ShipForces.centralBody(-1)).toThrow(/mu/);
  });
});
