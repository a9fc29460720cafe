/**
 * The conic result as n-body input, and the n-body arrival against the patched-conic one.
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
 * hyperbolas at that time, on the conic hyperbola's T, R axes; see bPlane.ts).
 */
import type { FlownSpan } from '../integrate/index.ts';
import { propagate } from '../integrate/index.ts';
import { InputError, SolverError } from '../math/index.ts';
import { inertialToVnb } from '../math/index.ts';
import { propagateKepler } from '../orbit/index.ts';
import { bodyState } from '../system/index.ts';
import { findBodyIndex, type StarSystem } from '../system/index.ts';
import type { Plan } from '../plan/index.ts';
import type { PlanResult } from '../plan/index.ts';
import { conicInfo, createConicInfo } from '../conic/index.ts';
import { createBurnBook, createVehicleState, dropStage, spendBurn } from '../plan/index.ts';
import { bPlane, bPlaneAxes, type BPlane } from './bPlane.ts';
import type { NBodyAction, NBodyStats } from './flight.ts';
import type { NBodyModel, NBodyState, ThrustPhase, Vec3Tuple } from './model.ts';

/** Farthest the arrival probe looks for the n-body periapsis from the conic periapsis time, s. */
export const PROBE_MAX = 30 * 86400;

// --- the conic result as n-body input -------------------------------------------------------------

/** Start state of a conic result: its first segment's state and central body. */
export function conicStart(result: PlanResult): NBodyState {
  const s = result.segments[0];
  if (!s) throw new InputError('conicResult.segments', 'must hold at least one segment (the plan flies no time)');
  return { t: s.t0, origin: s.central, x: Float64Array.from(s.state0.subarray(0, 3)), v: Float64Array.from(s.state0.subarray(3, 6)) };
}

/** The burns of a conic result as n-body actions (see the module comment), and notes on how they are flown. */
export function burnActions(plan: Plan, result: PlanResult): { actions: NBodyAction[]; notes: string[] } {
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
    let res: ReturnType<typeof propagate>;
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
        maxStep: model.maxStep,
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
export function compareArrival(
  model: NBodyModel,
  at: NBodyState,
  conic: ConicArrival,
  signal?: { aborted: boolean },
): { comparison: ArrivalComparison; spans: FlownSpan[]; stats: NBodyStats } {
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
