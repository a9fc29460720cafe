/**
 * Orbit elements written plainly for the targeting tests, sharing no code with core/.
 */

/** Periapsis radius, inclination and eccentricity of a state about a body of gravitational parameter mu, by the vector formulas (Curtis, Orbital Mechanics for Engineering Students, Algorithm 4.2). */
export function elements(mu: number, s: ArrayLike<number>): { rp: number; i: number; e: number } {
  const r = [s[0], s[1], s[2]];
  const v = [s[3], s[4], s[5]];
  const h = [r[1] * v[2] - r[2] * v[1], r[2] * v[0] - r[0] * v[2], r[0] * v[1] - r[1] * v[0]];
  const hn = Math.hypot(h[0], h[1], h[2]);
  const rn = Math.hypot(r[0], r[1], r[2]);
  const vr = (r[0] * v[0] + r[1] * v[1] + r[2] * v[2]) / rn;
  const v2 = v[0] ** 2 + v[1] ** 2 + v[2] ** 2;
  const ev = [0, 1, 2].map((k) => ((v2 - mu / rn) * r[k] - rn * vr * v[k]) / mu);
  const e = Math.hypot(ev[0], ev[1], ev[2]);
  return { rp: (hn * hn) / mu / (1 + e), i: Math.acos(h[2] / hn), e };
}
