/**
 * Front door of core/io. File formats at the edge: units, system and plan files (schema-checked, versioned, migrated), CCSDS OEM, CSV, reports, the burn schedule for a game (JSON and CSV).
 * Other folders of core/ and the app import from here only.
 */
export { burnTableCsv, ephemerisCsv } from './csv.ts';
export {
  ALTITUDE_MARGIN,
  DEPARTURE_SPAN_RECURRENCES,
  DISPERSION_DEFAULTS,
  GAME_STEP_DEFAULTS,
  INTEGRATOR_NAMES,
  PORKCHOP_GRID,
  PORKCHOP_GRID_CHOICES,
  RESOLVE_NAMES,
  STABILITY_METHODS,
  TOF_SPAN_HOHMANN,
  WINDOW_COUNT,
  integratorChoices,
  integratorName,
  orbitAltitude,
  parseIntegrator,
  porkchopRanges,
  requireSafeAltitude,
  safeAltitude,
  slug,
} from './defaults.ts';
export type { DispersionDefaults, GameStepDefaults, IntegratorId, PorkchopRanges } from './defaults.ts';
export { inlineLocalRefs } from './fileValidator.ts';
export { GAME_AXES, GAME_AXES_NAMES } from './gameAxes.ts';
export type { GameAxes, GameAxesName } from './gameAxes.ts';
export {
  GAME_SCHEDULE_DEFAULTS,
  GAME_SCHEDULE_FORMAT,
  GAME_SCHEDULE_VERSION,
  gameScheduleCsv,
  gameScheduleCsvColumns,
  gameScheduleJson,
  gameScheduleOptions,
  readGameScheduleJson,
} from './gameSchedule.ts';
export type { GameScheduleDocument, GameScheduleOptions } from './gameSchedule.ts';
export { issueInWords, issuesInWords } from './issueWords.ts';
export type { IssueWords } from './issueWords.ts';
export { writeOem } from './oem.ts';
export { planSaveIssues } from './planSaveCheck.ts';
export { RESOLVED_TOLERANCE, resolveBurns, resolveBurnsForSave, resolvedFromBudget, staleResolvedIssues } from './resolvedBurns.ts';
export type { ResolvedBurn, ResolvedBurns } from './resolvedBurns.ts';
export { RESOLVED_NOTE, checkPlanAgainstSystem, parsePlanFile, planToDocument, requirePlanFitsSystem, serializePlanFile } from './planFile.ts';
export type { PlanSystemRef } from './planFile.ts';
export { PLAN_FORMAT, PLAN_VERSION, checkDocumentAgainstSystem, checkPlanDocument } from './planSchema.ts';
export { budgetReport } from './report.ts';
export { parseSystemFile } from './systemFile.ts';
export { parseQuantity, parseRange, parseVector } from './units.ts';
export type { Dimension } from './units.ts';
export { decodeUtf8, invalidUtf8Offset } from './utf8.ts';
export { deltaVMapLayout, deltaVMapSvg, dvWords, mapLayoutBodies } from './deltaVMapSvg.ts';
export type { DeltaVMapLayout, DeltaVMapSvgOptions, MapLayoutBody } from './deltaVMapSvg.ts';
export { MAP_CSV_COLUMNS, deltaVMapCsv } from './deltaVMapCsv.ts';
export { CALENDAR_CSV_COLUMNS, calendarCsv } from './calendarCsv.ts';
