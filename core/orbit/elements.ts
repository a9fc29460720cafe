/**
 * Classical orbital elements ↔ Cartesian state, for every conic.
 *
 * stateToElements follows Curtis, Orbital Mechanics for Engineering Students, Algorithm 4.2
 * (Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., Algorithm 9, RV2COE),
 * with every angle taken by atan2 of a sine and a cosine (no acos loss near 0 and π).
 * elementsToState follows Curtis Algorithm 4.5 (Vallado Algorithm 10, COE2RV): the perifocal
 * state from p, e, ν, rotated by Rz(Ω)·Rx(i)·Rz(ω).
 *
 * Conventions for the singular cases, the same in both directions so that
 * elementsToState(stateToElements(x)) reproduces x:
 * - Equatorial (|sin i| < EQUATORIAL_TOLERANCE, i.e. i ≈ 0 or i ≈ π): Ω = 0, the node line
 *   is taken as the +x axis, so ω is the longitude of periapsis measured from +x in the
 *   direction of motion (about the angular-momentum vector; for i ≈ π that is clockwise seen
 *   from +z). i keeps its computed (tiny, or near-π) value.
 * - Circular inclined (e < CIRCULAR_TOLERANCE): ω = 0 and ν is the argument of latitude u
 *   (angle from the ascending node to r).
 * - Circular equatorial: Ω = ω = 0 and ν is the true longitude (angle from +x to r, about h).
 *   e keeps its computed tiny value.
 * - Parabola: a = Infinity only when e == 1 exactly; a near-parabolic orbit gets a huge a of
 *   the right sign (a = p/(1 − e²)). p is always defined and is what elementsToState prefers.
 * - Rectilinear states (|r × v| < RECTILINEAR_TOLERANCE·|r||v|, including v = 0) have no
 *   orbital plane: InputError.
 * Ranges: i ∈ [0, π]; Ω, ω ∈ [0, 2π); ν ∈ [0, 2π) for e < 1 (and for circular orbits),
 * ν ∈ (−ν∞, ν∞) ⊂ (−π, π) for e ≥ 1. The range follows the computed e, so a parabolic state
 * whose e rounds to 1 − 1e-16 gets ν in [0, 2π) like any ellipse.
 */
import { InputError, requireFinite, requireFiniteVector, requireNonNegative, requirePositive } from '../math/index.ts';
import { perifocalToInertial } from '../math/index.ts';
import type { Vec3Like } from '../math/index.ts';

export interface Elements {
  /** Semi-major axis, m (negative for a hyperbola, Infinity for the parabola). */
  a: number;
  /** Eccentricity. */
  e: number;
  /** Inclination, rad [0, π]. */
  i: number;
  /** Right ascension / longitude of the ascending node Ω, rad [0, 2π). */
  raan: number;
  /** Argument of periapsis ω, rad [0, 2π). */
  argp: number;
  /** True anomaly ν, rad (elliptic: [0, 2π); hyperbolic: (−ν∞, ν∞)). */
  nu: number;
  /** Semi-latus rectum, m (always defined, also for the parabola). */
  p: number;
}

/** e below this counts as circular. */
export const CIRCULAR_TOLERANCE = 1e-11;
/** |sin i| below this counts as equatorial. */
export const EQUATORIAL_TOLERANCE = 1e-11;
/** |r × v| below this fraction of |r||v| counts as rectilinear (no orbital plane). */
export const RECTILINEAR_TOLERANCE = 1e-14;

const TWO_PI = 2 * Math.PI;

function wrap2Pi(x: number): number {
  let w = x % TWO_PI;
  if (w < 0) w += TWO_PI;
  return w >= TWO_PI ? 0 : w;
}

/** Classical elements of the two-body state (r, v) about a body of gravitational parameter mu. */
export function stateToElements(mu: number, r: Vec3Like, v: Vec3Like): Elements {
  requirePositive('mu', mu);
  requireFiniteVector('r', r, 3);
  requireFiniteVector('v', v, 3);
  const rx = r[0],
    ry = r[1],
    rz = r[2];
  const vx = v[0],
    vy = v[1],
    vz = v[2];
  const rn = Math.sqrt(rx * rx + ry * ry + rz * rz);
  if (rn === 0) throw new InputError('r', 'must not be the zero vector', r);
  const vn = Math.sqrt(vx * vx + vy * vy + vz * vz);
  const hx = ry * vz - rz * vy;
  const hy = rz * vx - rx * vz;
  const hz = rx * vy - ry * vx;
  const hxy = Math.sqrt(hx * hx + hy * hy);
  const h = Math.sqrt(hxy * hxy + hz * hz);
  if (!(h > RECTILINEAR_TOLERANCE * rn * vn)) {
    throw new InputError('v', 'must not be parallel to r (zero angular momentum: rectilinear orbit has no elements)', v);
  }
  const p = (h * h) / mu;
  // e = (v × h)/μ − r/|r|
  const ex = (vy * hz - vz * hy) / mu - rx / rn;
  const ey = (vz * hx - vx * hz) / mu - ry / rn;
  const ez = (vx * hy - vy * hx) / mu - rz / rn;
  const e = Math.sqrt(ex * ex + ey * ey + ez * ez);
  const i = Math.atan2(hxy, hz);
  // unit normal
  const wx = hx / h,
    wy = hy / h,
    wz = hz / h;
  // node direction (unit); the +x axis for equatorial orbits
  let nx: number, ny: number;
  let raan: number;
  if (hxy < EQUATORIAL_TOLERANCE * h) {
    nx = 1;
    ny = 0;
    raan = 0;
  } else {
    nx = -hy / hxy;
    ny = hx / hxy;
    raan = wrap2Pi(Math.atan2(ny, nx));
  }
  // angle from a to b about the normal w: atan2(w·(a×b), a·b); node has z = 0
  let argp: number;
  let nu: number;
  if (e < CIRCULAR_TOLERANCE) {
    argp = 0;
    // from node to r
    const c = nx * rx + ny * ry;
    const s = wx * (ny * rz) + wy * (-nx * rz) + wz * (nx * ry - ny * rx);
    nu = wrap2Pi(Math.atan2(s, c));
  } else {
    // from node to e
    const c1 = nx * ex + ny * ey;
    const s1 = wx * (ny * ez) + wy * (-nx * ez) + wz * (nx * ey - ny * ex);
    argp = wrap2Pi(Math.atan2(s1, c1));
    // from e to r
    const c2 = ex * rx + ey * ry + ez * rz;
    const s2 = wx * (ey * rz - ez * ry) + wy * (ez * rx - ex * rz) + wz * (ex * ry - ey * rx);
    nu = Math.atan2(s2, c2);
    if (e < 1) nu = wrap2Pi(nu);
  }
  const a = p / ((1 - e) * (1 + e));
  return { a, e, i, raan, argp, nu, p };
}

const Q = new Float64Array(9);

/**
 * Writes [x, y, z, vx, vy, vz] into out (allocates a Float64Array(6) when omitted) and
 * returns it. Accepts either p or a (a is ignored when p is given; for e = 1 p is required).
 * Any finite angles are accepted (i outside [0, π] simply rotates further). For e ≥ 1 the
 * true anomaly must lie inside the asymptotes (1 + e·cos ν > 0).
 */
export function elementsToState(
  mu: number,
  el: { a?: number; p?: number; e: number; i: number; raan: number; argp: number; nu: number },
  out?: Float64Array | number[],
): Float64Array | number[] {
  requirePositive('mu', mu);
  if (!el || typeof el !== 'object') throw new InputError('el', 'must be an elements object', el);
  const e = requireNonNegative('e', el.e);
  requireFinite('i', el.i);
  requireFinite('raan', el.raan);
  requireFinite('argp', el.argp);
  const nu = requireFinite('nu', el.nu);
  let p: number;
  if (el.p !== undefined) {
    p = requirePositive('p', el.p);
  } else {
    if (e === 1) throw new InputError('p', 'is required for a parabola (e = 1)', el.p);
    const a = el.a;
    if (a === undefined) throw new InputError('a', 'or p is required', a);
    requireFinite('a', a);
    if (a === 0) throw new InputError('a', 'must not be 0', a);
    if (e < 1 && a < 0) throw new InputError('a', 'must be > 0 for an ellipse (e < 1)', a);
    if (e > 1 && a > 0) throw new InputError('a', 'must be < 0 for a hyperbola (e > 1)', a);
    p = a * (1 - e) * (1 + e);
    if (!(p > 0) || !Number.isFinite(p)) throw new InputError('a', 'gives no positive finite semi-latus rectum p = a(1 − e²)', a);
  }
  const cnu = Math.cos(nu);
  const snu = Math.sin(nu);
  const denom = 1 + e * cnu;
  if (!(denom > 0)) {
    throw new InputError('nu', `must lie inside the asymptotes (|nu| < acos(-1/e) = ${Math.acos(-1 / e)})`, nu);
  }
  const rr = p / denom;
  const vs = Math.sqrt(mu / p);
  const xp = rr * cnu;
  const yp = rr * snu;
  const vxp = -vs * snu;
  const vyp = vs * (e + cnu);
  perifocalToInertial(el.raan, el.i, el.argp, Q);
  const o = out ?? new Float64Array(6);
  if (o.length < 6) throw new InputError('out', 'must have 6 components', o.length);
  o[0] = Q[0] * xp + Q[1] * yp;
  o[1] = Q[3] * xp + Q[4] * yp;
  o[2] = Q[6] * xp + Q[7] * yp;
  o[3] = Q[0] * vxp + Q[1] * vyp;
  o[4] = Q[3] * vxp + Q[4] * vyp;
  o[5] = Q[6] * vxp + Q[7] * vyp;
  for (let k = 0; k < 6; k++) {
    if (!Number.isFinite(o[k])) throw new InputError('el', 'gives a non-finite state (overflow)', el);
  }
  return o;
}
