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

  it('reports field-precise issues in memory names', () => {
    const d = store();
    d.edit('bad', (p) => edits.setStart(p, { ...p.start, body: 'nowhere' }));
    expect(d.get().issues.map((i) => i.path)).toContain('start.body');
    d.edit('bad time', (p) => {
      const q = structuredClone(p);
      const first = q.events.find((e) => e.type === 'burn')!;
      if (first.type === 'burn') first.t = -1e12;
      return q;
    });
    expect(d.get().issues.some((i) => /^events\[\d+\]\.t$/.test(i.path))).toBe(true);
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
