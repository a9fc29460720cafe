/**
 * Small vector helpers of the route builder and the circular parking orbit through a chosen
 * direction in a chosen plane (the ship's start).
 */
import { propagateKepler, stateToElements } from '../orbit/index.ts';
import type { PlanStart } from '../plan/index.ts';

type ParkingStart = Extract<PlanStart, { kind: 'parking' }>;
import type { StarSystem } from '../system/index.ts';

export type V3 = [number, number, number];

export const cross = (a: ArrayLike<number>, b: ArrayLike<number>): V3 => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
export const dot = (a: ArrayLike<number>, b: ArrayLike<number>): number => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
export const norm = (a: ArrayLike<number>): number => Math.hypot(a[0], a[1], a[2]);
export const unit = (a: ArrayLike<number>): V3 => {
  const n = norm(a);
  return [a[0] / n, a[1] / n, a[2] / n];
};

/**
 * The normal of an orbit plane containing the direction û with inclination i to the reference
 * plane, or (i null) the least inclined such plane: ĥ = cos φ·ê₁ + sin φ·ê₂ with
 * ê₁ ∝ ẑ − (ẑ·û)û (the least inclined normal) and ê₂ = û × ê₁ (⊥ ẑ), so ĥ·ẑ = cos φ·|ẑ − (ẑ·û)û|
 * (plane geometry). An inclination below the least one reachable gives the least one.
 */
export function planeThrough(u: V3, i: number | null): V3 {
  let e1: V3 = [-u[2] * u[0], -u[2] * u[1], 1 - u[2] * u[2]];
  let n1 = norm(e1);
  if (n1 < 1e-9) {
    e1 = [1 - u[0] * u[0], -u[0] * u[1], -u[0] * u[2]];
    n1 = norm(e1);
  }
  e1 = [e1[0] / n1, e1[1] / n1, e1[2] / n1];
  if (i === null) return e1;
  const c = Math.max(-1, Math.min(1, Math.cos(i) / Math.max(e1[2], 1e-12)));
  const s = Math.sqrt(1 - c * c);
  const e2 = cross(u, e1);
  return [c * e1[0] + s * e2[0], c * e1[1] + s * e2[1], c * e1[2] + s * e2[2]];
}

/** The normal of a plane sharing the node line of the plane with normal n, at inclination i (i null: n itself). */
export function planeWithInclination(n: V3, i: number | null): V3 {
  if (i === null) return n;
  const node: V3 = Math.hypot(n[0], n[1]) < 1e-12 ? [1, 0, 0] : unit([-n[1], n[0], 0]);
  // ascending node N̂ = (cos Ω, sin Ω, 0): ĥ = (sin i sin Ω, −sin i cos Ω, cos i) = sin i·(N̂ × ẑ) + cos i·ẑ
  return [Math.sin(i) * node[1], -Math.sin(i) * node[0], Math.cos(i)];
}

/**
 * A circular parking orbit about body k of radius r, in the plane of normal ĥ, that passes the
 * direction p̂ (⊥ ĥ) at time t, written as the plan's start `lead` seconds earlier (the state
 * propagated back, its elements taken as in core/conic/fromWindow.ts: argument of latitude in ν).
 */
export function parkingThrough(system: StarSystem, k: number, altitude: number, h: V3, p: V3, t: number, lead: number): ParkingStart {
  const b = system.bodies[k];
  const r = b.radius + altitude;
  const vc = Math.sqrt(b.mu / r);
  const q = cross(h, p);
  const at = [r * p[0], r * p[1], r * p[2], vc * q[0], vc * q[1], vc * q[2]];
  const s = lead > 0 ? propagateKepler(b.mu, at, -lead) : at;
  const el = stateToElements(b.mu, [s[0], s[1], s[2]], [s[3], s[4], s[5]]);
  const nu = el.argp + el.nu;
  return {
    kind: 'parking',
    body: b.id,
    epoch: t - lead,
    periapsisAltitude: altitude,
    e: 0,
    i: el.i,
    raan: el.raan,
    argp: 0,
    nu: nu - 2 * Math.PI * Math.floor(nu / (2 * Math.PI)),
  };
}

/** Period of a circular orbit of radius r, s. */
export const circularPeriod = (mu: number, r: number): number => 2 * Math.PI * Math.sqrt((r * r * r) / mu);
