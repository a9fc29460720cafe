/**
 * 3-vectors as plain arrays or Float64Array views. Every operation writes into an `out`
 * target and returns it, so hot loops can reuse scratch vectors and allocate nothing
 * (the pattern of three.js's math classes). Omitting `out` allocates a new vector.
 */

/** A readable 3-vector: a plain array or a typed-array view. */
export type Vec3Like = ArrayLike<number>;
/** A writable 3-vector. */
export type Vec3 = number[] | Float64Array;

export function vec3(x = 0, y = 0, z = 0): number[] {
  return [x, y, z];
}

export function copy(a: Vec3Like, out: Vec3 = [0, 0, 0]): Vec3 {
  out[0] = a[0];
  out[1] = a[1];
  out[2] = a[2];
  return out;
}

export function set(out: Vec3, x: number, y: number, z: number): Vec3 {
  out[0] = x;
  out[1] = y;
  out[2] = z;
  return out;
}

export function add(a: Vec3Like, b: Vec3Like, out: Vec3 = [0, 0, 0]): Vec3 {
  out[0] = a[0] + b[0];
  out[1] = a[1] + b[1];
  out[2] = a[2] + b[2];
  return out;
}

export function sub(a: Vec3Like, b: Vec3Like, out: Vec3 = [0, 0, 0]): Vec3 {
  out[0] = a[0] - b[0];
  out[1] = a[1] - b[1];
  out[2] = a[2] - b[2];
  return out;
}

export function scale(a: Vec3Like, s: number, out: Vec3 = [0, 0, 0]): Vec3 {
  out[0] = a[0] * s;
  out[1] = a[1] * s;
  out[2] = a[2] * s;
  return out;
}

/** out = a + b·s */
export function addScaled(a: Vec3Like, b: Vec3Like, s: number, out: Vec3 = [0, 0, 0]): Vec3 {
  out[0] = a[0] + b[0] * s;
  out[1] = a[1] + b[1] * s;
  out[2] = a[2] + b[2] * s;
  return out;
}

export function dot(a: Vec3Like, b: Vec3Like): number {
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

export function cross(a: Vec3Like, b: Vec3Like, out: Vec3 = [0, 0, 0]): Vec3 {
  const x = a[1] * b[2] - a[2] * b[1];
  const y = a[2] * b[0] - a[0] * b[2];
  const z = a[0] * b[1] - a[1] * b[0];
  out[0] = x;
  out[1] = y;
  out[2] = z;
  return out;
}

export function norm(a: Vec3Like): number {
  return Math.sqrt(a[0] * a[0] + a[1] * a[1] + a[2] * a[2]);
}

export function normSq(a: Vec3Like): number {
  return a[0] * a[0] + a[1] * a[1] + a[2] * a[2];
}

export function distance(a: Vec3Like, b: Vec3Like): number {
  const dx = a[0] - b[0];
  const dy = a[1] - b[1];
  const dz = a[2] - b[2];
  return Math.sqrt(dx * dx + dy * dy + dz * dz);
}

/** Unit vector along a; the zero vector stays zero (callers that need a direction check first). */
export function normalize(a: Vec3Like, out: Vec3 = [0, 0, 0]): Vec3 {
  const n = norm(a);
  const s = n > 0 ? 1 / n : 0;
  out[0] = a[0] * s;
  out[1] = a[1] * s;
  out[2] = a[2] * s;
  return out;
}

/** Angle between a and b in [0, π], computed with atan2 for accuracy near 0 and π. */
export function angleBetween(a: Vec3Like, b: Vec3Like): number {
  const cx = a[1] * b[2] - a[2] * b[1];
  const cy = a[2] * b[0] - a[0] * b[2];
  const cz = a[0] * b[1] - a[1] * b[0];
  return Math.atan2(Math.sqrt(cx * cx + cy * cy + cz * cz), dot(a, b));
}
