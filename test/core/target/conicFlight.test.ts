import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../core/conic/index.ts';
import type { Plan } from '../../../core/plan/index.ts';
import { applyControls, burnControls, conicFlight, goalsFromTarget, planGoalValue, solveTargets } from '../../../core/target/index.ts';
import type { PlanGoal } from '../../../core/target/index.ts';
import { MU_EARTH, R_EARTH, impulsive, plan, testSystem } from '../plan/helpers.ts';

const DEG = Math.PI / 180;

/** A circular 300 km orbit about loam (Earth-like), one burn at the start, then a short coast. */
function raisePlan(): Plan {
  return plan(
    { kind: 'parking', body: 'loam', epoch: 0, periapsisAltitude: 300e3, e: 0, i: 28 * DEG, raan: 0, argp: 0, nu: 0 },
    [impulsive('raise', null, [0, 0, 0]), { type: 'coast', id: 'after', name: 'after', until: { kind: 'duration', dt: 600 } }],
    {
      target: {
        body: 'loam',
        periapsisAltitude: 300e3,
        e: null,
        apoapsisAltitude: 1000e3,
        i: null,
        tolerance: { periapsisAltitude: 1e3, e: 0.01, i: 0.1 * DEG },
      },
    },
  );
}

describe('conicFlight + solveTargets on a plan', () => {
  it('an apoapsis raise converges to the vis-viva Δv (Curtis, Orbital Mechanics for Engineering Students, §6.2 Hohmann first burn)', () => {
    const system = testSystem();
    const p = raisePlan();
    const before = structuredClone(p);
    const { controls, x0 } = burnControls(p, 'raise', 10);
    // 1 cm on the apoapsis: far above the conic evaluation's rounding (~1e-8 m at 7e6 m), and
    // at ∂Δv/∂r_a ≈ 0.26 m/s per km it pins the Δv to ~2.6e-6 m/s
    const goals: PlanGoal[] = [{ kind: 'apoapsis-altitude', name: 'apoapsis altitude', wanted: 1000e3, tolerance: 0.01, units: 'km', unitScale: 1000 }];
    const res = solveTargets([controls[0]], goals, conicFlight(system, p, [controls[0]], goals), { x0: [x0[0] + 50] });
    expect(res.status).toBe('converged');
    const r1 = R_EARTH + 300e3;
    const r2 = R_EARTH + 1000e3;
    const visViva = Math.sqrt(MU_EARTH / r1) * (Math.sqrt((2 * r2) / (r1 + r2)) - 1);
    // the goal's 1 cm maps to 0.01 m × 2.6e-4 (m/s)/m ≈ 2.6e-6 m/s (1.6e-6 m/s measured)
    expect(Math.abs(res.x[0] - visViva)).toBeLessThanOrEqual(3e-6);
    // the plan given is never changed
    expect(p).toEqual(before);
    // a smooth one-unknown problem: Newton needs a few iterations (each 1 Jacobian flight + ≥ 1 trial)
    expect(res.iterations).toBeLessThanOrEqual(6);
  });

  it('a pure plane change (V and N components, inclination and eccentricity goals) converges to 2·v·sin(Δi/2) (Curtis §6.12)', () => {
    const system = testSystem();
    const p = raisePlan();
    p.target = {
      body: 'loam',
      periapsisAltitude: 300e3,
      e: null,
      apoapsisAltitude: null,
      i: 33 * DEG,
      tolerance: { periapsisAltitude: 1e3, e: 1e-11, i: 1e-11 },
    };
    const { controls } = burnControls(p, 'raise', 100);
    const use = [controls[0], controls[1]];
    // 1e-11 rad in inclination ≈ 7.7e-8 m/s of Δv at 7.7 km/s; e ≤ 1e-11 keeps the speed circular to
    // ~1e-11 relative: both well above the rounding of elements from a state (~1e-15), so reachable
    const goals: PlanGoal[] = [
      { kind: 'inclination', name: 'inclination', wanted: 33 * DEG, tolerance: 1e-11, units: '°', unitScale: DEG },
      { kind: 'eccentricity', name: 'eccentricity', wanted: 0, tolerance: 1e-11 },
    ];
    // starting guess: the normal component alone, 10% short, no along-track part
    const v = Math.sqrt(MU_EARTH / (R_EARTH + 300e3));
    const res = solveTargets(use, goals, conicFlight(system, p, use, goals), { x0: [0, 0.9 * v * Math.sin(5 * DEG)] });
    expect(res.status).toBe('converged');
    const dv = Math.hypot(res.x[0], res.x[1]);
    // |Δv| error ≤ v·(1e-11 rad) + v·(1e-11 in e) ≈ 1.5e-7 m/s
    expect(Math.abs(dv - 2 * v * Math.sin((5 * DEG) / 2))).toBeLessThanOrEqual(2 * v * 1e-11);
    // Newton on a smooth 2×2 map from 10% off: a few iterations
    expect(res.iterations).toBeLessThanOrEqual(5);
  });

  it('a coplanar circular-to-circular transfer from a perturbed guess converges to the Hohmann Δv (Curtis §6.2)', () => {
    const system = testSystem();
    // 300 km circular → burn prograde → coast to apoapsis → burn prograde → 1,000 km circular
    const p = plan(
      { kind: 'parking', body: 'loam', epoch: 0, periapsisAltitude: 300e3, e: 0, i: 0, raan: 0, argp: 0, nu: 0 },
      [
        impulsive('first', null, [0, 0, 0]),
        { type: 'coast', id: 'up', name: 'up', until: { kind: 'apoapsis' } },
        impulsive('second', null, [0, 0, 0]),
        { type: 'coast', id: 'after', name: 'after', until: { kind: 'duration', dt: 600 } },
      ],
      {
        target: { body: 'loam', periapsisAltitude: 1000e3, e: null, apoapsisAltitude: 1000e3, i: null, tolerance: { periapsisAltitude: 1e-3, e: 1, i: 1 } },
      },
    );
    const use = [burnControls(p, 'first', 10).controls[0], burnControls(p, 'second', 10).controls[0]];
    // 1 mm on both apsides (rounding at 7e6 m is ~1e-9 m): ≈ 2.6e-7 m/s per burn at ~0.26 m/s per km
    const goals = goalsFromTarget(p);
    const r1 = R_EARTH + 300e3;
    const r2 = R_EARTH + 1000e3;
    const dv1 = Math.sqrt(MU_EARTH / r1) * (Math.sqrt((2 * r2) / (r1 + r2)) - 1);
    const dv2 = Math.sqrt(MU_EARTH / r2) * (1 - Math.sqrt((2 * r1) / (r1 + r2)));
    // 20% off each burn
    const res = solveTargets(use, goals, conicFlight(system, p, use, goals), { x0: [1.2 * dv1, 0.8 * dv2] });
    expect(res.status).toBe('converged');
    // each apsis within 1 mm bounds each burn to ~2.6e-7 m/s, and each burn moves both apsides:
    // 1e-6 m/s allows the two to add up (3e-8 and 1e-8 m/s measured)
    expect(Math.abs(res.x[0] - dv1)).toBeLessThanOrEqual(1e-6);
    expect(Math.abs(res.x[1] - dv2)).toBeLessThanOrEqual(1e-6);
    // Newton on a smooth 2×2 map from 20% off: 3 iterations measured
    expect(res.iterations).toBeLessThanOrEqual(5);
  });

  it('an unreachable goal (periapsis at the surface with the burn bounded to 50 m/s retrograde) stops at the bound and says so', () => {
    const system = testSystem();
    const p = raisePlan();
    p.target = { body: 'loam', periapsisAltitude: 0, e: null, apoapsisAltitude: null, i: null, tolerance: { periapsisAltitude: 1e3, e: 1, i: 1 } };
    // lowering the periapsis from 300 km to the surface takes ≈ 87 m/s retrograde (vis-viva); only 50 are allowed
    const prograde = { ...burnControls(p, 'raise', 10).controls[0], lower: -50, upper: 0 };
    const goals = goalsFromTarget(p);
    const res = solveTargets([prograde], goals, conicFlight(system, p, [prograde], goals), { x0: [-10] });
    expect(res.status).toBe('stalled');
    expect(res.x[0]).toBe(-50);
    expect(res.message).toContain('"periapsis altitude at loam" is');
    expect(res.message).toContain('wanted 0 km within ±1 km');
    expect(res.message).toContain('"raise Δv prograde" at its lower bound -50 m/s');
    expect(res.values.every((v) => Number.isFinite(v))).toBe(true);
    // the first step reaches the bound, the second iteration finds it held there: 4 flights measured
    expect(res.flights).toBeLessThanOrEqual(6);
  });

  it('a goal the flight cannot give (an open final orbit has no apoapsis) is a flight failure with the reason', () => {
    const system = testSystem();
    const p = raisePlan();
    const { controls } = burnControls(p, 'raise', 10);
    const goals: PlanGoal[] = [{ kind: 'apoapsis-altitude', name: 'apoapsis altitude', wanted: 1000e3, tolerance: 1 }];
    // 4 km/s prograde from 7.7 km/s circular exceeds escape (√2 · 7.7 ≈ 10.9 km/s)
    const res = solveTargets([controls[0]], goals, conicFlight(system, p, [controls[0]], goals), { x0: [4000] });
    expect(res.status).toBe('flight-failed');
    expect(res.message).toMatch(/open .*no apoapsis/);
    const result = evaluate(system, applyControls(p, [controls[0]], [4000]));
    expect(() => planGoalValue(system, result, goals[0])).toThrow(/no apoapsis/);
  });
});
