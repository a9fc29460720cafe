/**
 * Front door of core/gamestep. The game-step check: a game's fixed-step integrator, step, precision and floating origin flown against the reference, and the step sweep.
 * Other folders of core/ and the app import from here only.
 */
export { BASIS_EXTRAPOLATED, BASIS_MEASURED_PLUS, DEFAULT_ENERGY_TOLERANCE, DEFAULT_REBASE, GAME_INTEGRATORS, gameStepCheck } from './check.ts';
export type { GameIntegrator, GamePhysicsInput, GameStepResult } from './check.ts';
export { gameStepSweep } from './sweep.ts';
export type { PrecisionVerdict, SweepResult } from './sweep.ts';
// the pieces a retargeting of the plan for the game's physics builds on (core/handoff)
export { GameFlight } from './flight.ts';
export type { FlyHooks, GameFlightSetup } from './flight.ts';
export { ReferenceTrack, flyReference } from './reference.ts';
export type { ReferenceFlight, ReferenceSettings } from './reference.ts';
export { METHOD_ORDER, gameBurns, normalizePhysics, prepareGameStep } from './check.ts';
export type { GameBurn, GamePhysics, GamePrecision, PreparedGameStep } from './check.ts';
export { spreadDuration } from './guidance.ts';
