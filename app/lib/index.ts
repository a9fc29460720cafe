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
export type { RouteIntent, RouteOptions, RouteResult } from '../../core/route/index.ts';
export {
  budgetReport,
  burnTableCsv,
  ephemerisCsv,
  parsePlanFile,
  parseQuantity,
  parseSystemFile,
  PLAN_FORMAT,
  PLAN_VERSION,
  serializePlanFile,
  writeOem,
} from '../../core/io/index.ts';
export type { PlanSystemRef } from '../../core/io/index.ts';
export { FileError, loadPlanFile, loadSystemFile } from '../node/files.ts';
export type { LoadedPlan, LoadedSystem } from '../node/files.ts';
