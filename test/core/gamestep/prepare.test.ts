import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../core/conic/evaluate.ts';
import { InputError } from '../../../core/math/errors.ts';
import { gameBurns, normalizePhysics, prepareGameStep } from '../../../core/gamestep/prepare.ts';
import { G0 } from '../../../core/plan/rocket.ts';
import { propagateKepler } from '../../../core/orbit/kepler.ts';
import { bodyState } from '../../../core/system/ephemeris.ts';
import { demoPlan, longPatience } from '../../fixtures/demoPlan.ts';
import { bigVehicle, demoSystem, impulsive, MU_EARTH, plan, stateStart, testSystem } from '../plan/helpers.ts';

const system = demoSystem();
const result = evaluate(system, demoPlan, { samplesPerSegment: 0 });

describe('game physics filled in and checked', () => {
  it('fills the defaults: float64, no floating origin, central gravity, impulsive burns, re-solved guidance', () => {
    expect(normalizePhysics({ integrator: 'rk4', dt: 0.5 })).toEqual({
      integrator: 'rk4',
      dt: 0.5,
      precision: 'float64',
      rebase: null,
      gravity: 'central',
      burns: 'impulsive',
      guidance: 'resolve',
    });
  });

  it('copies the floating origin, so later edits of the input do not reach it', () => {
    const rebase = { distance: 500, velocity: true };
    const p = normalizePhysics({ integrator: 'verlet', dt: 1, precision: 'float32', rebase, gravity: 'all', burns: 'spread', guidance: 'open-loop' });
    rebase.distance = 1;
    expect(p.rebase).toEqual({ distance: 500, velocity: true });
    expect([p.precision, p.gravity, p.burns, p.guidance]).toEqual(['float32', 'all', 'spread', 'open-loop']);
  });

  it('rejects each bad field with InputError naming it', () => {
    const field = (p: unknown): string => {
      try {
        normalizePhysics(p as never);
      } catch (e) {
        expect(e).toBeInstanceOf(InputError);
        return (e as InputError).field;
      }
      return 'no error';
    };
    const ok = { integrator: 'verlet', dt: 1 };
    expect(field(null)).toBe('physics');
    expect(field({ ...ok, integrator: 'leapfrog' })).toBe('physics.integrator');
    expect(field({ ...ok, dt: NaN })).toBe('physics.dt');
    expect(field({ ...ok, dt: 0 })).toBe('physics.dt');
    expect(field({ ...ok, dt: 1e-46, precision: 'float32' })).toBe('physics.dt'); // below the smallest binary32 subnormal, 1.4e-45
    expect(field({ ...ok, precision: 'half' })).toBe('physics.precision');
    expect(field({ ...ok, rebase: 5 })).toBe('physics.rebase');
    expect(field({ ...ok, rebase: { distance: -1, velocity: true } })).toBe('physics.rebase.distance');
    expect(field({ ...ok, rebase: { distance: Infinity, velocity: true } })).toBe('physics.rebase.distance');
    expect(field({ ...ok, rebase: { distance: 1, velocity: 'yes' } })).toBe('physics.rebase.velocity');
    expect(field({ ...ok, gravity: 'some' })).toBe('physics.gravity');
    expect(field({ ...ok, burns: 'gradual' })).toBe('physics.burns');
    expect(field({ ...ok, guidance: 'auto' })).toBe('physics.guidance');
    expect(field({ ...ok, dt: 1e-46 })).toBe('no error'); // fine in float64
  });
});

describe("the plan's burns as the game flies them", () => {
  it("recovers each stage's thrust from the budget through the rocket equation (Tsiolkovsky, Curtis, 3rd ed., §11.3)", () => {
    // F = ṁ·ve and Δv = ve·ln(m0/m1), so Δv·ṁ/ln(m0/m1) must give back the firing stage's thrust
    const burns = gameBurns(demoPlan, result);
    const rows = result.budget.rows.filter((r) => r.dv > 0);
    expect(burns.map((b) => b.id)).toEqual(rows.map((r) => r.planEventId));
    for (const [k, b] of burns.entries()) {
      const stage = longPatience.stages.find((s) => s.name === rows[k].stages[0])!;
      expect(rows[k].stages.length).toBe(1);
      // budget masses and durations are rounded at ~1e-16; ln(m0/m1) ≥ 0.014 amplifies that to
      // ~1e-14 (measured 1.2e-15 and 0)
      expect(Math.abs(b.thrust / stage.thrust - 1)).toBeLessThan(1e-14);
      expect(Math.abs(b.mdot / (stage.thrust / (stage.isp * G0)) - 1)).toBeLessThan(1e-14);
      expect(b.tStart).toBe(b.t - b.duration / 2);
      expect(b.fraction).toBe(1);
      expect(b.event?.id).toBe(b.id);
    }
    for (let k = 1; k < burns.length; k++) expect(burns[k].t).toBeGreaterThan(burns[k - 1].t);
    // central bodies: the departure at Tessel, the mid-course about the star, the rest at Ochre
    expect(burns.map((b) => system.bodies[b.central].id)).toEqual(['tessel', 'ilmar', 'ochre', 'ochre', 'ochre']);
  });

  it('flies only what the vehicle can deliver: the rocket-equation capacity ve·ln(m0/m_dry) of a burn beyond it', () => {
    const sys = testSystem();
    const v = Math.sqrt(MU_EARTH / 7000e3);
    const p = plan(stateStart('loam', [7000e3, 0, 0], [0, v, 0]), [impulsive('big', 100, [20000, 0, 0])]);
    const [b] = gameBurns(p, evaluate(sys, p, { samplesPerSegment: 0 }));
    const st = bigVehicle.stages[0];
    const m0 = bigVehicle.payloadMass + st.dryMass + st.propellantMass;
    const capacity = st.isp * G0 * Math.log(m0 / (m0 - st.propellantMass));
    expect(Math.abs(b.dvMag / capacity - 1)).toBeLessThan(1e-14); // a few roundings: measured 1.1e-16
    expect(b.fraction).toBeCloseTo(capacity / 20000, 12);
    expect(Math.hypot(...b.dv)).toBeCloseTo(b.dvMag, 6);
  });
});

describe('prepared mission', () => {
  it("the reference (RK45 at rtol 1e-12) reproduces the plan's patched-conic segments (analytic Kepler arcs, open-loop burns)", () => {
    const prep = prepareGameStep(system, demoPlan, { guidance: 'open-loop', result });
    const a = new Float64Array(6);
    const b = new Float64Array(6);
    const arrive = result.target!.closestApproach!.t;
    for (const s of result.segments) {
      const exact = propagateKepler(s.mu, s.state0, s.t1 - s.t0) as Float64Array;
      bodyState(system, s.central, s.t1, b);
      prep.reference.at(s.t1 - 1e-6, a); // just before a burn at the segment's end
      const d = Math.hypot(a[0] - b[0] - exact[0], a[1] - b[1] - exact[1], a[2] - b[2] - exact[2]);
      // metres after 240 days of flight (measured 1.6 m at arrival with RK45 at rtol 1e-12;
      // DOP853 at 1e-12: 4.1 m); the final orbits drift a little more after capture
      expect(d).toBeLessThan(s.t1 <= arrive ? 20 : 200);
    }
  });

  it("has one span per segment of positive length, starts on the plan's first state and arrives at the closest approach", () => {
    const prep = prepareGameStep(system, demoPlan, { result });
    const segs = result.segments.filter((s) => s.t1 > s.t0);
    expect(prep.spans.map((s) => [s.t0, s.t1, s.central, s.kind])).toEqual(segs.map((s) => [s.t0, s.t1, s.central, s.kind]));
    expect(prep.t0).toBe(segs[0].t0);
    expect(prep.t1).toBe(segs[segs.length - 1].t1);
    const b = bodyState(system, segs[0].central, segs[0].t0, new Float64Array(6));
    for (let i = 0; i < 6; i++) expect(prep.start.abs[i]).toBe(b[i] + segs[0].state0[i]);
    expect(prep.arrival).toEqual({ t: result.target!.closestApproach!.t, body: result.target!.body });
    // the reference against a run at a tenth of its rtol: metres over the 240-day flight
    // (measured 4.7 m with RK45 at rtol 1e-12; the Kepler arcs above bound its true error before
    // arrival at 20 m)
    expect(prep.referenceStats.method).toBe('rk45');
    expect(prep.referenceError).toBeLessThan(20);
  });

  it('rejects bad models and a plan that flies nothing', () => {
    expect(() => prepareGameStep(system, demoPlan, { result, gravity: 'some' as never })).toThrow(InputError);
    expect(() => prepareGameStep(system, demoPlan, { result, burns: 'gradual' as never })).toThrow(InputError);
    expect(() => prepareGameStep(system, demoPlan, { result, guidance: 'auto' as never })).toThrow(InputError);
    const sys = testSystem();
    const still = plan(stateStart('loam', [7000e3, 0, 0], [0, 7.5e3, 0]), [{ type: 'coast', id: 'c', name: 'c', until: { kind: 'duration', dt: 0 } }]);
    let err: unknown;
    try {
      prepareGameStep(sys, still);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).field).toBe('plan');
  });
});
