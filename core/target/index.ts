/**
 * Front door of core/target. Targeting: goals × controls solved by bounded damped least squares over any flight function.
 * Other folders of core/ and the app import from here only.
 */
export { DAMPING_LIMIT, DEFAULT_DAMPING, DEFAULT_MAX_FLIGHTS, DEFAULT_MAX_ITERATIONS, GRADIENT_TOL, STEP_TOL, solveTargets } from './solve.ts';
export type { Control, Flight, Goal, GoalOutcome, JacobianFn, SolveIteration, SolveOptions, SolveResult, SolveStatus } from './solve.ts';
export { conicFlight } from './conicFlight.ts';
export type { ConicFlightOptions } from './conicFlight.ts';
export { applyControls, burnControls } from './controls.ts';
export type { BurnDvControl } from './controls.ts';
export { goalsFromTarget, planGoalValue, soiEntryGoal } from './goals.ts';
export type { PlanGoal, PlanGoalKind } from './goals.ts';
