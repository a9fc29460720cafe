/**
 * Classic 4th-order Runge–Kutta on the first-order form y = (x, v), y' = (v, a(t, x, v))
 * (Hairer, Nørsett & Wanner, Solving ODEs I, 2nd ed., §II.1, Table 1.2 left). Fourth order, not
 * symplectic: on a Kepler orbit its energy error grows secularly. Kept as a comparison method.
 */
import type { AccelFunction, FixedStepper } from './ode.ts';

export function rk4Stepper(accel: AccelFunction, n: number): FixedStepper {
  const xs = new Float64Array(n);
  const vs = new Float64Array(n);
  const a1 = new Float64Array(n);
  const a2 = new Float64Array(n);
  const a3 = new Float64Array(n);
  const a4 = new Float64Array(n);
  const v2 = new Float64Array(n);
  const v3 = new Float64Array(n);
  return {
    step(t, h, x, v) {
      const hh = 0.5 * h;
      accel(t, x, v, a1);
      for (let i = 0; i < n; i++) {
        xs[i] = x[i] + hh * v[i];
        vs[i] = v2[i] = v[i] + hh * a1[i];
      }
      accel(t + hh, xs, vs, a2);
      for (let i = 0; i < n; i++) {
        xs[i] = x[i] + hh * v2[i];
        vs[i] = v3[i] = v[i] + hh * a2[i];
      }
      accel(t + hh, xs, vs, a3);
      for (let i = 0; i < n; i++) {
        xs[i] = x[i] + h * v3[i];
        vs[i] = v[i] + h * a3[i];
      }
      accel(t + h, xs, vs, a4);
      const h6 = h / 6;
      for (let i = 0; i < n; i++) {
        x[i] += h6 * (v[i] + 2 * v2[i] + 2 * v3[i] + vs[i]);
        v[i] += h6 * (a1[i] + 2 * a2[i] + 2 * a3[i] + a4[i]);
      }
      return 4;
    },
    reset() {},
  };
}
