/**
 * The report of a flyby plan event (plan.ts FlybyEvent). `passReport` builds it from the ship's
 * states relative to the body at the sphere's entry and exit (shared with the n-body reading,
 * core/target/nbodyFlybys.ts); `flybyReport` reads those from the flown patched-conic
 * segments: the ship's stay in the body's sphere of influence nearest the marker, its incoming
 * conic (the one it entered on) and outgoing conic (the last one before it left).
 *
 * - v∞ in/out: the asymptotes of those conics, Ŝ_in = P/e + √(e² − 1)/e·Q and
 *   Ŝ_out = −P/e + √(e² − 1)/e·Q, |v∞| = √(−μ/a) (two-body hyperbola; Curtis, Orbital Mechanics
 *   for Engineering Students, §8.9 — from memory). The turn is the angle between them.
 * - Periapsis (radius, altitude, time) of the incoming conic: t_p = t_entry − M/n (a model that
 *   flies the pass itself may give its own periapsis instead, `periapsisMethod` saying how found).
 * - B-plane of the incoming conic: B = Ŝ × h / v∞ on T = Ŝ × ẑ normalised, R = Ŝ × T (Vallado,
 *   Fundamentals of Astrodynamics and Applications, 4th ed., §12.4 — from memory); θ from T to R.
 * - The free heliocentric Δv: |v∞ out − v∞ in| (the change of the parent-relative velocity the
 *   pass gives, burns at the body included — the Δv burned there is reported beside it).
 */
import type { StarSystem } from '../system/index.ts';
import type { FlybyReport, TrajectoryEvent, TrajectorySegment } from '../plan/index.ts';
import { propagateKepler } from '../orbit/index.ts';
import { conicInfo, createConicInfo } from './soiCrossing.ts';
import { bPlaneFrame } from '../orbit/index.ts';

const frameScratch = new Float64Array(6);

export interface FlybyMark {
  id: string;
  name: string;
  body: number;
  /** Flight time when the marker was reached, s. */
  t: number;
}

const info = createConicInfo();
const st6 = new Float64Array(6);

/** Asymptote direction of the conic in `info` (incoming: sign +1 on P/e; outgoing: −1), scaled by v∞. */
function asymptote(sign: number, mu: number): [number, number, number] | null {
  if (!(info.e > 1)) return null;
  const e = info.e;
  const vinf = Math.sqrt(-mu * info.alpha);
  const q = Math.sqrt(e * e - 1) / e;
  return [vinf * ((sign * info.P[0]) / e + q * info.Q[0]), vinf * ((sign * info.P[1]) / e + q * info.Q[1]), vinf * ((sign * info.P[2]) / e + q * info.Q[2])];
}

/**
 * What a pass report is built from, whatever model flew the pass: the ship's state relative to the
 * body when it entered the sphere (`stateIn`, at `tEntry`) and when it left (`stateOut`, at
 * `tExit`; both null when it did not leave), the Δv burned inside, and optionally the periapsis
 * found by the model itself (else the periapsis of the osculating hyperbola at entry).
 */
export interface PassStates {
  planEventId: string;
  name: string;
  body: number;
  tEntry: number;
  stateIn: ArrayLike<number>;
  /** Time of `stateIn` when it is not exactly tEntry (the incoming conic's start), s. */
  tIn?: number;
  tExit: number | null;
  stateOut: ArrayLike<number> | null;
  dvBurned: number;
  periapsis?: { t: number; radius: number; method: 'probe' | 'osculating' };
}

/**
 * The report of a pass from its entry and exit states (see the module comment): v∞ in, the
 * B-plane and the periapsis from the osculating hyperbola about the body at entry, v∞ out from the
 * one at exit. Null when the entry state is not on a hyperbola about the body.
 */
export function passReport(system: StarSystem, pass: PassStates): FlybyReport | null {
  const k = pass.body;
  const b = system.bodies[k];
  const mu = b.mu;
  conicInfo(mu, pass.stateIn, info);
  const vIn = asymptote(1, mu);
  if (!vIn) return null;
  const rp = pass.periapsis ? pass.periapsis.radius : info.rp;
  const tPeriapsis = pass.periapsis ? pass.periapsis.t : (pass.tIn ?? pass.tEntry) - info.M / info.n;
  const vinIn = Math.hypot(vIn[0], vIn[1], vIn[2]);
  const Sx = vIn[0] / vinIn,
    Sy = vIn[1] / vinIn,
    Sz = vIn[2] / vinIn;
  const bx = (Sy * info.hz - Sz * info.hy) / vinIn,
    by = (Sz * info.hx - Sx * info.hz) / vinIn,
    bz = (Sx * info.hy - Sy * info.hx) / vinIn;
  const fr = bPlaneFrame(Sx, Sy, Sz, frameScratch);
  const Tx = fr[0],
    Ty = fr[1],
    Tz = fr[2],
    Rx = fr[3],
    Ry = fr[4],
    Rz = fr[5];
  const bT = bx * Tx + by * Ty + bz * Tz;
  const bR = bx * Rx + by * Ry + bz * Rz;
  let vOut: [number, number, number] | null = null;
  if (pass.tExit !== null && pass.stateOut) {
    conicInfo(mu, pass.stateOut, info);
    vOut = asymptote(-1, mu);
  }
  let turn: number | null = null;
  let freeDv: number | null = null;
  if (vOut) {
    const vo = Math.hypot(vOut[0], vOut[1], vOut[2]);
    const c = (vIn[0] * vOut[0] + vIn[1] * vOut[1] + vIn[2] * vOut[2]) / (vinIn * vo);
    turn = Math.acos(Math.max(-1, Math.min(1, c)));
    freeDv = Math.hypot(vOut[0] - vIn[0], vOut[1] - vIn[1], vOut[2] - vIn[2]);
  }
  const report: FlybyReport = {
    planEventId: pass.planEventId,
    name: pass.name,
    body: k,
    tEntry: pass.tEntry,
    tExit: pass.tExit,
    tPeriapsis,
    periapsisRadius: rp,
    periapsisAltitude: rp - b.radius,
    vInfIn: vIn,
    vInfOut: vOut,
    turn,
    bT,
    bR,
    bAngle: Math.atan2(bR, bT),
    freeDv,
    dvBurned: pass.dvBurned,
  };
  if (pass.periapsis) report.periapsisMethod = pass.periapsis.method;
  return report;
}

/** The report of one flyby marker, or null when the ship never entered the body's SOI. */
export function flybyReport(
  system: StarSystem,
  mark: FlybyMark,
  segments: TrajectorySegment[],
  events: TrajectoryEvent[],
  burnRows: { t: number; dv: number }[],
): FlybyReport | null {
  const k = mark.body;
  // the stay: the last entry at or before the marker, else the first after it
  let entry = -1;
  for (const ev of events) {
    if (ev.kind !== 'soi-entry' || ev.central !== k) continue;
    if (ev.t <= mark.t + 1e-9 || entry < 0) entry = events.indexOf(ev);
    if (ev.t > mark.t) break;
  }
  if (entry < 0) return null;
  const tEntry = events[entry].t;
  let tExit: number | null = null;
  for (let i = entry + 1; i < events.length; i++) {
    if (events[i].kind === 'soi-exit' && events[i].central === k) {
      tExit = events[i].t;
      break;
    }
  }
  const inside = segments.filter((s) => s.kind === 'coast' && s.central === k && s.t0 >= tEntry - 1e-9 && (tExit === null || s.t1 <= tExit + 1e-9));
  if (inside.length === 0) return null;
  const first = inside[0];
  const last = inside[inside.length - 1];
  // outgoing: the last conic flown inside, at its end (only when the ship left the sphere)
  let stateOut: Float64Array | null = null;
  if (tExit !== null) {
    propagateKepler(system.bodies[k].mu, last.state0, last.t1 - last.t0, st6);
    stateOut = st6;
  }
  let dvBurned = 0;
  for (const r of burnRows) if (r.t >= tEntry && (tExit === null || r.t <= tExit)) dvBurned += r.dv;
  // the incoming conic's own start time (the entry, to the event's rounding) dates its periapsis
  return passReport(system, { planEventId: mark.id, name: mark.name, body: k, tEntry, tIn: first.t0, stateIn: first.state0, tExit, stateOut, dvBurned });
}
