/**
 * "Retarget for my game"'s own fields beside the game-step physics form: the tolerances as the
 * user types them (altitude km, inclination °, time s; a unit may be given) turned into the
 * core's tolerances (SI), the verification choice, and a hint of what each verification costs.
 * Empty fields keep the core's defaults (core/handoff GAME_TOLERANCES), shown as placeholders.
 */
import { GAME_TOLERANCES } from '../../../core/handoff/index.ts';
import { parseQuantity } from '../../../core/io/index.ts';
import type { TargetTolerances } from '../../../core/target/index.ts';
import { parseKm } from '../gamestep/physicsForm.ts';

const DEG = Math.PI / 180;
const PLAIN_NUMBER = /^\s*[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?\s*$/i;

export type VerifyMode = 'every-step' | 'extrapolated';

export interface RetargetForm {
  /** Altitude tolerance, km (or with a unit); '' for the default. */
  altitude: string;
  /** Inclination tolerance, degrees (or with a unit); '' for the default. */
  inclination: string;
  /** Arrival-time tolerance, s (or with a unit); '' for the default. */
  time: string;
  verify: VerifyMode;
}

export const DEFAULT_RETARGET_FORM: RetargetForm = { altitude: '', inclination: '', time: '', verify: 'every-step' };

/** The defaults in the fields' units, for their placeholders: "1", "0.01", "60". */
export const TOLERANCE_PLACEHOLDERS = {
  altitude: String(Number((GAME_TOLERANCES.altitude / 1000).toPrecision(3))),
  inclination: String(Number((GAME_TOLERANCES.i / DEG).toPrecision(3))),
  time: String(Number(GAME_TOLERANCES.time.toPrecision(3))),
} as const;

export type RetargetFormErrors = Partial<Record<'altitude' | 'inclination' | 'time', string>>;

export interface ParsedRetargetForm {
  tolerance: Partial<TargetTolerances> | null;
  verify: VerifyMode;
  errors: RetargetFormErrors;
}

function quantity(text: string, dim: 'angle' | 'time', plainUnit: string, words: string): number | string {
  let v: number;
  try {
    v = parseQuantity('tolerance', PLAIN_NUMBER.test(text) ? `${text.trim()}${plainUnit}` : text, dim);
  } catch {
    return words;
  }
  return Number.isFinite(v) && v > 0 ? v : 'must be more than 0';
}

/** Reads the fields; `tolerance` is null while any has an error. */
export function parseRetargetForm(form: RetargetForm): ParsedRetargetForm {
  const errors: RetargetFormErrors = {};
  const tolerance: Partial<TargetTolerances> = {};
  if (form.altitude.trim() !== '') {
    const v = parseKm(form.altitude);
    if (typeof v === 'string') errors.altitude = v;
    else tolerance.altitude = v;
  }
  if (form.inclination.trim() !== '') {
    const v = quantity(form.inclination, 'angle', 'deg', 'an angle in degrees, or with a unit (1e-4 rad)');
    if (typeof v === 'string') errors.inclination = v;
    else tolerance.i = v;
  }
  if (form.time.trim() !== '') {
    const v = quantity(form.time, 'time', 's', 'a time in seconds, or with a unit (2 min)');
    if (typeof v === 'string') errors.time = v;
    else tolerance.time = v;
  }
  return { tolerance: Object.keys(errors).length > 0 ? null : tolerance, verify: form.verify, errors };
}

/**
 * Game steps per second a verification flies, roughly (semi-implicit Euler, float64, central
 * gravity, in this app's worker: the demo's 1.26e9 steps at 1/60 s in about a minute); float32
 * and all-body gravity are slower. A hint for the user, never a promise.
 */
export const STEP_RATE_HINT = 2e7;

/** What each verification flies and about how long, for `span` seconds of plan at step `dt`. */
export function verifyHints(span: number | null, dt: number | null): Record<VerifyMode, string> {
  const extrapolated = 'long coasts estimated from coarser flights by step scaling: seconds';
  if (span === null || dt === null || !(span > 0) || !(dt > 0))
    return { 'every-step': 'every game step of the plan flown: slow for a long plan', extrapolated };
  const steps = span / dt;
  const s = steps / STEP_RATE_HINT;
  const about = s < 20 ? 'seconds' : s < 90 ? 'about a minute' : s < 3600 ? `about ${Math.round(s / 60)} min` : `about ${(s / 3600).toPrecision(2)} h`;
  return { 'every-step': `all ${steps.toExponential(2).replace('e+', 'e')} game steps flown: ${about} more`, extrapolated };
}
