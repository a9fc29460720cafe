/**
 * The Δv budget of a timed burn schedule from the schedule alone, every burn counted whatever the
 * trajectory.
 *
 * In a schedule (modelFlight.ts isSchedule) an impulsive burn is a fixed inertial Δv vector and a
 * finite burn fixed thrust along a fixed direction for the duration the rocket equation gives its
 * Δv (modelFlight.ts scheduleActions), and a staging drops its stage whatever the path: so the
 * propellant, masses and Δv left follow from the events in order (vehicle.ts spendBurn,
 * Tsiolkovsky), without flying the path. A patched-conic reading of the schedule may end early (an
 * impact where the n-body ship flies on) and never reach the later burns; this budget still counts
 * them. The summary is plan/budget.ts summarizeBudget's, so rows, totals, reserve, margin and flags
 * are the same kind of object as the evaluation's.
 *
 * What depends on the path (a finite burn's gravity loss, the burn's share of the orbital period
 * and the long-burn warning, a finite burn's start moved after its coast began) is taken from the
 * patched-conic reading `conic` for the burns it flew, and left out (null) for the others.
 */
import { InputError } from '../math/index.ts';
import type { Budget, BudgetRow, Flag, Plan, PlanResult } from '../plan/index.ts';
import { createBurnBook, createVehicleState, deltaVLeft, dropStage, spendBurn, summarizeBudget } from '../plan/index.ts';
import { isSchedule } from './modelFlight.ts';

/** Row flags read from the patched-conic reading (they depend on the path); the propellant's are recomputed here. */
const PATH_ROW_FLAGS: ReadonlySet<Flag['code']> = new Set<Flag['code']>(['long-burn', 'out-of-order']);

/**
 * The budget of a schedule plan (see the module comment). `conic` is its patched-conic evaluation,
 * for the path-dependent figures of the burns it flew. InputError unless the plan is a schedule.
 */
export function scheduleBudget(plan: Plan, conic?: PlanResult): Budget {
  if (!isSchedule(plan)) throw new InputError('plan', 'must be a timed burn schedule to budget from its burns alone (freeze it first)', plan.name);
  const vehicle = plan.vehicle;
  const vs = createVehicleState(vehicle);
  const book = createBurnBook(vehicle);
  const rows: BudgetRow[] = [];
  for (const ev of plan.events) {
    if (ev.type === 'stage') {
      // as the evaluation: a staging with no stage left drops nothing
      if (vs.stage < vehicle.stages.length) dropStage(vehicle, vs);
      continue;
    }
    if (ev.type !== 'burn') continue;
    const dvInertial: [number, number, number] = [ev.dv[0], ev.dv[1], ev.dv[2]];
    const dv = Math.hypot(dvInertial[0], dvInertial[1], dvInertial[2]);
    spendBurn(vehicle, vs, dv, book);
    const flags: Flag[] = [];
    // the same words as the evaluation's (core/conic/evaluate.ts) for the same bookkeeping
    if (book.dryMidBurn) {
      const names = book.dropped.filter((d) => d.offset > 0).map((d) => vehicle.stages[d.stage].name);
      const ran = names.length > 0 ? names.join(', ') : vehicle.stages[book.phaseStage[book.phases - 1]].name;
      flags.push({ code: 'stage-dry-mid-burn', severity: 'warning', message: `${ev.name}: ${ran} ran dry during the burn`, planEventId: ev.id });
    }
    if (book.missing > 0) {
      flags.push({
        code: 'out-of-propellant',
        severity: 'error',
        message: `${ev.name}: out of propellant, ${book.missing.toFixed(1)} m/s of ${dv.toFixed(1)} m/s not delivered`,
        planEventId: ev.id,
      });
    }
    const flown = conic?.budget.rows.find((r) => r.planEventId === ev.id);
    if (flown) for (const f of flown.flags) if (PATH_ROW_FLAGS.has(f.code)) flags.push(f);
    // isSchedule: every burn has its time
    const t = ev.t ?? 0;
    rows.push({
      planEventId: ev.id,
      name: ev.name,
      t,
      tStart: t - 0.5 * book.duration,
      tEnd: t + 0.5 * book.duration,
      dv,
      frame: 'inertial',
      dvFrame: [dvInertial[0], dvInertial[1], dvInertial[2]],
      dvInertial,
      duration: book.duration,
      propellantUsed: book.propellantUsed,
      massBefore: book.massBefore,
      massAfter: book.massAfter,
      stages: book.stagesFired.map((k) => vehicle.stages[k].name),
      dvLeft: deltaVLeft(vehicle, vs),
      dvMissing: book.missing,
      gravityLoss: flown ? flown.gravityLoss : null,
      periodFraction: flown ? flown.periodFraction : null,
      flags,
    });
  }
  return summarizeBudget(rows, { capacity: deltaVLeft(vehicle), dvLeft: deltaVLeft(vehicle, vs), finalMass: vs.mass }, plan.reserve).budget;
}

/** The schedule's burns the patched-conic reading `conic` never flew (it ended before them), in plan order. */
export function burnsNotFlown(plan: Plan, conic: PlanResult): { id: string; name: string }[] {
  const flown = new Set(conic.budget.rows.map((r) => r.planEventId));
  const out: { id: string; name: string }[] = [];
  for (const e of plan.events) if (e.type === 'burn' && !flown.has(e.id)) out.push({ id: e.id, name: e.name });
  return out;
}
