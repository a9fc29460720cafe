/**
 * Preparation of a game-step check (check.ts): the game's physics filled in and checked, the
 * plan's burns as the game flies them, the mission's spans and the reference flight (DOP853
 * through the propagation front door, reference.ts) with an estimate of its own error — the
 * difference to a run of the same method at a tenth of its rtol (at most down to MIN_RTOL) —
 * shared by every run of the plan.
 */
import { InputError, requireFinite } from '../math/index.ts';
import { bodyState } from '../system/index.ts';
import type { StarSystem } from '../system/index.ts';
import { MIN_RTOL } from '../integrate/index.ts';
import { evaluate } from '../conic/index.ts';
import type { GameGuidance } from './guidance.ts';
import { GAME_INTEGRATORS } from './kernel.ts';
import {
  REFERENCE_RTOL,
  ReferenceTrack,
  flyReference,
  type GameBurn,
  type GameBurnModel,
  type GameGravity,
  type ReferenceSettings,
  type ReferenceStats,
} from './reference.ts';
import {
  DEFAULT_BURN_MODEL,
  DEFAULT_GRAVITY,
  DEFAULT_GUIDANCE,
  DEFAULT_PRECISION,
  REFERENCE_CHECK_FACTOR,
  type GamePhysics,
  type GamePhysicsInput,
} from './types.ts';
import type { Plan } from '../plan/index.ts';
import type { PlanResult } from '../plan/index.ts';

/** One span of the mission: a trajectory segment of the plan. */
export interface SpanDef {
  index: number;
  kind: 'coast' | 'burn';
  central: number;
  t0: number;
  t1: number;
}

/** The plan, its reference flight and what every game-step run of it shares. */
export interface PreparedGameStep {
  system: StarSystem;
  plan: Plan;
  result: PlanResult;
  gravity: GameGravity;
  burnModel: GameBurnModel;
  guidance: GameGuidance;
  burns: GameBurn[];
  spans: SpanDef[];
  t0: number;
  t1: number;
  start: { abs: Float64Array; central: number };
  arrival: { t: number; body: number } | null;
  settings: ReferenceSettings;
  reference: ReferenceTrack;
  referenceStats: ReferenceStats;
  referenceError: number;
  rtol: number;
}

export interface PrepareOptions {
  gravity?: GameGravity;
  burns?: GameBurnModel;
  guidance?: GameGuidance;
  /** The plan's patched-conic result (evaluated when omitted). */
  result?: PlanResult;
  /** Relative tolerance of the reference (default REFERENCE_RTOL). */
  rtol?: number;
  signal?: { aborted: boolean };
}

/** Smallest ln(m0/m1) for which a burn's thrust is taken from its mass flow. */
const LN_RATIO_MIN = 1e-12;

/** Burns of the plan as the game flies them, from the result's budget rows and the plan's burn events. */
export function gameBurns(plan: Plan, result: PlanResult): GameBurn[] {
  const out: GameBurn[] = [];
  const segs = result.segments;
  for (const r of result.budget.rows) {
    if (!(r.dv > 0)) continue;
    const frac = r.dvMissing ? Math.max(0, (r.dv - r.dvMissing) / r.dv) : 1;
    const dv: [number, number, number] = [r.dvInertial[0] * frac, r.dvInertial[1] * frac, r.dvInertial[2] * frac];
    const dvMag = Math.hypot(dv[0], dv[1], dv[2]);
    if (!(dvMag > 0)) continue;
    const duration = r.duration > 0 ? r.duration : 0;
    const mdot = duration > 0 ? r.propellantUsed / duration : 0;
    const ev = plan.events.find((e) => e.id === r.planEventId);
    // the segment the burn starts (or, for a burn at the plan's end, the one it ends)
    const seg = segs.find((g) => g.t0 === r.t) ?? segs.find((g) => g.t0 <= r.t && r.t <= g.t1) ?? segs[segs.length - 1];
    const lnRatio = r.massAfter > 0 && r.massBefore > r.massAfter ? Math.log(r.massBefore / r.massAfter) : 0;
    const thrust = lnRatio > LN_RATIO_MIN ? (dvMag * mdot) / lnRatio : 0;
    out.push({
      id: r.planEventId,
      name: r.name,
      t: r.t,
      tStart: r.t - 0.5 * duration,
      duration,
      dv,
      dvMag,
      mass0: r.massBefore,
      mass1: r.massAfter,
      mdot,
      thrust,
      event: ev && ev.type === 'burn' ? ev : null,
      central: seg ? seg.central : 0,
      fraction: frac,
    });
  }
  return out.sort((a, b) => a.t - b.t);
}

/** Builds the mission's spans, burns and reference flight. */
export function prepareGameStep(system: StarSystem, plan: Plan, options: PrepareOptions = {}): PreparedGameStep {
  const gravity = options.gravity ?? DEFAULT_GRAVITY;
  if (gravity !== 'central' && gravity !== 'all') throw new InputError('physics.gravity', "must be 'central' or 'all'", gravity);
  const burnModel = options.burns ?? DEFAULT_BURN_MODEL;
  if (burnModel !== 'impulsive' && burnModel !== 'spread') throw new InputError('physics.burns', "must be 'impulsive' or 'spread'", burnModel);
  const guidance = options.guidance ?? DEFAULT_GUIDANCE;
  if (guidance !== 'resolve' && guidance !== 'open-loop') throw new InputError('physics.guidance', "must be 'resolve' or 'open-loop'", guidance);
  const rtol = options.rtol ?? REFERENCE_RTOL;
  const result = options.result ?? evaluate(system, plan, { samplesPerSegment: 0 });
  const segs = result.segments.filter((s) => s.t1 > s.t0);
  if (segs.length === 0) throw new InputError('plan', 'flies no trajectory (its result has no segment of positive length)');
  const spans: SpanDef[] = segs.map((s, index) => ({ index, kind: s.kind, central: s.central, t0: s.t0, t1: s.t1 }));
  const t0 = segs[0].t0;
  const t1 = segs[segs.length - 1].t1;
  const central = segs[0].central;
  const abs = new Float64Array(6);
  bodyState(system, central, t0, abs);
  for (let i = 0; i < 6; i++) abs[i] += segs[0].state0[i];
  const burns = gameBurns(plan, result);
  const frames = { t: segs.map((s) => s.t0), central: segs.map((s) => s.central) };
  const settings: ReferenceSettings = { system, gravity, burnModel, burns, guidance, frames, rtol, signal: options.signal };
  const flight = flyReference(settings, t0, abs, central, t1, true);
  const reference = new ReferenceTrack(system, flight);
  let arrival: { t: number; body: number } | null = null;
  const ca = result.target?.closestApproach;
  if (result.target && ca && ca.t >= t0 && ca.t <= t1) arrival = { t: ca.t, body: result.target.body };
  // the reference's own error: the difference to a run at a tighter tolerance
  const tight = new ReferenceTrack(system, flyReference({ ...settings, rtol: Math.max(MIN_RTOL, rtol * REFERENCE_CHECK_FACTOR) }, t0, abs, central, t1, true));
  const a6 = new Float64Array(6);
  const b6 = new Float64Array(6);
  let referenceError = 0;
  for (const t of [arrival?.t ?? t1, t1]) {
    reference.at(t, a6);
    tight.at(t, b6);
    referenceError = Math.max(referenceError, Math.hypot(a6[0] - b6[0], a6[1] - b6[1], a6[2] - b6[2]));
  }
  return {
    system,
    plan,
    result,
    gravity,
    burnModel,
    guidance,
    burns,
    spans,
    t0,
    t1,
    start: { abs, central },
    arrival,
    settings,
    reference,
    referenceStats: flight.stats,
    referenceError,
    rtol,
  };
}

/** Fills in and checks the game's physics. */
export function normalizePhysics(p: GamePhysicsInput): GamePhysics {
  if (!p || typeof p !== 'object') throw new InputError('physics', 'must be an object with integrator and dt', p);
  if (!GAME_INTEGRATORS.includes(p.integrator)) throw new InputError('physics.integrator', `must be one of ${GAME_INTEGRATORS.join(', ')}`, p.integrator);
  requireFinite('physics.dt', p.dt);
  if (!(p.dt > 0)) throw new InputError('physics.dt', 'must be > 0 (s)', p.dt);
  const precision = p.precision ?? DEFAULT_PRECISION;
  if (precision !== 'float64' && precision !== 'float32') throw new InputError('physics.precision', "must be 'float64' or 'float32'", precision);
  if (precision === 'float32' && !(Math.fround(p.dt) > 0)) throw new InputError('physics.dt', 'must be representable in float32 (> 1.4e-45 s)', p.dt);
  const rebase = p.rebase === undefined ? null : p.rebase;
  if (rebase !== null) {
    if (typeof rebase !== 'object') throw new InputError('physics.rebase', 'must be null or { distance, velocity }', rebase);
    requireFinite('physics.rebase.distance', rebase.distance);
    if (!(rebase.distance > 0)) throw new InputError('physics.rebase.distance', 'must be > 0 (m)', rebase.distance);
    if (typeof rebase.velocity !== 'boolean') throw new InputError('physics.rebase.velocity', 'must be true or false', rebase.velocity);
  }
  const gravity = p.gravity ?? DEFAULT_GRAVITY;
  if (gravity !== 'central' && gravity !== 'all') throw new InputError('physics.gravity', "must be 'central' or 'all'", gravity);
  const burns = p.burns ?? DEFAULT_BURN_MODEL;
  if (burns !== 'impulsive' && burns !== 'spread') throw new InputError('physics.burns', "must be 'impulsive' or 'spread'", burns);
  const guidance = p.guidance ?? DEFAULT_GUIDANCE;
  if (guidance !== 'resolve' && guidance !== 'open-loop') throw new InputError('physics.guidance', "must be 'resolve' or 'open-loop'", guidance);
  return { integrator: p.integrator, dt: p.dt, precision, rebase: rebase ? { ...rebase } : null, gravity, burns, guidance };
}
