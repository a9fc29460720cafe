/**
 * What `evaluate(system, plan, options)` returns: everything the views, the budget and the
 * exports draw from. Plain data (typed arrays included) so it crosses a worker boundary by
 * structured clone. SI units and radians; times in s from the system epoch.
 */
import type { BurnFrame } from './plan.ts';

/** One trajectory piece flown on a single conic (between two events) or one finite burn. */
export interface TrajectorySegment {
  kind: 'coast' | 'burn';
  /** Index of the body whose sphere of influence the ship is in. */
  central: number;
  t0: number;
  t1: number;
  /**
   * The exact conic of a coast: the state [r, v] relative to `central` at t0; any time in
   * [t0, t1] is the Kepler propagation of it. For a finite burn: the state at t0.
   */
  state0: Float64Array;
  /** μ of the conic (central body's μ). */
  mu: number;
  /** Times of the drawing samples (s). */
  sampleT: Float64Array;
  /** Drawing samples: positions relative to `central`, xyz interleaved (3 per sample), m. */
  samples: Float64Array;
  /** Ship mass at t0 and t1, kg. */
  mass0: number;
  mass1: number;
}

export type TrajectoryEventKind =
  | 'start'
  | 'burn-start'
  | 'burn'
  | 'burn-end'
  | 'stage'
  | 'soi-exit'
  | 'soi-entry'
  | 'periapsis'
  | 'apoapsis'
  | 'node'
  /** The altitude a coast waited for ('altitude' coast condition). */
  | 'altitude'
  | 'closest-approach'
  | 'atmosphere-entry'
  | 'impact'
  | 'end';

export interface TrajectoryEvent {
  kind: TrajectoryEventKind;
  t: number;
  /** Central body at the event. */
  central: number;
  /** Other body concerned (SOI entered/left, closest-approach body), or −1. */
  body: number;
  /** Distance from the central body (or from `body` for closest approach), m. */
  distance: number;
  /** Altitude above the central (or `body`) mean radius, m. */
  altitude: number;
  /** Id of the plan event this came from, or null. */
  planEventId: string | null;
  /** Plain text for lists and timelines: "leaves Tessel's sphere of influence". */
  label: string;
}

export type FlagCode =
  | 'negative-margin'
  | 'stage-dry-mid-burn'
  | 'long-burn'
  | 'atmosphere-entry'
  | 'impact'
  | 'target-missed'
  | 'out-of-propellant'
  | 'solve-failed'
  /** A burn or coast time lies before the end of the preceding event; it was flown at once. */
  | 'out-of-order'
  /** A 'stage' event found no stage left to drop. */
  | 'no-stage-left'
  /** A coast condition was not met within the evaluation's maxDuration (the coast stopped there). */
  | 'condition-not-met'
  /** A flyby's periapsis lies below the body's minimum safe altitude. */
  | 'flyby-low'
  /** A flyby marker found no pass of its body (the ship never entered its sphere of influence). */
  | 'flyby-missed';

export interface Flag {
  code: FlagCode;
  severity: 'error' | 'warning' | 'info';
  message: string;
  /** Plan event concerned, or null for the plan as a whole. */
  planEventId: string | null;
}

/** One row of the Δv budget per burn. */
export interface BudgetRow {
  planEventId: string;
  name: string;
  /** Burn centre, start and end (start = centre − duration/2, common practice), s. */
  t: number;
  tStart: number;
  tEnd: number;
  /** Δv magnitude, m/s (resolved for solved burns). */
  dv: number;
  /** Resolved Δv as components in the burn's frame and in inertial axes, m/s. */
  frame: BurnFrame;
  dvFrame: [number, number, number];
  dvInertial: [number, number, number];
  /** Burn duration at the current mass and thrust (across staging if a stage runs dry), s. */
  duration: number;
  propellantUsed: number;
  massBefore: number;
  massAfter: number;
  /** Names of the stages that fired during this burn, in order. */
  stages: string[];
  /** Δv the vehicle can still deliver after this burn, m/s. */
  dvLeft: number;
  /** Δv the burn could not deliver for want of propellant, m/s (0 when it was completed). */
  dvMissing?: number;
  /** Finite burns: Δv lost to gravity against the impulsive burn, m/s; null for impulsive. */
  gravityLoss: number | null;
  /** Duration as a fraction of the orbital period at the burn (Infinity on a hyperbola: null). */
  periodFraction: number | null;
  flags: Flag[];
}

export interface Budget {
  rows: BudgetRow[];
  /** Sum of burn Δv, m/s. */
  total: number;
  /** Δv capacity of the full vehicle before the first burn, m/s. */
  capacity: number;
  /** Reserve required by the policy, m/s. */
  reserve: number;
  /** Δv left after the last burn, m/s. */
  dvLeft: number;
  /** dvLeft − reserve, m/s: the margin. Negative means the plan does not close. */
  margin: number;
  propellantUsed: number;
  finalMass: number;
  /**
   * Burns that could not be solved or flown as planned (flag 'solve-failed'), with their budget
   * row number from 1. While any is listed the margin is not valid: the plan does not hold.
   */
  failedBurns: { planEventId: string; name: string; row: number }[];
  /**
   * Flybys beside the burns: the free heliocentric Δv |v∞ out − v∞ in| of each pass (not spent,
   * not in `total`); null when the ship did not leave the body. Absent when the plan has none.
   */
  flybys?: { planEventId: string; name: string; freeDv: number | null }[];
}

/** What a flyby plan event reports (core/conic/flybyReport.ts). SI units, rad. */
export interface FlybyReport {
  planEventId: string;
  name: string;
  /** Body index passed. */
  body: number;
  /** SOI entry and exit times (exit null when the ship did not leave), s. */
  tEntry: number;
  tExit: number | null;
  /** Periapsis of the incoming hyperbola: time, radius and altitude above the mean radius. */
  tPeriapsis: number;
  periapsisRadius: number;
  periapsisAltitude: number;
  /** v∞ in (incoming asymptote) and out (outgoing asymptote of the last conic inside), m/s. */
  vInfIn: [number, number, number];
  vInfOut: [number, number, number] | null;
  /** Angle between v∞ in and out, rad (null without v∞ out). */
  turn: number | null;
  /** B-plane of the incoming hyperbola: B·T, B·R (m), θ = atan2(B·R, B·T) (rad). */
  bT: number;
  bR: number;
  bAngle: number;
  /** |v∞ out − v∞ in|, m/s: the heliocentric Δv of the pass (null without v∞ out). */
  freeDv: number | null;
  /** Δv burned inside the sphere during the pass, m/s. */
  dvBurned: number;
  /**
   * How a model that flies the pass itself found the periapsis (n-body): 'probe' (flown to
   * x·v = 0) or 'osculating' (the hyperbola at entry). Absent: the incoming conic's periapsis.
   */
  periapsisMethod?: 'probe' | 'osculating';
}

/** How the final orbit compares with the plan's target. */
export interface TargetReport {
  body: number;
  reached: boolean;
  /** Achieved values at the end of the plan (orbit about the target body), or null when the ship is not there. */
  achieved: { periapsisAltitude: number; apoapsisAltitude: number | null; e: number; i: number } | null;
  desired: { periapsisAltitude: number; e: number | null; apoapsisAltitude: number | null; i: number | null };
  /** Closest approach to the target body over the whole plan. */
  closestApproach: { t: number; distance: number; altitude: number } | null;
}

export interface PlanResult {
  /** Start and end time of the flown plan, s. */
  t0: number;
  t1: number;
  segments: TrajectorySegment[];
  events: TrajectoryEvent[];
  budget: Budget;
  target: TargetReport | null;
  flags: Flag[];
  /** Flyby plan events, in plan order (absent when the plan has none). */
  flybys?: FlybyReport[];
  /** Model used: patched conics. */
  model: 'conic';
}
