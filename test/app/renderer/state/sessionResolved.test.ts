import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../../core/conic/evaluate.ts';
import * as edits from '../../../../app/renderer/plan/edits.ts';
import { Session } from '../../../../app/renderer/state/session.ts';
import { fakeHost } from './fakeHost.ts';

const root = new URL('../../../../', import.meta.url);
const systemText = readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8');
const demoText = readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8');

async function session() {
  const host = fakeHost();
  const s = await Session.create({
    host,
    evaluate: (sys, plan) => evaluate(sys, plan),
    bundledSystems: { 'ilmar.system.json': systemText },
    demo: { name: 'tessel-to-ochre.plan.json', text: demoText },
    ask: async () => 'cancel',
    autosaveMs: 0,
    now: () => 1234,
  });
  return { s, host };
}

type Json = Record<string, any>;

describe('session: the burns as solved, saved beside their settings and checked on open', () => {
  it("a save writes each burn's resolved block: the evaluation's budget row of that burn", async () => {
    const { s, host } = await session();
    s.doc.edit('Edit reserve', (p) => edits.setReserve(p, { percent: 4.5 }));
    expect(await s.save()).toBe(true);
    const doc = JSON.parse(host.files.get('tessel-to-ochre.plan.json')!);
    const rows = s.evaluation.get().result!.budget.rows;
    const burns = (doc.events as Json[]).filter((e) => e.type === 'burn');
    expect(burns.map((b) => b.id)).toEqual(rows.map((r) => r.planEventId));
    burns.forEach((b, k) => {
      expect(b.resolved.model).toBe('conic');
      expect(b.resolved.dv_inertial_mps).toEqual(rows[k].dvInertial);
      expect(b.resolved.t_start_s).toBe(rows[k].tStart);
      expect(b.resolved.mass_after_kg).toBe(rows[k].massAfter);
    });
  });

  it('a file whose saved figures are stale opens with a warning naming the burn; the plan is the file’s', async () => {
    const { s, host } = await session();
    expect(await s.save()).toBe(true);
    const doc = JSON.parse(host.files.get('tessel-to-ochre.plan.json')!);
    const k = (doc.events as Json[]).findIndex((e) => e.type === 'burn');
    doc.events[k].resolved.propellant_kg += 10;
    const ok = await s.openText(JSON.stringify(doc), { name: 'edited.plan.json', path: null, handle: null });
    expect(ok).toBe(true);
    const n = s.notices.get().at(-1)!;
    expect(n.kind).toBe('warning');
    const stale = (n.issues ?? []).filter((i) => i.path === `events[${k}].resolved`);
    expect(stale.length).toBe(1);
    expect((stale[0] as { words?: string }).words).toMatch(
      new RegExp(`^Burn ${k + 1} '${doc.events[k].name}': figures saved with the plan are out of date.*propellant`),
    );
  });
});
