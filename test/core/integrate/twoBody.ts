/**
 * Analytic two-body reference for the integrator tests, independent of the project's orbit code:
 * an ellipse from classical elements, Kepler's equation M = E − e·sin E solved by Newton's method
 * (Curtis, Orbital Mechanics for Engineering Students, 3rd ed., Algorithm 3.1, from memory),
 * perifocal position/velocity from E, rotated by R3(−Ω)·R1(−i)·R3(−ω).
 */

export interface Ellipse {
  mu: number;
  a: number;
  e: number;
  /** Inclination, RAAN, argument of periapsis (rad). */
  i: number;
  raan: number;
  argp: number;
  /** Mean anomaly at t = 0 (rad). */
  M0: number;
}

export function meanMotion(o: Ellipse): number {
  return Math.sqrt(o.mu / (o.a * o.a * o.a));
}

export function period(o: Ellipse): number {
  return (2 * Math.PI) / meanMotion(o);
}

/** Eccentric anomaly from mean anomaly (Newton, to machine precision). */
export function solveKepler(M: number, e: number): number {
  const Mr = M - 2 * Math.PI * Math.floor(M / (2 * Math.PI));
  let E = e < 0.8 ? Mr : Math.PI;
  for (let k = 0; k < 50; k++) {
    const dE = (E - e * Math.sin(E) - Mr) / (1 - e * Math.cos(E));
    E -= dE;
    if (Math.abs(dE) < 1e-15) break;
  }
  return E + (M - Mr);
}

/** Perifocal → inertial rotation matrix (rows). */
function rotation(o: Ellipse): number[][] {
  const cO = Math.cos(o.raan),
    sO = Math.sin(o.raan);
  const ci = Math.cos(o.i),
    si = Math.sin(o.i);
  const cw = Math.cos(o.argp),
    sw = Math.sin(o.argp);
  return [
    [cO * cw - sO * sw * ci, -cO * sw - sO * cw * ci, sO * si],
    [sO * cw + cO * sw * ci, -sO * sw + cO * cw * ci, -cO * si],
    [sw * si, cw * si, ci],
  ];
}

/** State [x, y, z, vx, vy, vz] at time t. */
export function stateAt(o: Ellipse, t: number): Float64Array {
  const nm = meanMotion(o);
  const E = solveKepler(o.M0 + nm * t, o.e);
  const cE = Math.cos(E),
    sE = Math.sin(E);
  const b = o.a * Math.sqrt(1 - o.e * o.e);
  const px = o.a * (cE - o.e);
  const py = b * sE;
  const edot = nm / (1 - o.e * cE);
  const vx = -o.a * sE * edot;
  const vy = b * cE * edot;
  const R = rotation(o);
  const s = new Float64Array(6);
  for (let k = 0; k < 3; k++) {
    s[k] = R[k][0] * px + R[k][1] * py;
    s[k + 3] = R[k][0] * vx + R[k][1] * vy;
  }
  return s;
}

/** Time (> tAfter, first occurrence) at which the true anomaly equals nu. */
export function timeOfTrueAnomaly(o: Ellipse, nu: number, tAfter: number): number {
  const E = 2 * Math.atan(Math.sqrt((1 - o.e) / (1 + o.e)) * Math.tan(nu / 2));
  const M = E - o.e * Math.sin(E);
  const nm = meanMotion(o);
  const P = (2 * Math.PI) / nm;
  let t = (M - o.M0) / nm;
  t -= P * Math.floor((t - tAfter) / P);
  if (t <= tAfter) t += P;
  return t;
}

/** Two-body derivative y = [r, v] → [v, −μ r/|r|³]. */
export function twoBodyOde(mu: number) {
  return (_t: number, y: Float64Array, dy: Float64Array): void => {
    const x = y[0],
      yy = y[1],
      z = y[2];
    const r2 = x * x + yy * yy + z * z;
    const k = -mu / (r2 * Math.sqrt(r2));
    dy[0] = y[3];
    dy[1] = y[4];
    dy[2] = y[5];
    dy[3] = k * x;
    dy[4] = k * yy;
    dy[5] = k * z;
  };
}

/** Two-body acceleration on x (3 components) for the second-order integrators. */
export function twoBodyAccel(mu: number) {
  return (_t: number, x: Float64Array, _v: Float64Array, out: Float64Array): void => {
    const r2 = x[0] * x[0] + x[1] * x[1] + x[2] * x[2];
    const k = -mu / (r2 * Math.sqrt(r2));
    out[0] = k * x[0];
    out[1] = k * x[1];
    out[2] = k * x[2];
  };
}

export function specificEnergy(mu: number, x: ArrayLike<number>, v: ArrayLike<number>): number {
  const r = Math.hypot(x[0], x[1], x[2]);
  return 0.5 * (v[0] * v[0] + v[1] * v[1] + v[2] * v[2]) - mu / r;
}

export function posError(a: ArrayLike<number>, b: ArrayLike<number>): number {
  return Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
}

/** Least-squares slope of y against x. */
export function slope(x: ArrayLike<number>, y: ArrayLike<number>): number {
  const n = x.length;
  let sx = 0,
    sy = 0;
  for (let i = 0; i < n; i++) {
    sx += x[i];
    sy += y[i];
  }
  const mx = sx / n,
    my = sy / n;
  let sxy = 0,
    sxx = 0;
  for (let i = 0; i < n; i++) {
    sxy += (x[i] - mx) * (y[i] - my);
    sxx += (x[i] - mx) ** 2;
  }
  return sxy / sxx;
}
