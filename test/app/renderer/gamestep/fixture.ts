/**
 * One game-step check of the demo shared by the gamestep tests: velocity Verlet at 10 s with a
 * low step budget per span, so the long cruise is extrapolated (both bases appear) and the run
 * takes a fraction of a second.
 */
import { evaluate } from '../../../../core/conic/evaluate.ts';
import { gameStepCheck, type GameStepResult } from '../../../../core/gamestep/check.ts';
import { demoPlan } from '../../../fixtures/demoPlan.ts';
import { demoSystem } from '../../../core/plan/helpers.ts';

export const system = demoSystem();
export const plan = demoPlan;
export const planResult = evaluate(system, demoPlan);

let cached: GameStepResult | null = null;

export function demoCheck(): GameStepResult {
  if (!cached)
    cached = gameStepCheck(system, demoPlan, { physics: { integrator: 'verlet', dt: 10 }, result: planResult, maxStepsPerSpan: 100_000, samplesPerSpan: 60 });
  return cached;
}
