/**
 * Front door of core/plan. Plans: the plan model, vehicle and stages, rocket equation, budget and margins, result types, plan checks, burn frames.
 * Other folders of core/ and the app import from here only.
 */
export { summarizeBudget } from './budget.ts';
export { burnToInertial, inertialToBurn } from './burnFrame.ts';
export { MAX_PLAN_SPEED, MAX_START_DISTANCE, checkPlan } from './checkPlan.ts';
export type {
  BurnEvent,
  BurnFrame,
  BurnSolve,
  CoastEvent,
  CoastUntil,
  Plan,
  PlanEvent,
  PlanStart,
  PlanTarget,
  ReservePolicy,
  Stage,
  StageEvent,
  FlybyEvent,
  TruthModel,
  Vehicle,
} from './plan.ts';
export type { Budget, BudgetRow, FlybyReport, Flag, PlanResult, TargetReport, TrajectoryEvent, TrajectoryEventKind, TrajectorySegment } from './result.ts';
export { G0, burnDuration, propellantForDeltaV, rocketDeltaV } from './rocket.ts';
export { TRUTH_MODELS, planTruthModel, truthModelLabel } from './truthModel.ts';
export {
  MIN_BURNOUT_FRACTION,
  MIN_STAGE_THRUST,
  checkVehicle,
  createBurnBook,
  createVehicleState,
  deltaVLeft,
  dropStage,
  spendBurn,
  stageDeltaVs,
} from './vehicle.ts';
export type { BurnBook, VehicleState } from './vehicle.ts';
