import { beforeAll, describe, expect, it } from 'vitest';
import { evaluate } from '../../../core/conic/evaluate.ts';
import { bodyState } from '../../../core/system/ephemeris.ts';
import { conicStart, type NBodyState } from '../../../core/nbody/index.ts';
import { flyModel, isSchedule, targetPlan, truthReport, type TargetResult, type TruthReport } from '../../../core/target/index.ts';
import { SKERRY_ORBIT_ALTITUDE, skerryPlan } from '../../fixtures/skerryPlan.ts';
import { flyStarCentred } from '../dynamics/starCentred.ts';
import { demoSystem } from '../plan/helpers.ts';
import { elements } from './elements.ts';

const sys = demoSystem();
const LEGS = ['arrival at Moravel', 'arrival at Skerry', 'final orbit about Skerry'];

/** A state relative to its origin body, made star-centred (the bodies on their conic ephemerides). */
function starCentred(s: NBodyState): number[] {
  const b6 = new Float64Array(6);
  bodyState(sys, s.origin, s.t, b6, 0);
  return [0, 1, 2, 3, 4, 5].map((i) => (i < 3 ? s.x[i] : s.v[i - 3]) + b6[i]);
}

/**
 * The moon demo (test/fixtures/skerryPlan.ts) targeted leg by leg: its arrival at Moravel, its
 * arrival at Skerry, then the final orbit about Skerry (issue 12's multi-leg plan).
 */
describe('the moon demo targeted in patched conics', () => {
  it('meets every goal at once: each of the three legs converges and the solved burns keep their Δv', () => {
    const r = targetPlan(sys, skerryPlan(), { model: 'conic' });
    expect(r.status).toBe('met');
    expect(r.legs.map((l) => l.name)).toEqual(LEGS);
    expect(r.legs.map((l) => l.status)).toEqual(['converged', 'converged', 'converged']);
    for (const l of r.legs) for (const g of l.goals) expect(g.met, `${l.name}: ${g.name}`).toBe(true);
    // the patched-conic reference is the plan's own flight: no step is taken, and the burns fixed
    // at the vectors their solves gave fly the same flight: the same Δv but for the
    // circularisation to e = 0, whose speed v_c(1 + √disc)^½ is solved where disc (1 − (1 − e²)/cos²γ
    // at a numerically found periapsis) is rounding, ~1e-16 to 1e-14: √disc/2 · 1.2 km/s is
    // 6e-6 to 6e-5 m/s (measured 1.3e-5 m/s)
    expect(r.iterations).toBe(0);
    expect(Math.abs(r.dv.added)).toBeLessThan(1e-4);
    const report = truthReport(sys, r.plan, { samples: false });
    expect(report.model).toBe('conic');
    expect(report.reached).toBe(true);
    expect(report.failures).toEqual([]);
  });
});

describe('the moon demo targeted in n-body', () => {
  let r: TargetResult;
  let report: TruthReport;
  beforeAll(() => {
    r = targetPlan(sys, skerryPlan(), { model: 'nbody' });
    report = truthReport(sys, r.plan, { samples: false });
  });

  it('meets the arrivals at Moravel and at Skerry and the final orbit leg by leg, with the margin holding, and the report says so in the n-body model', () => {
    expect(r.status).toBe('met');
    expect(r.legs.map((l) => l.name)).toEqual(LEGS);
    expect(r.legs.map((l) => l.status)).toEqual(['converged', 'converged', 'converged']);
    for (const l of r.legs) for (const g of l.goals) expect(g.met, `${l.name}: ${g.name}`).toBe(true);
    expect(isSchedule(r.plan)).toBe(true);
    expect(r.plan.truthModel).toBe('nbody');
    expect(report.model).toBe('nbody');
    expect(report.reached).toBe(true);
    // the vehicle carries enough for what n-body targeting adds (measured +371 m/s)
    expect(r.dv.added).toBeGreaterThan(0);
    expect(report.budget.margin).toBeGreaterThan(0);
    expect(report.failures).toEqual([]);
    // untargeted, the patched-conic burns flown in n-body do not reach the target orbit
    expect(truthReport(sys, { ...skerryPlan(), truthModel: 'nbody' }, { samples: false }).reached).toBe(false);
  });

  it('flown by odex through the star-centred equations written plainly (no shared code with the force model), the burns end in the 500 km circular orbit of Skerry', () => {
    const conic = evaluate(sys, r.plan, { samplesPerSegment: 0 });
    const start = conicStart(conic);
    const s0 = starCentred(start);
    const impulses = r.plan.events.flatMap((e) => (e.type === 'burn' ? [{ t: e.t as number, dv: e.dv }] : []));
    expect(impulses.length).toBe(6);
    // every burn is an inertial vector at a time: what odex flies is the plan as written
    expect(r.plan.events.every((e) => e.type !== 'burn' || (e.frame === 'inertial' && e.mode === 'impulsive'))).toBe(true);
    const tEnd = report.nbody?.t1 ?? NaN;
    expect(tEnd).toBeGreaterThan(impulses[5].t);
    // This path multiplies an error just after the departure about a thousandfold by Skerry: the
    // project's own flight at rtol 1e-10 and at 1e-13 differs by 0.25 m an hour before the
    // mid-course burn and by 0.86 km at Skerry's periapsis, and odex flown from the start lands
    // 0.06–1.3 km from the rtol-1e-13 flight there depending on its tolerance (1e-13…1e-15),
    // without converging. So odex checks the flight in two parts, split an hour before the
    // mid-course burn, outside Tessel's sphere of influence:
    const tc = impulses[1].t - 3600;
    const here = flyModel(sys, r.plan, 'nbody', { checkpoints: [tc] }).checkpoint(tc);
    expect(here).not.toBeNull();
    if (!here) return;
    const sc = starCentred(here);
    // 1. the parking orbit and the departure, from the start to there: odex and the project's flight
    //    agree to 10 m (measured 0.7 m at odex rtol 1e-14; odex's own results at rtol 1e-13…1e-15
    //    spread over 0.7–4.8 m from the project's, star-centred numbers holding the parking orbit to
    //    centimetres)
    const a = flyStarCentred(sys, start.t, s0, impulses, tc, 1e-14);
    expect(Math.hypot(a[0] - sc[0], a[1] - sc[1], a[2] - sc[2])).toBeLessThan(10);
    // 2. the other five burns and 842 days, from the project's state there to the end of the plan
    const end = flyStarCentred(sys, tc, sc, impulses, tEnd, 1e-14);
    const sk = sys.indexById.skerry;
    const b6 = new Float64Array(6);
    bodyState(sys, sk, tEnd, b6, 0);
    const el = elements(
      sys.bodies[sk].mu,
      end.map((x, i) => x - b6[i]),
    );
    // the targeter meets the final periapsis and apoapsis to 100 m; odex and the project's
    // integrator agree on this part to tens of metres: the project's flight at its default rtol
    // 1e-10 (DOP853, steps bounded by half Skerry's period) ends with its periapsis 34 m above its
    // own converged value (rtol 1e-12 and 1e-13, RK45 or DOP853: 499.9315 km, odex at rtol 1e-15
    // the same to 0.1 m; RK45 at 1e-10: 108 m below; without the step bound DOP853 at 1e-10
    // stepped over Skerry's pull in the cruise and odex's final periapsis here was 2.0 km from the
    // goal); measured: odex at 1e-14 40 m below the project's 499.966 km, e 2.4e-5 against 1.6e-5
    expect(Math.abs(el.rp - sys.bodies[sk].radius - SKERRY_ORBIT_ALTITUDE)).toBeLessThan(1e3);
    expect(el.e).toBeLessThan(1e-3);
    const achieved = report.achieved;
    expect(achieved).not.toBeNull();
    expect(Math.abs(el.rp - sys.bodies[sk].radius - (achieved?.periapsisAltitude ?? NaN))).toBeLessThan(100);
  });
});
