import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../../core/conic/index.ts';
import type { BurnEvent, Plan } from '../../../../core/plan/index.ts';
import { marginView } from '../../../../app/renderer/budget/marginView.ts';
import { speed } from '../../../../app/renderer/format/format.ts';
import { clonePlan, demoPlan, heavyDemoPlan } from '../../../fixtures/demoPlan.ts';
import { demoSystem } from '../../../core/plan/helpers.ts';

/** The plan with its apoapsis trim asking for a transfer to Ochre while the ship already orbits Ochre: no solution. */
function unsolvableTrim(plan: Plan): Plan {
  const p = clonePlan(plan);
  const trim = p.events.find((e) => e.id === 'trim') as BurnEvent;
  trim.solve = { kind: 'transfer', to: 'ochre', arrive: 500 * 86400 };
  return p;
}

describe('the margin as the Budget shows it', () => {
  const system = demoSystem();

  it('a plan whose burns all solve: the margin figure itself, holding when ≥ 0', () => {
    const b = evaluate(system, demoPlan).budget;
    expect(b.failedBurns).toEqual([]);
    const v = marginView(b);
    expect(v).toMatchObject({ valid: true, holds: b.margin >= 0, text: speed(b.margin), reason: '' });
    expect(v.holds).toBe(true);
    const heavy = marginView(evaluate(system, heavyDemoPlan).budget);
    expect(heavy).toMatchObject({ valid: true, holds: false, tone: 'bad' });
  });

  it('a later burn that fails to solve: not valid, not holding, the burn named, though the number looks better', () => {
    const solved = evaluate(system, heavyDemoPlan).budget;
    const b = evaluate(system, unsolvableTrim(heavyDemoPlan)).budget;
    // the unsolved trim is flown as 0 m/s: more Δv is left over than in the solved plan
    expect(b.margin).toBeGreaterThan(solved.margin);
    expect(b.failedBurns).toEqual([{ planEventId: 'trim', name: 'Apoapsis trim', row: 5 }]);
    const v = marginView(b);
    expect(v).toMatchObject({ valid: false, holds: false, text: 'not valid', tone: 'bad' });
    expect(v.reason).toBe(`Apoapsis trim (burn 5) failed to solve: its Δv is not counted (${speed(b.margin)} without it)`);
  });
});
