import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../../core/conic/evaluate.ts';
import { AnalysisClient, type AnalysisWorkerLike } from '../../../../app/renderer/analysis/client.ts';
import { methodGroups, methodSummary } from '../../../../app/renderer/analysis/methods.ts';
import type { FromAnalysisWorker, ToAnalysisWorker } from '../../../../app/renderer/analysis/protocol.ts';
import { runAnalysisJob } from '../../../../app/renderer/analysis/runJob.ts';
import { isCurrent } from '../../../../app/renderer/analysis/store.ts';
import * as edits from '../../../../app/renderer/plan/edits.ts';
import { Session } from '../../../../app/renderer/state/session.ts';
import { fakeHost } from '../state/fakeHost.ts';

const root = new URL('../../../../', import.meta.url);
const systemText = readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8');
const demoText = readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8');

/** A "worker" that runs the job in this thread (asynchronously, as a real one would answer). */
function inThreadWorker(): AnalysisWorkerLike & { terminated: number } {
  const w: AnalysisWorkerLike & { terminated: number } = {
    onmessage: null,
    terminated: 0,
    postMessage(m: ToAnalysisWorker) {
      setTimeout(() => {
        const send = (x: FromAnalysisWorker) => w.onmessage?.({ data: x } as MessageEvent<FromAnalysisWorker>);
        try {
          const output = runAnalysisJob(m.job, (fraction, note) => send({ type: 'progress', id: m.id, fraction, note }));
          send({ type: 'done', id: m.id, output, ms: 1 });
        } catch (e) {
          send({ type: 'error', id: m.id, message: (e as Error).message });
        }
      }, 0);
    },
    terminate() {
      w.terminated++;
    },
  };
  return w;
}

async function session() {
  return Session.create({
    host: fakeHost(),
    evaluate: (s, p) => evaluate(s, p),
    bundledSystems: { 'ilmar.system.json': systemText },
    demo: { name: 'tessel-to-ochre.plan.json', text: demoText },
    ask: async () => 'cancel',
    autosaveMs: 0,
    analysisWorker: inThreadWorker,
  });
}

describe('on-demand analyses of the plan (n-body, correction, dispersion)', () => {
  it('verifies in n-body gravity, with the methods that flew each span, and goes stale on an edit', async () => {
    const s = await session();
    await s.analysis.run('verify');
    const a = s.analysis.get();
    expect(a.running).toBeNull();
    expect(a.verify.value?.model).toBe('nbody');
    expect(a.verify.value!.spans.length).toBeGreaterThan(0);
    expect(isCurrent(a, a.verify)).toBe(true);
    expect(methodSummary(a.verify.value!.spans)).toMatch(/DOP853/);
    s.doc.edit('Edit reserve', (p) => edits.setReserve(p, { percent: 7 }));
    expect(isCurrent(s.analysis.get(), s.analysis.get().verify)).toBe(false);
  });

  it('corrects the mid-course burn and the corrected plan can be applied as one undoable edit', async () => {
    const s = await session();
    await s.analysis.run('correct');
    const c = s.analysis.get().correct.value!;
    expect(c.burns.map((b) => b.planEventId)).toEqual(['mid-course']);
    const before = s.doc.get().plan;
    s.doc.edit('Apply n-body correction', () => structuredClone(c.plan));
    expect(s.doc.get().plan).toEqual(c.plan);
    s.undo();
    expect(s.doc.get().plan).toBe(before);
  });

  it('runs a dispersion and reports the chance the margin holds', async () => {
    const s = await session();
    await s.analysis.run('disperse', { samples: 40, magnitudeSigma: 0.5, pointingSigma: 0.2 });
    const d = s.analysis.get().disperse.value!;
    expect(d.samples).toBe(40);
    expect(d.pMarginHolds).toBeGreaterThanOrEqual(0);
    expect(d.pMarginHolds).toBeLessThanOrEqual(1);
  });

  it('a cancel terminates the worker and resolves the job as cancelled', async () => {
    const w = inThreadWorker();
    w.postMessage = () => undefined; // never answers
    const c = new AnalysisClient(() => w);
    const p = c.run({ kind: 'correct', system: null as never, plan: null as never }, () => undefined);
    c.cancel();
    await expect(p).resolves.toBeNull();
    expect(w.terminated).toBe(1);
  });

  it('groups flown spans by method and reason', () => {
    const st = { steps: 0, rejected: 0, fevals: 0, accepted: 0 } as never;
    const g = methodGroups([
      { t0: 0, t1: 10, method: 'rk45', reason: 'default', stats: st },
      { t0: 10, t1: 20, method: 'yoshida4', reason: 'long coast: 40 revolutions > 20', stats: st },
      { t0: 20, t1: 50, method: 'rk45', reason: 'default', stats: st },
      { t0: 50, t1: 60, method: 'yoshida4', reason: 'long coast: 55 revolutions > 20', stats: st },
    ]);
    expect(g.map((x) => [x.method, x.spans, x.seconds, x.fallback])).toEqual([
      ['rk45', 2, 40, false],
      ['yoshida4', 2, 20, true],
    ]);
  });
});
