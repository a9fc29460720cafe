import { beforeAll, describe, expect, it } from 'vitest';
import { isSchedule, targetPlan, truthReport, type TargetResult, type TruthReport } from '../../../core/target/index.ts';
import { evaluate } from '../../../core/conic/evaluate.ts';
import { flybyPlan } from '../../fixtures/flybyPlan.ts';
import { demoSystem } from '../plan/helpers.ts';

const sys = demoSystem();
/** The flyby demo splits where the ship enters a sphere and burns there (legs.ts): the periapsis burn at Moravel, the capture at Fennick. */
const LEGS = ['arrival at Moravel', 'arrival at Fennick', 'final orbit about Fennick'];

/**
 * The flyby demo (test/fixtures/flybyPlan.ts) targeted leg by leg: the Moravel pass as an arrival
 * leg (its B-plane point and periapsis time, met with the burns before it), then the arrival at
 * Fennick and the final orbit. Bounded by work: at most 200 flights per leg (the n-body run took
 * 153 in all when written).
 */
describe('the flyby demo targeted', () => {
  it('in patched conics: the plan already meets every goal (no step taken)', () => {
    const r = targetPlan(sys, flybyPlan(sys), { model: 'conic', maxFlights: 200 });
    expect(r.status).toBe('met');
    expect(r.legs.map((l) => l.name)).toEqual(LEGS);
    expect(r.iterations).toBe(0);
    expect(Math.abs(r.dv.added)).toBeLessThan(1e-6);
  });

  describe('in n-body (the plan’s truth model)', () => {
    let r: TargetResult;
    let report: TruthReport;
    beforeAll(() => {
      r = targetPlan(sys, { ...flybyPlan(sys), truthModel: 'nbody' }, { maxFlights: 200 });
      report = truthReport(sys, r.plan, { samples: false });
    });

    it('meets the Moravel pass (B-plane and periapsis time), the Fennick arrival and the final orbit, with the margin holding', () => {
      expect(r.model).toBe('nbody');
      expect(r.status).toBe('met');
      expect(r.legs.map((l) => l.name)).toEqual(LEGS);
      expect(r.legs.map((l) => l.status)).toEqual(['converged', 'converged', 'converged']);
      for (const l of r.legs) for (const g of l.goals) expect(g.met, `${l.name}: ${g.name}`).toBe(true);
      expect(r.legs[0].goals.map((g) => g.name).some((n) => n.includes('B-plane'))).toBe(true);
      expect(isSchedule(r.plan)).toBe(true);
      expect(report.model).toBe('nbody');
      expect(report.reached).toBe(true);
      expect(report.failures).toEqual([]);
      expect(report.budget.margin).toBeGreaterThan(0);
      // untargeted, the patched-conic burns flown in n-body do not reach Fennick's orbit
      expect(truthReport(sys, { ...flybyPlan(sys), truthModel: 'nbody' }, { samples: false }).reached).toBe(false);
    });

    it('the targeted schedule still passes Moravel above its safe altitude in patched conics', () => {
      const c = evaluate(sys, r.plan, { samplesPerSegment: 0 });
      const pass = c.flybys?.[0];
      const m = sys.bodies.find((b) => b.id === 'moravel');
      expect(pass?.periapsisAltitude).toBeGreaterThan(m?.safeAlt ?? Infinity);
    });
  });

  it('unpowered in n-body: the pass with no burn inside Moravel’s sphere is a flyby leg (its B-plane point and periapsis time), then Fennick', () => {
    const plan = { ...flybyPlan(sys, false), truthModel: 'nbody' as const };
    const r = targetPlan(sys, plan, { maxFlights: 200 });
    expect(r.status).toBe('met');
    expect(r.legs.map((l) => l.name)).toEqual(['flyby of Moravel', 'arrival at Fennick', 'final orbit about Fennick']);
    // the flyby leg is met with the burns before the pass only
    expect([...new Set(r.legs[0].controls.map((c) => c.burnId))]).toEqual(['departure', 'correction-1', 'flyby-aim']);
    for (const l of r.legs) for (const g of l.goals) expect(g.met, `${l.name}: ${g.name}`).toBe(true);
    const report = truthReport(sys, r.plan, { samples: false });
    expect(report.reached).toBe(true);
    expect(report.budget.margin).toBeGreaterThan(0);
    // without the flyby marker there is no leg at the pass (no burn inside the sphere)
    const unmarked = { ...plan, events: plan.events.filter((e) => e.type !== 'flyby') };
    const conic = targetPlan(sys, unmarked, { model: 'conic', maxFlights: 200 });
    expect(conic.legs.map((l) => l.name)).toEqual(['arrival at Fennick', 'final orbit about Fennick']);
  });
});
