import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../../core/conic/evaluate.ts';
import { chooseTo, defaultRouteForm, readRouteForm } from '../../../../app/renderer/route/routeForm.ts';
import { routeSummary } from '../../../../app/renderer/route/routeSummary.ts';
import { Session, type Question } from '../../../../app/renderer/state/session.ts';
import { UNTITLED } from '../../../../app/renderer/state/document.ts';
import { fakeHost } from '../state/fakeHost.ts';
import { inThreadWorker, type TestWorker } from './inThreadWorker.ts';

const root = new URL('../../../../', import.meta.url);
const systemText = readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8');
const demoText = readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8');

async function session(worker: () => TestWorker = inThreadWorker, ask: (q: Question) => Promise<string> = async () => 'cancel') {
  return Session.create({
    host: fakeHost(),
    evaluate: (s, p) => evaluate(s, p),
    bundledSystems: { 'ilmar.system.json': systemText },
    demo: { name: 'tessel-to-ochre.plan.json', text: demoText },
    ask,
    autosaveMs: 0,
    analysisWorker: worker,
    truthDebounceMs: 0,
  });
}

/**
 * The form's intent for Tessel 300 km to Skerry 500 km over the default range, from the open plan
 * with its two stages' tanks filled to 300 t and 40 t (the demo ship carries about 6.5 km/s; the
 * trip takes about twice that).
 */
function skerryIntent(s: Session) {
  const { system } = s.doc.get();
  const demo = s.doc.get().plan;
  const plan = { ...demo, vehicle: { ...demo.vehicle, stages: demo.vehicle.stages.map((st, k) => ({ ...st, propellantMass: [300_000, 40_000][k] })) } };
  const r = readRouteForm(system, plan, {
    ...chooseTo(system, defaultRouteForm(system, plan), 'skerry'),
    fromAltitude: '300',
    periapsis: '500',
    truthModel: 'conic',
  });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.intent;
}

describe('planning a route from the app (in the analysis worker)', () => {
  it("the menu's New plan from a route opens the route panel for a new plan and changes nothing else", async () => {
    const s = await session();
    const before = s.doc.get();
    expect(s.route.get().open).toBe(false);
    await s.command({ command: 'new-from-route' });
    expect(s.route.get().open).toBe(true);
    expect(s.route.get().use).toBe('new');
    expect(s.doc.get().revision).toBe(before.revision);
    s.route.hide();
    expect(s.route.get().open).toBe(false);
  });

  it('a refused intent comes back across the worker at the form field, in its words', async () => {
    const s = await session();
    const intent = skerryIntent(s);
    s.route.show();
    // below Skerry's safe altitude: the form would refuse it; the route builder refuses it too
    await s.route.propose({ ...intent, to: { ...intent.to, periapsisAltitude: 1000 } });
    const r = s.route.get();
    expect(r.running).toBe(false);
    expect(r.result).toBeNull();
    expect(r.error?.field).toBe('periapsis');
    expect(r.error?.message).toMatch(/^Periapsis altitude must be at least/);
    expect(r.error?.message).toMatch(/Skerry/);
    expect(r.error?.message).not.toMatch(/NaN/);
    expect(r.open).toBe(true);
  });

  it('Discard while running cancels the job (the worker is stopped) and leaves the plan as it was', async () => {
    let worker: TestWorker | null = null;
    const s = await session(() => (worker = inThreadWorker()));
    const before = s.doc.get();
    const run = s.route.propose(skerryIntent(s));
    expect(s.route.get().running).toBe(true);
    s.route.discard();
    await run;
    const r = s.route.get();
    expect(r.running).toBe(false);
    expect(r.open).toBe(false);
    expect(r.result).toBeNull();
    expect(worker!.terminated).toBeGreaterThan(0);
    expect(s.doc.get().revision).toBe(before.revision);
    expect(await s.route.use()).toBe(false);
  });

  it("proposes Tessel 300 km to Skerry 500 km; from the Plan screen, Use replaces the open document's plan as one undoable edit", async () => {
    const s = await session();
    const before = s.doc.get();
    s.route.show('replace');
    const notes: string[] = [];
    const unsubscribe = s.route.subscribe((x) => {
      if (x.note && notes[notes.length - 1] !== x.note) notes.push(x.note);
    });
    const intent = skerryIntent(s);
    await s.route.propose(intent);
    unsubscribe();
    const r = s.route.get();
    expect(r.error).toBeNull();
    const result = r.result!;
    expect(notes.length).toBeGreaterThan(0);
    // the hops chain Tessel to Skerry through the body tree, each departing within the range and after the one before
    expect(result.hops[0].from).toBe('tessel');
    expect(result.hops[result.hops.length - 1].to).toBe('skerry');
    for (const [k, h] of result.hops.entries()) {
      expect(h.arrive).toBeGreaterThan(h.depart);
      if (k > 0) expect(h.from).toBe(result.hops[k - 1].to);
    }
    expect(result.hops[0].depart).toBeGreaterThanOrEqual(intent.departAfter);
    expect(result.hops[0].depart).toBeLessThanOrEqual(intent.departBefore);
    // the summary in words: names, calendar dates, no NaN
    const summary = routeSummary(s.doc.get().system, result, 'patched conics');
    expect(summary.hops.map((h) => h.from)[0]).toBe('Tessel');
    expect(summary.hops[summary.hops.length - 1].to).toBe('Skerry');
    expect(JSON.stringify(summary)).not.toMatch(/NaN|undefined/);
    expect(summary.met).toBe(result.target.status === 'met');

    expect(await s.route.use()).toBe(true);
    const after = s.doc.get();
    expect(after.plan).toEqual(result.plan);
    // the same document: its file and generation stay
    expect(after.file).toEqual(before.file);
    expect(after.generation).toBe(before.generation);
    expect(after.revision).not.toBe(before.revision);
    expect(after.undoLabel).toMatch(/^Plan a route/);
    expect(s.route.get().open).toBe(false);
    expect(s.route.get().result).toBeNull();
    // one edit: one undo brings the previous plan back
    s.undo();
    expect(s.doc.get().plan).toEqual(before.plan);
    expect(s.doc.get().canUndo).toBe(false);
  }, 120_000);

  it('from File › New plan from a route, Use opens the plan as a new untitled document, asking about unsaved changes first', async () => {
    const questions: Question[] = [];
    let answer = 'cancel';
    const s = await session(inThreadWorker, async (q) => {
      questions.push(q);
      return answer;
    });
    // unsaved changes in the open plan
    expect(s.doc.edit('rename', (p) => ({ ...p, name: 'Edited demo' }))).toBeNull();
    const before = s.doc.get();
    expect(before.dirty).toBe(true);
    expect(before.file?.name).toBe('tessel-to-ochre.plan.json');
    await s.command({ command: 'new-from-route' });
    await s.route.propose(skerryIntent(s));
    const result = s.route.get().result!;
    expect(s.route.get().error).toBeNull();

    // the user cancels the question: the open document and the route on offer stay
    expect(await s.route.use()).toBe(false);
    expect(questions.map((q) => q.title)).toEqual(['Unsaved changes']);
    expect(questions[0].message).toMatch(/^tessel-to-ochre\.plan\.json has unsaved changes/);
    expect(s.doc.get().generation).toBe(before.generation);
    expect(s.doc.get().revision).toBe(before.revision);
    expect(s.doc.get().plan.name).toBe('Edited demo');
    expect(s.route.get().open).toBe(true);
    expect(s.route.get().result).toBe(result);
    expect(s.route.get().using).toBe(false);

    // the user discards the changes: a new untitled document holds the route's plan
    answer = 'discard';
    expect(await s.route.use()).toBe(true);
    expect(questions.length).toBe(2);
    const after = s.doc.get();
    expect(after.file).toBeNull();
    expect(after.name).toBe(UNTITLED);
    expect(after.generation).not.toBe(before.generation);
    expect(after.plan).toEqual(result.plan);
    expect(after.system).toBe(before.system);
    expect(after.systemRef).toEqual(before.systemRef);
    // unsaved work, nothing to undo into the old document
    expect(after.dirty).toBe(true);
    expect(after.canUndo).toBe(false);
    expect(s.route.get().open).toBe(false);
    expect(s.route.get().result).toBeNull();
  }, 120_000);
});
