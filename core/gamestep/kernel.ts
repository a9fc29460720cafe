/**
 * The inner loop of the game-step check: one craft stepped with a game's fixed-step integrator,
 * in the game's arithmetic precision, with an optional floating origin.
 *
 * Methods (the same formulas, in the same order of operations, as core/integrate):
 * - 'symplectic-euler': v ← v + h·a(x), then x ← x + h·v with the new v (Hairer, Lubich &
 *   Wanner, Geometric Numerical Integration, 2nd ed., §VI.3);
 * - 'verlet': velocity Verlet, kick–drift–kick, the end-of-step gravity kept for the next step
 *   (ibid. §I.1.4);
 * - 'explicit-euler': x ← x + h·v, v ← v + h·a(x), both from the old state (Hairer, Nørsett &
 *   Wanner, Solving ODEs I, 2nd ed., §I.7);
 * - 'rk4': classic Runge–Kutta on (x, v) (ibid. §II.1, Table 1.2 left).
 * In float64 with no thrust and no floating origin the loops agree bit for bit with
 * core/integrate's steppers driven by `spacecraftAccel` (tested).
 *
 * Precision: `round` is applied to the result of every arithmetic operation on the state, the
 * thrust and the acceleration (Math.fround for float32: exactly binary32 arithmetic, see
 * float32.ts; the identity for float64). Time, the origin and the ephemeris stay in double, as
 * game engines keep them.
 *
 * Floating origin: the craft's position p and velocity u are stored relative to an origin whose
 * position relative to the frame centre is O(t) = O₀ + W·(t − t_O) (double). Rebasing (done by
 * the caller, flight.ts) moves O to the craft and sets p = 0 (and, with velocity
 * rebasing, W to the craft's velocity and u = 0). The origin moves uniformly, so no fictitious
 * force arises.
 *
 * Thrust: a constant acceleration (tx, ty, tz) held over each step (a game sets its forces once
 * per physics step); it is added to gravity at every evaluation within the step.
 *
 * Stops: after each step the loop stops early when |p|² exceeds `rebase2` (the floating-origin
 * threshold) or |O(t) + p|² exceeds `exit2` (leaving the central body's sphere of influence);
 * the caller then acts and resumes. Nothing allocates.
 */
import * as kernel32 from './kernelF32.ts';
import * as kernel64 from './kernelF64.ts';

import type { GameAccel, GameCraft, GameIntegrator } from './craft.ts';

export { EVALS_PER_STEP, GAME_INTEGRATORS, GameCraft, METHOD_ORDER } from './craft.ts';
export type { GameAccel, GameIntegrator } from './craft.ts';

/** The loops and gravity builders of one precision. */
export interface GameKernel {
  advance: (c: GameCraft, method: GameIntegrator, t0: number, h: number, n: number) => number;
  centralGravity: (c: GameCraft, mu: number) => GameAccel;
  bodiesGravity: (c: GameCraft, mus: ArrayLike<number>, positions: (t: number, out: Float64Array) => void) => GameAccel;
}

export type GamePrecision = 'float64' | 'float32';

const KERNELS: Record<GamePrecision, GameKernel> = { float64: kernel64, float32: kernel32 };

/** The kernel of a precision. */
export function kernelFor(precision: GamePrecision): GameKernel {
  return KERNELS[precision];
}
