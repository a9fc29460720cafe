/**
 * The game-step panel's form: the game's physics as the user types it (text fields, choices)
 * turned into the core's GamePhysicsInput and check options (SI), with a message per field that
 * does not parse. The core checks the values again (and its InputError is shown if it refuses
 * one); this only reads the text.
 *
 * Steps accept seconds ("0.02"), a fraction ("1/60") or a duration with a unit ("20 ms");
 * lengths are km unless a unit is given ("500 m").
 */
import { GAME_STEP_DEFAULTS, INTEGRATOR_NAMES, parseQuantity } from '../../../core/io/index.ts';
import { DEFAULT_ENERGY_TOLERANCE, DEFAULT_REBASE, type GameIntegrator, type GamePhysicsInput } from '../../../core/gamestep/index.ts';
import type { GameStepJobOptions } from '../analysis/checkJobs.ts';

export interface PhysicsForm {
  integrator: GameIntegrator;
  dt: string;
  precision: 'float64' | 'float32';
  rebase: boolean;
  /** Floating-origin distance, km (or with a unit). */
  rebaseDistance: string;
  rebaseVelocity: boolean;
  gravity: 'central' | 'all';
  burns: 'impulsive' | 'spread';
  guidance: 'resolve' | 'open-loop';
  /** Position tolerance, km (or with a unit); '' for the plan's own. */
  tolerance: string;
  /** Relative energy drift per orbit; '' for the default. */
  energyTolerance: string;
  /** Long coasts: extrapolated from shorter flights, or flown as a long-step coast (a longer step, `warpDt`). */
  longCoasts: 'extrapolate' | 'long-step';
  warpDt: string;
}

/** The form's starting values: the command line's `gamestep` defaults (core/io/defaults.ts). */
export const DEFAULT_FORM: PhysicsForm = {
  integrator: GAME_STEP_DEFAULTS.integrator,
  dt: GAME_STEP_DEFAULTS.dt,
  precision: 'float64',
  rebase: false,
  rebaseDistance: String(DEFAULT_REBASE.distance / 1000),
  rebaseVelocity: true,
  gravity: GAME_STEP_DEFAULTS.gravity,
  burns: GAME_STEP_DEFAULTS.burns,
  guidance: GAME_STEP_DEFAULTS.guidance,
  tolerance: '',
  energyTolerance: '',
  longCoasts: 'extrapolate',
  warpDt: GAME_STEP_DEFAULTS.coastStep,
};

/** The integrators' display names: the one table of core/io/defaults.ts (the command line's help uses it too). */
export { INTEGRATOR_NAMES };

/** Step presets offered beside the step field. */
export const STEP_PRESETS = ['1/60', '1/30', '1/50', '0.02', '0.1', '1', '10', '60'];

export type FormErrors = Partial<Record<keyof PhysicsForm, string>>;

export interface ParsedForm {
  options: GameStepJobOptions | null;
  errors: FormErrors;
}

const FRACTION = /^\s*(\d+(?:\.\d*)?|\.\d+)\s*\/\s*(\d+(?:\.\d*)?|\.\d+)\s*$/;
const PLAIN_NUMBER = /^\s*[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?\s*$/i;
const MILLISECONDS = /^\s*(\d+\.?\d*|\.\d+)(e[+-]?\d+)?\s*ms\s*$/i;

/** A step in seconds, or a message. */
export function parseStep(text: string): number | string {
  const f = FRACTION.exec(text);
  const ms = MILLISECONDS.exec(text);
  let v: number;
  if (f) v = Number(f[1]) / Number(f[2]);
  else if (ms) v = Number(ms[1] + (ms[2] ?? '')) / 1000;
  else {
    try {
      v = parseQuantity('step', text, 'time');
    } catch {
      return 'a step in seconds, e.g. 1/60, 0.02 or 20 ms';
    }
  }
  if (!Number.isFinite(v) || !(v > 0)) return 'must be more than 0 s';
  return v;
}

/** A length in metres from km (plain numbers) or a number with a unit, or a message. */
export function parseKm(text: string): number | string {
  let v: number;
  if (PLAIN_NUMBER.test(text)) v = Number(text) * 1000;
  else {
    try {
      v = parseQuantity('length', text, 'length');
    } catch {
      return 'a length in km, or with a unit (500 m)';
    }
  }
  if (!Number.isFinite(v) || !(v > 0)) return 'must be more than 0';
  return v;
}

/** Reads the form; `options` is null while any field has an error. */
export function parseForm(form: PhysicsForm): ParsedForm {
  const errors: FormErrors = {};
  const dt = parseStep(form.dt);
  if (typeof dt === 'string') errors.dt = dt;
  let rebase: GamePhysicsInput['rebase'] = null;
  if (form.rebase) {
    const d = parseKm(form.rebaseDistance);
    if (typeof d === 'string') errors.rebaseDistance = d;
    else rebase = { distance: d, velocity: form.rebaseVelocity };
  }
  let tolerance: number | undefined;
  if (form.tolerance.trim() !== '') {
    const t = parseKm(form.tolerance);
    if (typeof t === 'string') errors.tolerance = t;
    else tolerance = t;
  }
  let energyTolerance: number | undefined;
  if (form.energyTolerance.trim() !== '') {
    const e = PLAIN_NUMBER.test(form.energyTolerance) ? Number(form.energyTolerance) : NaN;
    if (!(e > 0) || !Number.isFinite(e)) errors.energyTolerance = `a number above 0, e.g. ${DEFAULT_ENERGY_TOLERANCE.toExponential(0)}`;
    else energyTolerance = e;
  }
  let warpDt: number | undefined;
  if (form.longCoasts === 'long-step') {
    const w = parseStep(form.warpDt);
    if (typeof w === 'string') errors.warpDt = w;
    else warpDt = w;
  }
  if (Object.keys(errors).length > 0) return { options: null, errors };
  return {
    options: {
      physics: {
        integrator: form.integrator,
        dt: dt as number,
        precision: form.precision,
        rebase,
        gravity: form.gravity,
        burns: form.burns,
        guidance: form.guidance,
      },
      tolerance,
      energyTolerance,
      warpDt,
    },
    errors,
  };
}

/** The physics in a few words: "velocity Verlet (leapfrog), 16.67 ms, float64, floating origin 10 km". */
export function physicsCaption(p: GamePhysicsInput): string {
  const dt = p.dt < 1 ? `${Number((p.dt * 1000).toPrecision(4))} ms` : `${Number(p.dt.toPrecision(4))} s`;
  const parts = [INTEGRATOR_NAMES[p.integrator] ?? p.integrator, dt, p.precision ?? 'float64'];
  if (p.rebase) parts.push(`floating origin ${Number((p.rebase.distance / 1000).toPrecision(4))} km`);
  if (p.gravity === 'all') parts.push('all-body gravity');
  if (p.burns === 'spread') parts.push('spread burns');
  if (p.guidance === 'open-loop') parts.push('open loop');
  return parts.join(', ');
}
