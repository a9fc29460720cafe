/**
 * The Budget's flags of the plan in its truth model. In patched conics they are the evaluation's
 * flags. In another model the plan's problems are the truth report's failures (every condition that
 * fails in that model, in the core's words) and its own warnings; what the patched-conic path alone
 * says (a missed target, an impact or an atmosphere entry of a flight that is not the plan's in
 * its model) is never the plan's error: it is listed under the labelled comparison.
 */
import type { Flag, PlanResult } from '../../../core/plan/index.ts';
import { truthModelLabel } from '../../../core/plan/index.ts';
import type { TruthReport } from '../../../core/target/index.ts';
import type { Readout } from './readout.ts';

/** Flags that describe the path of a patched-conic flight, not the burn schedule or the budget. */
export const PATH_FLAGS: ReadonlySet<Flag['code']> = new Set<Flag['code']>(['target-missed', 'impact', 'atmosphere-entry']);

export interface PlanFlags {
  /** Words of the model the plan's flags are in. */
  label: string;
  /** Conditions that fail in that model (shown as errors), in words. */
  problems: string[];
  /** The plan's flags in that model (patched conics: every flag of the evaluation; else the warnings and notes). */
  flags: Flag[];
  /** Flags of the patched-conic flight shown as the comparison (muted), or null. */
  comparison: { label: string; flags: Flag[] } | null;
}

/** Flags of the schedule's burns that the patched-conic reading of an n-body report never reached. */
function unflownBurnFlags(report: TruthReport): Flag[] {
  const flown = new Set(report.conic.budget.rows.map((r) => r.planEventId));
  return report.budget.rows.filter((r) => !flown.has(r.planEventId)).flatMap((r) => r.flags);
}

const same = (a: Flag, b: Flag) => a.code === b.code && a.message === b.message;

/**
 * The flags of the plan as the Budget shows them: `ro` is its readout (target/readout.ts),
 * `evaluation` its patched-conic result and `report` the truth report the readout was made from
 * (the readout's source 'truth' or 'stale'), else null.
 */
export function planFlags(ro: Pick<Readout, 'truthModel' | 'source'>, evaluation: Pick<PlanResult, 'flags'>, report: TruthReport | null): PlanFlags {
  if (ro.truthModel === 'conic') return { label: truthModelLabel('conic'), problems: [], flags: evaluation.flags, comparison: null };
  const comparisonLabel = truthModelLabel('conic');
  const fromTruth = (ro.source === 'truth' || ro.source === 'stale') && report !== null && report.model === ro.truthModel;
  if (!fromTruth) {
    // the model's flight is not there yet (or failed): the schedule's flags stand in, the path's are a comparison
    const path = evaluation.flags.filter((f) => PATH_FLAGS.has(f.code));
    return {
      label: comparisonLabel,
      problems: [],
      flags: evaluation.flags.filter((f) => !PATH_FLAGS.has(f.code)),
      comparison: path.length > 0 ? { label: comparisonLabel, flags: path } : null,
    };
  }
  // finite burns: the report's flight is the plan's in its model, every flag its own; n-body: the
  // schedule's patched-conic flight is a comparison, its path flags are not the plan's; the burns it
  // never reached (it ended early) flag from the schedule's own budget (core/target scheduleBudget)
  const later = report.model === 'nbody' ? unflownBurnFlags(report) : [];
  const own = report.model === 'finite' ? report.conic.flags : [...report.conic.flags.filter((f) => !PATH_FLAGS.has(f.code)), ...later];
  const rest = evaluation.flags.filter((f) => !own.some((o) => same(o, f)));
  return {
    label: report.label,
    problems: report.failures,
    flags: own.filter((f) => f.severity !== 'error'),
    comparison: rest.length > 0 ? { label: comparisonLabel, flags: rest } : null,
  };
}
