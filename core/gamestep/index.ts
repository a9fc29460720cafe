/**
 * Front door of core/gamestep. The game-step check: a game's fixed-step integrator, step, precision and floating origin flown against the reference, and the step sweep.
 * Other folders of core/ and the app import from here only.
 */
export { BASIS_EXTRAPOLATED, BASIS_MEASURED_PLUS, DEFAULT_ENERGY_TOLERANCE, DEFAULT_REBASE, GAME_INTEGRATORS, gameStepCheck } from './check.ts';
export type { GameIntegrator, GamePhysicsInput, GameStepResult } from './check.ts';
export { gameStepSweep } from './sweep.ts';
export type { PrecisionVerdict, SweepResult } from './sweep.ts';
