import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../../core/conic/evaluate.ts';
import { truthIsCurrent } from '../../../../app/renderer/analysis/truthStore.ts';
import * as edits from '../../../../app/renderer/plan/edits.ts';
import { Session } from '../../../../app/renderer/state/session.ts';
import { fakeHost } from '../state/fakeHost.ts';
import { inThreadWorker, type TestWorker } from './inThreadWorker.ts';

const root = new URL('../../../../', import.meta.url);
const systemText = readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8');
const demoText = readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8');

async function session() {
  const workers: TestWorker[] = [];
  const s = await Session.create({
    host: fakeHost(),
    evaluate: (sys, p) => evaluate(sys, p),
    bundledSystems: { 'ilmar.system.json': systemText },
    demo: { name: 'tessel-to-ochre.plan.json', text: demoText },
    ask: async () => 'cancel',
    autosaveMs: 0,
    analysisWorker: () => {
      const w = inThreadWorker();
      workers.push(w);
      return w;
    },
    truthDebounceMs: 0,
  });
  return { s, workers };
}

/** Resolves when the truth store has no report pending (bounded by a count of turns, not by time). */
async function settled(s: Session): Promise<void> {
  for (let k = 0; k < 2000 && s.truth.get().pending; k++) await new Promise((r) => setTimeout(r, 1));
}

const truthJobs = (workers: TestWorker[]) => workers.flatMap((w) => w.jobs).filter((j) => j.job.kind === 'truth');

describe('the plan read in its truth model (worker, after edits)', () => {
  it('in patched conics runs nothing: the evaluation is the truth', async () => {
    const { s, workers } = await session();
    s.doc.edit('Edit reserve', (p) => edits.setReserve(p, { percent: 7 }));
    await settled(s);
    expect(s.truth.get().pending).toBe(false);
    expect(s.truth.get().report).toBeNull();
    expect(truthJobs(workers)).toHaveLength(0);
  });

  it('in another model computes a report for each edit, stale in between, and a new truth model drops the old report', async () => {
    const { s, workers } = await session();
    s.doc.edit('Change truth model', (p) => edits.setTruthModel(p, 'finite'));
    expect(s.truth.get().pending).toBe(true);
    await settled(s);
    const a = s.truth.get();
    expect(a.error).toBeNull();
    expect(a.report?.model).toBe('finite');
    expect(truthIsCurrent(a)).toBe(true);
    expect(a.revision).toBe(s.doc.get().revision);
    s.doc.edit('Edit reserve', (p) => edits.setReserve(p, { percent: 7 }));
    // until the new report: the old one, no longer current
    expect(truthIsCurrent(s.truth.get())).toBe(false);
    expect(s.truth.get().report).toBe(a.report);
    await settled(s);
    expect(truthIsCurrent(s.truth.get())).toBe(true);
    expect(s.truth.get().report).not.toBe(a.report);
    s.doc.edit('Change truth model', (p) => edits.setTruthModel(p, 'conic'));
    expect(s.truth.get().report).toBeNull();
    expect(s.truth.get().pending).toBe(false);
    expect(truthJobs(workers).map((j) => (j.job as { model: string }).model)).toEqual(['finite', 'finite']);
  });

  it('an edit while a report is computed cancels it (its worker stops) and asks again', async () => {
    const { s, workers } = await session();
    s.doc.edit('Change truth model', (p) => edits.setTruthModel(p, 'finite'));
    // let the debounce fire and the job reach the worker, then edit before it answers
    for (let k = 0; k < 100 && truthJobs(workers).length === 0; k++) await new Promise((r) => setTimeout(r, 0));
    expect(truthJobs(workers)).toHaveLength(1);
    s.doc.edit('Edit reserve', (p) => edits.setReserve(p, { percent: 7 }));
    expect(workers.reduce((n, w) => n + w.terminated, 0)).toBe(1);
    await settled(s);
    expect(truthIsCurrent(s.truth.get())).toBe(true);
    expect(truthJobs(workers)).toHaveLength(2);
  });

  it('says why, in the core’s words, when the plan cannot be flown in its model', async () => {
    const { s } = await session();
    // The editor refuses an edit to such a plan (it could not be saved and opened again), so it is put in the store directly.
    const d = s.doc.get();
    s.doc.load({ plan: edits.updateStage(edits.setTruthModel(d.plan, 'finite'), 0, { isp: -1 }), system: d.system, systemRef: d.systemRef, file: d.file });
    await settled(s);
    const t = s.truth.get();
    expect(t.report).toBeNull();
    expect(t.error).toMatch(/isp/);
  });
});
