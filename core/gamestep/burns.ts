/**
 * The game-step check's burns and models: how gravity and burns are modelled in the game, and
 * one burn of the plan as the check flies it.
 */
import type { BurnEvent } from '../plan/index.ts';

export type GameGravity = 'central' | 'all';
export type GameBurnModel = 'impulsive' | 'spread';

/** One burn of the plan as the game-step check flies it (from the plan's budget rows). */
export interface GameBurn {
  id: string;
  name: string;
  /** Burn centre, s. */
  t: number;
  /** Start of the spread burn (centre − duration/2), s. */
  tStart: number;
  /** Duration at the vehicle's thrust, s (0: impulsive only). */
  duration: number;
  /** Inertial Δv delivered in the plan's evaluation, m/s (what 'open-loop' guidance flies). */
  dv: [number, number, number];
  /** |dv|, m/s. */
  dvMag: number;
  /** Mass at the start and end of the burn, kg. */
  mass0: number;
  mass1: number;
  /** Propellant flow, kg/s, and the thrust that delivers |dv| over the duration with it, N. */
  mdot: number;
  thrust: number;
  /** The plan's burn event (its solve and frame components), for 'resolve' guidance; null: fly dv. */
  event: BurnEvent | null;
  /** The plan's central body at the burn (what its solve is relative to). */
  central: number;
  /** Fraction of the Δv the vehicle delivers (< 1 when it runs out of propellant). */
  fraction: number;
}
