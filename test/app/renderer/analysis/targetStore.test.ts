import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../../core/conic/evaluate.ts';
import { targetIsApplied, targetIsCurrent } from '../../../../app/renderer/analysis/targetStore.ts';
import * as edits from '../../../../app/renderer/plan/edits.ts';
import { Session } from '../../../../app/renderer/state/session.ts';
import { fakeHost } from '../state/fakeHost.ts';
import { inThreadWorker, type TestWorker } from './inThreadWorker.ts';

const root = new URL('../../../../', import.meta.url);
const systemText = readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8');
const demoText = readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8');

async function session(worker: () => TestWorker = inThreadWorker) {
  return Session.create({
    host: fakeHost(),
    evaluate: (s, p) => evaluate(s, p),
    bundledSystems: { 'ilmar.system.json': systemText },
    demo: { name: 'tessel-to-ochre.plan.json', text: demoText },
    ask: async () => 'cancel',
    autosaveMs: 0,
    analysisWorker: worker,
    truthDebounceMs: 0,
  });
}

describe('targeting the plan from the app (in the analysis worker)', () => {
  it('targets the demo with every burn finite: the residual falls leg by leg, and the result applies as one undoable edit', async () => {
    const s = await session();
    const before = s.doc.get().plan;
    await s.targeting.run('finite');
    const t = s.targeting.get();
    expect(t.running).toBeNull();
    expect(t.error).toBeNull();
    const r = t.result!;
    // whether every goal is met in this model is the core's business (test/core/target); here, that its report comes through whole
    expect(r.status).toBe(r.legs.every((l) => l.status === 'converged') ? 'met' : 'not-met');
    expect(r.model).toBe('finite');
    expect(targetIsCurrent(t)).toBe(true);
    // the live series: per leg, each point lower than the one before; every leg seen
    expect(new Set(t.series.map((p) => p.leg))).toEqual(new Set(r.legs.map((_, k) => k + 1)));
    for (let k = 1; k < t.series.length; k++) {
      if (t.series[k].leg === t.series[k - 1].leg) expect(t.series[k].residual).toBeLessThan(t.series[k - 1].residual);
      expect(t.series[k].flights).toBeGreaterThan(t.series[k - 1].flights);
    }
    // a leg met ends with its last point within the goals' tolerances (a norm of at most √goals);
    // the chart's last point of a leg is the targeter's best, at or below its last accepted step
    for (const [k, leg] of r.legs.entries()) {
      const last = t.series.filter((p) => p.leg === k + 1).pop()!;
      if (leg.status === 'converged') expect(last.residual).toBeLessThanOrEqual(Math.sqrt(leg.goals.length));
      if (leg.residuals.length) expect(last.residual).toBeLessThanOrEqual(leg.residuals[leg.residuals.length - 1] * (1 + 1e-12));
    }
    expect(t.last?.legs).toBe(r.legs.length);

    expect(s.targeting.apply()).toBe(true);
    const applied = s.doc.get();
    expect(applied.plan).toEqual(r.plan);
    expect(applied.plan.truthModel).toBe('finite');
    expect(applied.undoLabel).toBe('Target the plan (patched conics, every burn finite)');
    expect(targetIsApplied(s.targeting.get())).toBe(true);
    expect(targetIsCurrent(s.targeting.get())).toBe(false); // the plan is now the result: nothing more to apply
    expect(s.targeting.apply()).toBe(false);
    s.undo();
    expect(s.doc.get().plan).toBe(before);
    expect(targetIsApplied(s.targeting.get())).toBe(false);
  });

  it('a result goes stale after another edit and cannot be applied', async () => {
    const s = await session();
    await s.targeting.run('conic');
    expect(targetIsCurrent(s.targeting.get())).toBe(true);
    s.doc.edit('Edit reserve', (p) => edits.setReserve(p, { percent: 7 }));
    expect(targetIsCurrent(s.targeting.get())).toBe(false);
    const plan = s.doc.get().plan;
    expect(s.targeting.apply()).toBe(false);
    expect(s.doc.get().plan).toBe(plan);
  });

  it('cancel stops the worker and leaves no result', async () => {
    const silent = (): TestWorker => {
      const w = inThreadWorker();
      w.postMessage = (m) => void w.jobs.push(m); // never answers
      return w;
    };
    let made: TestWorker | null = null;
    const s = await session(() => {
      made = silent();
      return made;
    });
    const run = s.targeting.run('nbody');
    expect(s.targeting.get().running).toBe('nbody');
    s.targeting.cancel();
    await run;
    const t = s.targeting.get();
    expect(t.running).toBeNull();
    expect(t.cancelled).toBe(true);
    expect(t.result).toBeNull();
    expect(made!.terminated).toBe(1);
    expect(made!.jobs[0].job.kind).toBe('target');
  });

  it('reports the core’s words when the plan cannot be targeted', async () => {
    const s = await session();
    // no burns: nothing to target with
    s.doc.edit('Delete every event', (p) => ({ ...p, events: [] }));
    await s.targeting.run('conic');
    const t = s.targeting.get();
    expect(t.result).toBeNull();
    expect(t.error).toMatch(/at least one burn/);
  });

  it('another document drops the result', async () => {
    const s = await session();
    await s.targeting.run('conic');
    expect(s.targeting.get().result).not.toBeNull();
    await s.newPlan();
    expect(s.targeting.get().result).toBeNull();
  });
});
