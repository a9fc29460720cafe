import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../core/conic/evaluate.ts';
import { InputError } from '../../../core/math/index.ts';
import type { Plan, PlanEvent, Vehicle } from '../../../core/plan/plan.ts';
import { burnsNotFlown, scheduleBudget, truthReport } from '../../../core/target/index.ts';
import { MU_EARTH, R_EARTH, impulsive, plan, stateStart, testSystem } from '../plan/helpers.ts';

const sys = testSystem();
/** Standard gravity, m/s² (exact by definition, CGPM 1901). */
const g0 = 9.80665;

/** Two stages: the lower one for the first burn, dropped by a staging, the upper one for the second. */
const twoStage: Vehicle = {
  name: 'two-stage test ship',
  payloadMass: 1000,
  stages: [
    { name: 'lower', dryMass: 2000, propellantMass: 10000, isp: 300, thrust: 50e3 },
    { name: 'upper', dryMass: 500, propellantMass: 3000, isp: 320, thrust: 5e3 },
  ],
};

const R0 = R_EARTH + 300e3;
const V0 = Math.sqrt(MU_EARTH / R0);
const DV1 = 1000;
const DV2 = 400;
const T2 = 86400;

/**
 * A 300 km circular orbit of loam; at t = 60 s a 1 km/s retrograde burn drops the periapsis far
 * below the surface (the ship hits loam within the hour), then a staging, and a day later a
 * finite burn of 400 m/s on the upper stage that no flight of this path ever reaches.
 */
function impactingSchedule(): Plan {
  const second: PlanEvent = { ...impulsive('second', T2, [0, 0, DV2], 'inertial'), mode: 'finite', pointing: 'inertial' } as PlanEvent;
  return plan(
    stateStart('loam', [R0, 0, 0], [0, V0, 0]),
    [impulsive('first', 60, [0, -DV1, 0], 'inertial'), { type: 'stage', id: 'drop', name: 'drop lower' }, second],
    { vehicle: twoStage, reserve: { percent: 10, absolute: 50 }, end: T2 + 3600 },
  );
}

describe('scheduleBudget', () => {
  it('counts every burn of a schedule whose patched-conic reading hits the planet before the last, by the rocket equation', () => {
    const p = impactingSchedule();
    const conic = evaluate(sys, p, { samplesPerSegment: 0 });
    // the premise: the patched-conic reading ends at the impact, with the first burn only
    expect(conic.events.some((e) => e.kind === 'impact')).toBe(true);
    expect(conic.budget.rows.map((r) => r.planEventId)).toEqual(['first']);
    expect(burnsNotFlown(p, conic)).toEqual([{ id: 'second', name: 'second' }]);

    const b = scheduleBudget(p, conic);
    expect(b.rows.map((r) => r.planEventId)).toEqual(['first', 'second']);

    // Tsiolkovsky written out: Δv = Isp·g0·ln(m0/m1), so m1 = m0·exp(−Δv/(Isp·g0))
    const c1 = 300 * g0;
    const c2 = 320 * g0;
    const m0 = 1000 + 2000 + 10000 + 500 + 3000;
    const m1 = m0 * Math.exp(-DV1 / c1);
    const p1 = m0 - m1;
    // the staging drops the lower stage with what propellant it has left
    const mB = m1 - 2000 - (10000 - p1);
    const m2 = mB * Math.exp(-DV2 / c2);
    const p2 = mB - m2;
    const upperLeft = 3000 - p2;
    const dvLeft = c2 * Math.log(m2 / (m2 - upperLeft));
    const capacity = c1 * Math.log(m0 / (m0 - 10000)) + c2 * Math.log(4500 / (4500 - 3000));
    const reserve = 0.1 * (DV1 + DV2) + 50;
    // mass flow F/c: the finite burn lasts its propellant over it
    const duration2 = p2 / (5e3 / c2);

    // relative 1e-12: a handful of logs and exponentials in double precision (≈ 1e-15 each), far
    // below any figure shown (0.1 m/s, 1 kg)
    const close = (got: number, want: number) => expect(Math.abs(got - want)).toBeLessThanOrEqual(1e-12 * Math.abs(want));
    close(b.rows[0].dv, DV1);
    close(b.rows[1].dv, DV2);
    close(b.total, DV1 + DV2);
    close(b.rows[0].propellantUsed, p1);
    close(b.rows[1].massBefore, mB);
    close(b.rows[1].propellantUsed, p2);
    close(b.rows[1].duration, duration2);
    close(b.rows[1].tStart, T2 - duration2 / 2);
    close(b.propellantUsed, p1 + p2);
    close(b.finalMass, m2);
    close(b.capacity, capacity);
    close(b.dvLeft, dvLeft);
    close(b.reserve, reserve);
    close(b.margin, dvLeft - reserve);
    expect(b.rows[1].stages).toEqual(['upper']);
    expect(b.failedBurns).toEqual([]);
    // the patched-conic reading's budget leaves the second burn out and flatters the margin
    expect(conic.budget.margin).toBeGreaterThan(b.margin + 300);
    // the path figures exist only where the patched conics flew the burn
    expect(b.rows[0].periodFraction).not.toBeNull();
    expect(b.rows[1].periodFraction).toBeNull();
    expect(b.rows[1].gravityLoss).toBeNull();
  });

  it('names a burn the propellant cannot deliver, and the missing Δv takes the margin below zero', () => {
    const p = impactingSchedule();
    const last = p.events[2];
    if (last.type !== 'burn') throw new Error('the third event is a burn');
    last.dv = [0, 0, 4000];
    const b = scheduleBudget(p);
    // after the staging the ship is the payload and the full upper stage, 4500 kg, of which 3000 kg
    // propellant: it delivers 320·g0·ln(4500/1500) ≈ 3.45 km/s of the 4 km/s asked
    const deliverable = 320 * g0 * Math.log(4500 / 1500);
    // relative 1e-12 of 4 km/s: rounding of the logs and exponentials only
    expect(Math.abs((b.rows[1].dvMissing ?? 0) - (4000 - deliverable))).toBeLessThan(1e-12 * 4000);
    expect(b.rows[1].flags.map((f) => [f.code, f.severity])).toEqual([['out-of-propellant', 'error']]);
    expect(b.margin).toBeLessThan(0);
  });

  it('refuses a plan that is not a timed schedule (a burn at the end of a coast)', () => {
    const p = impactingSchedule();
    p.events[0] = impulsive('first', null, [0, -DV1, 0], 'inertial');
    expect(() => scheduleBudget(p)).toThrow(InputError);
  });
});

describe('truthReport in n-body of a plan whose patched-conic reading ends early', () => {
  it('reads the budget from the schedule (both burns), and says the patched-conic reading is a comparison only', () => {
    const p = { ...impactingSchedule(), truthModel: 'nbody' as const };
    const r = truthReport(sys, p, { samples: false });
    expect(r.model).toBe('nbody');
    expect(r.conic.budget.rows).toHaveLength(1);
    expect(r.budget.rows.map((row) => row.planEventId)).toEqual(['first', 'second']);
    expect(r.budget.margin).toBe(scheduleBudget(p, r.conic).margin);
    expect(r.notes.some((n) => /^the patched-conic reading of the schedule hits Loam on day 0\.\d\d, before second: a comparison only/.test(n))).toBe(true);
  });

  it('a plan not yet a schedule whose patched-conic flight never reaches a burn: no fixed Δv for it, said in words, no error', () => {
    const p = impactingSchedule();
    // the same burns in the velocity frame: freezing takes each burn's vector from the patched-conic flight, which stops at the impact
    p.events[0] = impulsive('first', 60, [-DV1, 0, 0], 'vnb');
    p.events[2] = { ...impulsive('second', T2, [DV2, 0, 0], 'vnb'), mode: 'finite', pointing: 'velocity' } as PlanEvent;
    const r = truthReport(sys, { ...p, truthModel: 'nbody' }, { samples: false });
    expect(r.budget.rows.map((row) => row.planEventId)).toEqual(['first']);
    expect(r.notes.some((n) => /^the patched-conic flight hits Loam on day 0\.\d\d, before second: it has no fixed Δv to fly or count/.test(n))).toBe(true);
  });
});
