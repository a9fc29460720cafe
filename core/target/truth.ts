/**
 * A plan read in its truth model (or any model, as a comparison): the flight, the budget, the
 * final orbit about the target and whether the target is reached, judged with the plan's own
 * tolerances, plus the conditions that fail in words a designer understands.
 *
 * - 'conic' / 'finite': the patched-conic evaluation (every burn finite for 'finite').
 * - 'nbody': the plan as a timed burn schedule (a plan targeted in n-body already is one; any other
 *   plan is flown as the schedule of its patched-conic flight, with a note) flown through the
 *   restricted n-body model by core/nbody verifyNBody; the final orbit is the osculating orbit
 *   about the target at the end of the flight. The budget is the schedule's own (scheduleBudget.ts:
 *   every burn counted from its fixed vector, thrust and duration, whatever the path); the
 *   patched-conic reading of the schedule gives only the times and path figures, and when it ends
 *   before a burn (an impact the n-body ship does not meet) a note says so. The flyby passes are
 *   measured from the n-body flight (nbodyFlybys.ts) and listed in the budget as the conic ones are.
 */
import type { StarSystem } from '../system/index.ts';
import { findBodyIndex } from '../system/index.ts';
import type { Budget, FlybyReport, Plan, PlanResult, TruthModel } from '../plan/index.ts';
import { planTruthModel, truthModelLabel } from '../plan/index.ts';
import { evaluate } from '../conic/index.ts';
import { verifyNBody, type NBodyModelOptions, type NBodyResult } from '../nbody/index.ts';
import { freezeSchedule, isSchedule, planForModel, scheduleActions } from './modelFlight.ts';
import { burnsNotFlown, scheduleBudget } from './scheduleBudget.ts';
import { nbodyFlybyReports } from './nbodyFlybys.ts';

const DEG = Math.PI / 180;

export interface TruthGoal {
  name: string;
  /** SI values; shown divided by unitScale in `units`. */
  value: number | null;
  wanted: number;
  tolerance: number;
  met: boolean;
  units: string;
  unitScale: number;
}

export interface TruthReport {
  model: TruthModel;
  /** Words for screens: "n-body". */
  label: string;
  /** The plan as flown (for 'nbody' the timed schedule). */
  plan: Plan;
  /** Patched-conic evaluation of the plan as the model flies it (for 'nbody': of the schedule, for times and masses; a comparison only, its budget may leave out burns after an early end). */
  conic: PlanResult;
  /** The n-body flight ('nbody' only). */
  nbody: NBodyResult | null;
  budget: Budget;
  /** Flyby plan events' passes in this model (n-body: measured from the n-body flight, nbodyFlybys.ts; else the patched-conic reports). */
  flybys: FlybyReport[];
  /** Final orbit about the target at the end of the flight, or null (no target, the ship ends elsewhere, an impact). */
  achieved: { periapsisAltitude: number; apoapsisAltitude: number | null; e: number; i: number } | null;
  /** The plan's target, judged with its own tolerances (empty without a target). */
  goals: TruthGoal[];
  /** Every target goal met (false without a target). */
  reached: boolean;
  /** The margin holds: ≥ 0 and every burn solved (a failed solve flies no Δv and flatters the margin). */
  marginHolds: boolean;
  /** Each condition that fails, in words ("margin −54.2 m/s is below zero"). */
  failures: string[];
  notes: string[];
}

export interface TruthOptions extends NBodyModelOptions {
  /** Model to read the plan in (default its truth model). */
  model?: TruthModel;
  /** Drawing samples (conic: per segment, default 96; n-body: on/off, default on). */
  samples?: boolean;
  /** n-body: also keep full states on a fixed grid of this step from the start (ephemeris exports), s. */
  step?: number;
  onProgress?: (done: number, total: number) => void;
  signal?: { aborted: boolean };
}

/** The plan read in a model (see the module comment). */
export function truthReport(system: StarSystem, plan: Plan, options: TruthOptions = {}): TruthReport {
  const model = options.model ?? planTruthModel(plan);
  const samples = options.samples ?? true;
  const notes: string[] = [];
  let flown = planForModel(plan, model);
  let nbody: NBodyResult | null = null;
  if (model === 'nbody' && !isSchedule(flown)) {
    flown = freezeSchedule(system, flown);
    notes.push('flown in n-body as the burn schedule of its patched-conic flight (target the plan in n-body to make it arrive there)');
  }
  const conic = evaluate(system, flown, samples ? {} : { samplesPerSegment: 0 });
  let achieved: TruthReport['achieved'] = null;
  if (model === 'nbody') {
    nbody = verifyNBody(system, flown, conic, {
      ...options,
      samples,
      onProgress: options.onProgress,
      signal: options.signal,
      schedule: scheduleActions(flown, conic.t0),
    });
    achieved = nbody.final?.nbody ?? null;
    notes.push(...nbody.notes.filter((n) => !n.includes('no arrival comparison')));
  } else {
    achieved = conic.target?.achieved ?? null;
  }
  const goals: TruthGoal[] = [];
  const t = plan.target;
  const k = t ? findBodyIndex(system, t.body) : -1;
  const name = k >= 0 ? system.bodies[k].name : (t?.body ?? '');
  if (t) {
    const goal = (label: string, value: number | null, wanted: number, tolerance: number, units: string, unitScale: number) =>
      goals.push({ name: `${label} about ${name}`, value, wanted, tolerance, met: value !== null && Math.abs(value - wanted) <= tolerance, units, unitScale });
    const altTol = t.tolerance.periapsisAltitude;
    goal('periapsis altitude', achieved ? achieved.periapsisAltitude : null, t.periapsisAltitude, altTol, 'km', 1000);
    if (t.apoapsisAltitude !== null) goal('apoapsis altitude', achieved ? achieved.apoapsisAltitude : null, t.apoapsisAltitude, altTol, 'km', 1000);
    if (t.e !== null) goal('eccentricity', achieved ? achieved.e : null, t.e, t.tolerance.e, '', 1);
    if (t.i !== null) goal('inclination', achieved ? achieved.i : null, t.i, t.tolerance.i, '°', DEG);
  }
  const failures: string[] = [];
  // n-body: the schedule's own budget, every burn counted (the patched-conic reading may end before the last)
  const schedule = model === 'nbody' && isSchedule(flown);
  let budget = schedule ? scheduleBudget(flown, conic) : conic.budget;
  // the flyby passes as this model flies them (n-body: measured from its flight, not the conic reading's)
  let flybys: FlybyReport[] = conic.flybys ?? [];
  if (nbody) {
    const { rtol, atol, method, maxSteps, maxStep, gravity, pull, signal } = options;
    flybys = nbodyFlybyReports(system, flown, nbody, conic, { rtol, atol, method, maxSteps, maxStep, gravity, pull, signal });
    let marks = 0;
    for (const e of flown.events) {
      if (e.type !== 'flyby') continue;
      marks++;
      if (flybys.some((f) => f.planEventId === e.id)) continue;
      const name = system.bodies[findBodyIndex(system, e.body)]?.name ?? e.body;
      notes.push(`${e.name}: the n-body flight does not pass through ${name}'s sphere of influence`);
    }
    // listed as the patched-conic budget lists them: one row per pass found
    if (marks > 0) budget = { ...budget, flybys: flybys.map((f) => ({ planEventId: f.planEventId, name: f.name, freeDv: f.freeDv })) };
  }
  if (model === 'nbody') {
    const missed = burnsNotFlown(flown, conic);
    if (missed.length > 0) {
      const hit = conic.events.find((e) => e.kind === 'impact');
      const why = hit
        ? `hits ${system.bodies[hit.central]?.name ?? 'a body'} on day ${(hit.t / 86400).toFixed(2)}`
        : `ends on day ${(conic.t1 / 86400).toFixed(2)}`;
      const which = missed.map((b) => b.name).join(', ');
      notes.push(
        schedule
          ? `the patched-conic reading of the schedule ${why}, before ${which}: a comparison only; the budget counts every burn of the schedule`
          : // the patched-conic flight that froze the schedule never reached these burns, so they have no fixed Δv
            `the patched-conic flight ${why}, before ${which}: ${missed.length > 1 ? 'they have' : 'it has'} no fixed Δv to fly or count (target the plan in n-body)`,
      );
    }
  }
  // a burn that failed to solve flies no Δv, which can only flatter the margin: it does not hold then
  const marginHolds = budget.margin >= 0 && budget.failedBurns.length === 0;
  if (budget.margin < 0) failures.push(`margin ${budget.margin.toFixed(1)} m/s is below zero`);
  // what stops the plan being flown as written, whatever the target: errors of the flight in this model
  for (const f of conic.flags) {
    if (f.severity !== 'error') continue;
    // the patched-conic path's own impact or miss says nothing of an n-body flight
    if (model === 'nbody' && (f.code === 'impact' || f.code === 'target-missed')) continue;
    if (f.code === 'negative-margin' || f.code === 'target-missed') continue; // said below in the target's and margin's words
    // n-body: the propellant's errors are the schedule budget's (below), for every burn
    if (model === 'nbody' && f.code === 'out-of-propellant') continue;
    failures.push(f.message);
  }
  if (model === 'nbody')
    for (const r of budget.rows) for (const f of r.flags) if (f.severity === 'error' && f.code === 'out-of-propellant') failures.push(f.message);
  if (nbody?.status === 'impact' && nbody.impact) {
    failures.push(`the n-body flight hits ${system.bodies[nbody.impact.body]?.name ?? 'a body'} on day ${(nbody.impact.t / 86400).toFixed(2)}`);
  }
  if (t && !achieved) failures.push(`the ship does not end in orbit about ${name}${nbody?.status === 'impact' ? ' (it hits a body first)' : ''}`);
  for (const g of goals) {
    if (g.met) continue;
    if (g.value === null) {
      if (achieved) failures.push(`${g.name}: none, the orbit is open`);
      continue;
    }
    const show = (x: number) => `${(x / g.unitScale).toFixed(g.unitScale === 1 ? 4 : 3)}${g.units ? ` ${g.units}` : ''}`;
    failures.push(`${g.name} is ${show(g.value)}, wanted ${show(g.wanted)} ± ${show(g.tolerance)}`);
  }
  return {
    model,
    label: truthModelLabel(model),
    plan: flown,
    conic,
    nbody,
    budget,
    flybys,
    achieved,
    goals,
    reached: t !== null && achieved !== null && goals.every((g) => g.met),
    marginHolds,
    failures,
    notes,
  };
}
