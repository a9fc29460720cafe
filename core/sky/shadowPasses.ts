/**
 * The shadow passes of a flight: every interval in which a body hides part (penumbra) or all
 * (umbra) of the star from the ship, over every body whose shadow can reach it (shadow.ts for
 * the models).
 *
 * Sampling: the flight is walked with a step bounded by how fast the geometry can change, then
 * each change of kind between two samples is found by bisection to `tolerance` (1 s by default).
 * For each body near enough to matter, the angular margin m to the next boundary of the conical
 * model (sunlight: c − (a + b); penumbra: the nearer of a + b − c and |c − |b − a||; umbra:
 * (b − a) − c) and a bound on its rate, from the ship's velocity relative to the body and to the
 * star: |ṁ| ≤ (1 + tan b)·|v − v_b|/|r_b − r| + (1 + tan a)·|v|/|r| (each direction turns at most
 * at |v_rel|/distance; an apparent radius asin(R/d) changes at most at tan(radius)·|v_rel|/d).
 * The step is half the smallest m/|ṁ|, and at most a tenth of the nearest body's distance over
 * the relative speed (so the bound is renewed before an approach changes it much) and a hundredth
 * of the flight; at least `tolerance`. The factor ½ covers the change of the velocities within a
 * step. So a pass is missed only if it is shorter than about the step there: a grazing pass
 * through the edge of a penumbra, whose depth is then small. The cylindrical model's boundary
 * lies between the conical umbra and penumbra, so the same steps serve it.
 *
 * Cheap test: a body is skipped where the ship is more than ten umbra-cone lengths
 * (R·d/(R★ − R), d the body's distance from the star) from it: there the body's apparent radius
 * is below a tenth of the star's, so it could dim the star by 1 % at most (an antumbral transit),
 * which is not reported as a shadow; its step bound is then the time to come within that range.
 *
 * Antumbra (beyond the umbra's tip, the body inside the star's disc) is reported as penumbra.
 */
import { InputError, SolverError } from '../math/index.ts';
import { bodyState, type StarSystem } from '../system/index.ts';
import { discFraction, type ShadowModel, shadowAngles, shadowKind, SUNLIGHT, sunlitFraction, UMBRA, umbraLength } from './shadow.ts';

export interface ShadowPass {
  /** Index of the occulting body. */
  body: number;
  bodyName: string;
  kind: 'penumbra' | 'umbra';
  /** Start and end, s from the epoch. */
  t0: number;
  t1: number;
}

export interface ShadowResult {
  /** Every interval of penumbra and of umbra, in time order (an eclipse through the umbra: penumbra, umbra, penumbra). */
  passes: ShadowPass[];
  /** Number of eclipses: intervals of shadow (penumbra or umbra) by one body, entry to exit. */
  eclipses: number;
  /** Time in shadow of any body, s (overlaps counted once). */
  inShadow: number;
  model: ShadowModel;
  /** Samples walked (not counting the bisections). */
  steps: number;
}

export interface ShadowOptions {
  /** Shadow model; default conical. */
  model?: ShadowModel;
  /** Bisection tolerance on each entry and exit, s; default 1. */
  tolerance?: number;
  /** Budget of samples walked; default 200 000. */
  maxSteps?: number;
}

/** Where the ship is at t: its position and velocity relative to the star into out6 (m, m/s). */
export type ShipAt = (t: number, out6: Float64Array) => void;

/** A body is considered within this many umbra-cone lengths of the ship (see the module comment). */
export const REACH_CONES = 10;

const ship = new Float64Array(6);
const body = new Float64Array(6);
const angles = new Float64Array(3);

function lightAt(system: StarSystem, shipAt: ShipAt, j: number, t: number, model: ShadowModel): number {
  shipAt(t, ship);
  bodyState(system, j, t, body, 0);
  const f = sunlitFraction(ship[0], ship[1], ship[2], body[0], body[1], body[2], system.bodies[0].radius, system.bodies[j].radius, model);
  return shadowKind(f);
}

/** The shadow passes of the flight over [t0, t1] (see the module comment). */
export function shadowPasses(system: StarSystem, shipAt: ShipAt, t0: number, t1: number, options: ShadowOptions = {}): ShadowResult {
  const model = options.model ?? 'conical';
  const tol = options.tolerance ?? 1;
  const maxSteps = options.maxSteps ?? 200_000;
  if (model !== 'conical' && model !== 'cylindrical') throw new InputError('model', "must be 'conical' or 'cylindrical'", model);
  if (!(Number.isFinite(t0) && Number.isFinite(t1) && t1 >= t0)) throw new InputError('t1', 'must be finite and not before t0', t1);
  if (!(tol > 0 && Number.isFinite(tol))) throw new InputError('tolerance', 'must be a positive number of seconds', tol);
  if (!(Number.isInteger(maxSteps) && maxSteps > 0)) throw new InputError('maxSteps', 'must be a positive integer', maxSteps);
  const n = system.bodies.length;
  const rStar = system.bodies[0].radius;
  const kinds = new Int8Array(n);
  const since = new Float64Array(n);
  const passes: ShadowPass[] = [];
  let eclipses = 0;
  const span = t1 - t0;
  const hMax = Math.max(tol, span / 100);

  const close = (j: number, kind: number, a: number, b: number) => {
    if (kind === SUNLIGHT || !(b > a)) return;
    passes.push({ body: j, bodyName: system.bodies[j].name, kind: kind === UMBRA ? 'umbra' : 'penumbra', t0: a, t1: b });
  };

  // Kinds of every body at t and the step allowed from t.
  const survey = (t: number, out: Int8Array): number => {
    shipAt(t, ship);
    const sx = ship[0];
    const sy = ship[1];
    const sz = ship[2];
    const vs = Math.hypot(ship[3], ship[4], ship[5]);
    const ds = Math.hypot(sx, sy, sz);
    // the direction to the star: its turn rate and its apparent radius's rate, and a bound on their change
    const sDot = ds > 0 ? (sx * ship[3] + sy * ship[4] + sz * ship[5]) / ds : 0;
    const turnS = ds > 0 ? Math.sqrt(Math.max(0, vs * vs - sDot * sDot)) / ds : 0;
    const starRate = ds > rStar ? turnS + (Math.abs(sDot) * rStar) / Math.sqrt(ds * ds - rStar * rStar) / ds : 0;
    const starAccel = ds > 0 ? system.bodies[0].mu / (ds * ds * ds) + (2 * Math.abs(sDot) * turnS) / ds : 0;
    let h = hMax;
    for (let j = 1; j < n; j++) {
      bodyState(system, j, t, body, 0);
      const ux = body[0] - sx;
      const uy = body[1] - sy;
      const uz = body[2] - sz;
      const d = Math.hypot(ux, uy, uz);
      const vRel = Math.hypot(body[3] - ship[3], body[4] - ship[4], body[5] - ship[5]);
      const reach = REACH_CONES * umbraLength(rStar, system.bodies[j].radius, Math.hypot(body[0], body[1], body[2]));
      if (d > reach) {
        out[j] = SUNLIGHT;
        if (vRel > 0) h = Math.min(h, (0.5 * (d - reach)) / vRel);
        continue;
      }
      const rb = system.bodies[j].radius;
      const f = sunlitFraction(sx, sy, sz, body[0], body[1], body[2], rStar, rb, model);
      const kind = shadowKind(f);
      out[j] = kind;
      shadowAngles(sx, sy, sz, body[0], body[1], body[2], rStar, rb, angles);
      const a = angles[0];
      const b = angles[1];
      const c = angles[2];
      // the margin to the conical model's next boundary (and, in the cylindrical model, to the cylinder's: c = b)
      const conical = model === 'conical' ? kind : shadowKind(discFraction(a, b, c));
      let m: number;
      if (conical === SUNLIGHT) m = c - (a + b);
      else if (conical === UMBRA) m = b - a - c;
      else m = Math.min(a + b - c, Math.abs(c - Math.abs(b - a)));
      if (model === 'cylindrical') m = Math.min(m, Math.abs(c - b));
      // instantaneous rate of the margin and a bound on its change within the step (see the module comment)
      const dDot = (ux * (body[3] - ship[3]) + uy * (body[4] - ship[4]) + uz * (body[5] - ship[5])) / d;
      const turnB = Math.sqrt(Math.max(0, vRel * vRel - dDot * dDot)) / d;
      const rate = turnB + (Math.tan(b) * Math.abs(dDot)) / d + starRate;
      const accel = system.bodies[j].mu / (d * d * d) + (2 * Math.abs(dDot) * turnB) / d + starAccel;
      // the largest h with rate·h + accel·h²/2 ≤ m/2
      const mh = 0.5 * Math.max(0, m);
      const hj = accel > 0 ? (2 * mh) / (rate + Math.sqrt(rate * rate + 2 * accel * mh)) : rate > 0 ? mh / rate : Infinity;
      h = Math.min(h, hj);
      // and the distance changes by a tenth at most (an approach renews the bound before it matters)
      if (dDot !== 0) h = Math.min(h, (0.1 * d) / Math.abs(dDot));
    }
    return Math.max(tol, h);
  };

  const next = new Int8Array(n);
  let t = t0;
  let h = survey(t, kinds);
  for (let j = 1; j < n; j++) {
    since[j] = t0;
    if (kinds[j] !== SUNLIGHT) eclipses++;
  }
  let steps = 1;
  while (t < t1) {
    if (steps >= maxSteps) throw new SolverError('shadowPasses', 'step-budget', `more than ${maxSteps} samples over the flight`, { t0, t1 });
    const tb = Math.min(t1, t + h);
    h = survey(tb, next);
    steps++;
    for (let j = 1; j < n; j++) {
      if (next[j] === kinds[j]) continue;
      // one or more changes in (t, tb]: find each by bisection on this body alone
      let lo = t;
      let kLo = kinds[j];
      while (kLo !== next[j]) {
        let a = lo;
        let b = tb;
        while (b - a > tol) {
          const mid = 0.5 * (a + b);
          if (lightAt(system, shipAt, j, mid, model) === kLo) a = mid;
          else b = mid;
        }
        const tx = 0.5 * (a + b);
        const kHi = lightAt(system, shipAt, j, b, model);
        close(j, kLo, since[j], tx);
        if (kLo === SUNLIGHT && kHi !== SUNLIGHT) eclipses++;
        since[j] = tx;
        kLo = kHi;
        lo = b;
        if (b >= tb) break;
      }
      kinds[j] = next[j];
    }
    t = tb;
  }
  for (let j = 1; j < n; j++) close(j, kinds[j], since[j], t1);
  passes.sort((p, q) => p.t0 - q.t0 || p.body - q.body);
  return { passes, eclipses, inShadow: unionLength(passes), model, steps };
}

/** Total length of the union of the intervals, s. */
function unionLength(passes: readonly ShadowPass[]): number {
  let total = 0;
  let a = -Infinity;
  let b = -Infinity;
  for (const p of passes) {
    if (p.t0 > b) {
      if (b > a) total += b - a;
      a = p.t0;
      b = p.t1;
    } else if (p.t1 > b) b = p.t1;
  }
  if (b > a) total += b - a;
  return total;
}
