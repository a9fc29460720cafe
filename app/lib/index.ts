/**
 * The Waymark library (`import … from 'waymark'`): what a content pipeline needs to read,
 * check, fly and export plans without the command line. Built to dist/lib/index.js with its
 * types (app/cli/build.ts); every function is the one the command line and the app call.
 *
 * - Files: `loadPlanFile` / `loadSystemFile` read from disk (a plan with the system it names),
 *   `parsePlanFile` / `parseSystemFile` read text; `serializePlanFile` writes a plan back.
 * - Flight: `evaluate` (patched conics), `verifyNBody` (n-body flight of an evaluated plan),
 *   `truthReport` (the plan in its truth model), `targetPlan`, `planRoute`, `disperse`.
 * - Exports: `budgetReport` (text), `burnTableCsv`, `ephemerisCsv`, `writeOem` (CCSDS OEM)
 *   from `sampleEphemeris`.
 * - For a game: `gameStepCheck` (how its integrator flies the plan), `retargetForGame` (the burns
 *   retargeted for its integrator: a schedule it flies open loop), `gameScheduleJson` /
 *   `gameScheduleCsv` / `readGameScheduleJson` (the schedule in the game's units and axes),
 *   `gameRuntimeData` with `encodeRuntimeJson` / `encodeRuntimeBinary` (bodies and the ship's path
 *   as Chebyshev tracks) and `openRuntimeEphemeris` (the reader a game copies).
 * - Errors: InputError (a bad argument: `field`, `rule`), ValidationError (a bad document:
 *   `issues`, each with a `path` and a `rule`), SolverError (numerical failure), FileError.
 */
export { InputError, SolverError, ValidationError, WaymarkError } from '../../core/math/index.ts';
export type { ValidationIssue } from '../../core/math/index.ts';
export type { Body, StarSystem, SystemCalendar } from '../../core/system/index.ts';
export type { Budget, BudgetRow, Flag, Plan, PlanEvent, PlanResult, Vehicle } from '../../core/plan/index.ts';
export { evaluate, sampleEphemeris } from '../../core/conic/index.ts';
export type { SampledEphemeris } from '../../core/conic/index.ts';
export { disperse, verifyNBody } from '../../core/nbody/index.ts';
export type { DispersionOptions, DispersionResult, NBodyResult } from '../../core/nbody/index.ts';
export { targetPlan, truthReport } from '../../core/target/index.ts';
export type { TargetOptions, TargetResult, TruthReport } from '../../core/target/index.ts';
export { planRoute } from '../../core/route/index.ts';
export { gameStepCheck } from '../../core/gamestep/index.ts';
export type { GamePhysicsInput, GameStepResult } from '../../core/gamestep/index.ts';
export { gameRuntimeData, retargetForGame } from '../../core/handoff/index.ts';
export type { GameSchedule, RetargetOptions, RetargetResult, ScheduledBurn } from '../../core/handoff/index.ts';
export { decodeRuntimeBinary, decodeRuntimeJson, encodeRuntimeBinary, encodeRuntimeJson, openRuntimeEphemeris } from '../../core/runtime/index.ts';
export type { RuntimeEphemeris, RuntimeEphemerisReader } from '../../core/runtime/index.ts';
export type { RouteIntent, RouteOptions, RouteResult } from '../../core/route/index.ts';
export {
  budgetReport,
  burnTableCsv,
  ephemerisCsv,
  gameScheduleCsv,
  gameScheduleJson,
  parsePlanFile,
  parseQuantity,
  parseSystemFile,
  PLAN_FORMAT,
  PLAN_VERSION,
  readGameScheduleJson,
  serializePlanFile,
  writeOem,
} from '../../core/io/index.ts';
export type { GameScheduleOptions, PlanSystemRef } from '../../core/io/index.ts';
export { FileError, loadPlanFile, loadSystemFile } from '../node/files.ts';
export type { LoadedPlan, LoadedSystem } from '../node/files.ts';
