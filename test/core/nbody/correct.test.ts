import { describe, expect, it } from 'vitest';
import { InputError, SolverError } from '../../../core/math/errors.ts';
import { correctPlan } from '../../../core/nbody/correct.ts';
import { evaluate } from '../../../core/conic/evaluate.ts';
import { conicArrival, verifyNBody } from '../../../core/nbody/verify.ts';
import type { BurnEvent, Plan } from '../../../core/plan/plan.ts';
import { propagateKepler } from '../../../core/orbit/kepler.ts';
import { solveLambert } from '../../../core/orbit/lambert.ts';
import { bodyState } from '../../../core/system/ephemeris.ts';
import { clonePlan, demoPlan } from '../../fixtures/demoPlan.ts';
import { AU, MU_SUN, body, demoSystem, impulsive, plan, stateStart, testSystem } from '../plan/helpers.ts';

const DAY = 86400;
const DEG = Math.PI / 180;

describe('correctPlan: a two-body problem with a known answer', () => {
  // A sun, loam (helpers) and a tiny body "mote" (μ = 1e3 m³/s², 1 km) on a 1.3 AU orbit; the
  // n-body model is restricted to the sun's gravity, so the flight after the burn is a Kepler
  // arc and the burn that reaches a chosen closest-approach point at a chosen time is the
  // Lambert solution to that point (core/orbit/lambert.ts, checked there against Curtis,
  // Orbital Mechanics for Engineering Students, Example 5.2).
  const tArr = 210 * DAY;
  const tBurn = 10 * DAY;
  const aMote = 1.3 * AU;
  const nMote = Math.sqrt(MU_SUN / aMote ** 3);
  const M0 = 330 - (nMote * tArr) / DEG;
  const sys = testSystem([body('mote', 'sun', 1e3, 1000, 0, { a_m: aMote, i_deg: 2, mean_anomaly_deg: M0 })]);
  const mote = sys.indexById.mote;
  const vc = Math.sqrt(MU_SUN / AU);
  const s0 = [-AU, 0, 0, 0, -vc * 1.02, 300];
  const atBurn = propagateKepler(MU_SUN, s0, tBurn);
  const m6 = new Float64Array(6);
  bodyState(sys, mote, tArr, m6, 0);
  // closest-approach point 6 km from mote's centre, perpendicular to the relative velocity
  let o = [0, 0, 6000];
  let v1: number[] = [];
  let vRel: number[] = [];
  for (let it = 0; it < 6; it++) {
    const P = [m6[0] + o[0], m6[1] + o[1], m6[2] + o[2]];
    const sol = solveLambert(MU_SUN, atBurn.slice(0, 3), P, tArr - tBurn)[0];
    v1 = Array.from(sol.v1);
    vRel = [sol.v2[0] - m6[3], sol.v2[1] - m6[4], sol.v2[2] - m6[5]];
    const vn = Math.hypot(vRel[0], vRel[1], vRel[2]);
    const d = (o[0] * vRel[0] + o[1] * vRel[1] + o[2] * vRel[2]) / vn;
    o = o.map((c, i) => c - (d * vRel[i]) / vn);
    const on = Math.hypot(o[0], o[1], o[2]);
    o = o.map((c) => (6000 * c) / on);
  }
  const dvExact = [v1[0] - atBurn[3], v1[1] - atBurn[4], v1[2] - atBurn[5]];
  const h = [o[1] * vRel[2] - o[2] * vRel[1], o[2] * vRel[0] - o[0] * vRel[2], o[0] * vRel[1] - o[1] * vRel[0]];
  const iStar = Math.atan2(Math.hypot(h[0], h[1]), h[2]);
  const off: [number, number, number] = [0.8, -0.5, 0.3];
  const p = plan(
    stateStart('sun', s0.slice(0, 3), s0.slice(3, 6), 0),
    [
      impulsive('tcm', tBurn, [dvExact[0] + off[0], dvExact[1] + off[1], dvExact[2] + off[2]], 'inertial'),
      { type: 'coast', id: 'go', name: 'go', until: { kind: 'time', t: tArr + DAY } },
    ],
    { target: { body: 'mote', periapsisAltitude: 5000, e: null, apoapsisAltitude: null, i: null, tolerance: { periapsisAltitude: 100, e: 0.01, i: 0.01 } } },
  );

  it('recovers the Lambert Δv from a burn 0.99 m/s off (to 1e-4 m/s)', () => {
    const c = correctPlan(sys, p, {
      pull: ['sun'],
      burns: ['tcm'],
      desired: { t: tArr, periapsisAltitude: 5000, i: iStar },
      tolerance: { altitude: 1, i: 1e-6, t: 0.01 },
    });
    const got = c.burns[0].dvAfter;
    expect(Math.hypot(got[0] - dvExact[0], got[1] - dvExact[1], got[2] - dvExact[2])).toBeLessThan(1e-4);
    expect(c.correctionDv).toBeCloseTo(Math.hypot(...off), 3);
    expect(c.iterations).toBeGreaterThan(0);
    expect(Math.abs(c.achieved.altitude - 5000)).toBeLessThan(1);
    expect(Math.abs(c.achieved.t - tArr)).toBeLessThan(0.01);
    expect(c.initial).toBeNull(); // the perturbed conic flight misses mote's 21 km sphere of influence
    // the residual history falls to within the tolerances
    const last = c.history[c.history.length - 1];
    expect(Math.abs(last.altitude)).toBeLessThan(1);
    expect(c.history[0].norm).toBeGreaterThan(1e3 * last.norm);
  });
});

describe('correctPlan on the demo plan', () => {
  const sys = demoSystem();
  const nominal = evaluate(sys, demoPlan, { samplesPerSegment: 0 });
  const want = conicArrival(sys, demoPlan, nominal)!;
  const c = correctPlan(sys, demoPlan);

  it("converges on the mid-course burn, and the n-body verification of the corrected plan arrives within the correction's tolerances (100 m, 0.001°, 1 s) of the conic arrival", () => {
    expect(c.burns.map((b) => b.planEventId)).toEqual(['mid-course']);
    expect(c.iterations).toBeLessThanOrEqual(10);
    const v = verifyNBody(sys, c.plan, evaluate(sys, c.plan, { samplesPerSegment: 0 }), { samples: false });
    const a = v.nbodyArrival!;
    // the verification re-flies the corrected plan from its start in the same model the correction
    // flew from the burn on, so it lands within the correction's default tolerances (correct.ts);
    // measured 0.1 m, 1e-6° and 0.04 s
    expect(Math.abs(a.altitude - want.periapsisAltitude)).toBeLessThan(100);
    expect(Math.abs(a.i - want.i)).toBeLessThan(1e-3 * DEG);
    expect(Math.abs(a.t - want.t)).toBeLessThan(1);
    // before the correction the n-body arrival missed by millions of km
    expect(Math.abs(c.initial!.difference.altitude)).toBeGreaterThan(1e9);
  });

  it('returns a corrected plan: the mid-course burn fixed inertial with the corrected vector, later burns frozen to their conic vectors and times', () => {
    const mc = c.plan.events.find((e) => e.id === 'mid-course') as BurnEvent;
    expect(mc.solve.kind).toBe('fixed');
    expect(mc.frame).toBe('inertial');
    expect(mc.dv).toEqual(c.burns[0].dvAfter);
    expect(mc.t).toBe(nominal.budget.rows[1].t);
    for (const id of ['capture', 'plane', 'trim']) {
      const ev = c.plan.events.find((e) => e.id === id) as BurnEvent;
      const row = nominal.budget.rows.find((r) => r.planEventId === id)!;
      expect(ev.solve.kind).toBe('fixed');
      expect(ev.dv).toEqual(row.dvInertial);
      expect(ev.t).toBe(row.t);
    }
    // the departure (before the corrected burn) is untouched; the input plan is not changed
    expect(c.plan.events[0]).toEqual(demoPlan.events[0]);
    expect((demoPlan.events[4] as BurnEvent).solve.kind).toBe('transfer');
    const ch = c.burns[0].change;
    expect(c.correctionDv).toBeCloseTo(Math.hypot(ch[0], ch[1], ch[2]), 9);
  });

  it('reports the new margin of the re-evaluated corrected plan', () => {
    const again = evaluate(sys, c.plan, { samplesPerSegment: 0 });
    expect(c.margin.before).toBeCloseTo(nominal.budget.margin, 9);
    expect(c.margin.after).toBeCloseTo(again.budget.margin, 9);
    // only the mid-course Δv changed: the budget moves by the change of its magnitude (less the reserve share)
    const dMag = Math.hypot(...c.burns[0].dvAfter) - Math.hypot(...c.burns[0].dvBefore);
    expect(Math.sign(c.margin.after - c.margin.before)).toBe(-Math.sign(dMag));
    expect(c.notes.some((n) => n.includes('patched-conic evaluation of the corrected plan'))).toBe(true);
  });

  it('says clearly when it does not converge, with the last residual', () => {
    let err: unknown;
    try {
      correctPlan(sys, demoPlan, { maxIterations: 1 });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(SolverError);
    expect((err as SolverError).reason).toBe('no-convergence');
    expect((err as Error).message).toMatch(
      /^correct: no-convergence: no convergence after 1 iteration: the n-body periapsis at Ochre is off by -?[\d.]+ km in altitude, -?[\d.]+° in inclination and -?[\d.]+ s in time/,
    );
  });

  it('rejects bad choices with typed errors', () => {
    expect(() => correctPlan(sys, demoPlan, { burns: ['nope'] })).toThrow(InputError);
    expect(() => correctPlan(sys, demoPlan, { burns: ['capture'] })).toThrow(/after the arrival/);
    const finite: Plan = clonePlan(demoPlan);
    (finite.events[4] as BurnEvent).mode = 'finite';
    expect(() => correctPlan(sys, finite, { burns: ['mid-course'] })).toThrow(/finite burn/);
    const noTarget: Plan = { ...clonePlan(demoPlan), target: null };
    expect(() => correctPlan(sys, noTarget)).toThrow(/plan.target/);
  });
});
