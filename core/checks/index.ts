/**
 * Front door of core/checks. Whole-system checks: long-term stability of the system.
 * Other folders of core/ and the app import from here only.
 */
export {
  CLOSE_ENCOUNTER_HILL,
  DEFAULT_MAX_STEPS,
  DEFAULT_METHOD,
  DEFAULT_WH_MAX_STEPS,
  DEFAULT_YEARS,
  GLADMAN_SPACING,
  WH_MOON_STEP_FACTOR,
  checkStability,
} from './stability.ts';
export type { StabilityFlagCode, StabilityMethod, StabilityResult } from './stability.ts';
export { wisdomHolmanStepper } from './wisdomHolman.ts';
export type { WisdomHolmanStepper } from './wisdomHolman.ts';
