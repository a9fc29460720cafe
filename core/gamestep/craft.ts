/**
 * One craft as a game holds it (position and velocity relative to a floating origin, in the
 * game's precision), the game integrators' names, orders and costs, and the gravity callback
 * type the kernels share (see kernel.ts for the loops' contract).
 */
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
