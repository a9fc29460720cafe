import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../../core/conic/evaluate.ts';
import { parsePlanFile } from '../../../../core/io/planFile.ts';
import { parseSystemFile } from '../../../../core/io/systemFile.ts';
import { truthReport } from '../../../../core/target/index.ts';
import type { TruthState } from '../../../../app/renderer/analysis/truthStore.ts';
import { conicTarget, readout, viewPaths } from '../../../../app/renderer/target/readout.ts';

const root = new URL('../../../../', import.meta.url);
const system = parseSystemFile(readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8')).system;
const demo = parsePlanFile(readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8')).plan;

const state = (patch: Partial<TruthState>): TruthState => ({
  model: 'conic',
  report: null,
  revision: -1,
  generation: -1,
  pending: false,
  progress: 0,
  ms: 0,
  refreshMs: 0,
  error: null,
  docRevision: 3,
  docGeneration: 1,
  ...patch,
});

describe('the readout of the plan in its truth model', () => {
  it('in patched conics is the evaluation, judged goal by goal as the core judges the plan in that model', () => {
    const result = evaluate(system, demo);
    const r = readout(demo, system, result, state({}));
    expect(r.source).toBe('evaluation');
    expect(r.model).toBe('conic');
    expect(r.budget).toBe(result.budget);
    expect(r.comparison).toBeNull();
    // core/target truthReport reads the same plan in the same model by its own path
    const core = truthReport(system, demo, { model: 'conic', samples: false });
    expect(r.target?.reached).toBe(core.reached);
    expect(r.target?.goals.map((g) => [g.name, g.met, g.units])).toEqual(core.goals.map((g) => [g.name, g.met, g.units]));
    for (const [k, g] of r.target!.goals.entries()) {
      expect(g.value).toBeCloseTo(core.goals[k].value!, 6);
      expect(g.wanted).toBe(core.goals[k].wanted);
      expect(g.tolerance).toBe(core.goals[k].tolerance);
    }
    expect(r.target?.goals.map((g) => g.kind)).toEqual(['periapsis', 'apoapsis', 'i'].slice(0, r.target!.goals.length));
  });

  it('in another model shows its report, with the patched-conic figures as a labelled comparison', () => {
    const plan = { ...demo, truthModel: 'finite' as const };
    const result = evaluate(system, plan);
    const report = truthReport(system, plan, { samples: false });
    const r = readout(plan, system, result, state({ model: 'finite', report, revision: 3, generation: 1 }));
    expect(r.source).toBe('truth');
    expect(r.label).toBe('patched conics, every burn finite');
    expect(r.budget).toBe(report.budget);
    expect(r.target?.reached).toBe(report.reached);
    expect(r.failures).toBe(report.failures);
    expect(r.comparison).toEqual({ label: 'patched conics', margin: result.budget.margin, reached: result.target!.reached });
    // the finite flight of the impulsive demo burns misses and costs more: the two readouts differ
    expect(r.budget.margin).not.toBe(result.budget.margin);
  });

  it('says where its figures come from while the report is missing, stale or failed', () => {
    const plan = { ...demo, truthModel: 'nbody' as const };
    const result = evaluate(system, plan);
    const pending = readout(plan, system, result, state({ model: 'nbody', pending: true }));
    expect(pending.source).toBe('pending');
    expect(pending.model).toBe('conic');
    expect(pending.truthLabel).toBe('n-body');
    expect(pending.budget).toBe(result.budget);
    const failed = readout(plan, system, result, state({ model: 'nbody', error: 'n-body flight: step-budget: …' }));
    expect(failed.source).toBe('failed');
    expect(failed.error).toMatch(/step-budget/);
    const finite = truthReport(system, { ...demo, truthModel: 'finite' }, { samples: false });
    // a report of another model says nothing about this one
    expect(readout(plan, system, result, state({ model: 'nbody', report: finite, revision: 3, generation: 1 })).source).toBe('pending');
    const old = { ...finite, model: 'nbody' as const };
    expect(readout(plan, system, result, state({ model: 'nbody', report: old, revision: 2, generation: 1, pending: true })).source).toBe('stale');
  });

  it('has no target readout for a plan without a target', () => {
    const plan = { ...demo, target: null };
    expect(conicTarget(plan, system, evaluate(system, plan))).toBeNull();
  });
});

describe('the paths the System view draws', () => {
  it('in patched conics: the evaluation, nothing else', () => {
    const result = evaluate(system, demo);
    const v = viewPaths(demo, result, state({}));
    expect(v).toMatchObject({ result, resultIsComparison: false, comparison: null, track: null, comparisonLabel: null });
  });

  it('with every burn finite: the finite flight as the path, the plan’s evaluation as the comparison', () => {
    const plan = { ...demo, truthModel: 'finite' as const };
    const result = evaluate(system, plan);
    const report = truthReport(system, plan);
    const v = viewPaths(plan, result, state({ model: 'finite', report, revision: 3, generation: 1 }));
    expect(v.result).toBe(report.conic);
    expect(v.comparison).toBe(result);
    expect(v.label).toBe('patched conics, every burn finite');
    expect(v.comparisonLabel).toBe('patched conics');
    // before its report: the evaluation alone
    expect(viewPaths(plan, result, state({ model: 'finite', pending: true })).comparison).toBeNull();
  });

  it('in n-body: the n-body flight as the path, the evaluation drawn as the comparison', () => {
    const plan = { ...demo, truthModel: 'nbody' as const };
    const result = evaluate(system, plan);
    const report = truthReport(system, plan);
    const v = viewPaths(plan, result, state({ model: 'nbody', report, revision: 2, generation: 1, pending: true }));
    expect(v.track).toBe(report.nbody!.samples);
    expect(v.result).toBe(result);
    expect(v.resultIsComparison).toBe(true);
    expect(v.label).toBe('n-body');
  });
});
