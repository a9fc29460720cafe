/**
 * Front door of core/system. Star systems: the model, semantic validation, building from a document, conic ephemeris, calendar, mutual n-body ephemeris.
 * Other folders of core/ and the app import from here only.
 */
export { buildStarSystem, systemToDocument } from './build.ts';
export { STANDARD_DAY, dateParts, formatCompactDate, formatDate, formatDayLength, formatElapsed, parseDate } from './calendar.ts';
export { SYSTEM_FORMAT, SYSTEM_VERSION } from './document.ts';
export type { SystemDocument } from './document.ts';
export { bodyPosition, bodyState, bodyStateRelativeToParent, conicState, sampleOrbit } from './ephemeris.ts';
export {
  MAX_BODIES,
  MAX_DISPERSION_SAMPLES,
  MAX_EVENTS,
  MAX_GAME_SAMPLES_PER_SPAN,
  MAX_GAME_STEPS,
  MAX_LISTED_ISSUES,
  MAX_PLAN_YEARS_FROM_EPOCH,
  MAX_STABILITY_BODIES,
  MAX_STABILITY_SAMPLES,
  MAX_STABILITY_STEPS,
  MAX_STABILITY_WORK,
  MAX_STAGES,
  overLimitRule,
  requireWithinLimit,
} from './limits.ts';
export { findBodyIndex } from './model.ts';
export type { Body, StarSystem, SystemCalendar } from './model.ts';
export { initialStates } from './nbodyEphemeris.ts';
export { checkSystemDocument } from './validate.ts';
