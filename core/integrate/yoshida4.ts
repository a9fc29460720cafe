/**
 * Yoshida's 4th-order symmetric composition of leapfrog (Yoshida, "Construction of higher order
 * symplectic integrators", Phys. Lett. A 150 (1990) 262): three kick–drift–kick substeps of
 * w1·h, w0·h, w1·h with w1 = 1/(2 − 2^{1/3}), w0 = −2^{1/3}/(2 − 2^{1/3}).
 * Fourth order, symplectic and time-reversible for forces a(t, x); the middle substep runs
 * backward in time. Three evaluations per step (the end acceleration of each substep is the
 * start of the next).
 */
import type { AccelFunction, FixedStepper } from './ode.ts';

const CBRT2 = Math.cbrt(2);
/** Outer substep weight w1 = 1/(2 − 2^{1/3}). */
export const YOSHIDA_W1 = 1 / (2 - CBRT2);
/** Middle substep weight w0 = −2^{1/3}/(2 − 2^{1/3}) = 1 − 2·w1. */
export const YOSHIDA_W0 = -CBRT2 / (2 - CBRT2);

export function yoshida4Stepper(accel: AccelFunction, n: number): FixedStepper {
  const a = new Float64Array(n);
  let cached = false;
  const w1 = YOSHIDA_W1;
  const w0 = YOSHIDA_W0;
  const sub = (t: number, h: number, x: Float64Array, v: Float64Array): void => {
    const hh = 0.5 * h;
    for (let i = 0; i < n; i++) {
      v[i] += hh * a[i];
      x[i] += h * v[i];
    }
    accel(t + h, x, v, a);
    for (let i = 0; i < n; i++) v[i] += hh * a[i];
  };
  return {
    step(t, h, x, v) {
      let used = 3;
      if (!cached) {
        accel(t, x, v, a);
        used++;
      }
      sub(t, w1 * h, x, v);
      sub(t + w1 * h, w0 * h, x, v);
      sub(t + (w1 + w0) * h, w1 * h, x, v);
      cached = true;
      return used;
    },
    reset() {
      cached = false;
    },
  };
}
