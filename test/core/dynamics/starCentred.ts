/**
 * The ship force model written plainly, for tests: the star-centred equations of the restricted
 * n-body problem with the indirect term (Battin, An Introduction to the Mathematics and Methods
 * of Astrodynamics, §8.4; Montenbruck & Gill, Satellite Orbits, §3.3),
 *   a_S(X, t) = −μ_0 X/|X|³ + Σ_{k pulling, k≠star} μ_k [ (R_k − X)/|R_k − X|³ − R_k/|R_k|³ ],
 * the bodies at their conic ephemeris positions R_k (core/system/ephemeris.ts), flown by odex
 * (Hairer's ODEX extrapolation code, npm: an integrator the project did not write) in units
 * scaled to 1.5e11 m so its tolerances are relative to star-centred numbers. No origin body,
 * no grouping of terms, no shared code with core/dynamics.
 */
import { bodyPosition } from '../../../core/system/ephemeris.ts';
import type { StarSystem } from '../../../core/system/model.ts';
import { ODEX_CONVERGED, odexSolve } from '../integrate/odexRef.ts';

/** Length scale of the odex flights, m. */
export const L = 1.5e11;

/** Which bodies pull (all when omitted). */
function pulling(sys: StarSystem, pull?: readonly string[]): boolean[] {
  return sys.bodies.map((b) => pull === undefined || pull.includes(b.id));
}

/** a_S(X, t): the star-centred acceleration, written plainly. */
export function starCentredAccel(sys: StarSystem, t: number, X: ArrayLike<number>, pull?: readonly string[]): number[] {
  const on = pulling(sys, pull);
  const mu0 = on[0] ? sys.bodies[0].mu : 0;
  const r = Math.hypot(X[0], X[1], X[2]);
  const a = [0, 1, 2].map((i) => (-mu0 * X[i]) / r ** 3);
  const p = [0, 0, 0];
  for (const b of sys.bodies) {
    if (b.index === 0 || !on[b.index]) continue;
    bodyPosition(sys, b.index, t, p, 0);
    const d = [p[0] - X[0], p[1] - X[1], p[2] - X[2]];
    const dn = Math.hypot(d[0], d[1], d[2]) ** 3;
    const pn = Math.hypot(p[0], p[1], p[2]) ** 3;
    for (let i = 0; i < 3; i++) a[i] += b.mu * (d[i] / dn - p[i] / pn);
  }
  return a;
}

/** R̈_o: body o's acceleration on its ephemeris, Σ along its chain of −orbitMu_j c_j/|c_j|³. */
export function ephemerisAccel(sys: StarSystem, o: number, t: number): number[] {
  const a = [0, 0, 0];
  const c = [0, 0, 0];
  for (let j = o; j !== 0; j = sys.bodies[j].parentIndex) {
    bodyPosition(sys, j, t, c, sys.bodies[j].parentIndex);
    const r3 = Math.hypot(c[0], c[1], c[2]) ** 3;
    for (let i = 0; i < 3; i++) a[i] -= (sys.bodies[j].derived.orbitMu * c[i]) / r3;
  }
  return a;
}

/**
 * Flies the star-centred equations with odex from star-relative state s0 at t0 to tEnd, adding
 * the impulses (inertial Δv at their times) on the way; returns the star-relative end state.
 */
export function flyStarCentred(
  sys: StarSystem,
  t0: number,
  s0: ArrayLike<number>,
  impulses: readonly { t: number; dv: ArrayLike<number> }[],
  tEnd: number,
  rtol: number,
  pull?: readonly string[],
): number[] {
  const V = Math.sqrt(sys.bodies[0].mu / L);
  const T = L / V;
  const f = (tt: number, y: number[]): number[] => {
    const a = starCentredAccel(sys, tt * T, [y[0] * L, y[1] * L, y[2] * L], pull);
    return [y[3], y[4], y[5], (a[0] * T) / V, (a[1] * T) / V, (a[2] * T) / V];
  };
  let y = [s0[0] / L, s0[1] / L, s0[2] / L, s0[3] / V, s0[4] / V, s0[5] / V];
  let t = t0;
  const stops = [...impulses.filter((p) => p.t >= t0 && p.t <= tEnd)].sort((a, b) => a.t - b.t);
  for (const stop of [...stops, { t: tEnd, dv: [0, 0, 0] }]) {
    if (stop.t > t) {
      const res = odexSolve(f, t / T, y, stop.t / T, rtol, rtol);
      if (res.outcome !== ODEX_CONVERGED) throw new Error(`odex did not converge (outcome ${res.outcome})`);
      y = res.y;
      t = stop.t;
    }
    for (let i = 0; i < 3; i++) y[3 + i] += stop.dv[i] / V;
  }
  return [y[0] * L, y[1] * L, y[2] * L, y[3] * V, y[4] * V, y[5] * V];
}
