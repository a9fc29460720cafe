import { describe, expect, it } from 'vitest';
import type { Plan, TruthModel } from '../../../core/plan/plan.ts';
import { TRUTH_MODELS, planTruthModel, truthModelLabel } from '../../../core/plan/truthModel.ts';
import { samplePlan } from '../io/planSamples.ts';

describe('truth model', () => {
  it('names the three models the plan setting allows, in the order of the plan file', () => {
    expect(TRUTH_MODELS).toEqual(['conic', 'finite', 'nbody']);
    expect(Object.isFrozen(TRUTH_MODELS)).toBe(true);
  });

  it('a plan that names no truth model is targeted in patched conics', () => {
    const plan: Plan = samplePlan();
    delete plan.truthModel;
    expect(planTruthModel(plan)).toBe('conic');
  });

  it('a plan that names its truth model gets that one', () => {
    for (const m of TRUTH_MODELS) {
      const plan: Plan = { ...samplePlan(), truthModel: m };
      expect(planTruthModel(plan)).toBe(m);
    }
  });

  it('gives each model distinct words for screens', () => {
    const words: Record<TruthModel, string> = {
      conic: 'patched conics',
      finite: 'patched conics, every burn finite',
      nbody: 'n-body',
    };
    for (const m of TRUTH_MODELS) expect(truthModelLabel(m)).toBe(words[m]);
    expect(new Set(TRUTH_MODELS.map(truthModelLabel)).size).toBe(TRUTH_MODELS.length);
  });
});
