import { describe, expect, it } from 'vitest';
import { reserveFor, summarizeBudget } from '../../../core/plan/budget.ts';
import { evaluate } from '../../../core/conic/evaluate.ts';
import { G0 } from '../../../core/plan/rocket.ts';
import type { BudgetRow } from '../../../core/plan/result.ts';
import { demoPlan, heavyDemoPlan, longPatience } from '../../fixtures/demoPlan.ts';
import { demoSystem } from './helpers.ts';

function row(dv: number, propellantUsed: number, dvMissing = 0): BudgetRow {
  return {
    planEventId: 'x',
    name: 'x',
    t: 0,
    tStart: 0,
    tEnd: 0,
    dv,
    frame: 'vnb',
    dvFrame: [dv, 0, 0],
    dvInertial: [dv, 0, 0],
    duration: 0,
    propellantUsed,
    massBefore: 0,
    massAfter: 0,
    stages: [],
    dvLeft: 0,
    dvMissing,
    gravityLoss: null,
    periodFraction: null,
    flags: [],
  };
}

describe('reserve and margin arithmetic', () => {
  it('reserve = percent of the total + absolute; margin = Δv left − reserve (policy definition)', () => {
    // rows 1,200 + 300 + 500 = 2,000 m/s; 5 % → 100 m/s, + 40 m/s = 140 m/s; Δv left 400 → margin 260
    const { budget, flags } = summarizeBudget(
      [row(1200, 10), row(300, 2), row(500, 3)],
      { capacity: 2400, dvLeft: 400, finalMass: 900 },
      { percent: 5, absolute: 40 },
    );
    expect(budget.total).toBe(2000);
    expect(budget.reserve).toBeCloseTo(140, 12);
    expect(budget.margin).toBeCloseTo(260, 12);
    expect(budget.propellantUsed).toBe(15);
    expect(budget.capacity).toBe(2400);
    expect(flags).toEqual([]);
    expect(reserveFor({ percent: 10, absolute: 0 }, 1234)).toBeCloseTo(123.4, 12);
  });

  it('negative margin is an error flag; missing Δv counts against the margin', () => {
    const { budget, flags } = summarizeBudget([row(1000, 1, 150)], { capacity: 850, dvLeft: 0, finalMass: 1 }, { percent: 2, absolute: 10 });
    expect(budget.margin).toBeCloseTo(0 - 30 - 150, 12);
    expect(flags.map((f) => [f.code, f.severity])).toEqual([['negative-margin', 'error']]);
  });
});

describe('burns that failed to solve', () => {
  it('are listed with their row number; the margin arithmetic is unchanged', () => {
    const failed = { ...row(0, 0), planEventId: 'b2', name: 'Capture' };
    failed.flags = [{ code: 'solve-failed', severity: 'error', message: 'Capture: not solved', planEventId: 'b2' }];
    const { budget } = summarizeBudget([row(1200, 10), failed, row(500, 3)], { capacity: 2400, dvLeft: 400, finalMass: 900 }, { percent: 5, absolute: 40 });
    expect(budget.failedBurns).toEqual([{ planEventId: 'b2', name: 'Capture', row: 2 }]);
    // 1,700 m/s planned: reserve 5 % · 1,700 + 40 = 125 m/s; margin 400 − 125 = 275 m/s (policy definition)
    expect(budget.margin).toBeCloseTo(275, 12);
    const clean = summarizeBudget([row(1200, 10), row(500, 3)], { capacity: 2400, dvLeft: 400, finalMass: 900 }, { percent: 5, absolute: 40 }).budget;
    expect(clean.failedBurns).toEqual([]);
  });
});

describe('demo budgets', () => {
  const system = demoSystem();

  it('the demo plan: margin positive, recomputed by hand from the final mass (rocket equation)', () => {
    const res = evaluate(system, demoPlan);
    const b = res.budget;
    const total = b.rows.reduce((s, r) => s + r.dv, 0);
    expect(b.total).toBeCloseTo(total, 9);
    expect(b.reserve).toBeCloseTo(0.03 * total + 30, 9);
    // after the kick stage is dropped only the cruise stage is left: its remaining propellant is
    // final mass − payload − cruise dry mass; Δv left = Isp·g0·ln(m / (m − p))
    const m = b.finalMass;
    const p = m - longPatience.payloadMass - longPatience.stages[1].dryMass;
    const dvLeft = longPatience.stages[1].isp * G0 * Math.log(m / (m - p));
    expect(b.dvLeft).toBeCloseTo(dvLeft, 6);
    expect(b.margin).toBeCloseTo(dvLeft - (0.03 * total + 30), 6);
    expect(b.margin).toBeGreaterThan(0);
    expect(res.target?.reached).toBe(true);
    // rows chain: each burn starts at the mass the previous one (or the staging) left
    expect(b.rows[0].massBefore).toBeCloseTo(3000 + 2400 + 27000 + 1100 + 5200, 9);
    expect(b.rows[1].massBefore).toBeCloseTo(b.rows[0].massAfter - 2400 - (27000 - b.rows[0].propellantUsed), 6);
  });

  it('the heavy-payload plan: negative margin flagged', () => {
    const res = evaluate(system, heavyDemoPlan);
    expect(res.budget.margin).toBeLessThan(0);
    const f = res.flags.find((x) => x.code === 'negative-margin');
    expect(f?.severity).toBe('error');
    expect(f?.planEventId).toBeNull();
  });
});
