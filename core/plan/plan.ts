/**
 * The mission plan: plain, JSON-serialisable data that the UI edits and `evaluate` reads.
 * SI units and radians in memory; the plan file (core/io/planFile.ts) stores the same fields
 * with unit-bearing names (`_m`, `_s`, `_mps`, `_deg`) and converts on load and save.
 *
 * A plan is: a vehicle, a start (parking orbit or state vector at an epoch), an ordered list
 * of events (burns, coasts, staging), a target orbit and a reserve policy. Times are seconds
 * from the system's epoch.
 */

/** One stage of the vehicle, in firing order. */
export interface Stage {
  name: string;
  /** Structure left when the stage's propellant is spent, kg. */
  dryMass: number;
  /** Propellant loaded, kg. */
  propellantMass: number;
  /** Vacuum specific impulse, s. */
  isp: number;
  /** Vacuum thrust, N. */
  thrust: number;
}

export interface Vehicle {
  name: string;
  /** Mass carried to the end (never dropped), kg. */
  payloadMass: number;
  /** Stages in firing order: stages[0] fires first and is dropped first. */
  stages: Stage[];
}

/** A parking orbit around a body at an epoch. Angles in rad; defaults 0. */
export interface ParkingStart {
  kind: 'parking';
  /** Body id the orbit is around. */
  body: string;
  /** Start time, s from the system epoch. */
  epoch: number;
  /** Periapsis altitude above the body's mean radius, m. */
  periapsisAltitude: number;
  /** Eccentricity of the parking orbit (0: circular). */
  e: number;
  i: number;
  raan: number;
  argp: number;
  /** True anomaly at the epoch. */
  nu: number;
}

/** A state vector relative to a body (inertial axes of the system). */
export interface StateStart {
  kind: 'state';
  body: string;
  epoch: number;
  /** Position relative to the body, m. */
  r: [number, number, number];
  /** Velocity relative to the body, m/s. */
  v: [number, number, number];
}

export type PlanStart = ParkingStart | StateStart;

/** The frame a burn's Δv components are given in (see core/math/frames.ts). */
export type BurnFrame = 'vnb' | 'rtn' | 'inertial';

/**
 * How a burn's Δv is obtained.
 * - 'fixed': the components in `dv` (in `frame`) are flown as written.
 * - 'transfer': solved at evaluation time by Lambert from the ship's position at the burn to the
 *   target body's position at `arrive` (for a departure from a parking orbit, the hyperbolic
 *   excess velocity of the Lambert arc is reached with a burn at the current point; for a
 *   mid-course correction, the heliocentric velocity is changed to the Lambert v1).
 * - 'capture': at the current point (normally periapsis at the target), the Δv that turns the
 *   current orbit into one of eccentricity `e` with the same periapsis (retrograde, along −V).
 * - 'plane': at the current point, the Δv that rotates the velocity about the radius vector to
 *   reach inclination `i` (best at a node).
 * - 'apsis': at the current point, the along-track Δv that puts the opposite apsis at `altitude`.
 * The resolved vector is reported in the result; solved burns never change the plan itself.
 */
export type BurnSolve =
  | { kind: 'fixed' }
  | {
      kind: 'transfer';
      to: string;
      arrive: number;
      revs?: number;
      retrograde?: boolean;
      /**
       * Direct transfers only (the target orbits the ship's central body, e.g. a mid-course
       * correction): aim off the target's centre so the arrival hyperbola's periapsis is at this
       * altitude above the target's mean radius, m. Omitted: aim at the centre.
       */
      periapsisAltitude?: number;
      /**
       * Direct transfers only: the target is a flyby body. The arc aims off its centre so that the
       * patched-conic hyperbola's outgoing asymptote matches the Lambert leg from the target (at the
       * periapsis time) to `next` arriving at `arrive` (s from epoch): periapsis radius and B-plane
       * angle of a powered flyby (no lower than the target's radius + safe altitude); with
       * `powered: false` of an unpowered one (|v∞| kept: the mismatch is left to a later
       * correction). Excludes `periapsisAltitude`.
       */
      flyby?: { next: string; arrive: number; powered?: boolean };
    }
  | { kind: 'capture'; e: number }
  | { kind: 'plane'; i: number }
  | { kind: 'apsis'; altitude: number };

export interface BurnEvent {
  type: 'burn';
  /** Stable id within the plan (used by the UI, corrections and reports). */
  id: string;
  name: string;
  /**
   * When the burn is centred, s from the epoch; null: at the end of the preceding event
   * (e.g. after "coast until periapsis").
   */
  t: number | null;
  frame: BurnFrame;
  /** Δv components in `frame`, m/s (for 'fixed'; for solved burns, a correction added on top). */
  dv: [number, number, number];
  solve: BurnSolve;
  /** Impulsive (instantaneous) or finite (integrated thrust, RK45). */
  mode: 'impulsive' | 'finite';
  /** Finite burns: thrust held along the velocity, or inertially fixed along the impulsive Δv. */
  pointing: 'velocity' | 'inertial';
}

/** The condition a coast runs until. */
export type CoastUntil =
  | { kind: 'time'; t: number }
  | { kind: 'duration'; dt: number }
  /**
   * Next apsis passage of the ship's conic; with `body`, only while the ship is in that body's
   * sphere of influence (e.g. "periapsis at the target"), otherwise whichever conic it is on.
   */
  | { kind: 'periapsis'; body?: string }
  | { kind: 'apoapsis'; body?: string }
  | { kind: 'soi-change' }
  /** First crossing of an altitude above the central body's mean radius (either direction). */
  | { kind: 'altitude'; altitude: number }
  /** Crossing the central body's equatorial plane (a node), ascending or descending or either. */
  | { kind: 'node'; which: 'ascending' | 'descending' | 'any' };

export interface CoastEvent {
  type: 'coast';
  id: string;
  name: string;
  until: CoastUntil;
}

/** Drop the active stage now (whatever propellant it has left is lost). */
export interface StageEvent {
  type: 'stage';
  id: string;
  name: string;
}

/**
 * Marks the pass of a flyby body: nothing is flown; the evaluation reports the pass (periapsis,
 * v∞ in and out, turn, B-plane, the free heliocentric Δv) from the ship's stay in the body's
 * sphere of influence nearest this point of the plan.
 */
export interface FlybyEvent {
  type: 'flyby';
  id: string;
  name: string;
  /** Body id passed. */
  body: string;
}

export type PlanEvent = BurnEvent | CoastEvent | StageEvent | FlybyEvent;

/** The orbit the plan must end in. */
export interface PlanTarget {
  body: string;
  /** Desired periapsis altitude above the mean radius, m. */
  periapsisAltitude: number;
  /** Desired eccentricity, or null when `apoapsisAltitude` is given instead (or neither). */
  e: number | null;
  /** Desired apoapsis altitude, m, or null. */
  apoapsisAltitude: number | null;
  /** Desired inclination to the system's reference plane, rad, or null for "any". */
  i: number | null;
  /** Tolerances used to say "reached": periapsis altitude (m), eccentricity, inclination (rad). */
  tolerance: { periapsisAltitude: number; e: number; i: number };
}

/** Δv held back by policy: percent of the planned Δv plus an absolute amount. */
export interface ReservePolicy {
  /** Percent of the total planned Δv, e.g. 5 for 5 %. */
  percent: number;
  /** Absolute reserve, m/s. */
  absolute: number;
}

/**
 * The model a plan's burns are targeted in (and its readouts show; the other models are
 * comparisons).
 * - 'conic': patched conics, each burn flown as its `mode` says (the evaluation as it always was).
 * - 'finite': patched conics with every burn flown finite at the vehicle's thrust, whatever its
 *   `mode` (gravity losses count).
 * - 'nbody': the restricted n-body model of core/dynamics, each burn flown as its `mode` says.
 */
export type TruthModel = 'conic' | 'finite' | 'nbody';

export interface Plan {
  name: string;
  description: string;
  vehicle: Vehicle;
  start: PlanStart;
  events: PlanEvent[];
  target: PlanTarget | null;
  reserve: ReservePolicy;
  /** Where the plan ends if its last event ends earlier (s from epoch), or null: at the last event. */
  end: number | null;
  /** Which model the plan's burns are targeted in and its readouts show; omitted: 'conic'. */
  truthModel?: TruthModel;
}
