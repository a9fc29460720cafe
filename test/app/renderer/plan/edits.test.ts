import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parsePlanFile } from '../../../../core/io/planFile.ts';
import * as edits from '../../../../app/renderer/plan/edits.ts';
import { fileToMemoryPath, pathWithin } from '../../../../app/renderer/plan/paths.ts';

const plan = parsePlanFile(readFileSync(new URL('../../../../assets/plans/tessel-to-ochre.plan.json', import.meta.url), 'utf8')).plan;
const frozen = structuredClone(plan);

describe('plan edits', () => {
  it('never change their input', () => {
    edits.addEvent(plan, 'burn');
    edits.deleteEvent(plan, plan.events[0].id);
    edits.moveEvent(plan, plan.events[1].id, 1);
    edits.updateStage(plan, 0, { isp: 1 });
    edits.addStage(plan);
    edits.setReserve(plan, { percent: 50 });
    expect(plan).toEqual(frozen);
  });
  it('adds an event after the given one, with a fresh id', () => {
    const next = edits.addEvent(plan, 'burn', 0);
    expect(next.events).toHaveLength(plan.events.length + 1);
    const added = next.events[1];
    expect(added.type).toBe('burn');
    expect(plan.events.some((e) => e.id === added.id)).toBe(false);
  });
  it('moves and deletes by id; out-of-range moves are no-ops', () => {
    const [a, b] = plan.events;
    const moved = edits.moveEvent(plan, a.id, 1);
    expect(moved.events.slice(0, 2).map((e) => e.id)).toEqual([b.id, a.id]);
    expect(edits.moveEvent(plan, a.id, -1)).toBe(plan);
    expect(edits.deleteEvent(plan, a.id).events.map((e) => e.id)).not.toContain(a.id);
  });
  it('replaces an event keeping its id', () => {
    const ev = { ...plan.events[0], id: 'other', name: 'Renamed' };
    const next = edits.replaceEvent(plan, plan.events[0].id, ev);
    expect(next.events[0]).toMatchObject({ id: plan.events[0].id, name: 'Renamed' });
  });
  it('edits and reorders stages', () => {
    const next = edits.moveStage(plan, 0, 1);
    expect(next.vehicle.stages.map((s) => s.name)).toEqual([...plan.vehicle.stages].reverse().map((s) => s.name));
    expect(edits.removeStage(plan, 1).vehicle.stages).toHaveLength(plan.vehicle.stages.length - 1);
  });
  it('sets the truth model; the model the plan already has is a no-op (no undo step)', () => {
    expect(plan.truthModel).toBeUndefined();
    expect(edits.setTruthModel(plan, 'conic')).toBe(plan);
    const nbody = edits.setTruthModel(plan, 'nbody');
    expect(nbody.truthModel).toBe('nbody');
    expect(plan.truthModel).toBeUndefined();
    expect(edits.setTruthModel(nbody, 'nbody')).toBe(nbody);
    expect(edits.setTruthModel(nbody, 'finite').truthModel).toBe('finite');
    expect(edits.setTruthModel(nbody, 'conic').truthModel).toBe('conic');
  });
});

describe('field paths', () => {
  it('translates file field names to memory names', () => {
    expect(fileToMemoryPath('events[2].dv_mps[0]')).toBe('events[2].dv[0]');
    expect(fileToMemoryPath('vehicle.stages[1].isp_s')).toBe('vehicle.stages[1].isp');
    expect(fileToMemoryPath('start.periapsis_altitude_m')).toBe('start.periapsisAltitude');
    expect(fileToMemoryPath('events[0].solve.arrive_s')).toBe('events[0].solve.arrive');
  });
  it('knows which issues lie inside a field', () => {
    expect(pathWithin('events[2].dv[0]', 'events[2].dv')).toBe(true);
    expect(pathWithin('events[2].dv', 'events[2].dv')).toBe(true);
    expect(pathWithin('events[2].dvx', 'events[2].dv')).toBe(false);
    expect(pathWithin('events[20].t', 'events[2]')).toBe(false);
  });
});

describe('putting a porkchop transfer into a plan', async () => {
  const { parseSystemFile } = await import('../../../../core/io/systemFile.ts');
  const { planFromWindow } = await import('../../../../core/conic/fromWindow.ts');
  const system = parseSystemFile(readFileSync(new URL('../../../../assets/systems/ilmar.system.json', import.meta.url), 'utf8')).system;
  const DAY = 86400;
  const transfer = planFromWindow(system, {
    from: 'tessel',
    to: 'ochre',
    depart: 170 * DAY,
    arrive: 170 * DAY + 235 * DAY,
    parkingAltitude: 300_000,
    captureAltitude: 400_000,
    vehicle: plan.vehicle,
    captureE: 0.5,
  });
  const next = edits.applyTransfer(plan, transfer);

  it('replaces the events up to the capture burn and keeps the ones after it', () => {
    const cut = plan.events.findIndex((e) => e.type === 'burn' && e.solve.kind === 'capture');
    const keptIds = plan.events.slice(cut + 1).map((e) => e.id);
    expect(next.events.slice(-keptIds.length).map((e) => e.id)).toEqual(keptIds);
    const head = next.events.slice(0, next.events.length - keptIds.length);
    expect(head.filter((e) => e.type !== 'stage').map((e) => e.type)).toEqual(transfer.events.map((e) => e.type));
    expect(next.start).toEqual(transfer.start);
  });

  it('keeps staging after the same-numbered burn, the target, vehicle and reserve', () => {
    const firstBurn = next.events.findIndex((e) => e.type === 'burn');
    expect(next.events[firstBurn + 1]).toMatchObject({ type: 'stage', id: 'drop-kick' });
    expect(next.target).toEqual(plan.target);
    expect(next.vehicle).toEqual(plan.vehicle);
    expect(next.reserve).toEqual(plan.reserve);
    expect(next.name).toBe(plan.name);
  });

  it('keeps ids unique', () => {
    const ids = next.events.map((e) => e.id);
    expect(new Set(ids).size).toBe(ids.length);
  });
});

describe('where a new event goes', () => {
  it('at the end by default, after the event an insertion point names, or at the start', () => {
    const n = plan.events.length;
    expect(edits.insertionAfter(plan, null)).toBe(n - 1);
    expect(edits.insertionAfter(plan, 'start')).toBe(-1);
    expect(edits.insertionAfter(plan, { afterId: plan.events[2].id })).toBe(2);
    // a point after an event that is gone means the end
    expect(edits.insertionAfter(plan, { afterId: 'no-such-event' })).toBe(n - 1);
    const atEnd = edits.addEvent(plan, 'coast', edits.insertionAfter(plan, null));
    expect(atEnd.events.slice(0, n)).toEqual(plan.events);
    expect(atEnd.events[n].type).toBe('coast');
    const third = edits.addEvent(plan, 'stage', edits.insertionAfter(plan, { afterId: plan.events[2].id }));
    expect(third.events[3].type).toBe('stage');
    expect(third.events.filter((_, k) => k !== 3)).toEqual(plan.events);
  });
  it('a burn without context is a zero burn (never an arbitrary Δv)', () => {
    const b = edits.newEvent(plan, 'burn');
    expect(b.type === 'burn' && b.dv).toEqual([0, 0, 0]);
  });
});
