/**
 * The n-body flight: flies a start state through timed actions (impulses, finite-burn thrust
 * phases, checkpoints) in the restricted n-body model (../dynamics/shipForces.ts).
 *
 * The origin body of the equations changes at sphere-of-influence crossings, found as events on
 * the integration (|x| = SOI radius of o, rising; |x − p_c| = SOI radius of a child c, falling).
 * The state is re-expressed about the new origin with the conic ephemeris (the same conics that
 * move the origin in the force model), so a change is a change of coordinates only: the flight
 * is the same whichever body is the origin, to integration and rounding error (tested against an
 * independent integrator of the star-centred equations). The origin is chosen for precision:
 * relative tolerances then apply to numbers of the size of the orbit about the nearest body.
 *
 * Integration: every coast and every burn phase goes through the propagation front door
 * (core/integrate/propagate.ts) at rtol DEFAULT_NBODY_RTOL — DOP853 at the default 1e-10, RK45
 * above DOP853_RTOL — with steps no longer than the model's field step limit (stepLimit.ts), the
 * front door's symplectic fallback and long-coast policy (the osculating period is passed
 * when the orbit about o is closed); the FlownSpans say which method flew each span and why.
 * Impulsive burns change the velocity at the instant; finite burns fly their thrust phases.
 *
 * Drawing samples: taken from the dense output of every integration piece, about one every
 * SAMPLE_ANGLE radians of arc about the origin body (so low orbits are drawn as finely as the
 * cruise), as positions relative to the star and to the target. For ephemeris exports, `step`
 * adds full states on a fixed time grid (relative to the origin body of each state).
 */
import type { FlownSpan } from '../integrate/index.ts';
import { propagate } from '../integrate/index.ts';
import type { EventSpec } from '../integrate/index.ts';
import type { DenseOutput } from '../integrate/index.ts';
import { InputError, SolverError, requireFinite } from '../math/index.ts';
import { bodyStateRelativeToParent } from '../system/index.ts';
import type { NBodyModel, NBodyState, ThrustPhase, Vec3Tuple } from './model.ts';

// defined beside the force model (ShipForces.setThrust takes it), re-exported as part of the flight's API
export type { ThrustPhase } from './model.ts';

/** Drawing samples: one about every this many radians of arc about the origin body (3°). */
export const SAMPLE_ANGLE = Math.PI / 60;
/** Drawing samples kept at most; past this the trajectory is not sampled further (noted). */
export const MAX_SAMPLES = 200_000;

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

/** Position and velocity [x, y, z, vx, vy, vz], m and m/s. */
export type Vec3Tuple6 = [number, number, number, number, number, number];

/**
 * An SOI change of the n-body flight: time, the body left ('exit') or entered ('entry'), and the
 * ship's state relative to that body at the crossing (|r| = its SOI radius to the event locator's
 * tolerance): at an exit the state before the origin switch, at an entry the state after it.
 */
export interface NBodySoiChange {
  t: number;
  kind: 'exit' | 'entry';
  body: number;
  state: Vec3Tuple6;
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
  /** SOI changes of the n-body flight (see NBodySoiChange). */
  soiChanges: NBodySoiChange[];
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
            const dx = y[0] - p[0],
              dy = y[1] - p[1],
              dz = y[2] - p[2];
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
        maxStep: model.maxStep,
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
          // the state relative to the body left, before the switch
          const left: Vec3Tuple6 = [cur.x[0], cur.x[1], cur.x[2], cur.v[0], cur.v[1], cur.v[2]];
          soiChanges.push({ t: cur.t, kind: 'exit', body: what.body, state: left });
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
          // the state relative to the body entered, after the switch
          soiChanges.push({ t: cur.t, kind: 'entry', body: what.body, state: [cur.x[0], cur.x[1], cur.x[2], cur.v[0], cur.v[1], cur.v[2]] });
        }
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
