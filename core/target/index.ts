/**
 * Front door of core/target. Targeting: goals × controls solved by bounded damped least squares over any flight function;
 * a whole plan targeted leg by leg in a model (conic, finite, n-body); a plan read in its truth model.
 * Other folders of core/ and the app import from here only.
 */
export { DAMPING_LIMIT, DEFAULT_DAMPING, DEFAULT_MAX_FLIGHTS, DEFAULT_MAX_ITERATIONS, GRADIENT_TOL, STEP_TOL, solveTargets } from './solve.ts';
export type { Control, Flight, Goal, GoalOutcome, JacobianFn, SolveIteration, SolveOptions, SolveResult, SolveStatus } from './solve.ts';
export { conicFlight } from './conicFlight.ts';
export type { ConicFlightOptions } from './conicFlight.ts';
export { applyControls, burnControls, timeControl } from './controls.ts';
export type { BurnDvControl, EventTimeControl, PlanControl } from './controls.ts';
export { goalsFromTarget, planGoalValue, soiEntryGoal } from './goals.ts';
export type { PlanGoal, PlanGoalKind } from './goals.ts';
export { DEFAULT_TARGET_TOLERANCES, finalGoals, planLegs } from './legs.ts';
export type { Leg, TargetTolerances } from './legs.ts';
export { measure } from './measure.ts';
export type { BPlaneAxes, FlightGoal, MeasureKind } from './measure.ts';
export { flyModel, freezeSchedule, isSchedule, planForModel, scheduleActions } from './modelFlight.ts';
export type { FlyModelOptions, ModelFlight } from './modelFlight.ts';
export { targetPlan } from './targetPlan.ts';
export type { ArrivalGoal, ControlChange, FailureReason, LegReport, TargetOptions, TargetProgress, TargetResult } from './targetPlan.ts';
export { burnsNotFlown, scheduleBudget } from './scheduleBudget.ts';
export { truthReport } from './truth.ts';
export { nbodyFlybyReports } from './nbodyFlybys.ts';
export type { NBodyFlybyOptions } from './nbodyFlybys.ts';
export type { TruthGoal, TruthOptions, TruthReport } from './truth.ts';
