/**
 * What the Budget, the target readout and the System view show: the plan flown in its truth model. In patched
 * conics that is the plan's evaluation; in the other models the truth report computed in the
 * worker (analysis/truthStore.ts), with the patched-conic figures beside it as a labelled
 * comparison. Until the first report of a model arrives (or when it failed) the evaluation's
 * figures stand in, and say so.
 */
import type { Budget, Plan, PlanResult, TruthModel } from '../../../core/plan/index.ts';
import { planTruthModel, truthModelLabel } from '../../../core/plan/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import type { TruthGoal } from '../../../core/target/index.ts';
import { truthIsCurrent, type TruthState } from '../analysis/truthStore.ts';
import type { NBodySamples } from './truthTrack.ts';

const DEG = Math.PI / 180;

/** A target goal: one of the target orbit's elements against what the plan asks. */
export interface ReadoutGoal extends TruthGoal {
  /** Which element: the readout's short word for it. */
  kind: 'periapsis' | 'apoapsis' | 'e' | 'i';
}

export interface ReadoutTarget {
  body: string;
  reached: boolean;
  goals: ReadoutGoal[];
  /** Closest approach over the plan (patched conics only), or null. */
  closestApproach: { t: number; altitude: number } | null;
}

export interface Readout {
  /** The model the figures are in. */
  model: TruthModel;
  /** Its words ("n-body"). */
  label: string;
  /** The plan's truth model (differs from `model` while its figures stand in). */
  truthModel: TruthModel;
  truthLabel: string;
  /**
   * 'evaluation': patched conics, the evaluation is the truth; 'truth': the report of the plan as
   * it is; 'stale': a report of an earlier version while a new one is computed; 'pending': none
   * yet, the patched-conic figures stand in; 'failed': the report failed, the patched-conic
   * figures stand in.
   */
  source: 'evaluation' | 'truth' | 'stale' | 'pending' | 'failed';
  budget: Budget;
  target: ReadoutTarget | null;
  /** Each condition that fails, in the core's words (truth reports only). */
  failures: string[];
  notes: string[];
  /** The patched-conic figures as a comparison (truth model not conic), else null. */
  comparison: { label: string; margin: number; reached: boolean | null } | null;
  /** Why the report failed ('failed'), else null. */
  error: string | null;
}

function kindOf(name: string): ReadoutGoal['kind'] {
  if (name.startsWith('apoapsis')) return 'apoapsis';
  if (name.startsWith('eccentricity')) return 'e';
  if (name.startsWith('inclination')) return 'i';
  return 'periapsis';
}

/** The target goals of a patched-conic evaluation, judged as the evaluation judged them (the plan target's tolerances). */
export function conicTarget(plan: Plan, system: StarSystem, result: PlanResult): ReadoutTarget | null {
  const tr = result.target;
  const t = plan.target;
  if (!tr || !t) return null;
  const name = system.bodies[tr.body]?.name ?? t.body;
  const a = tr.achieved;
  const goals: ReadoutGoal[] = [];
  const add = (kind: ReadoutGoal['kind'], label: string, value: number | null, wanted: number, tolerance: number, units: string, unitScale: number) =>
    goals.push({
      kind,
      name: `${label} about ${name}`,
      value,
      wanted,
      tolerance,
      met: value !== null && Math.abs(value - wanted) <= tolerance,
      units,
      unitScale,
    });
  add('periapsis', 'periapsis altitude', a ? a.periapsisAltitude : null, t.periapsisAltitude, t.tolerance.periapsisAltitude, 'km', 1000);
  if (t.apoapsisAltitude !== null)
    add('apoapsis', 'apoapsis altitude', a ? a.apoapsisAltitude : null, t.apoapsisAltitude, t.tolerance.periapsisAltitude, 'km', 1000);
  if (t.e !== null) add('e', 'eccentricity', a ? a.e : null, t.e, t.tolerance.e, '', 1);
  if (t.i !== null) add('i', 'inclination', a ? a.i : null, t.i, t.tolerance.i, '°', DEG);
  const ca = tr.closestApproach;
  return { body: name, reached: tr.reached, goals, closestApproach: ca ? { t: ca.t, altitude: ca.altitude } : null };
}

/** The readout of the plan (see the module comment); `evaluation` is the plan's patched-conic result. */
export function readout(plan: Plan, system: StarSystem, evaluation: PlanResult, truth: TruthState): Readout {
  const truthModel = planTruthModel(plan);
  const conic: Readout = {
    model: 'conic',
    label: truthModelLabel('conic'),
    truthModel,
    truthLabel: truthModelLabel(truthModel),
    source: 'evaluation',
    budget: evaluation.budget,
    target: conicTarget(plan, system, evaluation),
    failures: [],
    notes: [],
    comparison: null,
    error: null,
  };
  if (truthModel === 'conic') return conic;
  const comparison = { label: truthModelLabel('conic'), margin: evaluation.budget.margin, reached: evaluation.target ? evaluation.target.reached : null };
  const r = truth.report;
  const failed = truth.error !== null && !truth.pending;
  if (!r || r.model !== truthModel || truth.generation !== truth.docGeneration || (failed && !truthIsCurrent(truth))) {
    return { ...conic, truthModel, source: failed ? 'failed' : 'pending', error: failed ? truth.error : null, comparison: null };
  }
  const k = plan.target ? system.bodies.findIndex((b) => b.id === plan.target?.body) : -1;
  const target: ReadoutTarget | null = plan.target
    ? {
        body: k >= 0 ? system.bodies[k].name : plan.target.body,
        reached: r.reached,
        goals: r.goals.map((g) => ({ ...g, kind: kindOf(g.name) })),
        closestApproach: null,
      }
    : null;
  return {
    model: r.model,
    label: r.label,
    truthModel,
    truthLabel: truthModelLabel(truthModel),
    source: truthIsCurrent(truth) ? 'truth' : 'stale',
    budget: r.budget,
    target,
    failures: r.failures,
    notes: r.notes,
    comparison,
    error: null,
  };
}

/** What the System view draws: the plan's path in its truth model as the main path, the patched-conic path as the comparison. */
export interface ViewPaths {
  /** The patched-conic result the scene draws with its burn markers (the ship follows it when there is no track). */
  result: PlanResult | null;
  /** `result`'s path is drawn as the comparison (n-body truth: the track is the main path). */
  resultIsComparison: boolean;
  /** Another patched-conic flight drawn faint as the comparison (finite truth: the plan's own evaluation). */
  comparison: PlanResult | null;
  /** The n-body flight (n-body truth), relative to the star; the main path. */
  track: NBodySamples | null;
  /** Words of the main path's model. */
  label: string;
  /** Words of the comparison, or null. */
  comparisonLabel: string | null;
}

/** The paths of the plan in its truth model (the last report of that model, even while a newer one is computed). */
export function viewPaths(plan: Plan, evaluation: PlanResult | null, truth: TruthState): ViewPaths {
  const model = planTruthModel(plan);
  const conic: ViewPaths = {
    result: evaluation,
    resultIsComparison: false,
    comparison: null,
    track: null,
    label: truthModelLabel('conic'),
    comparisonLabel: null,
  };
  const r = truth.report;
  if (model === 'conic' || !r || r.model !== model || truth.generation !== truth.docGeneration) return conic;
  const comparisonLabel = truthModelLabel('conic');
  if (model === 'finite') return { ...conic, result: r.conic, comparison: evaluation, label: r.label, comparisonLabel };
  const track = r.nbody?.samples ?? null;
  if (!track) return conic;
  return { ...conic, resultIsComparison: true, track, label: r.label, comparisonLabel };
}
