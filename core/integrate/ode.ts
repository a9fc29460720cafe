/**
 * Shared shapes of the integrators: the right-hand side of a first-order system, the
 * acceleration of a second-order system, and the statistics every solve returns.
 */

/** First-order system y' = f(t, y). Write the derivative into `dydt`; do not keep `y` or `dydt`. */
export type OdeFunction = (t: number, y: Float64Array, dydt: Float64Array) => void;

/**
 * Second-order system x'' = a(t, x, v); n = x.length (3 per particle). Write the acceleration
 * into `out` (same length as x); do not keep the arrays, the integrators reuse them.
 */
export type AccelFunction = (t: number, x: Float64Array, v: Float64Array, out: Float64Array) => void;

/** Counts of one solve: accepted steps, rejected steps, evaluations of f (or of the acceleration). */
export interface SolveStats {
  accepted: number;
  rejected: number;
  fevals: number;
}

/**
 * One fixed-step method bound to an acceleration and a state size, with its scratch buffers.
 * `step` advances (x, v) in place from t by h (h may be negative) and returns the number of
 * acceleration evaluations it used. `reset` drops any acceleration cached from the last step
 * (call it if x or v were changed between steps).
 */
export interface FixedStepper {
  step(t: number, h: number, x: Float64Array, v: Float64Array): number;
  reset(): void;
}
