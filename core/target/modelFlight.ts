/**
 * A plan flown in one of the three models the targeter works in, read through one interface.
 *
 * - 'conic': patched conics, each burn flown as its `mode` says (today's evaluation).
 * - 'finite': patched conics with every burn flown finite (the vehicle's thrust, so gravity
 *   losses count), whatever its `mode`.
 * - 'nbody': the restricted n-body model (core/dynamics, through core/nbody's flight) with each
 *   burn as its `mode` says. A plan is flown in n-body as a timed burn schedule: burns at explicit
 *   times with fixed Δv (freezeSchedule), since "at the next periapsis" of the patched-conic flight
 *   is not where the n-body ship is. The patched-conic evaluation of the schedule still gives the
 *   burns' times, stage phases and masses (they depend on the Δv magnitudes, not on the path).
 *
 * What a goal reads (measure.ts): the ship's state relative to any body at a probe time, the
 * state at the end of the plan, the SOI entries and an impact. n-body probes are checkpoints of
 * the flight, so the probe times are given before flying.
 */
import { InputError, SolverError } from '../math/index.ts';
import { bodyState, type StarSystem } from '../system/index.ts';
import type { Plan, PlanResult, TruthModel } from '../plan/index.ts';
import { evaluate, shipStateAt } from '../conic/index.ts';
import { NBodyModel, conicStart, flyNBody, freezePlan, type NBodyAction, type NBodyModelOptions, type NBodyState } from '../nbody/index.ts';
import { createBurnBook, createVehicleState, dropStage, spendBurn } from '../plan/index.ts';

/** The plan as the model flies it: every burn finite for 'finite', else unchanged. */
export function planForModel(plan: Plan, model: TruthModel): Plan {
  if (model !== 'finite') return plan;
  return { ...plan, events: plan.events.map((e) => (e.type === 'burn' && e.mode !== 'finite' ? { ...e, mode: 'finite' as const } : e)) };
}

/**
 * The plan as a timed burn schedule, for flying in n-body: every burn 'fixed' in inertial axes at
 * the time its patched-conic flight put it, with the Δv that flight resolved; coasts that end on a
 * condition become timed; "until SOI change" coasts are dropped (core/nbody freezePlan). Finite
 * burns keep their thrust along the fixed inertial direction ('inertial' pointing), which does not
 * depend on where the patched-conic path runs. A plan already a schedule comes back unchanged in
 * substance.
 */
export function freezeSchedule(system: StarSystem, plan: Plan, conic?: PlanResult): Plan {
  const result = conic ?? evaluate(system, plan, { samplesPerSegment: 0 });
  const frozen = freezePlan(system, plan, result, [], 0, -1);
  for (const e of frozen.events) if (e.type === 'burn' && e.mode === 'finite') e.pointing = 'inertial';
  return frozen;
}

/** Whether every burn of the plan is fixed at an explicit time in inertial axes and no coast waits on a condition. */
export function isSchedule(plan: Plan): boolean {
  return plan.events.every((e) =>
    e.type === 'burn'
      ? e.t !== null && e.solve.kind === 'fixed' && e.frame === 'inertial' && (e.mode === 'impulsive' || e.pointing === 'inertial')
      : e.type !== 'coast' || e.until.kind === 'time' || e.until.kind === 'duration',
  );
}

/**
 * The n-body actions of a timed schedule, from the plan alone (never from a patched-conic path,
 * which may end early — an impact — where the n-body ship flies on): each burn at its time with its
 * inertial Δv, scaled by the part the propellant delivers (vehicle bookkeeping over the burns and
 * staging in order); a finite burn as its stage phases centred on its time, thrust along the
 * fixed Δv direction. Also the schedule's end: the last burn's end, timed coast or duration coast,
 * or the plan's `end` when later.
 */
export function scheduleActions(plan: Plan, t0: number): { actions: NBodyAction[]; end: number } {
  const vehicle = plan.vehicle;
  const vs = createVehicleState(vehicle);
  const book = createBurnBook(vehicle);
  const actions: NBodyAction[] = [];
  let t = t0;
  for (const ev of plan.events) {
    if (ev.type === 'stage') {
      if (vs.stage < vehicle.stages.length) dropStage(vehicle, vs);
    } else if (ev.type === 'coast') {
      if (ev.until.kind === 'time') t = Math.max(t, ev.until.t);
      else if (ev.until.kind === 'duration') t += ev.until.dt;
    } else if (ev.type === 'burn') {
      const tb = ev.t ?? t;
      const mag = Math.hypot(ev.dv[0], ev.dv[1], ev.dv[2]);
      spendBurn(vehicle, vs, mag, book);
      const f = mag > 0 ? book.delivered / mag : 0;
      const dv: [number, number, number] = [ev.dv[0] * f, ev.dv[1] * f, ev.dv[2] * f];
      if (ev.mode === 'finite' && book.delivered > 0) {
        const phases = [];
        for (let p = 0; p < book.phases; p++) {
          phases.push({ duration: book.phaseDuration[p], thrust: book.phaseThrust[p], exhaust: book.phaseExhaust[p], mass0: book.phaseMass0[p] });
        }
        const u: [number, number, number] = [ev.dv[0] / mag, ev.dv[1] / mag, ev.dv[2] / mag];
        actions.push({ kind: 'finite', t: tb - book.duration / 2, id: ev.id, phases, pointing: 'inertial', u, vnb: null });
        t = Math.max(t, tb + book.duration / 2);
      } else {
        actions.push({ kind: 'impulse', t: tb, id: ev.id, dv });
        t = Math.max(t, tb);
      }
    }
  }
  return { actions, end: plan.end !== null ? Math.max(t, plan.end) : t };
}

/** One flight of a plan in a model, with what goals read from it. */
export interface ModelFlight {
  model: TruthModel;
  /** The patched-conic evaluation of the plan as the model flies it (for 'nbody': of the schedule; its times and masses). */
  conic: PlanResult;
  /** Start and end of the flight, s. */
  t0: number;
  t1: number;
  /** Ship state [r, v] relative to body k at probe time t into out6; false when t is not a probe of this flight. */
  stateAt(k: number, t: number, out6: Float64Array): boolean;
  /** Ship state relative to body k at the end of the flight. */
  endState(k: number, out6: Float64Array): void;
  /** SOI entries, in time order. */
  entries: { t: number; body: number }[];
  impact: { t: number; body: number } | null;
  /** n-body: the flight's state at a time given in `checkpoints` (relative to its origin body), else null. */
  checkpoint(t: number): NBodyState | null;
}

export interface FlyModelOptions extends NBodyModelOptions {
  /** Probe times for stateAt (n-body: checkpoints; patched conics: any time works). */
  probes?: readonly number[];
  /** n-body: start from this state (the flight before it is the same for every trial) and fly only later burns. */
  from?: NBodyState;
  /** n-body: times at which to keep the flight's own state (checkpoint). */
  checkpoints?: readonly number[];
  /** n-body: stop the flight here (an arrival leg needs nothing after its probe), s. */
  until?: number;
  /** n-body: reuse this model (its tolerances) across flights. */
  nbody?: NBodyModel;
  signal?: { aborted: boolean };
}

const rel6 = new Float64Array(6);

/** The ship's state [r, v] relative to body k at time t of a patched-conic result, into out6. */
export function conicStateRelativeTo(system: StarSystem, result: PlanResult, k: number, t: number, out6: Float64Array): Float64Array {
  const c = result.segments[shipStateAt(result, t, out6)]?.central ?? k;
  if (c !== k) {
    bodyState(system, c, t, rel6, k);
    for (let i = 0; i < 6; i++) out6[i] += rel6[i];
  }
  return out6;
}

function conicFlightOf(system: StarSystem, model: TruthModel, result: PlanResult): ModelFlight {
  const entries = result.events.filter((e) => e.kind === 'soi-entry').map((e) => ({ t: e.t, body: e.central }));
  const hit = result.events.find((e) => e.kind === 'impact');
  const toBody = (k: number, t: number, out6: Float64Array) => conicStateRelativeTo(system, result, k, t, out6);
  return {
    model,
    conic: result,
    t0: result.t0,
    t1: result.t1,
    stateAt: (k, t, out6) => {
      if (!(t >= result.t0 && t <= result.t1)) return false;
      toBody(k, t, out6);
      return true;
    },
    endState: (k, out6) => toBody(k, result.t1, out6),
    entries,
    impact: hit ? { t: hit.t, body: hit.central } : null,
    checkpoint: () => null,
  };
}

/**
 * Flies `plan` in `model`. For 'nbody' the plan must be a schedule (isSchedule; see freezeSchedule).
 * Throws SolverError('target', 'cancelled') when the signal aborts.
 */
export function flyModel(system: StarSystem, plan: Plan, model: TruthModel, options: FlyModelOptions = {}): ModelFlight {
  if (options.signal?.aborted) throw new SolverError('target', 'cancelled', 'targeting cancelled');
  const flown = planForModel(plan, model);
  const conic = evaluate(system, flown, { samplesPerSegment: 0 });
  if (model !== 'nbody') return conicFlightOf(system, model, conic);
  if (!isSchedule(plan)) throw new InputError('plan', 'must be a timed burn schedule to fly in n-body (freeze it first)', plan.name);
  const nb = options.nbody ?? new NBodyModel(system, options);
  const start = options.from ?? conicStart(conic);
  const schedule = scheduleActions(flown, conic.t0);
  const probes = (options.probes ?? []).filter((t) => t >= start.t && t <= schedule.end);
  const actions: NBodyAction[] = schedule.actions.filter((a) => a.t >= start.t);
  probes.forEach((t, j) => actions.push({ kind: 'checkpoint', t, id: `@probe${j}` }));
  const keep = (options.checkpoints ?? []).filter((t) => t >= start.t && t <= schedule.end);
  keep.forEach((t, j) => actions.push({ kind: 'checkpoint', t, id: `@keep${j}` }));
  const tEnd = options.until !== undefined ? Math.max(start.t, Math.min(schedule.end, options.until)) : schedule.end;
  const fly = flyNBody(
    nb,
    start,
    actions.filter((a) => a.t <= tEnd),
    tEnd,
    { samples: false, signal: options.signal },
  );
  const end = fly.state;
  const rel = (s: NBodyState, k: number, out6: Float64Array) => {
    bodyState(system, s.origin, s.t, rel6, k);
    for (let i = 0; i < 3; i++) {
      out6[i] = s.x[i] + rel6[i];
      out6[i + 3] = s.v[i] + rel6[i + 3];
    }
  };
  return {
    model,
    conic,
    t0: start.t,
    t1: end.t,
    stateAt: (k, t, out6) => {
      const j = probes.indexOf(t);
      const s = j >= 0 ? fly.checkpoints.get(`@probe${j}`) : undefined;
      if (!s) return false;
      rel(s, k, out6);
      return true;
    },
    endState: (k, out6) => rel(end, k, out6),
    entries: fly.soiChanges.filter((c) => c.kind === 'entry').map((c) => ({ t: c.t, body: c.body })),
    impact: fly.impact,
    checkpoint: (t) => {
      const j = keep.indexOf(t);
      return j >= 0 ? (fly.checkpoints.get(`@keep${j}`) ?? null) : null;
    },
  };
}
