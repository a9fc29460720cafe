/**
 * The defaults and names the command line and the app share: porkchop ranges, grid and orbit
 * altitudes, dispersion σ and mode, game-step physics, and the integrators' display names. The
 * command line's option defaults and help and the app's form defaults read them from here, so
 * the two never disagree (test/core/io/defaults.test.ts and test/app/defaults.test.ts).
 *
 * Rules (common practice of preliminary mission design, not from a single source):
 * - parking and capture orbits sit ALTITUDE_MARGIN above the body's minimum safe altitude, and a
 *   chosen altitude is never taken below that safe altitude;
 * - departures span DEPARTURE_SPAN_RECURRENCES recurrences of the pair's geometry (the synodic
 *   period of sister bodies; the moon's period for a planet–moon pair), so at least one window
 *   falls inside;
 * - flight times span TOF_SPAN_HOHMANN × the pair's Hohmann flight time (Curtis, Orbital
 *   Mechanics for Engineering Students, §6.2 / §8.2 — from memory), which brackets the
 *   single-revolution minimum of a near-circular pair.
 */
import type { checkStability } from '../checks/index.ts';
import type { GameIntegrator } from '../gamestep/index.ts';
import { InputError } from '../math/index.ts';
import { hohmann, synodicPeriod } from '../orbit/index.ts';
import { FROM_PARENT, porkchopPair, SIBLINGS, type PorkchopPair } from '../search/index.ts';
import { dateParts, type Body, type StarSystem } from '../system/index.ts';

const DAY = 86400;

// ---------------------------------------------------------------------------------------------
// Porkchop

/** Parking and capture orbits: this far above the body's minimum safe altitude, m. */
export const ALTITUDE_MARGIN = 100e3;
/** Samples per axis of a porkchop grid. */
export const PORKCHOP_GRID = 200;
/** Grid sizes the app offers (the command line takes any NxM). */
export const PORKCHOP_GRID_CHOICES: readonly number[] = [60, 100, 200, 300, 500];
/** Departures span this many recurrences of the pair's geometry. */
export const DEPARTURE_SPAN_RECURRENCES = 1.5;
/** Flight times span these multiples of the pair's Hohmann flight time. */
export const TOF_SPAN_HOHMANN: readonly [number, number] = [0.5, 2];
/** Windows listed after a search. */
export const WINDOW_COUNT = 5;

/** The default parking or capture periapsis altitude about `body`, m. */
export function orbitAltitude(body: Body): number {
  return body.safeAlt + ALTITUDE_MARGIN;
}

/** `wanted` when it is a finite altitude at or above the body's safe altitude, else the default (orbitAltitude). */
export function safeAltitude(body: Body, wanted: number | null | undefined): number {
  return wanted !== null && wanted !== undefined && Number.isFinite(wanted) && wanted >= body.safeAlt ? wanted : orbitAltitude(body);
}

/** InputError when `altitude` lies below the body's minimum safe altitude. */
export function requireSafeAltitude(field: string, body: Body, altitude: number): void {
  if (!(altitude >= body.safeAlt)) {
    throw new InputError(field, `must be at least ${body.name}'s minimum safe altitude, ${(body.safeAlt / 1e3).toLocaleString('en-US')} km`, altitude);
  }
}

export interface PorkchopRanges {
  /** The leg searched (the pair itself, or the ancestors that have the window). */
  pair: PorkchopPair;
  /** Recurrence of the leg's geometry, s. */
  recurrence: number;
  /** Hohmann flight time of the leg, s. */
  hohmannTof: number;
  /** Departure range, s from the system's epoch (starts of calendar days of the system). */
  depart: { start: number; end: number };
  /** Flight-time range, s (whole days, at least one day). */
  tof: { min: number; max: number };
  /** Default parking and capture altitudes of the leg's bodies, m. */
  parkingAltitude: number;
  captureAltitude: number;
}

const wholeDays = (t: number): number => Math.round(t / DAY) * DAY;

/**
 * The default ranges of the porkchop from → to (body indices), departures from `departFrom`
 * (s from the epoch): the leg (porkchopPair), its recurrence and Hohmann time, and the ranges
 * the rules above give. `parkingAltitude` sets the parking radius of a planet-to-moon leg.
 */
export function porkchopRanges(system: StarSystem, from: number, to: number, departFrom = 0, parkingAltitude?: number): PorkchopRanges {
  const pair = porkchopPair(system, from, to);
  const A = system.bodies[pair.from];
  const B = system.bodies[pair.to];
  const park = safeAltitude(A, parkingAltitude);
  let recurrence: number;
  let hohmannTof: number;
  if (pair.kind === SIBLINGS) {
    const central = system.bodies[A.parentIndex];
    recurrence = A.derived.period === B.derived.period ? A.derived.period : synodicPeriod(A.derived.period, B.derived.period);
    hohmannTof = hohmann(central.mu, A.elements!.a, B.elements!.a).tof;
  } else if (pair.kind === FROM_PARENT) {
    recurrence = B.derived.period;
    hohmannTof = hohmann(A.mu, A.radius + park, B.elements!.a).tof;
  } else {
    recurrence = A.derived.period;
    hohmannTof = hohmann(B.mu, A.elements!.a, B.radius + orbitAltitude(B)).tof;
  }
  // The start of the calendar day (the system's own day) that departFrom falls in, so the range
  // reads as a whole date in the app and on the command line.
  const start = departFrom - dateParts(system.calendar, departFrom).secondOfDay;
  const end = start + Math.max(DAY, wholeDays(DEPARTURE_SPAN_RECURRENCES * recurrence));
  return {
    pair,
    recurrence,
    hohmannTof,
    depart: { start, end: end - dateParts(system.calendar, end).secondOfDay },
    tof: {
      min: Math.max(DAY, wholeDays(TOF_SPAN_HOHMANN[0] * hohmannTof)),
      max: Math.max(2 * DAY, wholeDays(TOF_SPAN_HOHMANN[1] * hohmannTof)),
    },
    parkingAltitude: park,
    captureAltitude: orbitAltitude(B),
  };
}

// ---------------------------------------------------------------------------------------------
// Dispersion

export interface DispersionDefaults {
  samples: number;
  seed: number;
  /** 1σ burn magnitude error, percent. */
  magnitudeSigmaPct: number;
  /** 1σ burn pointing error per axis, degrees. */
  pointingSigmaDeg: number;
  /** 'retarget': solved burns re-solve (closed loop); 'frozen': burns as planned (open loop). */
  resolve: 'retarget' | 'frozen';
}

/** Execution errors of a small chemical engine (common practice: about 0.5 % and 0.2°, 1σ). */
export const DISPERSION_DEFAULTS: Readonly<DispersionDefaults> = { samples: 500, seed: 1, magnitudeSigmaPct: 0.5, pointingSigmaDeg: 0.2, resolve: 'retarget' };

/** The dispersion modes in words (the app's choice and the command line's help). */
export const RESOLVE_NAMES: Readonly<Record<DispersionDefaults['resolve'], string>> = {
  retarget: 're-solved (closed loop)',
  frozen: 'as planned (open loop)',
};

// ---------------------------------------------------------------------------------------------
// Integrators: one id ↔ one display name

export type IntegratorId = 'rk45' | 'dop853' | 'wisdom-holman' | 'yoshida4' | 'verlet' | 'symplectic-euler' | 'explicit-euler' | 'rk4';

/** Each integrator's display name; the command line accepts the id or the name's slug. */
export const INTEGRATOR_NAMES: Readonly<Record<IntegratorId, string>> = {
  rk45: 'RK45 (Dormand–Prince)',
  dop853: 'DOP853 (Dormand–Prince 8th order)',
  'wisdom-holman': 'Wisdom–Holman map',
  yoshida4: 'Yoshida 4th-order symplectic',
  verlet: 'velocity Verlet (leapfrog)',
  'symplectic-euler': 'semi-implicit Euler',
  'explicit-euler': 'explicit Euler',
  rk4: 'classic RK4',
};

/** "velocity Verlet (leapfrog)" → "velocity-verlet-leapfrog". */
export function slug(words: string): string {
  return words
    .normalize('NFKD')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '');
}

/** The display name of an integrator id (the id itself when it has none). */
export function integratorName(id: string): string {
  return (INTEGRATOR_NAMES as Record<string, string>)[id] ?? id;
}

/** An integrator of `allowed` by its id or the slug of its name (any case, spaces or hyphens); InputError otherwise. */
export function parseIntegrator<T extends IntegratorId>(field: string, text: string, allowed: readonly T[]): T {
  const s = slug(text);
  for (const id of allowed) if (s === id || s === slug(INTEGRATOR_NAMES[id])) return id;
  throw new InputError(field, `must be one of: ${allowed.map((id) => `${id} (${slug(INTEGRATOR_NAMES[id])})`).join(', ')}`, text);
}

/** "verlet = velocity Verlet (leapfrog), ..." for help texts. */
export function integratorChoices(allowed: readonly IntegratorId[]): string {
  return allowed.map((id) => `${id} = ${INTEGRATOR_NAMES[id]}`).join(', ');
}

/** The stability check's integrators, its default first. */
export const STABILITY_METHODS: readonly (StabilityMethod & IntegratorId)[] = ['wisdom-holman', 'yoshida4', 'verlet'];
type StabilityMethod = NonNullable<NonNullable<Parameters<typeof checkStability>[1]>['method']>;

// ---------------------------------------------------------------------------------------------
// Game step

export interface GameStepDefaults {
  integrator: GameIntegrator & IntegratorId;
  /** The fixed step as typed: seconds, a fraction or with a unit. */
  dt: string;
  gravity: 'central' | 'all';
  burns: 'impulsive' | 'spread';
  guidance: 'resolve' | 'open-loop';
  /** Step of a long-step coast, seconds as typed. */
  coastStep: string;
}

/** A game loop at 60 frames per second with velocity Verlet (common practice in game physics). */
export const GAME_STEP_DEFAULTS: Readonly<GameStepDefaults> = {
  integrator: 'verlet',
  dt: '1/60',
  gravity: 'central',
  burns: 'impulsive',
  guidance: 'resolve',
  coastStep: '10',
};
