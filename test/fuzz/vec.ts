/** Plain 3-vector arithmetic for building and checking fuzz cases (allocation does not matter here). */
export type V3 = [number, number, number];

export const add = (a: V3, b: V3): V3 => [a[0] + b[0], a[1] + b[1], a[2] + b[2]];
export const sub = (a: ArrayLike<number>, b: ArrayLike<number>): V3 => [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
export const scale = (a: V3, k: number): V3 => [a[0] * k, a[1] * k, a[2] * k];
export const dot = (a: ArrayLike<number>, b: ArrayLike<number>): number => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
export const cross = (a: V3, b: V3): V3 => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
export const norm = (a: ArrayLike<number>): number => Math.hypot(a[0], a[1], a[2]);
export const unit = (a: V3): V3 => scale(a, 1 / norm(a));

/** A unit vector perpendicular to u (u a unit vector), turned by angle phi about u. */
export function perpendicular(u: V3, phi: number): V3 {
  const helper: V3 = Math.abs(u[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0];
  const p = unit(cross(u, helper));
  const q = cross(u, p);
  return add(scale(p, Math.cos(phi)), scale(q, Math.sin(phi)));
}

/** u turned by angle theta toward the unit vector w (w ⟂ u). */
export function turn(u: V3, w: V3, theta: number): V3 {
  return add(scale(u, Math.cos(theta)), scale(w, Math.sin(theta)));
}
