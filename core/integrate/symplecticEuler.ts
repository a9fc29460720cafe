/**
 * Semi-implicit (symplectic) Euler, the form common in game loops: v ← v + h·a(t, x, v), then
 * x ← x + h·v with the new v (Hairer, Lubich & Wanner, Geometric Numerical Integration, 2nd ed.,
 * §VI.3, Theorem 3.3). First order, symplectic for forces a(t, x): energy error stays bounded.
 */
import type { AccelFunction, FixedStepper } from './ode.ts';

export function symplecticEulerStepper(accel: AccelFunction, n: number): FixedStepper {
  const a = new Float64Array(n);
  return {
    step(t, h, x, v) {
      accel(t, x, v, a);
      for (let i = 0; i < n; i++) {
        v[i] += h * a[i];
        x[i] += h * v[i];
      }
      return 1;
    },
    reset() {},
  };
}
