/**
 * How much of the system the whole plan covers, for the System view's whole-plan framing: the
 * body whose frame holds every segment of the flight and the given bodies (the innermost body
 * all their central bodies orbit: the star for an interplanetary plan, a planet for a flight
 * among its moons), and the radius about it of a sphere holding the path and those bodies at
 * the times given (each body's reach includes its radius). Reads the result and the conic
 * ephemeris only.
 */
import type { PlanResult } from '../../../core/plan/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import { bodyPosition } from '../../../core/system/index.ts';

export interface PlanExtent {
  /** Index of the body the framing centres on. */
  centre: number;
  /** Radius about it holding the path and the bodies, m (0: nothing to frame). */
  radius: number;
}

function ancestors(system: StarSystem, i: number): number[] {
  const out: number[] = [];
  for (let k = i; k >= 0; k = system.bodies[k].parentIndex) out.push(k);
  return out;
}

export function planExtent(system: StarSystem, result: PlanResult, bodies: readonly number[], times: readonly number[]): PlanExtent {
  const involved = new Set<number>(bodies.filter((i) => i >= 0 && i < system.bodies.length));
  for (const seg of result.segments) involved.add(seg.central);
  if (involved.size === 0) return { centre: 0, radius: 0 };
  const centre = [...involved].map((i) => ancestors(system, i)).reduce((a, b) => a.filter((k) => b.includes(k)))[0] ?? 0;
  const p = [0, 0, 0];
  let radius = 0;
  for (const seg of result.segments) {
    let reach = 0;
    for (let k = 0; k < seg.samples.length; k += 3) reach = Math.max(reach, Math.hypot(seg.samples[k], seg.samples[k + 1], seg.samples[k + 2]));
    if (seg.central !== centre) {
      // the segment's own samples about its body, that body where it is at the segment's start
      bodyPosition(system, seg.central, seg.t0, p, centre);
      reach += Math.hypot(p[0], p[1], p[2]);
    }
    radius = Math.max(radius, reach);
  }
  for (const i of involved) {
    if (i === centre) continue;
    for (const t of times) {
      bodyPosition(system, i, t, p, centre);
      radius = Math.max(radius, Math.hypot(p[0], p[1], p[2]) + system.bodies[i].radius);
    }
  }
  return { centre, radius };
}
