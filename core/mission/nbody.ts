/**
 * n-body verification: flies the burns of a patched-conic result through the restricted
 * n-body model and reports how the arrival differs from the patched-conic plan.
 *
 * Model (restricted n-body problem): the star and every body pull on the ship as point masses;
 * the bodies move on their conic ephemerides (core/system/ephemeris.ts); the ship pulls on
 * nothing. The equations are written relative to an origin body o — the body whose sphere of
 * influence the ship is in — in the standard third-body form (Montenbruck & Gill, Satellite
 * Orbits, §3.3; Battin, An Introduction to the Mathematics and Methods of Astrodynamics, §8.4):
 *
 *   ẍ = −μ_o x/|x|³ + Σ_{k≠o} μ_k [ (p_k − x)/|p_k − x|³ − p_k/|p_k|³ ],
 *
 * with x the ship and p_k body k relative to o. The second term in the bracket is the
 * acceleration of the origin itself (the frame is non-rotating and falls with o). When o is
 * the star this is the star-centred frame with the indirect acceleration −Σ μ_k r_k/|r_k|³
 * (the star's own acceleration towards the bodies). Writing the motion relative to the SOI
 * body keeps the integration accurate in a low orbit (relative tolerances apply to planet-
 * centred numbers); the origin changes at sphere-of-influence crossings, found as events on the
 * integration (|x| = SOI radius of o, rising; |x − p_c| = SOI radius of a child c, falling). At a
 * change, o's acceleration goes from "its gravity from the other bodies" to "its conic
 * ephemeris" — the two differ by the other bodies' tidal pull on o (≲ 1e-7 m/s² in the demo
 * system), the level at which conic ephemerides are consistent with n-body physics at all.
 *
 * Integration: every coast and every burn phase goes through the propagation front door
 * (core/integrate/propagate.ts) — Dormand–Prince RK45 at rtol DEFAULT_NBODY_RTOL, with the
 * front door's symplectic fallback and long-coast policy (the osculating period is passed
 * when the orbit about o is closed); the FlownSpans say which method flew each span and why.
 *
 * What is flown: the start state of the conic result, then each burn at its time with its
 * inertial Δv as resolved in the conic result (budget rows: `dvInertial`, scaled by the part
 * the propellant delivered). Impulsive burns change the velocity at the instant. Finite burns
 * the conic result flew as finite are flown with their thrust profile: the stage phases of the
 * vehicle bookkeeping (vehicle.ts, replayed over the plan's burns and staging), mass falling
 * linearly in each phase, thrust along the inertial direction of the Δv ('inertial') or at the
 * fixed VNB components of that direction at the burn centre ('velocity'), starting where the
 * conic result's burn segment starts. A finite burn the conic result flew as impulsive (its
 * integration failed) is flown impulsive here too, with a note. Burns keep their conic times:
 * a burn planned "at periapsis" fires at the conic periapsis time, wherever the n-body ship is.
 *
 * Arrival (when the plan has a target and the conic result reaches its sphere of influence):
 * the conic arrival is the first periapsis at the target after entering its SOI. The n-body
 * state is taken at that time (before any burn there), its periapsis about the target found
 * by a short probe integration (no burn) to x·v = 0, and the two compared: periapsis time,
 * altitude, inclination, eccentricity; the miss distance (n-body − conic position relative to
 * the target at the conic periapsis time); the B-plane offset (B·T, B·R of both osculating
 * hyperbolas at that time, on the conic hyperbola's T, R axes; T = Ŝ × k̂ normalised, R = Ŝ × T,
 * Ŝ the incoming asymptote; Vallado, Fundamentals of Astrodynamics and Applications, 4th ed.,
 * §12.4 "B-plane targeting", from memory).
 *
 * Drawing samples: taken from the dense output of every integration piece, about one every
 * SAMPLE_ANGLE radians of arc about the origin body (so low orbits are drawn as finely as the
 * cruise), as positions relative to the star and to the target. For ephemeris exports, `step`
 * adds full states on a fixed time grid (relative to the origin body of each state).
 *
 * Limits: no oblateness, drag or radiation pressure; bodies do not feel each other beyond their
 * conics; the ship's mass only matters for finite burns.
 */
import type { FlownSpan, MethodChoice } from '../integrate/propagate.ts';
import { propagate } from '../integrate/propagate.ts';
import type { EventSpec } from '../integrate/eventLocator.ts';
import type { DenseOutput } from '../integrate/dense.ts';
import { InputError, SolverError, requireFinite } from '../math/errors.ts';
import { inertialToVnb } from '../math/frames.ts';
import { propagateKepler } from '../orbit/kepler.ts';
import { bodyPosition, bodyState, bodyStateRelativeToParent } from '../system/ephemeris.ts';
import { findBodyIndex, type StarSystem } from '../system/model.ts';
import type { Plan } from './plan.ts';
import type { PlanResult } from './result.ts';
import { conicInfo, createConicInfo, type ConicInfo } from './soiCrossing.ts';
import { createBurnBook, createVehicleState, dropStage, spendBurn } from './vehicle.ts';

/** Relative tolerance of the n-body integration. */
export const DEFAULT_NBODY_RTOL = 1e-10;
/** Drawing samples: one about every this many radians of arc about the origin body (3°). */
export const SAMPLE_ANGLE = Math.PI / 60;
/** Drawing samples kept at most; past this the trajectory is not sampled further (noted). */
export const MAX_SAMPLES = 200_000;
/** Farthest the arrival probe looks for the n-body periapsis from the conic periapsis time, s. */
export const PROBE_MAX = 30 * 86400;

export type Vec3Tuple = [number, number, number];

/** The ship's state in the n-body flight: relative to body `origin` (index), inertial axes. */
export interface NBodyState {
  t: number;
  origin: number;
  x: Float64Array;
  v: Float64Array;
}

/** One stage phase of a finite burn: constant thrust, mass falling at thrust/exhaust. */
export interface ThrustPhase {
  duration: number;
  thrust: number;
  exhaust: number;
  mass0: number;
}

/** Something that happens at an instant of the n-body flight. */
export type NBodyAction =
  | { kind: 'checkpoint'; t: number; id: string }
  | { kind: 'impulse'; t: number; id: string; dv: Vec3Tuple }
  | {
      kind: 'finite';
      t: number;
      id: string;
      phases: ThrustPhase[];
      pointing: 'velocity' | 'inertial';
      /** Unit thrust direction (inertial). */
      u: Vec3Tuple;
      /** VNB components of u at the burn centre ('velocity' pointing), or null. */
      vnb: Vec3Tuple | null;
    };

export interface NBodyModelOptions {
  /** Ids of the bodies whose gravity acts (default: the star and every body). */
  pull?: readonly string[];
  /** Relative tolerance (default DEFAULT_NBODY_RTOL). */
  rtol?: number;
  /** Absolute tolerance; default DEFAULT_ATOL_FACTOR × rtol (see atolFor). */
  atol?: number;
  /** Integrator choice handed to the front door (default 'auto'). */
  method?: MethodChoice;
  /** RK45 step budget per integration piece (front-door default when omitted). */
  maxSteps?: number;
}

/**
 * The absolute tolerance is rtol × DEFAULT_ATOL_FACTOR (in metres and metres per second
 * alike): negligible beside rtol·|x| for positions, so position components crossing zero do not
 * force tiny steps, and at the level of rtol·|v| for velocities of a few km/s.
 */
export const DEFAULT_ATOL_FACTOR = 1;

/** The force model and integrator settings of one system (reuse it across flights). */
export class NBodyModel {
  readonly system: StarSystem;
  readonly count: number;
  /** μ of each body as it pulls on the ship (0: not pulling). */
  readonly mu: Float64Array;
  readonly rtol: number;
  readonly atol: number;
  readonly method: MethodChoice;
  readonly maxSteps: number | undefined;
  /** Bodies other than the star in parent-before-child order. */
  private readonly order: Int32Array;
  private readonly parent: Int32Array;
  /** Star-relative positions of every body at tCache, 3 per body. */
  private readonly R: Float64Array;
  private tCache = NaN;
  private readonly tmp3 = new Float64Array(3);
  /** Current origin body. */
  origin = 0;
  /** Thrust of the current finite-burn phase (0: none). */
  private thrust = 0;
  private thrustT0 = 0;
  private thrustMass0 = 1;
  private thrustMdot = 0;
  private readonly thrustU = new Float64Array(3);
  private thrustVnb: Float64Array | null = null;
  /** The acceleration function handed to the front door. */
  readonly accel: (t: number, x: Float64Array, v: Float64Array, out: Float64Array) => void;

  constructor(system: StarSystem, options: NBodyModelOptions = {}) {
    this.system = system;
    const n = system.bodies.length;
    this.count = n;
    this.mu = new Float64Array(n);
    if (options.pull !== undefined) {
      if (!Array.isArray(options.pull)) throw new InputError('options.pull', 'must be an array of body ids', options.pull);
      for (const id of options.pull) {
        const k = findBodyIndex(system, id);
        if (k < 0) throw new InputError('options.pull', `names no body of the system ("${id}")`, id);
        this.mu[k] = system.bodies[k].mu;
      }
    } else {
      for (let k = 0; k < n; k++) this.mu[k] = system.bodies[k].mu;
    }
    this.rtol = options.rtol ?? DEFAULT_NBODY_RTOL;
    requireFinite('options.rtol', this.rtol);
    if (!(this.rtol > 0)) throw new InputError('options.rtol', 'must be > 0', this.rtol);
    this.atol = options.atol ?? this.rtol * DEFAULT_ATOL_FACTOR;
    requireFinite('options.atol', this.atol);
    if (!(this.atol > 0)) throw new InputError('options.atol', 'must be > 0', this.atol);
    this.method = options.method ?? 'auto';
    this.maxSteps = options.maxSteps;
    this.parent = Int32Array.from(system.bodies.map((b) => b.parentIndex));
    const others = system.bodies.filter((b) => b.index !== 0).map((b) => b.index);
    others.sort((a, b) => system.bodies[a].derived.depth - system.bodies[b].derived.depth);
    this.order = Int32Array.from(others);
    this.R = new Float64Array(3 * n);
    const mu = this.mu;
    const R = this.R;
    const U = this.thrustU;
    this.accel = (t, x, v, out) => {
      this.positions(t);
      const o = this.origin;
      const ox = R[3 * o], oy = R[3 * o + 1], oz = R[3 * o + 2];
      const x0 = x[0], x1 = x[1], x2 = x[2];
      let ax = 0, ay = 0, az = 0;
      const muo = mu[o];
      if (muo > 0) {
        const r2 = x0 * x0 + x1 * x1 + x2 * x2;
        const k = -muo / (r2 * Math.sqrt(r2));
        ax = k * x0;
        ay = k * x1;
        az = k * x2;
      }
      for (let j = 0; j < n; j++) {
        const m = mu[j];
        if (j === o || m === 0) continue;
        const px = R[3 * j] - ox, py = R[3 * j + 1] - oy, pz = R[3 * j + 2] - oz;
        const dx = px - x0, dy = py - x1, dz = pz - x2;
        const d2 = dx * dx + dy * dy + dz * dz;
        const p2 = px * px + py * py + pz * pz;
        const kd = m / (d2 * Math.sqrt(d2));
        const kp = m / (p2 * Math.sqrt(p2));
        ax += kd * dx - kp * px;
        ay += kd * dy - kp * py;
        az += kd * dz - kp * pz;
      }
      if (this.thrust > 0) {
        const a = this.thrust / (this.thrustMass0 - this.thrustMdot * (t - this.thrustT0));
        let ux = U[0], uy = U[1], uz = U[2];
        const l = this.thrustVnb;
        if (l) {
          // VNB frame of the current state (Vallado §3.3): V along v, N along r × v, B = V × N
          const vx = v[0], vy = v[1], vz = v[2];
          const vn = Math.sqrt(vx * vx + vy * vy + vz * vz);
          const Vx = vx / vn, Vy = vy / vn, Vz = vz / vn;
          let Nx = x1 * vz - x2 * vy, Ny = x2 * vx - x0 * vz, Nz = x0 * vy - x1 * vx;
          const hn = Math.sqrt(Nx * Nx + Ny * Ny + Nz * Nz);
          Nx /= hn;
          Ny /= hn;
          Nz /= hn;
          const Bx = Vy * Nz - Vz * Ny, By = Vz * Nx - Vx * Nz, Bz = Vx * Ny - Vy * Nx;
          ux = l[0] * Vx + l[1] * Nx + l[2] * Bx;
          uy = l[0] * Vy + l[1] * Ny + l[2] * By;
          uz = l[0] * Vz + l[1] * Nz + l[2] * Bz;
        }
        ax += a * ux;
        ay += a * uy;
        az += a * uz;
      }
      out[0] = ax;
      out[1] = ay;
      out[2] = az;
    };
  }

  /** Fills the star-relative body positions for time t (cached for repeated t). */
  positions(t: number): void {
    if (t === this.tCache) return;
    const R = this.R;
    const tmp = this.tmp3;
    const order = this.order;
    R[0] = R[1] = R[2] = 0;
    for (let q = 0; q < order.length; q++) {
      const j = order[q];
      const p = this.parent[j];
      bodyPosition(this.system, j, t, tmp, p);
      R[3 * j] = R[3 * p] + tmp[0];
      R[3 * j + 1] = R[3 * p + 1] + tmp[1];
      R[3 * j + 2] = R[3 * p + 2] + tmp[2];
    }
    this.tCache = t;
  }

  /** Position of body k relative to body o at time t, into out. */
  relative(k: number, o: number, t: number, out: Float64Array): Float64Array {
    this.positions(t);
    const R = this.R;
    out[0] = R[3 * k] - R[3 * o];
    out[1] = R[3 * k + 1] - R[3 * o + 1];
    out[2] = R[3 * k + 2] - R[3 * o + 2];
    return out;
  }

  /** Turns a thrust phase on (from t0) or off (phase null). */
  setThrust(phase: ThrustPhase | null, t0: number, u: ArrayLike<number>, vnb: ArrayLike<number> | null): void {
    if (!phase || !(phase.thrust > 0)) {
      this.thrust = 0;
      return;
    }
    this.thrust = phase.thrust;
    this.thrustT0 = t0;
    this.thrustMass0 = phase.mass0;
    this.thrustMdot = phase.thrust / phase.exhaust;
    this.thrustU[0] = u[0];
    this.thrustU[1] = u[1];
    this.thrustU[2] = u[2];
    this.thrustVnb = vnb ? Float64Array.from(vnb) : null;
  }
}

/** Counts over a flight: accepted and rejected steps, acceleration evaluations. */
export interface NBodyStats {
  steps: number;
  rejected: number;
  fevals: number;
  /** Integration pieces (front-door calls). */
  pieces: number;
}

export interface FlyOptions {
  /** Keep drawing samples (positions relative to the star and, with `sampleTarget` ≥ 0, to that body). */
  samples?: boolean;
  sampleTarget?: number;
  /** Called after every integration piece with (flight seconds done, flight seconds in all). */
  onProgress?: (done: number, total: number) => void;
  signal?: { aborted: boolean };
  /** Record the first periapsis passage (x·v = 0, rising) about this body while it is the origin. */
  periapsisOf?: number;
  /** Also keep full states on a fixed time grid start.t + k·step (for ephemeris exports), s. */
  step?: number;
}

/** Ship states on a fixed time grid (a grid time at a burn instant gets the state after the burn). */
export interface NBodyStates {
  t: Float64Array;
  /** Origin body of each state. */
  origin: Int32Array;
  /** [x, v] relative to the origin body, 6 per state, m and m/s. */
  state: Float64Array;
}

export interface NBodySamples {
  /** Sample times, s. */
  t: Float64Array;
  /** Positions relative to the star, xyz interleaved, m. */
  star: Float64Array;
  /** Positions relative to the target body (null without a target), m. */
  target: Float64Array | null;
  /** Origin body of the integration at each sample. */
  origin: Int32Array;
}

export interface FlyResult {
  /** Where the flight stopped (tEnd, or an impact). */
  state: NBodyState;
  status: 'done' | 'impact';
  /** The body hit and when, for status 'impact'. */
  impact: { t: number; body: number } | null;
  /** States at the checkpoint actions (before any burn at the same time), by id. */
  checkpoints: Map<string, NBodyState>;
  spans: FlownSpan[];
  stats: NBodyStats;
  /** SOI changes of the n-body flight: time, body left/entered. */
  soiChanges: { t: number; kind: 'exit' | 'entry'; body: number }[];
  samples: NBodySamples | null;
  /** First periapsis passage about `periapsisOf` (burns included), or null. */
  periapsis: NBodyState | null;
  /** States on the `step` grid, or null without `step`. */
  states: NBodyStates | null;
  /** State just before the first burn flown while `periapsisOf` is the origin, or null. */
  preBurn: NBodyState | null;
  notes: string[];
}

function cloneState(s: NBodyState): NBodyState {
  return { t: s.t, origin: s.origin, x: Float64Array.from(s.x), v: Float64Array.from(s.v) };
}

/** Sorted copy of the actions: by time, checkpoints before burns at the same instant (stable otherwise). */
export function sortActions(actions: readonly NBodyAction[]): NBodyAction[] {
  return actions
    .map((a, k) => ({ a, k }))
    .sort((p, q) => p.a.t - q.a.t || (p.a.kind === 'checkpoint' ? 0 : 1) - (q.a.kind === 'checkpoint' ? 0 : 1) || p.k - q.k)
    .map((p) => p.a);
}

class Sampler {
  t: number[] = [];
  star: number[] = [];
  target: number[] = [];
  origin: number[] = [];
  full = false;
  private readonly y = new Float64Array(6);
  private readonly p = new Float64Array(3);

  constructor(
    readonly model: NBodyModel,
    readonly targetIndex: number,
  ) {}

  push(t: number, o: number, x: ArrayLike<number>): void {
    if (this.t.length >= MAX_SAMPLES) {
      this.full = true;
      return;
    }
    const m = this.model;
    m.relative(o, 0, t, this.p);
    this.t.push(t);
    this.origin.push(o);
    this.star.push(x[0] + this.p[0], x[1] + this.p[1], x[2] + this.p[2]);
    if (this.targetIndex >= 0) {
      m.relative(o, this.targetIndex, t, this.p);
      this.target.push(x[0] + this.p[0], x[1] + this.p[1], x[2] + this.p[2]);
    }
  }

  /** Samples one integration piece [t0, t1] from its dense output. */
  piece(dense: DenseOutput, t0: number, t1: number, o: number): void {
    const y = this.y;
    let t = t0;
    for (let guard = 0; guard < MAX_SAMPLES && t < t1; guard++) {
      dense.at(t, y);
      this.push(t, o, y);
      const r = Math.hypot(y[0], y[1], y[2]);
      const v = Math.hypot(y[3], y[4], y[5]);
      const dt = v > 0 ? (SAMPLE_ANGLE * r) / v : t1 - t;
      t = Math.min(t1, t + Math.max(dt, 1e-6 * (t1 - t0)));
      if (t1 - t < 1e-9 * (t1 - t0)) break;
    }
    dense.at(t1, y);
    this.push(t1, o, y);
  }

  result(): NBodySamples {
    return {
      t: Float64Array.from(this.t),
      star: Float64Array.from(this.star),
      target: this.targetIndex >= 0 ? Float64Array.from(this.target) : null,
      origin: Int32Array.from(this.origin),
    };
  }
}

const fly6 = new Float64Array(6);

/**
 * Flies from `start` to tEnd through the actions (sorted here) in the model; see the module
 * comment. Throws SolverError('nbody', 'cancelled') when the signal aborts, and
 * SolverError('nbody', <reason>) when an integration piece fails without a fallback.
 */
export function flyNBody(model: NBodyModel, start: NBodyState, actions: readonly NBodyAction[], tEnd: number, options: FlyOptions = {}): FlyResult {
  requireFinite('tEnd', tEnd);
  if (!(tEnd >= start.t)) throw new InputError('tEnd', `must be >= the start time ${start.t}`, tEnd);
  const system = model.system;
  const bodies = system.bodies;
  const acts = sortActions(actions).filter((a) => a.t >= start.t && a.t <= tEnd);
  const cur = cloneState(start);
  const checkpoints = new Map<string, NBodyState>();
  const spans: FlownSpan[] = [];
  const stats: NBodyStats = { steps: 0, rejected: 0, fevals: 0, pieces: 0 };
  const soiChanges: FlyResult['soiChanges'] = [];
  const notes: string[] = [];
  const sampler = options.samples ? new Sampler(model, options.sampleTarget ?? -1) : null;
  let step = 0;
  if (options.step !== undefined) {
    requireFinite('options.step', options.step);
    if (!(options.step > 0)) throw new InputError('options.step', 'must be > 0', options.step);
    step = options.step;
    if ((tEnd - start.t) / step > MAX_SAMPLES * 25) throw new InputError('options.step', `would give more than ${MAX_SAMPLES * 25} states`, step);
  }
  const grid = step > 0 ? { t: [] as number[], origin: [] as number[], state: [] as number[], next: 0 } : null;
  const gy = new Float64Array(6);
  const total = tEnd - start.t;
  const signal = options.signal;
  let impact: FlyResult['impact'] = null;
  let periapsis: NBodyState | null = null;
  let preBurn: NBodyState | null = null;
  const periOf = options.periapsisOf ?? -1;

  const cancelled = (): never => {
    throw new SolverError('nbody', 'cancelled', `n-body flight cancelled at t = ${cur.t} s`, { t: cur.t });
  };

  /** Integrates from cur to t1 (thrust as set on the model), switching origin at SOI crossings. */
  const coastTo = (t1: number): boolean => {
    for (let guard = 0; cur.t < t1; guard++) {
      if (guard > 10_000) throw new SolverError('nbody', 'no-convergence', `too many SOI changes before t = ${t1}`, { t: cur.t });
      if (signal?.aborted) cancelled();
      const o = cur.origin;
      model.origin = o;
      const events: EventSpec[] = [];
      const kinds: { kind: 'exit' | 'entry' | 'impact' | 'periapsis'; body: number }[] = [];
      const b = bodies[o];
      if (o !== 0 && Number.isFinite(b.derived.soiRadius)) {
        const R2 = b.derived.soiRadius * b.derived.soiRadius;
        events.push({ g: (_t, y) => y[0] * y[0] + y[1] * y[1] + y[2] * y[2] - R2, direction: 1, terminal: true, name: `exit ${b.id}` });
        kinds.push({ kind: 'exit', body: o });
      }
      for (const c of b.children) {
        const Rc = bodies[c].derived.soiRadius;
        if (!Number.isFinite(Rc)) continue;
        const Rc2 = Rc * Rc;
        const p = new Float64Array(3);
        events.push({
          g: (t, y) => {
            model.relative(c, o, t, p);
            const dx = y[0] - p[0], dy = y[1] - p[1], dz = y[2] - p[2];
            return dx * dx + dy * dy + dz * dz - Rc2;
          },
          direction: -1,
          terminal: true,
          name: `entry ${bodies[c].id}`,
        });
        kinds.push({ kind: 'entry', body: c });
      }
      if (b.radius > 0) {
        const Rb2 = b.radius * b.radius;
        events.push({ g: (_t, y) => y[0] * y[0] + y[1] * y[1] + y[2] * y[2] - Rb2, direction: -1, terminal: true, name: `impact ${b.id}` });
        kinds.push({ kind: 'impact', body: o });
      }
      if (o === periOf && periapsis === null) {
        events.push({ g: (_t, y) => y[0] * y[3] + y[1] * y[4] + y[2] * y[5], direction: 1, terminal: false, name: `periapsis ${b.id}` });
        kinds.push({ kind: 'periapsis', body: o });
      }
      // osculating period about o, for the front door's long-coast policy
      let period: number | undefined;
      if (bodies[o].mu > 0) {
        const r = Math.hypot(cur.x[0], cur.x[1], cur.x[2]);
        const v2 = cur.v[0] * cur.v[0] + cur.v[1] * cur.v[1] + cur.v[2] * cur.v[2];
        const alpha = 2 / r - v2 / bodies[o].mu;
        if (alpha > 0) period = 2 * Math.PI * Math.sqrt(1 / (bodies[o].mu * alpha * alpha * alpha));
      }
      const res = propagate({
        accel: model.accel,
        t0: cur.t,
        x0: cur.x,
        v0: cur.v,
        tEnd: t1,
        method: model.method,
        rtol: model.rtol,
        atol: model.atol,
        maxSteps: model.maxSteps,
        events,
        dense: sampler !== null || grid !== null,
        period,
        signal,
      });
      stats.pieces++;
      for (const s of res.spans) {
        spans.push(s);
        stats.steps += s.stats.accepted;
        stats.rejected += s.stats.rejected;
        stats.fevals += s.stats.fevals;
      }
      if (res.status === 'cancelled') cancelled();
      if (res.status !== 'done' && res.status !== 'event') {
        const reason = res.status === 'step-budget' ? 'step-budget' : res.status === 'step-underflow' ? 'step-underflow' : 'no-convergence';
        throw new SolverError('nbody', reason, `integration stopped at t = ${res.t} s about ${b.name}: ${res.message}`, { t: res.t, origin: o });
      }
      for (let i = 0; i < 3; i++) {
        if (!Number.isFinite(res.x[i]) || !Number.isFinite(res.v[i])) {
          throw new SolverError('nbody', 'non-finite', `the n-body state became non-finite at t = ${res.t} s`, { t: res.t });
        }
      }
      if (sampler && res.dense && res.t > cur.t) sampler.piece(res.dense, cur.t, res.t, o);
      if (grid && res.dense && res.t > cur.t) {
        for (;;) {
          const tg = start.t + grid.next * step;
          if (!(tg < res.t)) break;
          if (tg >= cur.t) {
            res.dense.at(tg, gy);
            grid.t.push(tg);
            grid.origin.push(o);
            for (let i = 0; i < 6; i++) grid.state.push(gy[i]);
          }
          grid.next++;
        }
      }
      cur.t = res.t;
      cur.x.set(res.x);
      cur.v.set(res.v);
      options.onProgress?.(cur.t - start.t, total);
      for (const h of res.events) {
        if (periapsis === null && kinds[h.index].kind === 'periapsis') {
          periapsis = { t: h.t, origin: o, x: Float64Array.from(h.y.subarray(0, 3)), v: Float64Array.from(h.y.subarray(3, 6)) };
        }
      }
      if (res.status === 'event') {
        let hit = res.events[res.events.length - 1];
        for (const h of res.events) if (kinds[h.index].kind !== 'periapsis') hit = h;
        const what = kinds[hit.index];
        if (what.kind === 'impact') {
          impact = { t: cur.t, body: o };
          notes.push(`the ship hits ${b.name} at t = ${cur.t.toFixed(0)} s in the n-body model; the flight ends there`);
          return false;
        }
        if (what.kind === 'exit') {
          bodyStateRelativeToParent(system, o, cur.t, fly6);
          for (let i = 0; i < 3; i++) {
            cur.x[i] += fly6[i];
            cur.v[i] += fly6[i + 3];
          }
          cur.origin = b.parentIndex;
        } else {
          bodyStateRelativeToParent(system, what.body, cur.t, fly6);
          for (let i = 0; i < 3; i++) {
            cur.x[i] -= fly6[i];
            cur.v[i] -= fly6[i + 3];
          }
          cur.origin = what.body;
        }
        soiChanges.push({ t: cur.t, kind: what.kind === 'exit' ? 'exit' : 'entry', body: what.body });
      }
    }
    return true;
  };

  let alive = true;
  for (const a of acts) {
    if (!alive) break;
    alive = coastTo(a.t);
    if (!alive) break;
    if (a.kind !== 'checkpoint' && preBurn === null && cur.origin === periOf) preBurn = cloneState(cur);
    if (a.kind === 'checkpoint') {
      checkpoints.set(a.id, cloneState(cur));
    } else if (a.kind === 'impulse') {
      cur.v[0] += a.dv[0];
      cur.v[1] += a.dv[1];
      cur.v[2] += a.dv[2];
    } else {
      for (const ph of a.phases) {
        if (!(ph.duration > 0)) continue;
        model.setThrust(ph, cur.t, a.u, a.pointing === 'velocity' ? a.vnb : null);
        try {
          alive = coastTo(cur.t + ph.duration);
        } finally {
          model.setThrust(null, 0, a.u, null);
        }
        if (!alive) break;
      }
    }
  }
  if (alive) coastTo(tEnd);
  if (grid) {
    // the end of the flight closes the grid
    grid.t.push(cur.t);
    grid.origin.push(cur.origin);
    for (let i = 0; i < 3; i++) grid.state.push(cur.x[i]);
    for (let i = 0; i < 3; i++) grid.state.push(cur.v[i]);
  }
  if (sampler?.full) notes.push(`drawing samples stop after ${MAX_SAMPLES} points`);
  return {
    state: cur,
    status: impact ? 'impact' : 'done',
    impact,
    checkpoints,
    spans,
    stats,
    soiChanges,
    samples: sampler ? sampler.result() : null,
    periapsis,
    preBurn,
    states: grid ? { t: Float64Array.from(grid.t), origin: Int32Array.from(grid.origin), state: Float64Array.from(grid.state) } : null,
    notes,
  };
}

// --- the conic result as n-body input -------------------------------------------------------------

/** Start state of a conic result: its first segment's state and central body. */
export function conicStart(result: PlanResult): NBodyState {
  const s = result.segments[0];
  if (!s) throw new InputError('conicResult.segments', 'must hold at least one segment (the plan flies no time)');
  return { t: s.t0, origin: s.central, x: Float64Array.from(s.state0.subarray(0, 3)), v: Float64Array.from(s.state0.subarray(3, 6)) };
}

/** The burns of a conic result as n-body actions (see the module comment), and notes on how they are flown. */
export function burnActions(system: StarSystem, plan: Plan, result: PlanResult): { actions: NBodyAction[]; notes: string[] } {
  const notes: string[] = [];
  const actions: NBodyAction[] = [];
  const vehicle = plan.vehicle;
  const vs = createVehicleState(vehicle);
  const book = createBurnBook(vehicle);
  const rowsById = new Map(result.budget.rows.map((r) => [r.planEventId, r]));
  const burnSegs = result.segments.filter((s) => s.kind === 'burn');
  for (const ev of plan.events) {
    if (ev.type === 'stage') {
      if (vs.stage < vehicle.stages.length) dropStage(vehicle, vs);
      continue;
    }
    if (ev.type !== 'burn') continue;
    const row = rowsById.get(ev.id);
    if (!row) continue; // not flown (the conic flight ended earlier)
    spendBurn(vehicle, vs, row.dv, book);
    const frac = row.dv > 0 ? 1 - (row.dvMissing ?? 0) / row.dv : 0;
    const dv: Vec3Tuple = [row.dvInertial[0] * frac, row.dvInertial[1] * frac, row.dvInertial[2] * frac];
    const mag = Math.hypot(dv[0], dv[1], dv[2]);
    if (ev.mode === 'finite' && mag > 0) {
      const seg = burnSegs.find((s) => s.t0 <= row.t + 1e-6 && s.t1 >= row.t - 1e-6);
      if (!seg) {
        notes.push(`${ev.name}: the patched-conic result flew this finite burn as impulsive; flown impulsive here too`);
      } else {
        const phases: ThrustPhase[] = [];
        for (let p = 0; p < book.phases; p++) {
          phases.push({ duration: book.phaseDuration[p], thrust: book.phaseThrust[p], exhaust: book.phaseExhaust[p], mass0: book.phaseMass0[p] });
        }
        const u: Vec3Tuple = [dv[0] / mag, dv[1] / mag, dv[2] / mag];
        let vnb: Vec3Tuple | null = null;
        if (ev.pointing === 'velocity') {
          // VNB components of the thrust direction at the burn centre, on the conic coast before the burn
          const coast = result.segments.find((s) => s.kind === 'coast' && s.central === seg.central && Math.abs(s.t1 - seg.t0) <= 1e-6);
          const centre = coast ? propagateKepler(coast.mu, coast.state0, row.t - coast.t0) : seg.state0;
          try {
            const l = inertialToVnb([centre[0], centre[1], centre[2]], [centre[3], centre[4], centre[5]], u);
            vnb = [l[0], l[1], l[2]];
          } catch {
            vnb = null;
            notes.push(`${ev.name}: no VNB frame at the burn centre; thrust held along the inertial Δv direction`);
          }
        }
        actions.push({ kind: 'finite', t: seg.t0, id: ev.id, phases, pointing: ev.pointing, u, vnb });
        continue;
      }
    }
    actions.push({ kind: 'impulse', t: row.t, id: ev.id, dv });
  }
  return { actions, notes };
}

/** The patched-conic arrival at the target: the first periapsis there after entering its SOI. */
export interface ConicArrival {
  target: number;
  /** Periapsis time, s. */
  t: number;
  /** State relative to the target at t (before any burn at t). */
  state: Float64Array;
  periapsisAltitude: number;
  e: number;
  i: number;
}

/** Finds the conic arrival in a result, or null (no target, or the target's SOI is never reached). */
export function conicArrival(system: StarSystem, plan: Plan, result: PlanResult): ConicArrival | null {
  if (!plan.target) return null;
  const k = findBodyIndex(system, plan.target.body);
  if (k < 0) return null;
  const entry = result.events.find((e) => e.kind === 'soi-entry' && e.central === k);
  const start = entry ? entry.t : result.segments.length > 0 && result.segments[0].central === k ? result.t0 : Infinity;
  if (!Number.isFinite(start)) return null;
  const peri = result.events.find((e) => e.kind === 'periapsis' && e.central === k && e.t >= start);
  const t = peri ? peri.t : result.target?.closestApproach && result.target.closestApproach.t >= start ? result.target.closestApproach.t : NaN;
  if (!Number.isFinite(t)) return null;
  // the coast segment about the target that ends at (or covers) t; prefer the one before a burn at t
  let seg = result.segments.find((s) => s.kind === 'coast' && s.central === k && s.t0 < t && s.t1 >= t);
  seg ??= result.segments.find((s) => s.kind === 'coast' && s.central === k && s.t0 <= t && s.t1 >= t);
  if (!seg) return null;
  const state = Float64Array.from(propagateKepler(seg.mu, seg.state0, t - seg.t0));
  const info = conicInfo(system.bodies[k].mu, state);
  return { target: k, t, state, periapsisAltitude: info.rp - system.bodies[k].radius, e: info.e, i: info.i };
}

// --- arrival analysis ---------------------------------------------------------------------------

/** B-plane coordinates of an osculating hyperbola (Vallado §12.4, from memory). */
export interface BPlane {
  /** B·T and B·R, m, on the axes given (or the hyperbola's own). */
  bt: number;
  br: number;
  /** |B|, m. */
  b: number;
}

/** Incoming asymptote Ŝ and the T, R axes of a hyperbola (e > 1), or null for a closed orbit. */
export function bPlaneAxes(info: ConicInfo): { S: Vec3Tuple; T: Vec3Tuple; R: Vec3Tuple } | null {
  if (!(info.e > 1)) return null;
  const e = info.e;
  const c = 1 / e;
  const s = Math.sqrt(e * e - 1) / e;
  const S: Vec3Tuple = [c * info.P[0] + s * info.Q[0], c * info.P[1] + s * info.Q[1], c * info.P[2] + s * info.Q[2]];
  // T = Ŝ × k̂ normalised (in the reference plane), R = Ŝ × T
  let tx = S[1], ty = -S[0];
  const tn = Math.hypot(tx, ty);
  if (!(tn > 1e-12)) return null;
  tx /= tn;
  ty /= tn;
  const T: Vec3Tuple = [tx, ty, 0];
  const R: Vec3Tuple = [S[1] * 0 - S[2] * ty, S[2] * tx - S[0] * 0, S[0] * ty - S[1] * tx];
  return { S, T, R };
}

/** B vector Ŝ × h / v∞ of a hyperbola, projected on the axes T, R; null for a closed orbit. */
export function bPlane(info: ConicInfo, axes: { T: Vec3Tuple; R: Vec3Tuple } | null): BPlane | null {
  const own = bPlaneAxes(info);
  if (!own) return null;
  const ax = axes ?? own;
  const S = own.S;
  const vinf = Math.sqrt(-info.mu * info.alpha);
  const Bx = (S[1] * info.hz - S[2] * info.hy) / vinf;
  const By = (S[2] * info.hx - S[0] * info.hz) / vinf;
  const Bz = (S[0] * info.hy - S[1] * info.hx) / vinf;
  return {
    bt: Bx * ax.T[0] + By * ax.T[1] + Bz * ax.T[2],
    br: Bx * ax.R[0] + By * ax.R[1] + Bz * ax.R[2],
    b: Math.hypot(Bx, By, Bz),
  };
}

export interface PeriapsisReport {
  t: number;
  altitude: number;
  e: number;
  i: number;
}

/** The arrival at the target in both models. */
export interface ArrivalComparison {
  target: number;
  conic: PeriapsisReport;
  nbody: PeriapsisReport;
  /** n-body − conic. */
  difference: { t: number; altitude: number; e: number; i: number };
  /** |x_nbody − x_conic| relative to the target at the conic periapsis time, m. */
  missDistance: number;
  /** B-plane offset n-body − conic on the conic hyperbola's axes (null unless both are hyperbolas). */
  bPlane: { conic: BPlane; nbody: BPlane; dbt: number; dbr: number; offset: number } | null;
  /** How the n-body periapsis was found. */
  method: 'probe' | 'osculating';
}

const arr6 = new Float64Array(6);
const infoN = createConicInfo();
const infoC = createConicInfo();

/** State of the ship relative to body k (position and velocity), from an n-body state. */
export function stateRelativeTo(model: NBodyModel, at: NBodyState, k: number, out: Float64Array = new Float64Array(6)): Float64Array {
  bodyState(model.system, at.origin, at.t, arr6, k);
  for (let i = 0; i < 3; i++) {
    out[i] = at.x[i] + arr6[i];
    out[i + 3] = at.v[i] + arr6[i + 3];
  }
  return out;
}

/**
 * The n-body periapsis about body k nearest to time t, from the state xT relative to k: the
 * osculating conic's nearest periapsis, then a probe flight (no burns, relative to k) to
 * x·v = 0 when it is more than a millisecond away and within PROBE_MAX; 'osculating' when the
 * probe is not flown or finds no crossing.
 */
export function probePeriapsis(
  model: NBodyModel,
  t: number,
  xT: Float64Array,
  k: number,
  signal?: { aborted: boolean },
): { report: PeriapsisReport; method: 'probe' | 'osculating'; spans: FlownSpan[]; stats: NBodyStats } {
  const body = model.system.bodies[k];
  const mu = body.mu;
  const osc = conicInfo(mu, xT, infoN);
  const dtp = osc.n > 0 ? -osc.M / osc.n : 0;
  let method: 'probe' | 'osculating' = 'osculating';
  let tp = t + dtp;
  let peri = xT;
  const spans: FlownSpan[] = [];
  const stats: NBodyStats = { steps: 0, rejected: 0, fevals: 0, pieces: 0 };
  if (Number.isFinite(dtp) && Math.abs(dtp) > 1e-3 && Math.abs(dtp) <= PROBE_MAX) {
    const sign = dtp > 0 ? 1 : -1;
    const savedOrigin = model.origin;
    model.origin = k;
    let res;
    try {
      res = propagate({
        accel: model.accel,
        t0: t,
        x0: xT.subarray(0, 3),
        v0: xT.subarray(3, 6),
        tEnd: t + dtp * 1.5 + sign * 600,
        method: model.method,
        rtol: model.rtol,
        atol: model.atol,
        maxSteps: model.maxSteps,
        events: [{ g: (_t, y) => y[0] * y[3] + y[1] * y[4] + y[2] * y[5], terminal: true, name: 'periapsis' }],
        signal,
      });
    } finally {
      model.origin = savedOrigin;
    }
    stats.pieces++;
    for (const s of res.spans) {
      spans.push(s);
      stats.steps += s.stats.accepted;
      stats.rejected += s.stats.rejected;
      stats.fevals += s.stats.fevals;
    }
    if (res.status === 'cancelled') throw new SolverError('nbody', 'cancelled', 'n-body arrival probe cancelled', {});
    if (res.status === 'event') {
      method = 'probe';
      tp = res.t;
      peri = new Float64Array(6);
      peri.set(res.x, 0);
      peri.set(res.v, 3);
    }
  } else if (Math.abs(dtp) <= 1e-3) {
    method = 'probe';
  }
  const pn = conicInfo(mu, peri, infoN);
  const rp = method === 'probe' ? Math.hypot(peri[0], peri[1], peri[2]) : pn.rp;
  return { report: { t: tp, altitude: rp - body.radius, e: pn.e, i: pn.i }, method, spans, stats };
}

/**
 * The n-body arrival from the n-body state at the conic periapsis time (before any burn), and
 * its comparison with the conic arrival. The probe flies without burns, relative to the target.
 */
export function compareArrival(model: NBodyModel, at: NBodyState, conic: ConicArrival, signal?: { aborted: boolean }): { comparison: ArrivalComparison; spans: FlownSpan[]; stats: NBodyStats } {
  const k = conic.target;
  const mu = model.system.bodies[k].mu;
  const xT = stateRelativeTo(model, at, k);
  const oscN = conicInfo(mu, xT, infoN);
  const oscC = conicInfo(mu, conic.state, infoC);
  const axes = bPlaneAxes(oscC);
  const bc = axes ? bPlane(oscC, axes) : null;
  const bn = axes ? bPlane(oscN, axes) : null;
  const missDistance = Math.hypot(xT[0] - conic.state[0], xT[1] - conic.state[1], xT[2] - conic.state[2]);
  const probe = probePeriapsis(model, at.t, xT, k, signal);
  const nbody = probe.report;
  const conicR: PeriapsisReport = { t: conic.t, altitude: conic.periapsisAltitude, e: conic.e, i: conic.i };
  const comparison: ArrivalComparison = {
    target: k,
    conic: conicR,
    nbody,
    difference: { t: nbody.t - conicR.t, altitude: nbody.altitude - conicR.altitude, e: nbody.e - conicR.e, i: nbody.i - conicR.i },
    missDistance,
    bPlane: bc && bn ? { conic: bc, nbody: bn, dbt: bn.bt - bc.bt, dbr: bn.br - bc.br, offset: Math.hypot(bn.bt - bc.bt, bn.br - bc.br) } : null,
    method: probe.method,
  };
  return { comparison, spans: probe.spans, stats: probe.stats };
}

// --- verification ---------------------------------------------------------------------------------

export interface VerifyOptions extends NBodyModelOptions {
  /** Keep drawing samples (default true). */
  samples?: boolean;
  /** Stop the flight here instead of at the conic result's end, s. */
  until?: number;
  /** Also return states on a fixed grid of this step from the start (ephemeris exports), s. */
  step?: number;
  onProgress?: (done: number, total: number) => void;
  signal?: { aborted: boolean };
}

/** Osculating orbit about the target at the end of the flight, against the conic result's. */
export interface FinalComparison {
  target: number;
  conic: { periapsisAltitude: number; apoapsisAltitude: number | null; e: number; i: number } | null;
  nbody: { periapsisAltitude: number; apoapsisAltitude: number | null; e: number; i: number };
}

export interface NBodyResult {
  model: 'nbody';
  t0: number;
  t1: number;
  status: 'done' | 'impact';
  impact: { t: number; body: number } | null;
  /** Which method flew each span and why (the front door's records, in flight order). */
  spans: FlownSpan[];
  stats: NBodyStats;
  /** The burns as flown. */
  burns: { planEventId: string; t: number; mode: 'impulsive' | 'finite'; dvInertial: Vec3Tuple }[];
  soiChanges: { t: number; kind: 'exit' | 'entry'; body: number }[];
  /** Arrival at the target in both models (null without a target or a conic arrival). */
  arrival: ArrivalComparison | null;
  /** The n-body flight's own first periapsis about the target (burns included), or null. */
  nbodyArrival: PeriapsisReport | null;
  /** Final orbit about the target (null without a target, or when the flight ends in an impact). */
  final: FinalComparison | null;
  /** End state of the flight (relative to `end.origin`). */
  end: NBodyState;
  samples: NBodySamples | null;
  /** States on the `step` grid (null without `step`); the last one is the end of the flight. */
  states: NBodyStates | null;
  notes: string[];
}

const ARRIVAL_ID = '@arrival';

/** n-body verification of a plan's patched-conic result (see the module comment). */
export function verifyNBody(system: StarSystem, plan: Plan, conicResult: PlanResult, options: VerifyOptions = {}): NBodyResult {
  if (!conicResult || conicResult.model !== 'conic') throw new InputError('conicResult', "must be a patched-conic PlanResult (model 'conic')", conicResult?.model);
  const model = new NBodyModel(system, options);
  const start = conicStart(conicResult);
  const { actions, notes } = burnActions(system, plan, conicResult);
  const arrival = conicArrival(system, plan, conicResult);
  if (plan.target && !arrival) notes.push(`the patched-conic flight does not reach ${plan.target.body}'s sphere of influence: no arrival comparison`);
  let tEnd = conicResult.t1;
  if (options.until !== undefined) {
    requireFinite('options.until', options.until);
    if (!(options.until >= start.t)) throw new InputError('options.until', `must be >= the start time ${start.t}`, options.until);
    tEnd = Math.min(tEnd, options.until);
  }
  const all = arrival && arrival.t <= tEnd ? [...actions, { kind: 'checkpoint' as const, t: arrival.t, id: ARRIVAL_ID }] : actions;
  const targetIndex = plan.target ? findBodyIndex(system, plan.target.body) : -1;
  const fly = flyNBody(model, start, all, tEnd, {
    samples: options.samples ?? true,
    sampleTarget: targetIndex,
    onProgress: options.onProgress,
    signal: options.signal,
    periapsisOf: targetIndex,
    step: options.step,
  });
  const spans = [...fly.spans];
  const stats = { ...fly.stats };
  let comparison: ArrivalComparison | null = null;
  const at = fly.checkpoints.get(ARRIVAL_ID);
  if (arrival && at) {
    const c = compareArrival(model, at, arrival, options.signal);
    comparison = c.comparison;
    spans.push(...c.spans);
    stats.steps += c.stats.steps;
    stats.rejected += c.stats.rejected;
    stats.fevals += c.stats.fevals;
    stats.pieces += c.stats.pieces;
  } else if (arrival && fly.status === 'impact') {
    notes.push('the n-body flight ends before the conic arrival time: no arrival comparison');
  }
  // the n-body flight's own arrival: its first periapsis about the target, unless a burn there
  // comes first — then the periapsis of the approach, probed from the state before that burn
  let nbodyArrival: PeriapsisReport | null = null;
  if (targetIndex >= 0) {
    const tb = system.bodies[targetIndex];
    const p = fly.periapsis;
    if (p && (!fly.preBurn || p.t <= fly.preBurn.t)) {
      const pi = conicInfo(tb.mu, [p.x[0], p.x[1], p.x[2], p.v[0], p.v[1], p.v[2]]);
      nbodyArrival = { t: p.t, altitude: Math.hypot(p.x[0], p.x[1], p.x[2]) - tb.radius, e: pi.e, i: pi.i };
    } else if (fly.preBurn) {
      const pr = probePeriapsis(model, fly.preBurn.t, stateRelativeTo(model, fly.preBurn, targetIndex), targetIndex, options.signal);
      nbodyArrival = pr.report;
      spans.push(...pr.spans);
      stats.steps += pr.stats.steps;
      stats.rejected += pr.stats.rejected;
      stats.fevals += pr.stats.fevals;
      stats.pieces += pr.stats.pieces;
    }
  }
  let final: FinalComparison | null = null;
  if (targetIndex >= 0 && fly.status === 'done') {
    bodyState(system, fly.state.origin, fly.state.t, arr6, targetIndex);
    const s = new Float64Array(6);
    for (let i = 0; i < 3; i++) {
      s[i] = fly.state.x[i] + arr6[i];
      s[i + 3] = fly.state.v[i] + arr6[i + 3];
    }
    const tb = system.bodies[targetIndex];
    const info = conicInfo(tb.mu, s);
    final = {
      target: targetIndex,
      conic: conicResult.target?.achieved ?? null,
      nbody: {
        periapsisAltitude: info.rp - tb.radius,
        apoapsisAltitude: Number.isFinite(info.ra) ? info.ra - tb.radius : null,
        e: info.e,
        i: info.i,
      },
    };
  }
  return {
    model: 'nbody',
    t0: start.t,
    t1: fly.state.t,
    status: fly.status,
    impact: fly.impact,
    spans,
    stats,
    burns: actions
      .filter((a) => a.kind !== 'checkpoint')
      .map((a) => {
        if (a.kind === 'impulse') return { planEventId: a.id, t: a.t, mode: 'impulsive' as const, dvInertial: a.dv };
        const row = conicResult.budget.rows.find((r) => r.planEventId === a.id);
        const frac = row && row.dv > 0 ? 1 - (row.dvMissing ?? 0) / row.dv : 0;
        const dv: Vec3Tuple = row ? [row.dvInertial[0] * frac, row.dvInertial[1] * frac, row.dvInertial[2] * frac] : [0, 0, 0];
        return { planEventId: a.id, t: a.t, mode: 'finite' as const, dvInertial: dv };
      }),
    soiChanges: fly.soiChanges,
    arrival: comparison,
    nbodyArrival,
    final,
    end: fly.state,
    samples: fly.samples,
    states: fly.states,
    notes: [...notes, ...fly.notes],
  };
}
