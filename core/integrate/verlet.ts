/**
 * Velocity Verlet (leapfrog, kick–drift–kick): v½ = v + (h/2)·a(x), x ← x + h·v½,
 * v ← v½ + (h/2)·a(x_new) (Hairer, Lubich & Wanner, Geometric Numerical Integration, 2nd ed.,
 * §I.1.4 Störmer–Verlet). Second order, symplectic and time-reversible for forces a(t, x).
 *
 * The acceleration at the end of a step is kept for the start of the next (one evaluation per
 * step after the first). A velocity-dependent acceleration is evaluated with the half-step
 * velocity v½; the method is then no longer symplectic.
 */
import type { AccelFunction, FixedStepper } from './ode.ts';

export function verletStepper(accel: AccelFunction, n: number): FixedStepper {
  const a = new Float64Array(n);
  let cached = false;
  return {
    step(t, h, x, v) {
      let used = 0;
      if (!cached) {
        accel(t, x, v, a);
        used++;
      }
      const hh = 0.5 * h;
      for (let i = 0; i < n; i++) {
        v[i] += hh * a[i];
        x[i] += h * v[i];
      }
      accel(t + h, x, v, a);
      used++;
      for (let i = 0; i < n; i++) v[i] += hh * a[i];
      cached = true;
      return used;
    },
    reset() {
      cached = false;
    },
  };
}
