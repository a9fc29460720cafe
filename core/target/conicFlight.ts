/**
 * A flight function for the solver: controls → a new plan → patched-conic evaluation → goal values.
 * The plan given is never changed; each flight evaluates a fresh copy with the controls applied.
 */
import { evaluate } from '../conic/index.ts';
import type { Plan } from '../plan/index.ts';
import type { StarSystem } from '../system/index.ts';
import type { BurnDvControl } from './controls.ts';
import { applyControls } from './controls.ts';
import type { PlanGoal } from './goals.ts';
import { planGoalValue } from './goals.ts';
import type { Flight } from './solve.ts';

/** The conic evaluation's options (samples, long-burn fraction, longest flight). */
export type ConicFlightOptions = NonNullable<Parameters<typeof evaluate>[2]>;

/** The conic flight of `plan` under `controls`, giving `goals`' values (drawing samples off: goals need none). */
export function conicFlight(
  system: StarSystem,
  plan: Plan,
  controls: readonly BurnDvControl[],
  goals: readonly PlanGoal[],
  options: ConicFlightOptions = {},
): Flight {
  const opts: ConicFlightOptions = { ...options, samplesPerSegment: 0 };
  return (x, out) => {
    const result = evaluate(system, applyControls(plan, controls, x), opts);
    for (let i = 0; i < goals.length; i++) out[i] = planGoalValue(system, result, goals[i]);
  };
}
