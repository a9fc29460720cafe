/**
 * The plan's truth model: the model its burns are targeted in and its readouts show
 * (see `TruthModel` in plan.ts), with its default and the words screens use for it.
 */
import type { Plan, TruthModel } from './plan.ts';

/** The truth models, in order of fidelity. */
export const TRUTH_MODELS: readonly TruthModel[] = Object.freeze(['conic', 'finite', 'nbody'] as const);

/** The plan's truth model; a plan that names none is targeted in patched conics ('conic'). */
export function planTruthModel(plan: Plan): TruthModel {
  return plan.truthModel ?? 'conic';
}

const LABELS: Readonly<Record<TruthModel, string>> = {
  conic: 'patched conics',
  finite: 'patched conics, every burn finite',
  nbody: 'n-body',
};

/** The words a screen shows for a truth model. */
export function truthModelLabel(model: TruthModel): string {
  return LABELS[model];
}
