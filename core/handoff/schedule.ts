/**
 * A burn schedule for a game: the burns a game's physics loop applies, at whole steps of its fixed
 * step, with fixed Δv vectors (open loop: the game does not re-solve them), as retargeting
 * (retarget.ts) makes them. All values SI, Waymark's axes: star-centred, non-rotating, x and y in
 * the system's reference plane, z towards its north pole (right-handed). Conversion to a game's
 * units and axes is core/io gameSchedule.ts.
 */
import type { GamePhysics } from '../gamestep/index.ts';

/** Thrust spread over steps: the game holds the acceleration thrust/mass along `direction` each step until |Δv| is delivered. */
export interface ScheduledThrust {
  /** Steps the engine burns (the last at part throttle). */
  steps: number;
  /** Unit vector of the thrust. */
  direction: [number, number, number];
  /** Thrust, N; mass at the first step, kg; propellant flow, kg/s. */
  thrust: number;
  mass0: number;
  mdot: number;
  /** Δv of the first step and of the last (part-throttle) step, m/s. */
  firstStepDv: number;
  lastStepDv: number;
}

export interface ScheduledBurn {
  /** The plan's burn event id and name. */
  id: string;
  name: string;
  /** Game step index counted from the schedule's step 0: the Δv is added before this step is integrated (impulsive), or the engine starts at it (spread). */
  step: number;
  /** Time of that step, s from the system epoch (= schedule.t0 + step·dt). */
  t: number;
  /** Inertial Δv, m/s (Waymark axes). */
  dv: [number, number, number];
  /** |dv|, m/s. */
  dvMag: number;
  /**
   * The same Δv in the burn frame of the game's own state at the burn, relative to the central
   * body: [velocity, normal (orbit normal), binormal (velocity × normal)], m/s.
   */
  dvBurnFrame: [number, number, number];
  /** Δv minus the reference plan's Δv for this burn (inertial), m/s. */
  change: [number, number, number];
  /** Body the game's frame is centred on at the burn (its name). */
  central: string;
  /** Spread burns; null for an impulse at the step. */
  thrust: ScheduledThrust | null;
}

export interface GameSchedule {
  /** Plan and system names. */
  plan: string;
  system: string;
  /** The game's physics the schedule is made for. */
  physics: GamePhysics;
  /** Time of step 0, s from the system epoch. */
  t0: number;
  /** The ship at step 0: its central body and state relative to it [x, y, z, vx, vy, vz] (m, m/s). */
  start: { central: string; state: [number, number, number, number, number, number] };
  /** Last step of the plan (the schedule runs from step 0 to this one). */
  endStep: number;
  burns: ScheduledBurn[];
}
