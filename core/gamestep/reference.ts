/**
 * The reference flight of the game-step check: the same plan, the same gravity model and the
 * same burn model as the game, integrated through the propagation front door
 * (core/integrate/propagate.ts) at a tight tolerance — at rtol ≤ 1e-10 it chooses DOP853, and the
 * method and its reason are kept in the stats — and kept as dense output, so the game's state
 * at any of its step times can be compared with it. No fallback: a piece the adaptive method
 * cannot finish is an error, not a change of method. With 'all' gravity the step is bounded by
 * the n-body model's field step limit (core/nbody/stepLimit.ts: half the shortest period of a
 * pulling body), as in the n-body verification. The forces are the ship force model's
 * (core/dynamics/shipForces.ts), the one every non-conic flight of Waymark uses.
 *
 * Gravity models
 * - 'central' (patched conics, what most games do): the force model's two-body mode — only the
 *   central body pulls; the state is kept relative to it. The sphere-of-influence changes are
 *   integration events: leaving the central body's SOI (|r| rising through its Laplace radius) and
 *   entering a child's (distance to the child falling through the child's radius); at an event
 *   the state is re-expressed about the new central body with the conic ephemeris
 *   (core/system/ephemeris.ts).
 * - 'all': the force model's n-body mode — the star and every body pull (point masses on their
 *   conic ephemerides), with the star's own acceleration towards the bodies (the indirect term),
 *   which is the physics of the n-body verification. The state is kept relative to a frame body
 *   — the plan's central body of the time, switched at the plan's segment boundaries (a change
 *   of coordinates only; the force model is independent of the origin) — so it stays small and
 *   the reference precise in double. A game flying the plan with all-body gravity in a
 *   star-centred world frame flies the same physics when it adds the indirect term (one vector
 *   per time, kernelF64.ts `bodiesGravity`).
 *
 * Burns (their Δv from guidance.ts: re-solved from the flight's own state, or the
 * plan's): impulsive — the Δv added at the burn time; spread — a thrust acceleration F/m(t)
 * along the fixed inertial direction of the Δv from tStart until |Δv| is delivered, with
 * m(t) = m0 − ṁ·(t − tStart) and F = |Δv_plan|·ṁ / ln(m0/m1) (Tsiolkovsky; for a single-stage
 * burn F is the stage's thrust), so the plan's own Δv takes the plan's duration (the force
 * model's thrust phase). Burn times, burn ends and frame switches are breakpoints: no step
 * crosses them.
 */
import { InputError, SolverError } from '../math/index.ts';
import type { DenseOutput } from '../integrate/index.ts';
import { propagate, type EventSpec } from '../integrate/index.ts';
import { fieldStepLimit } from '../nbody/index.ts';
import { bodyPosition, bodyState, bodyStateRelativeToParent } from '../system/index.ts';
import type { StarSystem } from '../system/index.ts';
import { ShipForces, type ThrustPhase } from '../dynamics/index.ts';
import { burnDv, spreadDuration, type GameGuidance } from './guidance.ts';
import type { GameBurn, GameBurnModel, GameGravity } from './burns.ts';

export type { GameBurn, GameBurnModel, GameGravity } from './burns.ts';

/**
 * Method of the reference flight, passed to the front door. RK45: with DOP853 (the front door's
 * own choice at this rtol) at 1e-13 the energy-drift probe of the demo's heliocentric coast
 * (check.ts: a whole orbit without burns, which passes close by Ochre) read 2.7e-2 per orbit for
 * every integrator (RK45 at 1e-12: 4.8e-7): the close pass parts the game and the reference by an
 * amount that depends on the method. The probe now stops counting at the first change of sphere
 * of influence; the reference stays on the method its figures were checked with until DOP853 is
 * re-checked there.
 */
export const REFERENCE_METHOD = 'rk45' as const;
/** Default relative tolerance of the reference flight (RK45). */
export const REFERENCE_RTOL = 1e-12;
/** Default absolute tolerance (m and m/s) of the reference flight. */
export const REFERENCE_ATOL = 1e-9;
/** Step budget per reference piece (attempted steps of the adaptive method). */
export const REFERENCE_MAX_STEPS = 2_000_000;

export interface ReferenceSettings {
  system: StarSystem;
  gravity: GameGravity;
  burnModel: GameBurnModel;
  burns: GameBurn[];
  guidance: GameGuidance;
  /** 'all': frame body schedule — frame body frames.central[k] from frames.t[k] on (t ascending, t[0] ≤ start). */
  frames: { t: number[]; central: number[] };
  rtol?: number;
  /** Step budget per piece (default REFERENCE_MAX_STEPS). */
  maxSteps?: number;
  atol?: number;
  signal?: { aborted: boolean };
}

export interface ReferencePiece {
  t0: number;
  t1: number;
  /** Central (or frame) body the piece's state is relative to. */
  central: number;
  dense: DenseOutput | null;
}

export interface ReferenceStats {
  steps: number;
  rejected: number;
  fevals: number;
  /** SOI changes ('central' model). */
  soiChanges: number;
  /** Method the front door chose ('' before any piece is flown) and its reason, as in FlownSpan. */
  method: string;
  reason: string;
  /** Burns whose solve failed (flown with the plan's Δv instead). */
  solveFailures: string[];
}

export interface ReferenceFlight {
  pieces: ReferencePiece[];
  /** End time, state (relative to `central`) and central body. */
  t: number;
  y: Float64Array;
  central: number;
  stats: ReferenceStats;
}

/** Frame body of the 'all' model at time t. */
export function frameAt(frames: { t: number[]; central: number[] }, t: number): number {
  let k = 0;
  while (k + 1 < frames.t.length && frames.t[k + 1] <= t) k++;
  return frames.central[k];
}

/** Thrust acceleration magnitude of a spread burn at time t (inside its window), m/s². */
export function spreadAccel(b: GameBurn, t: number): number {
  if (!(b.mdot > 0) || !(b.mass0 > b.mass1)) return b.duration > 0 ? b.dvMag / b.duration : 0;
  return b.thrust / (b.mass0 - b.mdot * (t - b.tStart));
}

/**
 * A spread burn as a thrust phase of the force model, from tStart: thrust F with the mass
 * falling at ṁ, or — without a mass flow — the constant acceleration |Δv|/duration (no exhaust
 * flow: exhaust Infinity, mass 1). Its acceleration is spreadAccel.
 */
export function spreadPhase(b: GameBurn): ThrustPhase {
  if (!(b.mdot > 0) || !(b.mass0 > b.mass1)) return { duration: b.duration, thrust: b.duration > 0 ? b.dvMag / b.duration : 0, exhaust: Infinity, mass0: 1 };
  return { duration: b.duration, thrust: b.thrust, exhaust: b.thrust / b.mdot, mass0: b.mass0 };
}

const abs6 = new Float64Array(6);
const rel6 = new Float64Array(6);
const p3 = new Float64Array(3);

/**
 * Flies the reference from absolute (star-frame) state `absState` at t0 about `central`
 * ('central' model; ignored by 'all', which takes its frame body from the schedule) to tEnd.
 * Burns whose time (impulsive) or window (spread) lies in [t0, tEnd) are flown.
 */
export function flyReference(
  s: ReferenceSettings,
  t0: number,
  absState: ArrayLike<number>,
  central: number,
  tEnd: number,
  keepDense: boolean,
): ReferenceFlight {
  const system = s.system;
  const bodies = system.bodies;
  if (!(tEnd >= t0)) throw new InputError('tEnd', 'must not be before t0', tEnd);
  const rtol = s.rtol ?? REFERENCE_RTOL;
  const atol = s.atol ?? REFERENCE_ATOL;
  let c = s.gravity === 'all' ? frameAt(s.frames, t0) : central;
  const y = new Float64Array(6);
  bodyState(system, c, t0, abs6);
  for (let i = 0; i < 6; i++) y[i] = absState[i] - abs6[i];
  const burns = s.burns;
  const isSpread = (b: GameBurn): boolean => s.burnModel === 'spread' && b.duration > 0;
  // burns before t0 are done (as GameFlight.reset counts them)
  const done = burns.map((b) => (isSpread(b) ? b.tStart < t0 : b.t < t0));
  let active: { b: GameBurn; dv: [number, number, number]; tEnd: number } | null = null;
  const pieces: ReferencePiece[] = [];
  const stats: ReferenceStats = { steps: 0, rejected: 0, fevals: 0, soiChanges: 0, method: '', reason: '', solveFailures: [] };
  const dv: [number, number, number] = [0, 0, 0];
  const forces = new ShipForces(system, { gravity: s.gravity === 'all' ? 'n-body' : 'two-body' });
  const limit = fieldStepLimit(forces);
  const maxStep = Number.isFinite(limit) ? limit : undefined;
  const u = new Float64Array(3);
  let t = t0;
  let guard = 0;
  for (;;) {
    if (++guard > 100_000) throw new SolverError('game-step reference', 'step-budget', 'too many pieces (SOI changes)');
    if (s.signal?.aborted) throw new SolverError('game-step reference', 'cancelled', `cancelled at t = ${t} s`);
    // what happens at t: impulses, spread starts and ends, frame switches
    if (active && active.tEnd <= t) active = null;
    for (let i = 0; i < burns.length; i++) {
      if (done[i] || t >= tEnd) continue;
      const b = burns[i];
      if (!isSpread(b) && b.t <= t) {
        toAbs(system, c, t, y, abs6);
        if (!burnDv(system, b, s.guidance, t, abs6, false, dv)) stats.solveFailures.push(b.id);
        addDv(y, dv);
        done[i] = true;
      } else if (isSpread(b) && b.tStart <= t && !active) {
        toAbs(system, c, t, y, abs6);
        const d: [number, number, number] = [0, 0, 0];
        if (!burnDv(system, b, s.guidance, t, abs6, true, d)) stats.solveFailures.push(b.id);
        active = { b, dv: d, tEnd: t + spreadDuration(b, Math.hypot(d[0], d[1], d[2])) };
        done[i] = true;
      }
    }
    if (s.gravity === 'all') {
      const nf = frameAt(s.frames, t);
      if (nf !== c) {
        shiftFrame(system, c, nf, t, y);
        c = nf;
      }
    }
    if (t >= tEnd) break;
    let tb = tEnd;
    for (let i = 0; i < burns.length; i++) {
      if (done[i]) continue;
      const tn = isSpread(burns[i]) ? burns[i].tStart : burns[i].t;
      if (tn > t && tn < tb) tb = tn;
    }
    if (active && active.tEnd > t && active.tEnd < tb) tb = active.tEnd;
    if (s.gravity === 'all') for (const tf of s.frames.t) if (tf > t && tf < tb) tb = tf;
    forces.origin = c;
    const m = active ? Math.hypot(active.dv[0], active.dv[1], active.dv[2]) : 0;
    if (active && m > 0) {
      for (let i = 0; i < 3; i++) u[i] = active.dv[i] / m;
      // the phase lasts as long as this burn's own Δv takes (a re-solved or retargeted Δv may differ from the plan's)
      forces.setThrust({ ...spreadPhase(active.b), duration: active.tEnd - active.b.tStart }, active.b.tStart, u, null);
    } else {
      forces.setThrust(null, 0, u, null);
    }
    const events = s.gravity === 'central' ? soiEvents(system, c) : [];
    const res = propagate({
      accel: forces.accel,
      t0: t,
      x0: y.subarray(0, 3),
      v0: y.subarray(3, 6),
      tEnd: tb,
      rtol,
      atol,
      maxStep,
      maxSteps: s.maxSteps ?? REFERENCE_MAX_STEPS,
      method: REFERENCE_METHOD,
      fallback: false,
      dense: keepDense,
      events,
      signal: s.signal,
    });
    for (const span of res.spans) {
      stats.steps += span.stats.accepted;
      stats.rejected += span.stats.rejected;
      stats.fevals += span.stats.fevals;
      stats.method = span.method;
      stats.reason = span.reason;
    }
    if (res.status === 'cancelled') throw new SolverError('game-step reference', 'cancelled', `cancelled at t = ${res.t} s`);
    if (res.status !== 'done' && res.status !== 'event') {
      throw new SolverError('game-step reference', res.status === 'step-budget' ? 'step-budget' : 'step-underflow', `${res.message} (t = ${res.t} s)`, {
        t: res.t,
      });
    }
    if (res.t > t) pieces.push({ t0: t, t1: res.t, central: c, dense: res.dense ?? null });
    t = res.t;
    y.set(res.x, 0);
    y.set(res.v, 3);
    if (res.status === 'event') {
      const hit = res.events[res.events.length - 1];
      const next = hit.index === 0 && c !== 0 ? bodies[c].parentIndex : eventChild(system, c, hit.index);
      changeCentral(system, c, next, t, y);
      c = next;
      stats.soiChanges++;
    }
  }
  return { pieces, t, y, central: c, stats };
}

function toAbs(system: StarSystem, c: number, t: number, y: Float64Array, out: Float64Array): void {
  bodyState(system, c, t, out);
  for (let i = 0; i < 6; i++) out[i] += y[i];
}

function addDv(y: Float64Array, dv: ArrayLike<number>): void {
  y[3] += dv[0];
  y[4] += dv[1];
  y[5] += dv[2];
}

// Index of event k (k ≥ 1 for children; k = 0 is the exit when the central body is not the star).
function eventChild(system: StarSystem, c: number, k: number): number {
  const kids = system.bodies[c].children;
  return kids[c === 0 ? k : k - 1];
}

function soiEvents(system: StarSystem, c: number): EventSpec[] {
  const bodies = system.bodies;
  const ev: EventSpec[] = [];
  if (c !== 0) {
    const R = bodies[c].derived.soiRadius;
    ev.push({ name: 'soi-exit', terminal: true, direction: 1, g: (_t, y) => Math.hypot(y[0], y[1], y[2]) - R });
  }
  for (const k of bodies[c].children) {
    const R = bodies[k].derived.soiRadius;
    const q = new Float64Array(3);
    ev.push({
      name: `soi-entry-${k}`,
      terminal: true,
      direction: -1,
      g: (t, y) => {
        bodyPosition(system, k, t, q, c);
        return Math.hypot(y[0] - q[0], y[1] - q[1], y[2] - q[2]) - R;
      },
    });
  }
  return ev;
}

/** Re-expresses y (relative to `from`) about `to`, a parent or a child of `from`, at time t. */
export function changeCentral(system: StarSystem, from: number, to: number, t: number, y: Float64Array): void {
  if (system.bodies[from].parentIndex === to) {
    bodyStateRelativeToParent(system, from, t, rel6);
    for (let i = 0; i < 6; i++) y[i] += rel6[i];
  } else {
    bodyStateRelativeToParent(system, to, t, rel6);
    for (let i = 0; i < 6; i++) y[i] -= rel6[i];
  }
}

function shiftFrame(system: StarSystem, from: number, to: number, t: number, y: Float64Array): void {
  bodyState(system, to, t, rel6, from);
  for (let i = 0; i < 6; i++) y[i] -= rel6[i];
}

/** Absolute positions (star frame) of every body at t, 3 per body, parents before children. */
export function absolutePositions(system: StarSystem, order: readonly number[], t: number, out: Float64Array): void {
  const bodies = system.bodies;
  out[0] = out[1] = out[2] = 0;
  for (const j of order) {
    if (j === 0) continue;
    const p = bodies[j].parentIndex;
    bodyPosition(system, j, t, p3, p);
    out[3 * j] = out[3 * p] + p3[0];
    out[3 * j + 1] = out[3 * p + 1] + p3[1];
    out[3 * j + 2] = out[3 * p + 2] + p3[2];
  }
}

/** Body indices ordered parents first. */
export function treeOrder(system: StarSystem): number[] {
  const out: number[] = [];
  const visit = (i: number): void => {
    out.push(i);
    for (const k of system.bodies[i].children) visit(k);
  };
  visit(0);
  return out;
}

/**
 * Dense lookup over the pieces of a reference flight: the absolute (star-frame) state at any
 * time of the flight. At a piece boundary the later piece wins (the state after an impulse).
 */
export class ReferenceTrack {
  private readonly starts: Float64Array;
  private readonly y = new Float64Array(6);
  private readonly b = new Float64Array(6);

  constructor(
    readonly system: StarSystem,
    readonly flight: ReferenceFlight,
  ) {
    const p = flight.pieces;
    if (p.length === 0 || p.some((x) => !x.dense)) throw new InputError('flight', 'must hold at least one piece with dense output');
    this.starts = Float64Array.from(p.map((x) => x.t0));
  }

  get t0(): number {
    return this.flight.pieces[0].t0;
  }

  get t1(): number {
    return this.flight.pieces[this.flight.pieces.length - 1].t1;
  }

  /** Absolute state at t (clamped to the flight's span) into out6; returns the piece's central body. */
  at(t: number, out6: Float64Array): number {
    const pieces = this.flight.pieces;
    const tc = Math.min(Math.max(t, this.t0), this.t1);
    const s = this.starts;
    let lo = 0;
    let hi = s.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (s[mid] <= tc) lo = mid;
      else hi = mid - 1;
    }
    let piece = pieces[lo];
    if (tc > piece.t1) piece = pieces[Math.min(lo + 1, pieces.length - 1)];
    const tt = Math.min(Math.max(tc, piece.t0), piece.t1);
    (piece.dense as DenseOutput).at(tt, this.y);
    bodyState(this.system, piece.central, tt, this.b);
    for (let i = 0; i < 6; i++) out6[i] = this.y[i] + this.b[i];
    return piece.central;
  }
}
