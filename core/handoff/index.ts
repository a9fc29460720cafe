/**
 * Front door of core/handoff. Handing the plan to a game: burns retargeted for the game's own
 * integrator (fixed step, precision, floating origin, gravity, burn model) and the burn schedule
 * the game flies. Other folders of core/ and the app import from here only.
 */
export type { GameSchedule, ScheduledBurn, ScheduledThrust } from './schedule.ts';
export { DEFAULT_GAME_FLIGHTS, GAME_TOLERANCES, LEG_CLEARANCE_STEPS, RECOMMEND_HALVINGS, RETARGET_RTOL, retargetForGame } from './retarget.ts';
export type { ErrorCurve, Recommendation, RetargetGoal, RetargetLeg, RetargetOptions, RetargetProgress, RetargetResult } from './retarget.ts';
export { DEFAULT_COARSE_STEPS, DEFAULT_RUN_MAX_STEPS, ORDER_SLACK, REGION_MARGIN, flyGame } from './gameRun.ts';
export type { GameRun, GameRunOptions, GameState, RunContext, RunRegion } from './gameRun.ts';
export { FINE_WINDOW, gameRuntimeData } from './runtimeData.ts';
export type { GameRuntimeOptions } from './runtimeData.ts';
