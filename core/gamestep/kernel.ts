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

/** The integrators a game-step check can fly. */
export type GameIntegrator = 'symplectic-euler' | 'verlet' | 'explicit-euler' | 'rk4';

export const GAME_INTEGRATORS: readonly GameIntegrator[] = ['symplectic-euler', 'verlet', 'explicit-euler', 'rk4'];

/** Acceleration evaluations per step (Verlet: one after its first step). */
export const EVALS_PER_STEP: Readonly<Record<GameIntegrator, number>> = {
  'symplectic-euler': 1,
  verlet: 1,
  'explicit-euler': 1,
  rk4: 4,
};

/** Order of accuracy of each method (global error ∝ h^order). */
export const METHOD_ORDER: Readonly<Record<GameIntegrator, number>> = {
  'symplectic-euler': 1,
  verlet: 2,
  'explicit-euler': 1,
  rk4: 4,
};

/**
 * Gravity on the craft at position (px, py, pz) relative to the origin, time t: writes the
 * acceleration (in the game's precision) into out[0..2].
 */
export type GameAccel = (t: number, px: number, py: number, pz: number, out: Float64Array) => void;

/** One craft's state as a game holds it, plus the stop thresholds of the kernel. */
export class GameCraft {
  // position and velocity relative to the origin (game precision)
  px = 0;
  py = 0;
  pz = 0;
  ux = 0;
  uy = 0;
  uz = 0;
  // origin relative to the frame centre: O(t) = (ox, oy, oz) + (wx, wy, wz)·(t − tOrigin), double
  ox = 0;
  oy = 0;
  oz = 0;
  wx = 0;
  wy = 0;
  wz = 0;
  tOrigin = 0;
  // thrust acceleration held over the step (game precision)
  tx = 0;
  ty = 0;
  tz = 0;
  // gravity at the current position, kept by Verlet between steps
  gx = 0;
  gy = 0;
  gz = 0;
  gValid = false;
  /** |p|² above which the kernel stops (floating-origin threshold squared; Infinity: none). */
  rebase2 = Infinity;
  /** |O(t) + p|² above which the kernel stops (SOI radius squared; Infinity: none). */
  exit2 = Infinity;
  /** Acceleration evaluations so far. */
  evals = 0;
  /** Acceleration scratch. */
  readonly a = new Float64Array(3);
  accel: GameAccel;

  constructor(readonly round: (x: number) => number) {
    this.accel = zeroAccel;
  }

  /** Origin position at time t relative to the frame centre, into out[0..2] (double). */
  originAt(t: number, out: Float64Array | number[]): void {
    const s = t - this.tOrigin;
    out[0] = this.ox + this.wx * s;
    out[1] = this.oy + this.wy * s;
    out[2] = this.oz + this.wz * s;
  }
}

function zeroAccel(_t: number, _x: number, _y: number, _z: number, out: Float64Array): void {
  out[0] = out[1] = out[2] = 0;
}

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
