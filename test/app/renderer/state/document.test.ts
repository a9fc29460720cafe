import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parsePlanFile } from '../../../../core/io/planFile.ts';
import { parseSystemFile } from '../../../../core/io/systemFile.ts';
import { PlanDocumentStore } from '../../../../app/renderer/state/document.ts';
import { planIssues } from '../../../../app/renderer/state/session.ts';
import * as edits from '../../../../app/renderer/plan/edits.ts';

const root = new URL('../../../../', import.meta.url);
const system = parseSystemFile(readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8')).system;
const parsed = parsePlanFile(readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8'));

function store() {
  return new PlanDocumentStore({ plan: parsed.plan, system, systemRef: parsed.system, file: { name: 'd.plan.json', path: null, handle: null } }, planIssues);
}

describe('document store', () => {
  it('tracks unsaved changes by revision, so undoing back to the saved state is clean', () => {
    const d = store();
    d.edit('a', (p) => edits.setReserve(p, { percent: 9 }));
    d.edit('b', (p) => edits.setReserve(p, { percent: 10 }));
    expect(d.get().dirty).toBe(true);
    d.markSaved({ name: 'd.plan.json', path: null, handle: null });
    expect(d.get().dirty).toBe(false);
    d.undo();
    expect(d.get().dirty).toBe(true);
    d.redo();
    expect(d.get().dirty).toBe(false);
  });

  it('ignores edits that change nothing', () => {
    const d = store();
    const r = d.get().revision;
    d.edit('noop', (p) => edits.moveEvent(p, 'no-such-id', 1));
    expect(d.get().revision).toBe(r);
    expect(d.get().canUndo).toBe(false);
  });

  it('refuses an edit that would make the plan invalid: no undo step, no change, the rule and field in memory names', () => {
    const d = store();
    const before = d.get();
    const r = d.edit('Edit dry mass', (p) => edits.updateStage(p, 0, { dryMass: -5000 }));
    expect(r?.label).toBe('Edit dry mass');
    expect(r?.issues.map((i) => `${i.path}: ${i.rule}`)).toEqual(['vehicle.stages[0].dryMass: must be >= 0']);
    expect(d.get()).toBe(before); // nothing emitted
    expect(d.get().plan).toBe(before.plan);
    expect(d.get().canUndo).toBe(false);
    expect(d.refused.get()).toBe(r);
    // Every rule of a saved file: schema bounds, semantic checks, the system.
    const refused = (fn: Parameters<typeof d.edit>[1]) => d.edit('x', fn)?.issues.map((i) => i.path);
    expect(refused((p) => edits.updateStage(p, 0, { propellantMass: 1e30 }))).toEqual(['vehicle.stages[0].propellantMass']);
    expect(refused((p) => edits.setStart(p, { ...p.start, epoch: -2e13 }))).toEqual(['start.epoch']);
    expect(refused((p) => edits.setStart(p, { ...(p.start as Extract<typeof p.start, { kind: 'parking' }>), i: 4 * Math.PI }))).toEqual(['start.i']);
    expect(refused((p) => edits.setReserve(p, { percent: 500 }))).toEqual(['reserve.percent']);
    expect(refused((p) => edits.setStart(p, { ...p.start, body: 'nowhere' }))).toEqual(['start.body']);
    expect(refused((p) => edits.updateStage(p, 0, { isp: Number.NaN }))).toEqual(['vehicle.stages[0].isp']);
    expect(d.get().plan).toBe(before.plan);
    // A valid edit goes through and clears nothing else.
    expect(d.edit('ok', (p) => edits.setReserve(p, { percent: 9 }))).toBeNull();
    expect(d.get().plan.reserve.percent).toBe(9);
  });

  it('a plan loaded with problems takes edits that add none, so it can be mended step by step', () => {
    const bad = structuredClone(parsed.plan);
    bad.reserve.percent = 500;
    bad.vehicle.stages[0].isp = -1;
    const d = new PlanDocumentStore({ plan: bad, system, systemRef: parsed.system, file: null }, planIssues, true);
    expect(
      d
        .get()
        .issues.filter((i) => i.severity === 'error')
        .map((i) => i.path),
    ).toEqual(['vehicle.stages[0].isp', 'reserve.percent']);
    expect(d.edit('mend', (p) => edits.setReserve(p, { percent: 5 }))).toBeNull();
    expect(d.edit('worse', (p) => edits.setReserve(p, { absolute: -1 }))).not.toBeNull();
    expect(
      d
        .get()
        .issues.filter((i) => i.severity === 'error')
        .map((i) => i.path),
    ).toEqual(['vehicle.stages[0].isp']);
  });

  it('loading another document resets the history', () => {
    const d = store();
    d.edit('a', (p) => edits.setReserve(p, { percent: 9 }));
    const g = d.get().generation;
    d.load({ plan: parsed.plan, system, systemRef: parsed.system, file: null });
    expect(d.get().canUndo).toBe(false);
    expect(d.get().generation).toBe(g + 1);
    expect(d.get().name).toBe('Untitled plan');
  });
});
