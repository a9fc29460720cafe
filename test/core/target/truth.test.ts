import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../core/conic/evaluate.ts';
import { truthReport } from '../../../core/target/index.ts';
import { demoPlan, heavyDemoPlan } from '../../fixtures/demoPlan.ts';
import { demoSystem } from '../plan/helpers.ts';

const sys = demoSystem();
const DEG = Math.PI / 180;

describe('truthReport', () => {
  it('in patched conics is the evaluation itself: the same budget and final orbit, every goal of the target judged with its own tolerances', () => {
    const r = truthReport(sys, demoPlan, { samples: false });
    const e = evaluate(sys, demoPlan, { samplesPerSegment: 0 });
    expect(r.model).toBe('conic');
    expect(r.nbody).toBeNull();
    expect(r.budget.margin).toBe(e.budget.margin);
    expect(r.achieved).toEqual(e.target?.achieved);
    expect(r.goals.map((g) => [g.name, g.wanted, g.tolerance])).toEqual([
      ['periapsis altitude about Ochre', 400e3, 10e3],
      ['apoapsis altitude about Ochre', 2000e3, 10e3],
      ['inclination about Ochre', 30 * DEG, 0.2 * DEG],
    ]);
    expect(r.reached).toBe(true);
    expect(r.marginHolds).toBe(true);
    expect(r.failures).toEqual([]);
  });

  it('names a negative margin in m/s (the heavy demo: the same flight, 0.6 t more payload)', () => {
    const r = truthReport(sys, heavyDemoPlan, { samples: false });
    expect(r.reached).toBe(true);
    expect(r.marginHolds).toBe(false);
    expect(r.failures[0]).toMatch(/^margin -\d+\.\d m\/s is below zero$/);
  });

  it('in n-body, a plan that is not yet a schedule is flown as the schedule of its patched-conic flight, says so, and names the miss', () => {
    const r = truthReport(sys, demoPlan, { model: 'nbody', samples: false });
    expect(r.nbody).not.toBeNull();
    expect(r.notes.some((n) => n.includes('burn schedule of its patched-conic flight'))).toBe(true);
    expect(r.reached).toBe(false);
    // millions of km off (verify.test.ts checks the miss against odex): the periapsis goal says so in km
    expect(r.failures.some((f) => /^periapsis altitude about Ochre is \d{7,}\.\d{3} km, wanted 400\.000 km ± 10\.000 km$/.test(f))).toBe(true);
    // the schedule's burns are the plan's: the same Δv
    expect(r.budget.total).toBeCloseTo(evaluate(sys, demoPlan, { samplesPerSegment: 0 }).budget.total, 6);
    // the schedule's patched-conic reading flies every burn here: the schedule's own budget is the
    // same bookkeeping of the same burns in the same order, to the last bit, and no note is added
    expect(r.conic.budget.rows).toHaveLength(r.budget.rows.length);
    expect(r.budget.margin).toBe(r.conic.budget.margin);
    expect(r.notes.some((n) => n.includes('patched-conic reading of the schedule'))).toBe(false);
  });
});

describe('truthReport with a burn that fails to solve', () => {
  it('the margin does not hold though it looks larger, and the failed solve is named', () => {
    const p = structuredClone(demoPlan);
    const trim = p.events.find((e) => e.id === 'trim');
    if (trim?.type !== 'burn') throw new Error('the demo has a trim burn');
    // an opposite apsis a million km below the centre: no burn along the velocity reaches it
    trim.solve = { kind: 'apsis', altitude: -1e9 };
    const solved = truthReport(sys, demoPlan, { samples: false });
    const r = truthReport(sys, p, { samples: false });
    expect(r.budget.failedBurns.map((b) => b.planEventId)).toEqual(['trim']);
    expect(r.budget.margin).toBeGreaterThan(solved.budget.margin);
    expect(r.marginHolds).toBe(false);
    expect(r.failures.some((f) => /trim|Apoapsis trim/i.test(f))).toBe(true);
  });
});
