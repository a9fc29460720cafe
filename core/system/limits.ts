/**
 * What Waymark handles: the largest documents and runs it accepts, in one place (the README's
 * "What bad input gets" lists them). Each is enforced where the input arrives — a system or
 * plan file when it is read (core/io), the options of a long run when it starts (stability,
 * game-step check, dispersion) — with a message naming the field, the limit and the value, so
 * an oversized input is refused at once instead of exhausting memory or running for hours.
 *
 * Chosen generous for real use (common practice: bounds an order of magnitude or more above
 * the largest real case): the demo system has 8 bodies and the test suite loads one of 1,008
 * (asteroids); the demo plan has 12 events and a vehicle of 2 stages; a dispersion of 10⁵ samples resolves a probability
 * to ±0.3 % (2σ); the demo's stability run takes 6.5·10⁶ steps of 15 body pairs and its
 * game-step check about 10⁸ game steps.
 */
import { formatCount, InputError } from '../math/index.ts';

/** Problems a refused file lists one by one (core/math/errors.ts; the rest are counted). */
export { MAX_LISTED_ISSUES } from '../math/index.ts';

/** Bodies in a system (the star not counted). */
export const MAX_BODIES = 2_000;
/** Events in a plan (burns, coasts and stagings together). */
export const MAX_EVENTS = 1_000;
/** Stages of a plan's vehicle. */
export const MAX_STAGES = 100;
/** Bodies the stability check flies (it follows every pair, every step). */
export const MAX_STABILITY_BODIES = 200;
/** Steps of a stability run (the `maxSteps` budget may not be raised past this). */
export const MAX_STABILITY_STEPS = 1_000_000_000;
/**
 * Body-pair force evaluations of a stability run (steps × evaluations per step × pairs): about
 * ten minutes of one core; the demo's default run needs 3·10⁸.
 */
export const MAX_STABILITY_WORK = 2e10;
/** Element-history samples of a stability run. */
export const MAX_STABILITY_SAMPLES = 10_000;
/** Samples of a dispersion run. */
export const MAX_DISPERSION_SAMPLES = 100_000;
/** Game steps of one game-step check (all spans, windows and probes; the demo's takes about 10⁸). */
export const MAX_GAME_STEPS = 2_000_000_000;
/**
 * Calendar years between the system's epoch and any time a plan names (its start, burn times,
 * arrival dates). The n-body ephemeris is integrated from the epoch, so a plan thousands of
 * years away would take minutes to verify; ten centuries cover any story's mission.
 */
export const MAX_PLAN_YEARS_FROM_EPOCH = 1_000;
/** Series points per span of a game-step check. */
export const MAX_GAME_SAMPLES_PER_SPAN = 100_000;

/** The rule of a value past a limit, in the user's words: "is 10,000 bodies, more than the 2,000 Waymark handles". */
export function overLimitRule(value: number, limit: number, noun: string): string {
  return `is ${formatCount(value)} ${noun}, more than the ${formatCount(limit)} Waymark handles`;
}

/** Throws InputError(field, …) when value > limit (value is a count, already checked to be a number). */
export function requireWithinLimit(field: string, value: number, limit: number, noun: string): number {
  if (value > limit) throw new InputError(field, overLimitRule(value, limit, noun));
  return value;
}
