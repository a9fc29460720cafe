/**
 * Numerical robustness of the plan evaluation: the CI budget of the evaluation fuzz target
 * (random plans in memory, flown in the demo system and in random variants of it), plans that
 * exhaust every stage, coasts that never reach their condition, unreachable targets — each a
 * result with flags, never an exception — and the cases that failed once, kept as regressions.
 */
import { describe, expect, it } from 'vitest';
import { evaluate } from '../../core/conic/evaluate.ts';
import type { Plan, PlanEvent } from '../../core/plan/plan.ts';
import type { PlanResult } from '../../core/plan/result.ts';
import { conicInfo, MIN_EVENT_DT } from '../../core/conic/soiCrossing.ts';
import { propagateKepler } from '../../core/orbit/kepler.ts';
import { clonePlan, demoPlan } from '../fixtures/demoPlan.ts';
import { bigVehicle, MU_EARTH, MU_SUN, plan, R_EARTH, stateStart, testSystem } from '../core/plan/helpers.ts';
import { checkResult } from '../fuzz/evaluation.ts';
import { demoSystem } from '../fuzz/files.ts';
import { TARGETS } from '../fuzz/targets.ts';
import { count, runBudget } from './budget.ts';

const codes = (r: PlanResult) => r.flags.map((f) => f.code);
const coast = (id: string, until: Extract<PlanEvent, { type: 'coast' }>['until']): PlanEvent => ({ type: 'coast', id, name: id, until });
const tessel = () => demoSystem().bodies[demoSystem().indexById.tessel];

/** A 300 km circular orbit about Tessel in the demo system. */
function lowTesselStart(): Plan['start'] {
  return { kind: 'parking', body: 'tessel', epoch: 0, periapsisAltitude: 300e3, e: 0, i: 0.2, raan: 0, argp: 0, nu: 0 };
}

describe('evaluation, fuzzed', () => {
  it('every random plan evaluates to a finite, consistent result (or an InputError naming the field), within the case time', () => {
    const outcomes = runBudget(TARGETS.evaluate, 500);
    expect(count(outcomes, 'evaluated')).toBeGreaterThan(200);
  });
});

describe('plans that cannot be flown come back as results with flags', () => {
  it('burns that exhaust every stage: out of propellant, stages run dry, negative margin, Δv missing in the budget', () => {
    const p: Plan = {
      ...plan(lowTesselStart(), [
        {
          type: 'burn',
          id: 'big',
          name: 'Big burn',
          t: 600,
          frame: 'vnb',
          dv: [20_000, 0, 0],
          solve: { kind: 'fixed' },
          mode: 'impulsive',
          pointing: 'velocity',
        },
        { type: 'burn', id: 'more', name: 'More', t: 1200, frame: 'vnb', dv: [500, 0, 0], solve: { kind: 'fixed' }, mode: 'finite', pointing: 'velocity' },
        coast('after', { kind: 'duration', dt: 3600 }),
      ]),
      vehicle: {
        name: 'Small',
        payloadMass: 500,
        stages: [
          { name: 'One', dryMass: 300, propellantMass: 2000, isp: 300, thrust: 50e3 },
          { name: 'Two', dryMass: 100, propellantMass: 400, isp: 320, thrust: 5e3 },
        ],
      },
    };
    const r = evaluate(demoSystem(), p);
    checkResult(demoSystem(), r);
    expect(codes(r)).toContain('out-of-propellant');
    expect(codes(r)).toContain('stage-dry-mid-burn');
    expect(codes(r)).toContain('negative-margin');
    expect(r.budget.rows[0].dvMissing).toBeGreaterThan(10_000);
    expect(r.budget.rows[1].dv).toBeGreaterThan(0);
    expect(r.budget.rows[1].dvMissing).toBeCloseTo(r.budget.rows[1].dv, 6); // nothing left to fire
    expect(r.budget.dvLeft).toBe(0);
  });

  it('a coast until apoapsis on a hyperbola (escaping the star) stops at the evaluation limit with condition-not-met', () => {
    const system = testSystem();
    const r0 = 2e11;
    const vEsc = Math.sqrt((2 * MU_SUN) / r0);
    const p = plan(stateStart('sun', [r0, 0, 0], [0, 1.3 * vEsc, 0]), [coast('to-apo', { kind: 'apoapsis' })]);
    const r = evaluate(system, p, { maxDuration: 1e8 });
    checkResult(system, r);
    expect(codes(r)).toEqual(['condition-not-met']);
    expect(r.t1 - r.t0).toBeCloseTo(1e8, 3);
  });

  it('a coast until an altitude the orbit never reaches stops at the limit with condition-not-met', () => {
    const p = plan(lowTesselStart(), [coast('high', { kind: 'altitude', altitude: 10_000e3 })]);
    const r = evaluate(demoSystem(), p, { maxDuration: 5e6 });
    checkResult(demoSystem(), r);
    expect(codes(r)).toContain('condition-not-met');
    expect(r.events.some((e) => e.kind === 'altitude')).toBe(false);
  });

  it('an unreachable target: a transfer to Ochre in one minute is out of propellant, the target is missed, the result is finite', () => {
    const p: Plan = {
      ...plan(lowTesselStart(), [
        {
          type: 'burn',
          id: 'go',
          name: 'Go',
          t: 1000,
          frame: 'vnb',
          dv: [0, 0, 0],
          solve: { kind: 'transfer', to: 'ochre', arrive: 1060 },
          mode: 'impulsive',
          pointing: 'velocity',
        },
        coast('cruise', { kind: 'duration', dt: 86400 }),
      ]),
      vehicle: bigVehicle,
      target: { body: 'ochre', periapsisAltitude: 400e3, e: 0.1, apoapsisAltitude: null, i: null, tolerance: { periapsisAltitude: 10e3, e: 0.01, i: 0.01 } },
    };
    const r = evaluate(demoSystem(), p);
    checkResult(demoSystem(), r);
    expect(codes(r)).toContain('target-missed');
    expect(codes(r).some((c) => c === 'out-of-propellant' || c === 'solve-failed')).toBe(true);
    expect(r.target?.reached).toBe(false);
  });
});

describe('evaluation: cases kept as regressions', () => {
  it("regression (a timed coast to exactly the SOI exit time left the ship on Tessel's conic: exit 3 days late, margin −48,626 m/s): the next coast leaves at once", () => {
    const system = demoSystem();
    const base = evaluate(system, demoPlan);
    const exit = base.events.find((e) => e.kind === 'soi-exit')!;
    const p = clonePlan(demoPlan);
    const k = p.events.findIndex((e) => e.id === 'leave-soi');
    p.events[k] = coast('leave-soi', { kind: 'time', t: exit.t });
    const r = evaluate(system, p);
    checkResult(system, r);
    const e2 = r.events.find((e) => e.kind === 'soi-exit')!;
    expect(e2.t).toBeCloseTo(exit.t, 3);
    expect(r.events.find((e) => e.kind === 'soi-entry')!.t).toBeCloseTo(base.events.find((e) => e.kind === 'soi-entry')!.t, 0);
    expect(r.budget.margin).toBeCloseTo(base.budget.margin, 3);
    expect(r.flags).toEqual(base.flags);
  });

  it('the rule behind it: within the distance flown in MIN_EVENT_DT of the SOI surface, moving out, the ship leaves at once', () => {
    const b = tessel();
    const R = b.derived.soiRadius;
    const v = 3000;
    const r0 = R - 0.5 * v * MIN_EVENT_DT;
    const r = evaluate(demoSystem(), plan(stateStart('tessel', [r0, 0, 0], [v, 0, 0], 5000), [coast('go', { kind: 'duration', dt: 1000 })]));
    expect(r.events.find((e) => e.kind === 'soi-exit')!.t).toBe(5000);
    // and at the surface, moving in: the impact is now
    const s0 = b.radius + 0.5 * v * MIN_EVENT_DT;
    const hit = evaluate(demoSystem(), plan(stateStart('tessel', [0, s0, 0], [0, -v, 0], 5000), [coast('go', { kind: 'duration', dt: 1000 })]));
    expect(hit.events.find((e) => e.kind === 'impact')!.t).toBe(5000);
  });

  it('regression (same, at the SOI entry into Ochre): a timed coast to exactly the entry time changes nothing', () => {
    const system = demoSystem();
    const base = evaluate(system, demoPlan);
    const entry = base.events.find((e) => e.kind === 'soi-entry')!;
    const p = clonePlan(demoPlan);
    p.events.splice(
      p.events.findIndex((e) => e.id === 'approach'),
      0,
      coast('to-entry', { kind: 'time', t: entry.t }),
    );
    const r = evaluate(system, p);
    expect(r.budget.margin).toBeCloseTo(base.budget.margin, 3);
    expect(r.events.filter((e) => e.kind === 'soi-entry' || e.kind === 'soi-exit')).toHaveLength(2);
  });

  it('regression (same class, at the surface): a timed coast to exactly the impact time ends in the impact there, not a period later', () => {
    const system = testSystem();
    // an ellipse about Loam whose periapsis is below the surface
    const r0 = 3 * R_EARTH;
    const s = [r0, 0, 0, 0, 0.4 * Math.sqrt(MU_EARTH / r0), 0];
    const first = evaluate(system, plan(stateStart('loam', s.slice(0, 3), s.slice(3)), [coast('fall', { kind: 'duration', dt: 1e6 })]));
    const hit = first.events.find((e) => e.kind === 'impact')!;
    expect(hit).toBeDefined();
    const p = plan(stateStart('loam', s.slice(0, 3), s.slice(3)), [coast('to-hit', { kind: 'time', t: hit.t }), coast('after', { kind: 'duration', dt: 1e6 })]);
    const r = evaluate(system, p);
    checkResult(system, r);
    expect(r.events.filter((e) => e.kind === 'impact')).toHaveLength(1);
    expect(r.events.find((e) => e.kind === 'impact')!.t).toBeCloseTo(hit.t, 3);
  });

  it('regression (a ship at rest above Tessel: the true anomaly is undefined, no impact was found and the SOI search stepped 1 ms at a time for ~10⁹ s — a hang): it falls and hits at the time of the radial free fall (analytic)', () => {
    const r0 = 2e7;
    const body = tessel();
    const r = evaluate(demoSystem(), plan(stateStart('tessel', [0, 0, r0], [0, 0, 0]), [coast('drop', { kind: 'duration', dt: 1e6 })]));
    checkResult(demoSystem(), r);
    const hit = r.events.find((e) => e.kind === 'impact')!;
    // t = √(r0³/2μ)·(√(x(1−x)) + acos √x), x = R/r0 (radial Kepler problem; Bate, Mueller & White, ch. 4, from memory)
    const x = body.radius / r0;
    const t = Math.sqrt(r0 ** 3 / (2 * body.mu)) * (Math.sqrt(x * (1 - x)) + Math.acos(Math.sqrt(x)));
    expect(Math.abs(hit.t - t) / t).toBeLessThan(1e-6);
    expect(codes(r)).toContain('impact');
  });

  it("regression (found by the plan fuzz: a nearly radial climb at escape speed, e rounding to 1 — a hang): it leaves Tessel's SOI where the conic reaches the SOI radius", () => {
    const st = [2312.992315188933, -969.9591065495925, 10982653.152916007, 1.5551379147598166, -0.6521509701767493, 7384.17512699821];
    const r = evaluate(demoSystem(), plan(stateStart('tessel', st.slice(0, 3), st.slice(3)), [coast('out', { kind: 'soi-change' })]));
    checkResult(demoSystem(), r);
    const exit = r.events.find((e) => e.kind === 'soi-exit')!;
    const at = propagateKepler(tessel().mu, st, exit.t - r.t0);
    expect(Math.hypot(at[0], at[1], at[2]) / tessel().derived.soiRadius).toBeCloseTo(1, 9);
  });

  it('regression (exactly radial states: the orbit normal was NaN and conicInfo threw InputError "nu must be a finite number" from inside evaluate): defined and flown', () => {
    const st = [-3194221.43073807, 14898099.859619489, -6812925.790866, 979.1358854000332, -4566.766742109061, 2088.390010226349];
    const c = conicInfo(3e14, st);
    expect(c.h).toBe(0);
    expect(Number.isFinite(c.nu) && Number.isFinite(c.Q[0] + c.Q[1] + c.Q[2])).toBe(true);
    const r = evaluate(
      demoSystem(),
      plan(stateStart('tessel', st.slice(0, 3), st.slice(3)), [coast('a', { kind: 'apoapsis' }), coast('b', { kind: 'duration', dt: 1e5 })]),
    );
    checkResult(demoSystem(), r);
  });

  it('regression (found by the evaluation fuzz: coast until periapsis on a fall from rest polished the periapsis at the centre — SolverError escaped): the impact comes first', () => {
    const r = evaluate(demoSystem(), plan(stateStart('tessel', [-4.294e8 / 60, -5.7e8 / 60, 1.13e8 / 60], [0, 0, 0]), [coast('peri', { kind: 'periapsis' })]));
    checkResult(demoSystem(), r);
    expect(codes(r)).toContain('impact');
    expect(r.events.some((e) => e.kind === 'periapsis')).toBe(false);
  });
});
