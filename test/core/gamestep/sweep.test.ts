import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import { gameStepCheck } from '../../../core/gamestep/check.ts';
import { gameStepSweep } from '../../../core/gamestep/sweep.ts';
import { elementsToState } from '../../../core/orbit/elements.ts';
import { MU_EARTH, plan, stateStart, testSystem } from '../plan/helpers.ts';

const system = testSystem();
const A = 8750e3;
const PERIOD = 2 * Math.PI * Math.sqrt(A ** 3 / MU_EARTH);
const S0 = Array.from(elementsToState(MU_EARTH, { a: A, e: 0.2, i: 0.3, raan: 0.2, argp: 0.5, nu: 1 }));
const coast = plan(stateStart('loam', S0.slice(0, 3), S0.slice(3)), [{ type: 'coast', id: 'c', name: 'coast', until: { kind: 'duration', dt: 5 * PERIOD } }]);

describe('game-step sweep', () => {
  const dt = PERIOD / 8192;
  const sweep = gameStepSweep(system, coast, { physics: { integrator: 'rk4', dt: PERIOD / 1024 }, tolerance: 1000, dtMax: PERIOD / 16 });
  const ladder = gameStepSweep(system, coast, { physics: { integrator: 'verlet', dt }, tolerance: 1000, dtMax: PERIOD / 16, precisionCheck: false });

  it('finds the largest passing step per integrator, trying the ladder from the top', () => {
    expect(ladder.ladder.length).toBe(10); // T/8192 … T/16
    for (const b of ladder.best) {
      const rows = ladder.rows.filter((r) => r.integrator === b.integrator);
      // tried from the largest step down, each row failing until the one that passes
      for (let k = 1; k < rows.length; k++) expect(rows[k].dt).toBeLessThan(rows[k - 1].dt);
      for (let k = 0; k < rows.length - 1; k++) expect(rows[k].passes).toBe(false);
      if (b.dt !== null) {
        expect(rows[rows.length - 1].passes).toBe(true);
        expect(rows[rows.length - 1].dt).toBe(b.dt);
        // independent re-run at that step passes, and at twice the step fails
        expect(gameStepCheck(system, coast, { physics: { integrator: b.integrator, dt: b.dt }, tolerance: 1000 }).passes).toBe(true);
        if (b.dt * 2 <= ladder.ladder[ladder.ladder.length - 1]) {
          expect(gameStepCheck(system, coast, { physics: { integrator: b.integrator, dt: b.dt * 2 }, tolerance: 1000 }).passes).toBe(false);
        }
      } else {
        expect(rows.length).toBe(ladder.ladder.length);
      }
    }
  });

  it('ranks the methods as their orders predict (common practice)', () => {
    const best = Object.fromEntries(ladder.best.map((b) => [b.integrator, b.dt]));
    expect(best['explicit-euler']).toBeNull(); // its energy grows every orbit at any of these steps
    expect(best['rk4']).not.toBeNull();
    expect(best['verlet']).not.toBeNull();
    expect(best['rk4'] as number).toBeGreaterThan(best['verlet'] as number);
    expect(best['verlet'] as number).toBeGreaterThan((best['symplectic-euler'] as number | null) ?? 0);
    const c = ladder.cheapest!;
    for (const b of ladder.best) if (b.missionEvals !== null) expect(c.missionEvals).toBeLessThanOrEqual(b.missionEvals);
  });

  it('compares float64, float32 and float32 with a floating origin at the game step', () => {
    const p = sweep.precision!;
    expect(p.rows.map((r) => [r.precision, r.rebase !== null])).toEqual([
      ['float64', false],
      ['float32', false],
      ['float32', true],
    ]);
    expect(p.rows[0].passes).toBe(true);
    expect(p.rows[1].arrivalMiss as number).toBeGreaterThan(p.rows[0].arrivalMiss as number);
    expect(p.float32.length).toBe(1);
    expect(p.float32[0].spacing).toBe(1); // ulp32 of ~8,000–10,500 km from loam's centre
    const v = p.verdict;
    expect(v).toBe(p.rows[1].passes ? 'float32' : p.rows[2].passes ? 'float32-rebase' : 'float64');
  });

  it('rejects a ladder top below the step', () => {
    expect(() => gameStepSweep(system, coast, { physics: { integrator: 'verlet', dt: 10 }, dtMax: 5 })).toThrow(InputError);
  });
});
