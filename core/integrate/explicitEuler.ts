/**
 * Explicit (forward) Euler on the first-order form of x'' = a: x ← x + h·v, v ← v + h·a(x, v),
 * both from the old state (Hairer, Nørsett & Wanner, Solving ODEs I, 2nd ed., §I.7). First order,
 * not symplectic: on a Kepler orbit its energy grows secularly. Kept as a comparison method.
 */
import type { AccelFunction, FixedStepper } from './ode.ts';

export function explicitEulerStepper(accel: AccelFunction, n: number): FixedStepper {
  const a = new Float64Array(n);
  return {
    step(t, h, x, v) {
      accel(t, x, v, a);
      for (let i = 0; i < n; i++) {
        x[i] += h * v[i];
        v[i] += h * a[i];
      }
      return 1;
    },
    reset() {},
  };
}
