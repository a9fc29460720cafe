/**
 * The evaluation check shared by the file, system and plan fuzz targets: evaluate(system, plan)
 * must return a result whose every number is finite and whose parts are consistent, or throw
 * an InputError naming the field; nothing else may come out.
 */
import { InputError } from '../../core/math/errors.ts';
import { evaluate, type EvaluateOptions } from '../../core/conic/evaluate.ts';
import type { Plan } from '../../core/plan/plan.ts';
import type { PlanResult } from '../../core/plan/result.ts';
import type { StarSystem } from '../../core/system/model.ts';
import { findNonFinite } from './finite.ts';
import { CaseFailure, typedOrFail } from './verdict.ts';

/** Few drawing samples: the fuzz checks the samples are finite, not how many there are. */
export const FUZZ_EVALUATE_OPTIONS: EvaluateOptions = { samplesPerSegment: 4 };

/** Throws CaseFailure when a result breaks a rule of result.ts. */
export function checkResult(system: StarSystem, result: PlanResult): void {
  const bad = findNonFinite(result);
  if (bad.length > 0) throw new CaseFailure('non-finite in result', bad.map((b) => `${b.path} = ${b.value}`).join('; '));
  if (!(result.t1 >= result.t0)) throw new CaseFailure('result times', `t1 ${result.t1} < t0 ${result.t0}`);
  const nb = system.bodies.length;
  for (const [k, s] of result.segments.entries()) {
    if (!(s.t1 >= s.t0)) throw new CaseFailure('segment times', `segments[${k}] t1 ${s.t1} < t0 ${s.t0}`);
    if (!(s.central >= 0 && s.central < nb)) throw new CaseFailure('segment central', `segments[${k}].central = ${s.central}`);
    if (!(s.mass0 >= 0 && s.mass1 >= 0)) throw new CaseFailure('negative mass', `segments[${k}] mass ${s.mass0} → ${s.mass1}`);
    if (s.samples.length !== 3 * s.sampleT.length)
      throw new CaseFailure('segment samples', `segments[${k}] ${s.samples.length} values for ${s.sampleT.length} times`);
  }
  for (let k = 1; k < result.events.length; k++) {
    if (result.events[k].t < result.events[k - 1].t)
      throw new CaseFailure('events out of order', `events[${k}] at ${result.events[k].t} before ${result.events[k - 1].t}`);
  }
  for (const [k, e] of result.events.entries()) {
    if (!(e.central >= 0 && e.central < nb)) throw new CaseFailure('event central', `events[${k}] (${e.kind}).central = ${e.central}`);
    if (typeof e.label !== 'string' || e.label === '') throw new CaseFailure('event label', `events[${k}] has no label`);
  }
  // SOI transitions at one instant: a moon's SOI into its planet's and on into the star's is
  // at most a few; more is the ship bouncing across one boundary (exit, entry, exit ...)
  let same = 0;
  for (let k = 1; k < result.events.length; k++) {
    const a = result.events[k - 1];
    const b = result.events[k];
    const soi = (x: typeof a) => x.kind === 'soi-exit' || x.kind === 'soi-entry';
    same = soi(a) && soi(b) && a.t === b.t ? same + 1 : 0;
    if (same > 4) throw new CaseFailure('soi ping-pong', `more than 5 SOI transitions at t = ${b.t}`);
  }
  for (const f of result.flags) {
    if (typeof f.message !== 'string' || f.message === '') throw new CaseFailure('flag message', `flag ${f.code} has no message`);
  }
  for (const [k, r] of result.budget.rows.entries()) {
    if (!(r.dv >= 0 && r.propellantUsed >= 0 && r.duration >= 0))
      throw new CaseFailure('budget row', `budget.rows[${k}]: dv ${r.dv}, propellant ${r.propellantUsed}, duration ${r.duration}`);
    if (!(r.massAfter <= r.massBefore)) throw new CaseFailure('budget row', `budget.rows[${k}]: mass grows ${r.massBefore} → ${r.massAfter}`);
  }
  if (!(result.budget.finalMass >= 0)) throw new CaseFailure('negative mass', `budget.finalMass = ${result.budget.finalMass}`);
}

/** Evaluates and checks; returns "evaluated" (with the flag codes) or "InputError". */
export function evaluateChecked(system: StarSystem, plan: Plan, options: EvaluateOptions = FUZZ_EVALUATE_OPTIONS): string {
  let result: PlanResult;
  try {
    result = evaluate(system, plan, options);
  } catch (e) {
    const kind = typedOrFail(e, [InputError], 'evaluate');
    return `evaluate: ${kind} (${(e as InputError).field} ${(e as InputError).rule})`;
  }
  checkResult(system, result);
  return result.flags.length === 0 ? 'evaluated' : 'evaluated with flags';
}
