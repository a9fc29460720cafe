/**
 * The burns as the plan's evaluation solved them, written into the plan file as derived data
 * (each burn's `resolved` block, planFileShape.ts) so that a pipeline reading the file learns what
 * to fly without running Waymark, and checked when the file is opened again.
 *
 * - `resolveBurns(system, plan)`: the figures in the plan's truth model (core/plan planTruthModel):
 *   the budget rows of the patched-conic evaluation (core/conic evaluate) of the plan as that model
 *   flies it ('finite': every burn finite, core/target planForModel); for 'nbody', the budget of
 *   the plan's timed burn schedule (core/target freezeSchedule and scheduleBudget), the same
 *   figures truthReport's n-body budget gives, without flying the n-body path (the schedule's Δv,
 *   times and masses do not depend on it). No drawing samples: one evaluation, fast enough to run
 *   on every save.
 * - `resolvedFromBudget(budget, model)`: the same from budget rows the caller already has.
 * - `staleResolvedIssues(system, plan, recorded)`: the recorded figures compared with the
 *   recomputed ones; each burn whose figures differ (or that the plan no longer solves, or
 *   recorded in another model) is one warning at `events[k].resolved`, which
 *   core/io/issueWords.ts names as the card does. Never an error: the file's figures are simply
 *   not used.
 *
 * Why the caller computes and passes the figures to serializePlanFile rather than serializing
 * computing them: the editor serializes on every edit (planSaveIssues judges an edit as a saved
 * file) and an evaluation there would double the cost of each keystroke; the callers that write
 * files (the app's save, the command line's writes) run one evaluation each, at the moment of
 * writing.
 */
import { ValidationError, InputError, SolverError, type ValidationIssue } from '../math/index.ts';
import type { StarSystem } from '../system/index.ts';
import type { Budget, BudgetRow, Plan, TruthModel } from '../plan/index.ts';
import { planTruthModel } from '../plan/index.ts';
import { evaluate } from '../conic/index.ts';
import { freezeSchedule, isSchedule, planForModel, scheduleBudget } from '../target/index.ts';

/**
 * One burn as solved (SI): the in-memory form of the file's `resolved` block — the budget row's
 * figures (frame of dvFrame: the burn's own, 'inertial' for the n-body schedule) and the model.
 */
export type ResolvedBurn = { model: TruthModel } & Pick<
  BudgetRow,
  'frame' | 'dvFrame' | 'dvInertial' | 'dv' | 'tStart' | 'tEnd' | 'duration' | 'propellantUsed' | 'massAfter'
>;

/** Resolved burns by plan event id. */
export type ResolvedBurns = ReadonlyMap<string, ResolvedBurn>;

/**
 * Tolerances of the comparison on open. The figures are written with every digit (a save and a
 * re-open on the same machine give them back bit for bit); what may move them is another
 * platform's last-bit differences in Math.sin/cos/exp amplified through Lambert and Kepler
 * iterations (parts in 1e12 of the value at most, common practice for double-precision
 * trajectory codes). 1 mm/s, 1 ms and 1 g are far below anything a flight could act on and far
 * above that noise for any realistic value; the relative part keeps huge values (|t| near 1e13 s,
 * where one double step is 2 ms) from being flagged for their rounding alone.
 */
export const RESOLVED_TOLERANCE = Object.freeze({ dv: 1e-3, t: 1e-3, mass: 1e-3, relative: 1e-12 });

/** The resolved burns of budget rows the caller already has (the plan read in `model`); failed solves are left out. */
export function resolvedFromBudget(budget: Budget, model: TruthModel): Map<string, ResolvedBurn> {
  const out = new Map<string, ResolvedBurn>();
  for (const r of budget.rows) {
    // a burn that failed to solve flies no Δv: that is not what the plan asks for
    if (r.flags.some((f) => f.code === 'solve-failed')) continue;
    out.set(r.planEventId, {
      model,
      frame: r.frame,
      dvFrame: [r.dvFrame[0], r.dvFrame[1], r.dvFrame[2]],
      dvInertial: [r.dvInertial[0], r.dvInertial[1], r.dvInertial[2]],
      dv: r.dv,
      tStart: r.tStart,
      tEnd: r.tEnd,
      duration: r.duration,
      propellantUsed: r.propellantUsed,
      massAfter: r.massAfter,
    });
  }
  return out;
}

/** The budget of the plan in its truth model (see the module comment). */
function truthBudget(system: StarSystem, plan: Plan, model: TruthModel): Budget {
  const flown = planForModel(plan, model);
  if (model !== 'nbody') return evaluate(system, flown, { samplesPerSegment: 0 }).budget;
  const schedule = isSchedule(flown) ? flown : freezeSchedule(system, flown);
  return scheduleBudget(schedule, evaluate(system, schedule, { samplesPerSegment: 0 }));
}

/**
 * The plan's burns as its evaluation in its truth model solves them. Throws what the evaluation
 * throws (InputError, SolverError) for a plan that does not evaluate.
 */
export function resolveBurns(system: StarSystem, plan: Plan): Map<string, ResolvedBurn> {
  const model = planTruthModel(plan);
  return resolvedFromBudget(truthBudget(system, plan, model), model);
}

/**
 * `resolveBurns`, or an empty map when the plan does not evaluate (the file is then written
 * without resolved figures: a save never fails for them).
 */
export function resolveBurnsForSave(system: StarSystem, plan: Plan): Map<string, ResolvedBurn> {
  try {
    return resolveBurns(system, plan);
  } catch (e) {
    if (e instanceof InputError || e instanceof SolverError || e instanceof ValidationError) return new Map();
    throw e;
  }
}

const close = (a: number, b: number, abs: number): boolean => Math.abs(a - b) <= Math.max(abs, RESOLVED_TOLERANCE.relative * Math.abs(b));
const f3 = (x: number): string => String(Number(x.toFixed(3)));
const vec = (v: readonly number[]): string => `[${v.map(f3).join(', ')}]`;

/** What differs between a recorded and a recomputed burn, in words (empty: the same within the tolerances). */
function differences(rec: ResolvedBurn, now: ResolvedBurn): string[] {
  const out: string[] = [];
  if (rec.model !== now.model) return [`solved in the ${rec.model} model, the plan's truth model is now ${now.model}`];
  if (rec.frame !== now.frame) out.push(`frame ${rec.frame}, now ${now.frame}`);
  const dvAt = (a: readonly number[], b: readonly number[]) => a.every((x, k) => close(x, b[k], RESOLVED_TOLERANCE.dv));
  if (!dvAt(rec.dvFrame, now.dvFrame)) out.push(`Δv in its frame ${vec(rec.dvFrame)} m/s, now ${vec(now.dvFrame)} m/s`);
  if (!dvAt(rec.dvInertial, now.dvInertial)) out.push(`inertial Δv ${vec(rec.dvInertial)} m/s, now ${vec(now.dvInertial)} m/s`);
  if (!close(rec.dv, now.dv, RESOLVED_TOLERANCE.dv)) out.push(`Δv ${f3(rec.dv)} m/s, now ${f3(now.dv)} m/s`);
  if (!close(rec.tStart, now.tStart, RESOLVED_TOLERANCE.t)) out.push(`start ${f3(rec.tStart)} s, now ${f3(now.tStart)} s`);
  if (!close(rec.tEnd, now.tEnd, RESOLVED_TOLERANCE.t)) out.push(`end ${f3(rec.tEnd)} s, now ${f3(now.tEnd)} s`);
  if (!close(rec.duration, now.duration, RESOLVED_TOLERANCE.t)) out.push(`duration ${f3(rec.duration)} s, now ${f3(now.duration)} s`);
  if (!close(rec.propellantUsed, now.propellantUsed, RESOLVED_TOLERANCE.mass))
    out.push(`propellant ${f3(rec.propellantUsed)} kg, now ${f3(now.propellantUsed)} kg`);
  if (!close(rec.massAfter, now.massAfter, RESOLVED_TOLERANCE.mass)) out.push(`mass after ${f3(rec.massAfter)} kg, now ${f3(now.massAfter)} kg`);
  return out;
}

const STALE = 'are out of date and are not used';

/**
 * Warnings (path `events[k].resolved`) for each burn whose recorded figures the plan no longer
 * gives within RESOLVED_TOLERANCE (see the module comment). Never throws for the plan's sake: a
 * plan that does not evaluate gives one warning per recorded burn saying so.
 */
export function staleResolvedIssues(system: StarSystem, plan: Plan, recorded: ResolvedBurns): ValidationIssue[] {
  if (recorded.size === 0) return [];
  let now: Map<string, ResolvedBurn> | null = null;
  let why = '';
  try {
    now = resolveBurns(system, plan);
  } catch (e) {
    if (!(e instanceof InputError || e instanceof SolverError || e instanceof ValidationError)) throw e;
    why = e.message;
  }
  const out: ValidationIssue[] = [];
  plan.events.forEach((ev, k) => {
    const rec = ev.type === 'burn' ? recorded.get(ev.id) : undefined;
    if (!rec) return;
    const path = `events[${k}].resolved`;
    const fresh = now?.get(ev.id);
    if (!now) out.push({ path, rule: `${STALE} (the plan does not evaluate: ${why})`, severity: 'warning' });
    else if (!fresh) out.push({ path, rule: `${STALE} (the plan no longer solves or reaches this burn)`, severity: 'warning' });
    else {
      const diff = differences(rec, fresh);
      if (diff.length > 0)
        out.push({
          path,
          rule: `${STALE} (${diff.join('; ')}; tolerance 1 mm/s, 1 ms, 1 g)`,
          severity: 'warning',
        });
    }
  });
  return out;
}
