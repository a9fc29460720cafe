/**
 * Front door of core/handoff. Handing the plan to a game: burns retargeted for the game's own
 * integrator (fixed step, precision, floating origin, gravity, burn model) and the burn schedule
 * the game flies. Other folders of core/ and the app import from here only.
 */
export type { GameSchedule, ScheduledBurn, ScheduledThrust } from './schedule.ts';
