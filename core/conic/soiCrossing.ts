/**
 * Patched-conic coast geometry: where on the analytic conic the next event happens.
 *
 * Inside one sphere of influence the ship flies a two-body conic about its central body
 * (universal-variable Kepler propagation, core/orbit/kepler.ts). On that conic:
 * - apsis passages, radius crossings (SOI exit, altitude, atmosphere, surface) and equatorial
 *   node crossings are found in closed form from the true anomaly (r = p/(1 + e cos ν); time from
 *   the mean anomaly, core/orbit/anomaly.ts; Curtis, Orbital Mechanics for Engineering Students,
 *   ch. 3), then polished with Brent's method (core/math/roots.ts) on the function that defines
 *   the event (r·v, |r| − R, z), propagated by Kepler, to ~1e-7 s;
 * - SOI entry into a child body cannot be written in closed form (the child moves on its own
 *   conic), so `findSoiEntry` steps along the conic with a step that provably cannot skip a
 *   crossing and refines the crossing with Brent.
 *
 * Safe step for SOI entry (derived here): with g = d − R_soi the distance of the ship from the
 * child's SOI surface, v0 = |v_ship − v_child| now and A an upper bound on the relative
 * acceleration (A = μ/r_min,ship² + μ_child,orbit/r_min,child², both bodies being pulled only by the
 * central body), the distance cannot shrink by more than v0·h + A·h²/2 in a time h. The step
 * h = 2g / (v0 + √(v0² + 2·A·g)) solves v0·h + A·h²/2 = g, so no crossing can happen before it.
 * r_min,ship is at least the central body's radius: the search window ends at an impact.
 * Steps have a floor of ENTRY_MIN_STEP (a grazing crossing shallower than ~v·ENTRY_MIN_STEP can
 * be missed). Each child keeps its own schedule, so far-away bodies are rarely evaluated, and a
 * child whose distance range from the central body [q − R_soi, Q + R_soi] does not overlap the
 * ship's [r_p, r_a] is not evaluated at all.
 *
 * Conventions: a (near-)circular orbit (e < CIRCULAR_E) has no periapsis of its own: its
 * "periapsis" is taken at the current point (a coast until periapsis on it ends at once). Times
 * are offsets Δt from the state given; Infinity means "not on this conic".
 */
import { brent, SolverError } from '../math/index.ts';
import { propagateKepler } from '../orbit/index.ts';
import { eccentricToMean, hyperbolicToMean, trueToEccentric, trueToHyperbolic } from '../orbit/index.ts';
import { bodyStateRelativeToParent } from '../system/index.ts';
import type { StarSystem } from '../system/index.ts';

/** Eccentricity below which an orbit counts as circular (periapsis undefined). */
export const CIRCULAR_E = 1e-9;
/** Smallest step of the SOI-entry search, s. */
export const ENTRY_MIN_STEP = 1e-3;
/** Brent tolerance on event times, s. */
export const EVENT_TIME_TOL = 1e-7;
/** An event closer than this to the start of a coast belongs to the previous one, s. */
export const MIN_EVENT_DT = 1e-3;

const TWO_PI = 2 * Math.PI;

/** The shape and placement of the conic through a state (all SI). */
export interface ConicInfo {
  mu: number;
  r: number;
  v: number;
  /** r·v, m²/s. */
  rv: number;
  /** Angular momentum h = r × v and |h|. */
  hx: number;
  hy: number;
  hz: number;
  h: number;
  e: number;
  /** Semi-latus rectum, m. */
  p: number;
  /** 1/a = 2/r − v²/μ (≤ 0 open orbit). */
  alpha: number;
  /** Periapsis and apoapsis radius (Infinity when open), m. */
  rp: number;
  ra: number;
  /** Period (Infinity when open), s; mean motion, rad/s (√(μ/p³) for the parabola). */
  period: number;
  n: number;
  /** Periapsis direction P and Q = ĥ × P (unit vectors). */
  P: Float64Array;
  Q: Float64Array;
  /** True anomaly of the state in (−π, π]. */
  nu: number;
  /** Mean anomaly of the state (ellipse: E − e sin E; hyperbola: e sinh H − H; parabola: Barker's). */
  M: number;
  /** Inclination to the reference (xy) plane, rad. */
  i: number;
}

export function createConicInfo(): ConicInfo {
  return {
    mu: 0,
    r: 0,
    v: 0,
    rv: 0,
    hx: 0,
    hy: 0,
    hz: 0,
    h: 0,
    e: 0,
    p: 0,
    alpha: 0,
    rp: 0,
    ra: 0,
    period: 0,
    n: 0,
    P: new Float64Array(3),
    Q: new Float64Array(3),
    nu: 0,
    M: 0,
    i: 0,
  };
}

/** Fills `out` with the conic through `state` (relative position and velocity) about μ. */
export function conicInfo(mu: number, state: ArrayLike<number>, out: ConicInfo = createConicInfo()): ConicInfo {
  const x = state[0],
    y = state[1],
    z = state[2];
  const vx = state[3],
    vy = state[4],
    vz = state[5];
  const r = Math.sqrt(x * x + y * y + z * z);
  const v2 = vx * vx + vy * vy + vz * vz;
  const rv = x * vx + y * vy + z * vz;
  const hx = y * vz - z * vy;
  const hy = z * vx - x * vz;
  const hz = x * vy - y * vx;
  const h = Math.sqrt(hx * hx + hy * hy + hz * hz);
  // eccentricity vector e = ((v² − μ/r) r − (r·v) v)/μ
  const k1 = v2 - mu / r;
  const ex = (k1 * x - rv * vx) / mu;
  const ey = (k1 * y - rv * vy) / mu;
  const ez = (k1 * z - rv * vz) / mu;
  const e = Math.sqrt(ex * ex + ey * ey + ez * ez);
  const p = (h * h) / mu;
  const alpha = 2 / r - v2 / mu;
  out.mu = mu;
  out.r = r;
  out.v = Math.sqrt(v2);
  out.rv = rv;
  out.hx = hx;
  out.hy = hy;
  out.hz = hz;
  out.h = h;
  out.e = e;
  out.p = p;
  out.alpha = alpha;
  out.rp = p / (1 + e);
  out.ra = alpha > 0 && e < 1 ? p / (1 - e) : Infinity;
  out.i = Math.atan2(Math.sqrt(hx * hx + hy * hy), hz);
  const P = out.P;
  const Q = out.Q;
  if (e < CIRCULAR_E) {
    P[0] = x / r;
    P[1] = y / r;
    P[2] = z / r;
  } else {
    P[0] = ex / e;
    P[1] = ey / e;
    P[2] = ez / e;
  }
  let wx = hx / h,
    wy = hy / h,
    wz = hz / h;
  if (!(h > 0)) {
    // rectilinear (r ∥ v, or at rest): no orbit plane; any normal to P serves, ν is then ±π or 0
    const ax = Math.abs(P[0]) < 0.9 ? 1 : 0;
    const ay = 1 - ax;
    wx = -P[2] * ay;
    wy = P[2] * ax;
    wz = P[0] * ay - P[1] * ax;
    const wn = Math.sqrt(wx * wx + wy * wy + wz * wz);
    wx /= wn;
    wy /= wn;
    wz /= wn;
  }
  Q[0] = wy * P[2] - wz * P[1];
  Q[1] = wz * P[0] - wx * P[2];
  Q[2] = wx * P[1] - wy * P[0];
  out.nu = e < CIRCULAR_E ? 0 : Math.atan2(Q[0] * x + Q[1] * y + Q[2] * z, P[0] * x + P[1] * y + P[2] * z);
  if (e < 1) {
    out.n = Math.sqrt(mu * alpha * alpha * alpha);
    out.period = TWO_PI / out.n;
  } else if (e > 1) {
    out.n = Math.sqrt(-mu * alpha * alpha * alpha);
    out.period = Infinity;
  } else {
    out.n = Math.sqrt(mu / (p * p * p));
    out.period = Infinity;
  }
  out.M = meanAnomalyAt(out, out.nu);
  return out;
}

/** Mean anomaly at true anomaly ν on the conic (NaN when ν is outside an open conic's asymptotes). */
export function meanAnomalyAt(info: ConicInfo, nu: number): number {
  const e = info.e;
  if (e < 1) return eccentricToMean(trueToEccentric(nu, e), e);
  if (e > 1) {
    if (!(1 + e * Math.cos(nu) > 0) || Math.abs(nu) >= Math.PI) return NaN;
    return hyperbolicToMean(trueToHyperbolic(nu, e), e);
  }
  if (!(Math.abs(nu) < Math.PI)) return NaN;
  const D = Math.tan(0.5 * nu);
  return 0.5 * (D + (D * D * D) / 3);
}

/**
 * Time from the state to the next passage through true anomaly ν (at least minDt ahead), s;
 * Infinity when an open conic does not reach ν ahead.
 */
export function timeToTrueAnomaly(info: ConicInfo, nu: number, minDt = MIN_EVENT_DT): number {
  const M1 = meanAnomalyAt(info, nu);
  if (!Number.isFinite(M1)) return Infinity;
  let d = M1 - info.M;
  if (info.e < 1) {
    d -= TWO_PI * Math.floor(d / TWO_PI);
    let dt = d / info.n;
    if (dt < minDt) dt += info.period;
    return dt;
  }
  const dt = d / info.n;
  return dt >= minDt ? dt : Infinity;
}

// --- Brent polishing on a function of the propagated state --------------------------------------

const pstate = new Float64Array(6);

type StateFn = (s: Float64Array) => number;

/**
 * Refines an event time estimate `est` (offset from `state`) to the root of fn(state(Δt)) in
 * [lo, hi], Brent's method (Brent 1973) after widening a small bracket around the estimate.
 * Returns the estimate unchanged when no sign change is found near it.
 */
function polish(mu: number, state: ArrayLike<number>, fn: StateFn, est: number, lo: number, hi: number): number {
  const g = (dt: number): number => fn(propagateKepler(mu, state, dt, pstate) as Float64Array);
  let delta = Math.max(1e-4, 1e-9 * Math.abs(est));
  for (let k = 0; k < 14; k++) {
    const a = Math.max(lo, est - delta);
    const b = Math.min(hi, est + delta);
    if (b > a) {
      const ga = g(a);
      const gb = g(b);
      if (ga === 0) return a;
      if (gb === 0) return b;
      if (ga < 0 !== gb < 0) return brent(g, a, b, { tol: EVENT_TIME_TOL });
    }
    delta *= 8;
  }
  return est;
}

const fnRv: StateFn = (s) => s[0] * s[3] + s[1] * s[4] + s[2] * s[5];
const fnZ: StateFn = (s) => s[2];
let radiusTarget = 0;
const fnRadius: StateFn = (s) => Math.sqrt(s[0] * s[0] + s[1] * s[1] + s[2] * s[2]) - radiusTarget;

const infoScratch = createConicInfo();

/**
 * Time to the next periapsis or apoapsis passage (≥ minDt ahead, ≤ tMax), s, or Infinity.
 * A circular orbit (e < CIRCULAR_E) has its periapsis at the current point: returns 0 for
 * 'periapsis' and half a period for 'apoapsis'.
 */
export function timeToApsis(
  mu: number,
  state: ArrayLike<number>,
  which: 'periapsis' | 'apoapsis',
  tMax = Infinity,
  minDt = MIN_EVENT_DT,
  info?: ConicInfo,
): number {
  const c = info ?? conicInfo(mu, state, infoScratch);
  if (c.e < CIRCULAR_E) {
    const dt = which === 'periapsis' ? 0 : 0.5 * c.period;
    return dt <= tMax ? dt : Infinity;
  }
  if (which === 'apoapsis' && !(c.e < 1)) return Infinity;
  const est = timeToTrueAnomaly(c, which === 'periapsis' ? 0 : Math.PI, minDt);
  if (!(est <= tMax + 1)) return Infinity;
  const halfWidth = Number.isFinite(c.period) ? 0.25 * c.period : Math.max(1, 0.5 * est);
  let dt: number;
  try {
    dt = polish(mu, state, fnRv, est, Math.max(minDt, est - halfWidth), est + halfWidth);
  } catch (e) {
    // a radial fall reaches the centre first (kepler.ts refuses to fly through it): never reached
    if (e instanceof SolverError && e.reason === 'collision') return Infinity;
    throw e;
  }
  return dt >= minDt && dt <= tMax ? dt : Infinity;
}

/** |α·r0| below which radius crossings are estimated from the true anomaly (near-parabolic). */
const PARABOLIC_ALPHA_R = 1e-12;

/**
 * First estimate of the time to the next crossing of radius R (≥ minDt ahead), s; Infinity
 * when the conic does not cross R in that direction; NaN for a (near-)parabola. From the
 * eccentric or hyperbolic anomaly written in terms of the state itself (Vallado, Fundamentals
 * of Astrodynamics and Applications, 4th ed., §2.2): on an ellipse e·cos E = 1 − r/a and
 * e·sin E = r·v/√(μa); on a hyperbola e·cosh H = 1 + r/|a| and e·sinh H = r·v/√(μ|a|); time
 * from Kepler's equation. Unlike the true anomaly, which piles up at ±π on a (nearly)
 * rectilinear orbit (angular momentum → 0, a fall from rest), this stays well defined there.
 */
function radiusEstimate(mu: number, state: ArrayLike<number>, R: number, direction: 1 | -1 | 0, minDt: number): number {
  const x = state[0],
    y = state[1],
    z = state[2];
  const r0 = Math.sqrt(x * x + y * y + z * z);
  const v2 = state[3] * state[3] + state[4] * state[4] + state[5] * state[5];
  const rv = x * state[3] + y * state[4] + z * state[5];
  const alpha = 2 / r0 - v2 / mu;
  if (!(Math.abs(alpha * r0) > PARABOLIC_ALPHA_R)) return NaN;
  let best = Infinity;
  if (alpha > 0) {
    const a = 1 / alpha;
    const ec = 1 - r0 / a;
    const es = rv / Math.sqrt(mu * a);
    const e = Math.hypot(ec, es);
    const cosE = (1 - R / a) / e;
    if (!(cosE >= -1 && cosE <= 1)) return Infinity;
    const Er = Math.acos(cosE);
    const n = Math.sqrt(mu * alpha * alpha * alpha);
    const M0 = Math.atan2(es, ec) - es;
    for (let side = -1; side <= 1; side += 2) {
      if (direction !== 0 && direction !== side) continue;
      const E = side * Er; // outbound crossings have sin E > 0
      let d = E - e * Math.sin(E) - M0;
      d -= TWO_PI * Math.floor(d / TWO_PI);
      let dt = d / n;
      if (dt < minDt) dt += TWO_PI / n;
      if (dt < best) best = dt;
    }
    return best;
  }
  const a = -1 / alpha;
  const ech = 1 + r0 / a;
  const esh = rv / Math.sqrt(mu * a);
  const e = Math.sqrt((ech - esh) * (ech + esh));
  const coshH = (1 + R / a) / e;
  if (!(coshH >= 1)) return Infinity;
  const Hr = Math.acosh(coshH);
  const n = Math.sqrt(-mu * alpha * alpha * alpha);
  const M0 = esh - Math.asinh(esh / e);
  for (let side = -1; side <= 1; side += 2) {
    if (direction !== 0 && direction !== side) continue;
    const H = side * Hr;
    const dt = (e * Math.sinh(H) - H - M0) / n;
    if (dt >= minDt && dt < best) best = dt;
  }
  return best;
}

/**
 * Time to the next crossing of radius R (≥ minDt ahead, ≤ tMax), s, or Infinity.
 * direction +1: outbound only (r increasing), −1: inbound only, 0: either.
 */
export function timeToRadius(
  mu: number,
  state: ArrayLike<number>,
  R: number,
  direction: 1 | -1 | 0,
  tMax = Infinity,
  minDt = MIN_EVENT_DT,
  info?: ConicInfo,
): number {
  const c = info ?? conicInfo(mu, state, infoScratch);
  if (!(R > 0) || !Number.isFinite(R)) return Infinity;
  if (c.e < CIRCULAR_E) return Infinity;
  let est = radiusEstimate(mu, state, R, direction, minDt);
  if (Number.isNaN(est)) {
    // (near-)parabolic: from the true anomaly
    const cosNu = (c.p / R - 1) / c.e;
    if (!(cosNu >= -1 && cosNu <= 1)) return Infinity;
    const nuR = Math.acos(cosNu);
    est = Infinity;
    if (direction >= 0) est = Math.min(est, timeToTrueAnomaly(c, nuR, minDt));
    if (direction <= 0) est = Math.min(est, timeToTrueAnomaly(c, -nuR, minDt));
  }
  if (!(est <= tMax + 1)) return Infinity;
  radiusTarget = R;
  // bracket half-width: stay inside the arc between the two crossings
  const halfWidth = Number.isFinite(c.period) ? 0.1 * c.period : Math.max(1, 0.5 * est);
  const dt = polish(mu, state, fnRadius, est, Math.max(minDt, est - halfWidth), est + halfWidth);
  return dt >= minDt && dt <= tMax ? dt : Infinity;
}

/**
 * Time to the next crossing of the reference (xy) plane through the central body
 * (≥ minDt ahead, ≤ tMax), s, or Infinity; 'ascending' means z increasing.
 * An orbit in the plane (sin i < 1e-12) has no nodes.
 */
export function timeToNode(
  mu: number,
  state: ArrayLike<number>,
  which: 'ascending' | 'descending' | 'any',
  tMax = Infinity,
  minDt = MIN_EVENT_DT,
  info?: ConicInfo,
): number {
  const c = info ?? conicInfo(mu, state, infoScratch);
  if (!(Math.sin(c.i) > 1e-12)) return Infinity;
  // ascending node direction n = ẑ × h (unit); ν of the node = angle from P to n about h
  const hxy = Math.sqrt(c.hx * c.hx + c.hy * c.hy);
  const nx = -c.hy / hxy;
  const ny = c.hx / hxy;
  const nuAsc = Math.atan2(c.Q[0] * nx + c.Q[1] * ny, c.P[0] * nx + c.P[1] * ny);
  let nuDesc = nuAsc + Math.PI;
  if (nuDesc > Math.PI) nuDesc -= TWO_PI;
  let est = Infinity;
  if (which !== 'descending') est = Math.min(est, timeToTrueAnomaly(c, nuAsc, minDt));
  if (which !== 'ascending') est = Math.min(est, timeToTrueAnomaly(c, nuDesc, minDt));
  if (!(est <= tMax + 1)) return Infinity;
  const halfWidth = Number.isFinite(c.period) ? 0.2 * c.period : Math.max(1, 0.5 * est);
  const dt = polish(mu, state, fnZ, est, Math.max(minDt, est - halfWidth), est + halfWidth);
  return dt >= minDt && dt <= tMax ? dt : Infinity;
}

// --- SOI entry search ---------------------------------------------------------------------------

export interface EntrySearch {
  system: StarSystem;
  /** Index of the central body. */
  central: number;
  /** μ of the ship's conic (the central body's). */
  mu: number;
  /** Ship state relative to the central body at t0. */
  state0: ArrayLike<number>;
  t0: number;
  /**
   * End of the search window (absolute time, s); no later than an impact on the central body
   * (the safe step assumes the ship stays above its surface).
   */
  tEnd: number;
  /** Child the ship has just left: it must be seen outside before an entry counts. −1: none. */
  justLeft: number;
  /** Child to follow for closest approach, or −1. */
  track: number;
}

export interface EntryResult {
  /** Entry time (absolute), or Infinity when no child SOI is entered before tEnd. */
  t: number;
  /** Index of the child entered, or −1. */
  body: number;
  /** Closest approach to `track` in the flown window [t0, min(t, tEnd)]: time and distance (Infinity when not tracked). */
  caT: number;
  caDistance: number;
  /** Evaluations of child states (a cost figure). */
  evaluations: number;
}

let cap = 0;
let nextT = new Float64Array(0);
let prevT = new Float64Array(0);
let prevS = new Float64Array(0);
let armed = new Uint8Array(0);
const ship = new Float64Array(6);
const child = new Float64Array(6);
const refine = new Float64Array(6);
const refineBody = new Float64Array(6);

function ensure(n: number): void {
  if (n <= cap) return;
  cap = Math.max(n, 2 * cap, 8);
  nextT = new Float64Array(cap);
  prevT = new Float64Array(cap);
  prevS = new Float64Array(cap);
  armed = new Uint8Array(cap);
}

/** Relative state of child k to the ship at absolute time t into `out` (ship − child). */
function relative(q: EntrySearch, k: number, t: number, out: Float64Array): void {
  propagateKepler(q.mu, q.state0, t - q.t0, refine);
  bodyStateRelativeToParent(q.system, k, t, refineBody);
  for (let i = 0; i < 6; i++) out[i] = refine[i] - refineBody[i];
}

const rel = new Float64Array(6);

/**
 * First entry into the SOI of a child of the central body within (t0, tEnd], by safe stepping
 * and Brent refinement (see the module comment); also follows the closest approach to `track`.
 */
export function findSoiEntry(q: EntrySearch, out?: EntryResult): EntryResult {
  const res: EntryResult = out ?? { t: Infinity, body: -1, caT: Infinity, caDistance: Infinity, evaluations: 0 };
  res.t = Infinity;
  res.body = -1;
  res.caT = Infinity;
  res.caDistance = Infinity;
  res.evaluations = 0;
  const bodies = q.system.bodies;
  const kids = bodies[q.central].children;
  const nk = kids.length;
  if (nk === 0 || !(q.tEnd > q.t0)) return res;
  ensure(nk);
  const c = conicInfo(q.mu, q.state0, infoScratch);
  const open = !(c.e < 1);
  const rSurface = bodies[q.central].radius;
  for (let j = 0; j < nk; j++) {
    const bd = bodies[kids[j]].derived;
    // radius ranges that cannot meet: [rp, ra] of the ship vs the child's [q − R, Q + R]
    const never = c.ra < bd.periapsis - bd.soiRadius || c.rp > bd.apoapsis + bd.soiRadius;
    nextT[j] = never && kids[j] !== q.track ? Infinity : q.t0;
    prevT[j] = q.t0;
    prevS[j] = NaN;
    armed[j] = 0;
  }
  let shipT = NaN;
  for (;;) {
    let j = 0;
    for (let m = 1; m < nk; m++) if (nextT[m] < nextT[j]) j = m;
    const t = nextT[j];
    if (t > q.tEnd) break;
    if (t !== shipT) {
      propagateKepler(q.mu, q.state0, t - q.t0, ship);
      shipT = t;
    }
    const k = kids[j];
    const body = bodies[k];
    bodyStateRelativeToParent(q.system, k, t, child);
    res.evaluations++;
    const dx = ship[0] - child[0],
      dy = ship[1] - child[1],
      dz = ship[2] - child[2];
    const dvx = ship[3] - child[3],
      dvy = ship[4] - child[4],
      dvz = ship[5] - child[5];
    const d = Math.sqrt(dx * dx + dy * dy + dz * dz);
    const R = body.derived.soiRadius;
    const g = d - R;
    if (armed[j]) {
      if (g <= 0) {
        const t0 = prevT[j];
        const gf = (tt: number): number => {
          relative(q, k, tt, rel);
          return Math.sqrt(rel[0] * rel[0] + rel[1] * rel[1] + rel[2] * rel[2]) - R;
        };
        const te = g === 0 ? t : brent(gf, t0, t, { tol: EVENT_TIME_TOL });
        res.t = te;
        res.body = k;
        if (k === q.track) trackClosest(q, k, t0, te, res, true);
        return res;
      }
    } else if (g > 0) {
      armed[j] = 1;
    } else if (k !== q.justLeft && t === q.t0) {
      // already inside a child's SOI at the start: the ship belongs to it now
      res.t = t;
      res.body = k;
      return res;
    }
    if (k === q.track) {
      const s = dx * dvx + dy * dvy + dz * dvz;
      if (d < res.caDistance) {
        res.caDistance = d;
        res.caT = t;
      }
      if (prevS[j] < 0 && s >= 0) trackClosest(q, k, prevT[j], t, res, false);
      prevS[j] = s;
    }
    // safe step: relative speed now plus a bound on relative acceleration
    const v0 = Math.sqrt(dvx * dvx + dvy * dvy + dvz * dvz);
    // the window ends at an impact (callers cap tEnd there), so the ship stays above the surface
    const rShipMin = Math.max(
      rSurface,
      open && ship[0] * ship[3] + ship[1] * ship[4] + ship[2] * ship[5] >= 0 ? Math.sqrt(ship[0] * ship[0] + ship[1] * ship[1] + ship[2] * ship[2]) : c.rp,
    );
    const A = q.mu / (rShipMin * rShipMin) + body.derived.orbitMu / (body.derived.periapsis * body.derived.periapsis);
    const ga = Math.abs(g);
    let h = (2 * ga) / (v0 + Math.sqrt(v0 * v0 + 2 * A * ga));
    if (!(h >= ENTRY_MIN_STEP)) h = ENTRY_MIN_STEP;
    prevT[j] = t;
    nextT[j] = t + h;
  }
  if (q.track >= 0) {
    const j = kids.indexOf(q.track);
    if (j >= 0) {
      // end of the window: the last stretch may hold the minimum, or end on the way in
      relative(q, q.track, q.tEnd, rel);
      const d = Math.sqrt(rel[0] * rel[0] + rel[1] * rel[1] + rel[2] * rel[2]);
      const s = rel[0] * rel[3] + rel[1] * rel[4] + rel[2] * rel[5];
      if (prevS[j] < 0 && s >= 0) trackClosest(q, q.track, prevT[j], q.tEnd, res, false);
      if (d < res.caDistance) {
        res.caDistance = d;
        res.caT = q.tEnd;
      }
    }
  }
  return res;
}

/** Closest approach to child k in [a, b] where r·v goes from < 0 to ≥ 0 (or, at an entry, the end point). */
function trackClosest(q: EntrySearch, k: number, a: number, b: number, res: EntryResult, atEntry: boolean): void {
  let tc = b;
  if (!atEntry) {
    const sf = (tt: number): number => {
      relative(q, k, tt, rel);
      return rel[0] * rel[3] + rel[1] * rel[4] + rel[2] * rel[5];
    };
    tc = brent(sf, a, b, { tol: EVENT_TIME_TOL });
  }
  relative(q, k, tc, rel);
  const d = Math.sqrt(rel[0] * rel[0] + rel[1] * rel[1] + rel[2] * rel[2]);
  if (d < res.caDistance) {
    res.caDistance = d;
    res.caT = tc;
  }
}
