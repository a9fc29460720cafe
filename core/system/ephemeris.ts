/**
 * Analytic conic ephemeris: the state of any body at any time, relative to its parent or to
 * any other body, from its Keplerian elements at the epoch.
 *
 * Per body, `buildEphemerisTables` precomputes the perifocal unit vectors P (towards
 * periapsis) and Q (90° ahead in the orbit plane), a, b = a√(1−e²), e, √(1−e²), n and M0.
 * An evaluation is then: M = M0 + n t, reduced to [−π, π] → E from Kepler's equation
 * M = E − e sin E by core/orbit/anomaly.ts (Mikkola's cubic starter, Halley iteration) →
 *   r = a (cos E − e) P + b sin E Q,
 *   v = n a / (1 − e cos E) · (−sin E P + √(1−e²) cos E Q)
 * (Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., §2.2 and §3.3 for
 * the perifocal frame; the rotation is Ω about z, i about x, ω about z).
 *
 * The μ of each orbit is μ_parent + μ_body (see model.ts). Nothing allocates per call: the
 * chain sums use module-scope scratch.
 */

import { InputError } from '../math/index.ts';
import { solveEllipticKepler } from '../orbit/index.ts';
import type { Body, EphemerisTables, StarSystem } from './model.ts';

/** Number of doubles per body in `EphemerisTables.k`. */
export const EPHEMERIS_STRIDE = 14;
// Offsets into a body's row.
const A = 0;
const B = 1;
const E = 2;
const SQ = 3; // √(1 − e²)
const N = 4;
const M0 = 5;
const PX = 6;
const PY = 7;
const PZ = 8;
const QX = 9;
const QY = 10;
const QZ = 11;
const NA = 12; // n·a
const MU = 13; // μ of the orbit

export type { EphemerisTables } from './model.ts';

/** Precomputes the per-body constants of the conic ephemeris. */
export function buildEphemerisTables(bodies: readonly Body[]): EphemerisTables {
  const count = bodies.length;
  const parent = new Int32Array(count);
  const depth = new Int32Array(count);
  const k = new Float64Array(count * EPHEMERIS_STRIDE);
  for (let j = 0; j < count; j++) {
    const b = bodies[j];
    parent[j] = b.parentIndex;
    depth[j] = b.derived.depth;
    const el = b.elements;
    if (!el) continue;
    const o = j * EPHEMERIS_STRIDE;
    const cO = Math.cos(el.raan);
    const sO = Math.sin(el.raan);
    const cw = Math.cos(el.argp);
    const sw = Math.sin(el.argp);
    const ci = Math.cos(el.i);
    const si = Math.sin(el.i);
    const sq = Math.sqrt(1 - el.e * el.e);
    k[o + A] = el.a;
    k[o + B] = el.a * sq;
    k[o + E] = el.e;
    k[o + SQ] = sq;
    k[o + N] = b.derived.meanMotion;
    k[o + M0] = el.M0;
    k[o + PX] = cO * cw - sO * sw * ci;
    k[o + PY] = sO * cw + cO * sw * ci;
    k[o + PZ] = sw * si;
    k[o + QX] = -cO * sw - sO * cw * ci;
    k[o + QY] = -sO * sw + cO * cw * ci;
    k[o + QZ] = cw * si;
    k[o + NA] = b.derived.meanMotion * el.a;
    k[o + MU] = b.derived.orbitMu;
  }
  return { count, parent, depth, k };
}

const TWO_PI = 2 * Math.PI;
// [sin E, cos E] of the last Kepler solve
const sinCosE = new Float64Array(2);
// The time of the current evaluation: accumulate reads it here rather than as an argument, which
// a call that is not inlined would box once per body state.
const TIME = new Float64Array(1);

function checkIndex(tables: EphemerisTables, index: number, field: string): void {
  if (!(index >= 0 && index < tables.count && (index | 0) === index)) {
    throw new InputError(field, `must be a body index in [0, ${tables.count - 1}]`, index);
  }
}

function checkTime(t: number): void {
  if (!Number.isFinite(t)) throw new InputError('t', 'must be a finite number', t);
}

// Adds (sign = +1) or subtracts (sign = −1) body j's state relative to its parent at t = TIME[0] into out.
function accumulate(k: Float64Array, j: number, out: Float64Array, sign: number, withVelocity: boolean): void {
  const o = j * EPHEMERIS_STRIDE;
  const e = k[o + E];
  const M = k[o + M0] + k[o + N] * TIME[0];
  solveEllipticKepler(M - TWO_PI * Math.round(M / TWO_PI), e, sinCosE);
  const sinE = sinCosE[0];
  const cosE = sinCosE[1];
  const px = k[o + A] * (cosE - e) * sign;
  const qy = k[o + B] * sinE * sign;
  out[0] += px * k[o + PX] + qy * k[o + QX];
  out[1] += px * k[o + PY] + qy * k[o + QY];
  out[2] += px * k[o + PZ] + qy * k[o + QZ];
  if (withVelocity) {
    const f = (k[o + NA] / (1 - e * cosE)) * sign;
    const vp = -sinE * f;
    const vq = k[o + SQ] * cosE * f;
    out[3] += vp * k[o + PX] + vq * k[o + QX];
    out[4] += vp * k[o + PY] + vq * k[o + QY];
    out[5] += vp * k[o + PZ] + vq * k[o + QZ];
  }
}

/**
 * State of body `index` (not the star) relative to its parent at time t into out6, for hot
 * loops such as porkchop grids: no input checks (`index` must name a body with an orbit, t must
 * be finite). The operations of bodyStateRelativeToParent, so the same numbers (a zero
 * component may be −0 where that gives +0); small enough to be inlined into the caller's loop,
 * so t is not boxed.
 */
export function conicState(tables: EphemerisTables, index: number, t: number, out6: Float64Array): void {
  const k = tables.k;
  const o = index * EPHEMERIS_STRIDE;
  const e = k[o + E];
  const M = k[o + M0] + k[o + N] * t;
  solveEllipticKepler(M - TWO_PI * Math.round(M / TWO_PI), e, sinCosE);
  const sinE = sinCosE[0];
  const cosE = sinCosE[1];
  const px = k[o + A] * (cosE - e);
  const qy = k[o + B] * sinE;
  out6[0] = px * k[o + PX] + qy * k[o + QX];
  out6[1] = px * k[o + PY] + qy * k[o + QY];
  out6[2] = px * k[o + PZ] + qy * k[o + QZ];
  const f = k[o + NA] / (1 - e * cosE);
  const vp = -sinE * f;
  const vq = k[o + SQ] * cosE * f;
  out6[3] = vp * k[o + PX] + vq * k[o + QX];
  out6[4] = vp * k[o + PY] + vq * k[o + QY];
  out6[5] = vp * k[o + PZ] + vq * k[o + QZ];
}

/**
 * State [x, y, z, vx, vy, vz] (m, m/s) of body `index` at time t (s from epoch) relative to
 * its parent; zeros for the star.
 */
export function bodyStateRelativeToParent(system: StarSystem, index: number, t: number, out6: Float64Array): Float64Array {
  const tables = system.ephemeris;
  checkIndex(tables, index, 'index');
  checkTime(t);
  out6[0] = out6[1] = out6[2] = out6[3] = out6[4] = out6[5] = 0;
  if (index !== 0) {
    TIME[0] = t;
    accumulate(tables.k, index, out6, 1, true);
  }
  return out6;
}

function chain(tables: EphemerisTables, index: number, relativeTo: number, t: number, out: Float64Array, withVelocity: boolean): void {
  const { k, parent, depth } = tables;
  TIME[0] = t;
  let a = index;
  let b = relativeTo;
  while (depth[a] > depth[b]) {
    accumulate(k, a, out, 1, withVelocity);
    a = parent[a];
  }
  while (depth[b] > depth[a]) {
    accumulate(k, b, out, -1, withVelocity);
    b = parent[b];
  }
  while (a !== b) {
    accumulate(k, a, out, 1, withVelocity);
    accumulate(k, b, out, -1, withVelocity);
    a = parent[a];
    b = parent[b];
  }
}

/**
 * State of body `index` relative to body `relativeTo` (default the star), summing conic
 * states along the parent chain up to the common ancestor.
 */
export function bodyState(system: StarSystem, index: number, t: number, out6: Float64Array, relativeTo = 0): Float64Array {
  const tables = system.ephemeris;
  checkIndex(tables, index, 'index');
  checkIndex(tables, relativeTo, 'relativeTo');
  checkTime(t);
  out6[0] = out6[1] = out6[2] = out6[3] = out6[4] = out6[5] = 0;
  chain(tables, index, relativeTo, t, out6, true);
  return out6;
}

const pos6 = new Float64Array(6);

/** Position of body `index` relative to `relativeTo` (default the star), m. */
export function bodyPosition(system: StarSystem, index: number, t: number, out3: Float64Array | number[], relativeTo = 0): Float64Array | number[] {
  const tables = system.ephemeris;
  checkIndex(tables, index, 'index');
  checkIndex(tables, relativeTo, 'relativeTo');
  checkTime(t);
  pos6[0] = pos6[1] = pos6[2] = 0;
  chain(tables, index, relativeTo, t, pos6, false);
  out3[0] = pos6[0];
  out3[1] = pos6[1];
  out3[2] = pos6[2];
  return out3;
}

/**
 * Points of body `index`'s orbit relative to its parent for drawing: `nPoints` positions
 * evenly spaced in eccentric anomaly from periapsis (denser in time near apoapsis, evenly
 * spread along the curve), as x, y, z triples (m); the loop is closed by the caller. Pass a
 * Float32Array as `out` for drawing buffers.
 */
export function sampleOrbit<T extends Float64Array | Float32Array = Float64Array>(system: StarSystem, index: number, nPoints: number, out?: T): T {
  const tables = system.ephemeris;
  checkIndex(tables, index, 'index');
  if (index === 0) throw new InputError('index', 'must name a body with an orbit (not the star)', index);
  if (!(Number.isInteger(nPoints) && nPoints >= 3)) throw new InputError('nPoints', 'must be an integer >= 3', nPoints);
  const res = (out ?? new Float64Array(3 * nPoints)) as T;
  if (res.length < 3 * nPoints) throw new InputError('out', `must hold ${3 * nPoints} numbers`, res.length);
  const k = tables.k;
  const o = index * EPHEMERIS_STRIDE;
  const e = k[o + E];
  for (let j = 0; j < nPoints; j++) {
    const Ej = (TWO_PI * j) / nPoints;
    const px = k[o + A] * (Math.cos(Ej) - e);
    const qy = k[o + B] * Math.sin(Ej);
    res[3 * j] = px * k[o + PX] + qy * k[o + QX];
    res[3 * j + 1] = px * k[o + PY] + qy * k[o + QY];
    res[3 * j + 2] = px * k[o + PZ] + qy * k[o + QZ];
  }
  return res;
}
