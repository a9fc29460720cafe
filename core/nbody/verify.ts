/**
 * n-body verification: flies the burns of a patched-conic result through the restricted
 * n-body model and reports how the arrival differs from the patched-conic plan.
 *
 * The parts, each with its own doc: the force model (../dynamics/shipForces.ts, with the integrator settings in model.ts), the flight through timed
 * burns with SOI switching and drawing samples (flight.ts), the conic result as n-body
 * input and the arrival comparison (arrival.ts), the B-plane (bPlane.ts). This module
 * is the front door (verifyNBody) and re-exports the parts' names.
 *
 * Besides the arrival comparison, the result holds the n-body flight's own first periapsis
 * about the target (burns included; when a burn there comes first, the periapsis of the
 * approach probed from the state before that burn) and the osculating orbit about the target at
 * the end of the flight against the conic result's achieved orbit.
 */
import type { FlownSpan } from '../integrate/index.ts';
import { InputError, requireFinite } from '../math/index.ts';
import { bodyState } from '../system/index.ts';
import { findBodyIndex, type StarSystem } from '../system/index.ts';
import type { Plan } from '../plan/index.ts';
import type { PlanResult } from '../plan/index.ts';
import { conicInfo } from '../conic/index.ts';
import { NBodyModel, type NBodyModelOptions, type NBodyState, type Vec3Tuple } from './model.ts';
import { flyNBody, type NBodyAction, type NBodySamples, type NBodySoiChange, type NBodyStates, type NBodyStats } from './flight.ts';
import {
  burnActions,
  compareArrival,
  conicArrival,
  conicStart,
  probePeriapsis,
  stateRelativeTo,
  type ArrivalComparison,
  type PeriapsisReport,
} from './arrival.ts';

export { DEFAULT_ATOL_FACTOR, DEFAULT_NBODY_RTOL, NBodyModel } from './model.ts';
export type { NBodyModelOptions, NBodyState, Vec3Tuple } from './model.ts';
export { MAX_SAMPLES, SAMPLE_ANGLE, flyNBody, sortActions } from './flight.ts';
export type { FlyOptions, FlyResult, NBodyAction, NBodySamples, NBodySoiChange, Vec3Tuple6, NBodyStates, NBodyStats, ThrustPhase } from './flight.ts';
export { bPlane, bPlaneAxes } from './bPlane.ts';
export type { BPlane } from './bPlane.ts';
export { PROBE_MAX, burnActions, compareArrival, conicArrival, conicStart, probePeriapsis, stateRelativeTo } from './arrival.ts';
export type { ArrivalComparison, ConicArrival, PeriapsisReport } from './arrival.ts';

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
  /**
   * Fly these actions to this end instead of the conic result's burns and end (a timed burn
   * schedule flown from the plan alone, core/target scheduleActions: a patched-conic path that
   * ends early, e.g. in an impact, then does not cut the n-body flight short).
   */
  schedule?: { actions: NBodyAction[]; end: number };
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
  /** SOI changes of the flight, with the ship's state relative to the body left or entered (flight.ts NBodySoiChange). */
  soiChanges: NBodySoiChange[];
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

const arr6 = new Float64Array(6);
const ARRIVAL_ID = '@arrival';

/** n-body verification of a plan's patched-conic result (see the module comment). */
export function verifyNBody(system: StarSystem, plan: Plan, conicResult: PlanResult, options: VerifyOptions = {}): NBodyResult {
  if (conicResult?.model !== 'conic') throw new InputError('conicResult', "must be a patched-conic PlanResult (model 'conic')", conicResult?.model);
  const model = new NBodyModel(system, options);
  const start = conicStart(conicResult);
  const { actions, notes } = options.schedule ? { actions: options.schedule.actions, notes: [] as string[] } : burnActions(plan, conicResult);
  const arrival = conicArrival(system, plan, conicResult);
  if (plan.target && !arrival) notes.push(`the patched-conic flight does not reach ${plan.target.body}'s sphere of influence: no arrival comparison`);
  let tEnd = options.schedule ? options.schedule.end : conicResult.t1;
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
