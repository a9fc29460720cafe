/**
 * Local orbital frames and 3×3 rotations.
 *
 * Local frames built from a state (r, v), all right-handed and orthonormal:
 * - VNB: V = v/|v| (velocity), N = (r×v)/|r×v| (orbit normal), B = V×N (binormal; points
 *   outward, along r, on a circular orbit).
 * - RTN: R = r/|r| (radial), N = (r×v)/|r×v| (orbit normal), T = N×R (transverse; along v on
 *   a circular orbit).
 * Local components are ordered as the frame's name: VNB = [v, n, b], RTN = [r, t, n].
 * (Frame definitions as in Vallado, Fundamentals of Astrodynamics and Applications, 4th ed.,
 * §3.3, where RSW/NTW are the same triads under other letters.)
 *
 * 3×3 matrices are 9-element Float64Arrays in row-major order. `rotX`/`rotZ` are ACTIVE
 * rotations: they turn a vector by +angle about the axis (right-hand rule). The perifocal →
 * inertial matrix is Q = Rz(Ω)·Rx(i)·Rz(ω), the 3-1-3 Euler sequence of Curtis, Orbital
 * Mechanics for Engineering Students, §4.6 (Curtis writes the transpose, inertial → perifocal).
 *
 * All frame functions are allocation-free when `out` is given and allow `out` to alias the
 * input vector. They throw InputError when r or v is zero or r ∥ v (the normal is undefined).
 */
import { InputError } from './errors.ts';
import type { Vec3, Vec3Like } from './vec3.ts';

/** |r×v| below this fraction of |r||v| counts as r ∥ v (frame undefined). */
export const PARALLEL_TOLERANCE = 1e-12;

/** A 3×3 matrix, row-major. */
export type Mat3 = Float64Array;

// Module-scope scratch for the frame basis: [e1x, e1y, e1z, e2x, ..., e3z] (rows = axes).
const basis = new Float64Array(9);

function checkVector(field: string, a: Vec3Like): number {
  if (!a || a.length < 3) throw new InputError(field, 'must have 3 components', a);
  const x = a[0];
  const y = a[1];
  const z = a[2];
  if (!Number.isFinite(x) || !Number.isFinite(y) || !Number.isFinite(z)) {
    throw new InputError(field, 'must have finite components', a);
  }
  const n = Math.sqrt(x * x + y * y + z * z);
  if (n === 0) throw new InputError(field, 'must not be the zero vector', a);
  return n;
}

/** Fills `basis` with the normal N (row 1) from r × v; returns nothing, throws on r ∥ v. */
function normalInto(r: Vec3Like, v: Vec3Like, rn: number, vn: number): void {
  const hx = r[1] * v[2] - r[2] * v[1];
  const hy = r[2] * v[0] - r[0] * v[2];
  const hz = r[0] * v[1] - r[1] * v[0];
  const h = Math.sqrt(hx * hx + hy * hy + hz * hz);
  if (!(h > PARALLEL_TOLERANCE * rn * vn)) {
    throw new InputError('r, v', 'must not be parallel (orbit normal undefined)', [r[0], r[1], r[2], v[0], v[1], v[2]]);
  }
  basis[3] = hx / h;
  basis[4] = hy / h;
  basis[5] = hz / h;
}

/** Rows of `basis` = V, N, B. */
function vnbBasis(r: Vec3Like, v: Vec3Like): void {
  const rn = checkVector('r', r);
  const vn = checkVector('v', v);
  normalInto(r, v, rn, vn);
  const vx = v[0] / vn;
  const vy = v[1] / vn;
  const vz = v[2] / vn;
  basis[0] = vx;
  basis[1] = vy;
  basis[2] = vz;
  const nx = basis[3];
  const ny = basis[4];
  const nz = basis[5];
  // B = V × N (unit: V ⟂ N and both are unit)
  basis[6] = vy * nz - vz * ny;
  basis[7] = vz * nx - vx * nz;
  basis[8] = vx * ny - vy * nx;
}

/** Rows of `basis` = R, T, N. */
function rtnBasis(r: Vec3Like, v: Vec3Like): void {
  const rn = checkVector('r', r);
  const vn = checkVector('v', v);
  normalInto(r, v, rn, vn);
  const nx = basis[3];
  const ny = basis[4];
  const nz = basis[5];
  const rx = r[0] / rn;
  const ry = r[1] / rn;
  const rz = r[2] / rn;
  basis[0] = rx;
  basis[1] = ry;
  basis[2] = rz;
  // T = N × R, stored in row 1; N moves to row 2.
  basis[3] = ny * rz - nz * ry;
  basis[4] = nz * rx - nx * rz;
  basis[5] = nx * ry - ny * rx;
  basis[6] = nx;
  basis[7] = ny;
  basis[8] = nz;
}

function checkLocal(field: string, a: Vec3Like): void {
  if (!a || a.length < 3) throw new InputError(field, 'must have 3 components', a);
  if (!Number.isFinite(a[0]) || !Number.isFinite(a[1]) || !Number.isFinite(a[2])) {
    throw new InputError(field, 'must have finite components', a);
  }
}

/** out = Σ local[k]·(axis k): components in the basis rows → inertial. */
function basisToInertial(local: Vec3Like, out: Vec3): Vec3 {
  const a = local[0];
  const b = local[1];
  const c = local[2];
  out[0] = a * basis[0] + b * basis[3] + c * basis[6];
  out[1] = a * basis[1] + b * basis[4] + c * basis[7];
  out[2] = a * basis[2] + b * basis[5] + c * basis[8];
  return out;
}

/** out[k] = (axis k)·vec: inertial → components in the basis rows. */
function inertialToBasis(vec: Vec3Like, out: Vec3): Vec3 {
  const x = vec[0];
  const y = vec[1];
  const z = vec[2];
  out[0] = basis[0] * x + basis[1] * y + basis[2] * z;
  out[1] = basis[3] * x + basis[4] * y + basis[5] * z;
  out[2] = basis[6] * x + basis[7] * y + basis[8] * z;
  return out;
}

/** Inertial vector from VNB components [v, n, b] at state (r, v). */
export function vnbToInertial(r: Vec3Like, v: Vec3Like, local: Vec3Like, out: Vec3 = [0, 0, 0]): Vec3 {
  checkLocal('local', local);
  vnbBasis(r, v);
  return basisToInertial(local, out);
}

/** VNB components [v, n, b] of an inertial vector at state (r, v). */
export function inertialToVnb(r: Vec3Like, v: Vec3Like, vec: Vec3Like, out: Vec3 = [0, 0, 0]): Vec3 {
  checkLocal('vec', vec);
  vnbBasis(r, v);
  return inertialToBasis(vec, out);
}

/** Inertial vector from RTN components [r, t, n] at state (r, v). */
export function rtnToInertial(r: Vec3Like, v: Vec3Like, local: Vec3Like, out: Vec3 = [0, 0, 0]): Vec3 {
  checkLocal('local', local);
  rtnBasis(r, v);
  return basisToInertial(local, out);
}

/** RTN components [r, t, n] of an inertial vector at state (r, v). */
export function inertialToRtn(r: Vec3Like, v: Vec3Like, vec: Vec3Like, out: Vec3 = [0, 0, 0]): Vec3 {
  checkLocal('vec', vec);
  rtnBasis(r, v);
  return inertialToBasis(vec, out);
}

/**
 * The VNB → inertial matrix at (r, v): columns are V, N, B, so inertial = M·local.
 * Written row-major into `out`.
 */
export function vnbMatrix(r: Vec3Like, v: Vec3Like, out: Mat3 = new Float64Array(9)): Mat3 {
  vnbBasis(r, v);
  return transposeBasisInto(out);
}

/** The RTN → inertial matrix at (r, v): columns are R, T, N, so inertial = M·local. */
export function rtnMatrix(r: Vec3Like, v: Vec3Like, out: Mat3 = new Float64Array(9)): Mat3 {
  rtnBasis(r, v);
  return transposeBasisInto(out);
}

function transposeBasisInto(out: Mat3): Mat3 {
  out[0] = basis[0];
  out[1] = basis[3];
  out[2] = basis[6];
  out[3] = basis[1];
  out[4] = basis[4];
  out[5] = basis[7];
  out[6] = basis[2];
  out[7] = basis[5];
  out[8] = basis[8];
  return out;
}

/** Active rotation by `angle` about +x, row-major. */
export function rotX(angle: number, out: Mat3 = new Float64Array(9)): Mat3 {
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  out[0] = 1;
  out[1] = 0;
  out[2] = 0;
  out[3] = 0;
  out[4] = c;
  out[5] = -s;
  out[6] = 0;
  out[7] = s;
  out[8] = c;
  return out;
}

/** Active rotation by `angle` about +z, row-major. */
export function rotZ(angle: number, out: Mat3 = new Float64Array(9)): Mat3 {
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  out[0] = c;
  out[1] = -s;
  out[2] = 0;
  out[3] = s;
  out[4] = c;
  out[5] = 0;
  out[6] = 0;
  out[7] = 0;
  out[8] = 1;
  return out;
}

/**
 * Perifocal → inertial matrix Q = Rz(raan)·Rx(i)·Rz(argp) (3-1-3 Euler angles; Curtis,
 * Orbital Mechanics for Engineering Students, eq. 4.49 transposed). Column 0 is the periapsis
 * direction P, column 1 is Q (ν = 90°), column 2 the orbit normal W.
 */
export function perifocalToInertial(raan: number, i: number, argp: number, out: Mat3 = new Float64Array(9)): Mat3 {
  const cO = Math.cos(raan);
  const sO = Math.sin(raan);
  const ci = Math.cos(i);
  const si = Math.sin(i);
  const cw = Math.cos(argp);
  const sw = Math.sin(argp);
  out[0] = cO * cw - sO * ci * sw;
  out[1] = -cO * sw - sO * ci * cw;
  out[2] = sO * si;
  out[3] = sO * cw + cO * ci * sw;
  out[4] = -sO * sw + cO * ci * cw;
  out[5] = -cO * si;
  out[6] = si * sw;
  out[7] = si * cw;
  out[8] = ci;
  return out;
}

/** out = m·a (m row-major 3×3); out may alias a. */
export function mat3MulVec(m: ArrayLike<number>, a: Vec3Like, out: Vec3 = [0, 0, 0]): Vec3 {
  const x = a[0];
  const y = a[1];
  const z = a[2];
  out[0] = m[0] * x + m[1] * y + m[2] * z;
  out[1] = m[3] * x + m[4] * y + m[5] * z;
  out[2] = m[6] * x + m[7] * y + m[8] * z;
  return out;
}

/** out = mᵀ·a (the inverse for a rotation); out may alias a. */
export function mat3TMulVec(m: ArrayLike<number>, a: Vec3Like, out: Vec3 = [0, 0, 0]): Vec3 {
  const x = a[0];
  const y = a[1];
  const z = a[2];
  out[0] = m[0] * x + m[3] * y + m[6] * z;
  out[1] = m[1] * x + m[4] * y + m[7] * z;
  out[2] = m[2] * x + m[5] * y + m[8] * z;
  return out;
}

/** out = a·b for row-major 3×3 matrices; out may alias a or b. */
export function mat3Mul(a: ArrayLike<number>, b: ArrayLike<number>, out: Mat3 = new Float64Array(9)): Mat3 {
  const r0 = a[0] * b[0] + a[1] * b[3] + a[2] * b[6];
  const r1 = a[0] * b[1] + a[1] * b[4] + a[2] * b[7];
  const r2 = a[0] * b[2] + a[1] * b[5] + a[2] * b[8];
  const r3 = a[3] * b[0] + a[4] * b[3] + a[5] * b[6];
  const r4 = a[3] * b[1] + a[4] * b[4] + a[5] * b[7];
  const r5 = a[3] * b[2] + a[4] * b[5] + a[5] * b[8];
  const r6 = a[6] * b[0] + a[7] * b[3] + a[8] * b[6];
  const r7 = a[6] * b[1] + a[7] * b[4] + a[8] * b[7];
  const r8 = a[6] * b[2] + a[7] * b[5] + a[8] * b[8];
  out[0] = r0;
  out[1] = r1;
  out[2] = r2;
  out[3] = r3;
  out[4] = r4;
  out[5] = r5;
  out[6] = r6;
  out[7] = r7;
  out[8] = r8;
  return out;
}
