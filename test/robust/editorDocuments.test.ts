/**
 * The plan on disk is always valid: every document the editor can produce saves and re-opens
 * with the same content. Random sequences of the editor's own edits (app/renderer/plan/edits.ts)
 * with random values — many of them invalid (negative masses, huge or non-finite numbers,
 * angles past their range, unknown bodies, zero tolerances, times out of order) — go through the
 * document store as the Plan screen sends them; after each one:
 * - a refused edit left the document as it was (the same plan object, revision and undo history);
 *   Undo and Redo between the edits only ever bring back documents that were accepted;
 * - the present plan serialises, re-opens with the system it flies in, and the re-opened plan
 *   equals it (serialise → parse → same plan), and serialising that gives the same bytes.
 * Bounded by case counts (fast-check, fixed seed), never by a wall clock.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parsePlanFile, serializePlanFile, type PlanSystemRef } from '../../core/io/planFile.ts';
import type { BurnEvent, BurnSolve, CoastUntil, Plan, PlanEvent, PlanTarget, Stage, TruthModel } from '../../core/plan/plan.ts';
import { PlanDocumentStore } from '../../app/renderer/state/document.ts';
import { planIssues } from '../../app/renderer/state/session.ts';
import * as edits from '../../app/renderer/plan/edits.ts';
import { demoPlanText, demoSystem } from '../fuzz/files.ts';
import { FUZZ_SEED } from './budget.ts';

const system = demoSystem();
const REF: PlanSystemRef = { kind: 'path', path: '../systems/ilmar.system.json' };
const DEG = Math.PI / 180; // the editor's degree fields read a typed value d as d · π/180 (fieldText.ts UNITS.deg)
const DAY = 86400;

// Values as a field can produce them: a double typed in the field's unit times the unit's scale,
// weighted towards the edges the file's rules care about.
const anyDouble = fc.double(); // includes ±0, ±Infinity and NaN (a field refuses those, edits may still carry them)
const edgy = fc.constantFrom(-5, 0, -0, 1e-9, 1e12, 1e13, 1e30, -1e30, 720, 500, 1e308);
const value = (scale: number, typical: fc.Arbitrary<number>) => fc.oneof({ weight: 3, arbitrary: typical }, anyDouble, edgy).map((x) => x * scale);
const mass = value(1000, fc.double({ min: 0, max: 50, noNaN: true })); // t
const length = value(1000, fc.double({ min: -100, max: 5e6, noNaN: true })); // km
const angle = value(DEG, fc.double({ min: -400, max: 400, noNaN: true })); // °
const time = value(1, fc.double({ min: 0, max: 800 * DAY, noNaN: true })); // s from the epoch (typed as a date or "150d")
const plain = value(1, fc.double({ min: -0.5, max: 1.5, noNaN: true }));
const bodyId = fc.constantFrom(...system.bodies.map((b) => b.id), 'nowhere');
const name = fc.oneof(fc.string({ maxLength: 12 }), fc.constant(''));

/** An edit, or Undo / Redo (the history must hold only documents that save and re-open). */
type Op = { label: string; fn: (p: Plan) => Plan; history?: 'undo' | 'redo' };
const pick = (p: Plan, k: number): PlanEvent | undefined => p.events[k % Math.max(1, p.events.length)];

const solve: fc.Arbitrary<BurnSolve> = fc.oneof(
  fc.constant<BurnSolve>({ kind: 'fixed' }),
  fc.record({ to: bodyId, arrive: time, revs: fc.option(fc.integer({ min: -1, max: 120 }), { nil: undefined }) }).map((s) => {
    const out: BurnSolve = { kind: 'transfer', to: s.to, arrive: s.arrive };
    if (s.revs !== undefined) out.revs = s.revs;
    return out;
  }),
  plain.map((e): BurnSolve => ({ kind: 'capture', e })),
  angle.map((i): BurnSolve => ({ kind: 'plane', i })),
  length.map((altitude): BurnSolve => ({ kind: 'apsis', altitude })),
);

const until: fc.Arbitrary<CoastUntil> = fc.oneof(
  time.map((t): CoastUntil => ({ kind: 'time', t })),
  value(3600, fc.double({ min: 0, max: 100, noNaN: true })).map((dt): CoastUntil => ({ kind: 'duration', dt })),
  length.map((altitude): CoastUntil => ({ kind: 'altitude', altitude })),
  fc.constantFrom<CoastUntil>({ kind: 'periapsis' }, { kind: 'apoapsis' }, { kind: 'soi-change' }, { kind: 'node', which: 'any' }),
  bodyId.map((body): CoastUntil => ({ kind: 'periapsis', body })),
);

/** A change to one event, as its card makes it. */
const eventPatch = fc.oneof(
  fc.record({ t: fc.option(time, { nil: null }) }),
  fc.record({ k: fc.integer({ min: 0, max: 2 }), v: value(1, fc.double({ min: -500, max: 500, noNaN: true })) }),
  fc.record({ solve }),
  fc.record({ frame: fc.constantFrom<BurnEvent['frame']>('vnb', 'rtn', 'inertial') }),
  fc.record({ mode: fc.constantFrom<BurnEvent['mode']>('impulsive', 'finite'), pointing: fc.constantFrom<BurnEvent['pointing']>('velocity', 'inertial') }),
  fc.record({ until }),
  fc.record({ name }),
);

function patchEvent(ev: PlanEvent, patch: Record<string, unknown>): PlanEvent {
  if ('k' in patch) {
    if (ev.type !== 'burn') return ev;
    const dv: [number, number, number] = [...ev.dv];
    dv[patch.k as number] = patch.v as number;
    return { ...ev, dv };
  }
  if ('until' in patch) return ev.type === 'coast' ? { ...ev, until: patch.until as CoastUntil } : ev;
  if ('name' in patch) return { ...ev, name: patch.name as string };
  return ev.type === 'burn' ? ({ ...ev, ...patch } as PlanEvent) : ev;
}

const stagePatch: fc.Arbitrary<Partial<Stage>> = fc.oneof(
  mass.map((dryMass) => ({ dryMass })),
  mass.map((propellantMass) => ({ propellantMass })),
  value(1, fc.double({ min: 0, max: 500, noNaN: true })).map((isp) => ({ isp })),
  value(1000, fc.double({ min: 0, max: 100, noNaN: true })).map((thrust) => ({ thrust })),
  name.map((n) => ({ name: n })),
);

const targetPatch: fc.Arbitrary<Partial<PlanTarget> | null> = fc.oneof(
  fc.constant(null),
  fc.record({ body: bodyId }),
  fc.record({ periapsisAltitude: length }),
  fc.record({ e: fc.option(plain, { nil: null }) }),
  fc.record({ apoapsisAltitude: fc.option(length, { nil: null }) }),
  fc.record({ i: fc.option(angle, { nil: null }) }),
  fc.record({ tolerance: fc.record({ periapsisAltitude: length, e: plain, i: angle }) }),
);

const DEFAULT_TARGET: PlanTarget = {
  body: 'ochre',
  periapsisAltitude: 400_000,
  e: 0,
  apoapsisAltitude: null,
  i: null,
  tolerance: { periapsisAltitude: 10_000, e: 0.01, i: 0.01 },
};

const op: fc.Arbitrary<Op> = fc.oneof(
  fc
    .record({ kind: fc.constantFrom<edits.NewEventKind>('burn', 'coast', 'stage'), after: fc.integer({ min: -1, max: 20 }) })
    .map(({ kind, after }): Op => ({ label: 'Add', fn: (p) => edits.addEvent(p, kind, after) })),
  fc.record({ k: fc.nat(), at: fc.integer({ min: -1, max: 20 }) }).map(
    ({ k, at }): Op => ({
      label: 'Insert copy',
      fn: (p) => {
        const ev = pick(p, k);
        return ev ? edits.insertEvent(p, { ...ev, id: edits.freshId(p, ev.type) }, at) : p;
      },
    }),
  ),
  fc.constantFrom<Op>({ label: 'Undo', fn: (p) => p, history: 'undo' }, { label: 'Redo', fn: (p) => p, history: 'redo' }),
  fc.nat().map((k): Op => ({ label: 'Delete', fn: (p) => (pick(p, k) ? edits.deleteEvent(p, pick(p, k)!.id) : p) })),
  fc
    .record({ k: fc.nat(), d: fc.constantFrom(-1, 1) })
    .map(({ k, d }): Op => ({ label: 'Move', fn: (p) => (pick(p, k) ? edits.moveEvent(p, pick(p, k)!.id, d) : p) })),
  fc.record({ k: fc.nat(), patch: eventPatch }).map(
    ({ k, patch }): Op => ({
      label: 'Edit event',
      fn: (p) => {
        const ev = pick(p, k);
        return ev ? edits.replaceEvent(p, ev.id, patchEvent(ev, patch)) : p;
      },
    }),
  ),
  fc
    .record({ k: fc.nat(5), patch: stagePatch })
    .map(({ k, patch }): Op => ({ label: 'Edit stage', fn: (p) => edits.updateStage(p, k % p.vehicle.stages.length, patch) })),
  fc.constant<Op>({ label: 'Add stage', fn: edits.addStage }),
  fc.nat(5).map((k): Op => ({ label: 'Remove stage', fn: (p) => (p.vehicle.stages.length > 1 ? edits.removeStage(p, k % p.vehicle.stages.length) : p) })),
  fc
    .record({ k: fc.nat(5), d: fc.constantFrom(-1, 1) })
    .map(({ k, d }): Op => ({ label: 'Reorder stages', fn: (p) => edits.moveStage(p, k % p.vehicle.stages.length, d) })),
  fc
    .oneof(
      mass.map((payloadMass) => ({ payloadMass })),
      name.map((n) => ({ name: n })),
    )
    .map((patch): Op => ({ label: 'Edit vehicle', fn: (p) => edits.setVehicle(p, patch) })),
  fc
    .oneof(
      value(1, fc.double({ min: 0, max: 20, noNaN: true })).map((percent) => ({ percent })),
      value(1, fc.double({ min: 0, max: 200, noNaN: true })).map((absolute) => ({ absolute })),
    )
    .map((patch): Op => ({ label: 'Edit reserve', fn: (p) => edits.setReserve(p, patch) })),
  fc
    .oneof(
      fc.record({ epoch: time }),
      fc.record({ periapsisAltitude: length }),
      fc.record({ e: plain }),
      fc.record({ i: angle }),
      fc.record({ raan: angle }),
      fc.record({ argp: angle }),
      fc.record({ nu: angle }),
      fc.record({ body: bodyId }),
    )
    .map((patch): Op => ({ label: 'Edit start', fn: (p) => (p.start.kind === 'parking' ? edits.setStart(p, { ...p.start, ...patch }) : p) })),
  targetPatch.map(
    (patch): Op => ({ label: 'Edit target', fn: (p) => edits.setTarget(p, patch === null ? null : { ...(p.target ?? DEFAULT_TARGET), ...patch }) }),
  ),
  fc
    .oneof(fc.record({ name }), fc.record({ description: fc.string({ maxLength: 20 }) }), fc.record({ end: fc.option(time, { nil: null }) }))
    .map((patch): Op => ({ label: 'Edit plan', fn: (p) => edits.setPlanInfo(p, patch) })),
  fc.constantFrom<TruthModel>('conic', 'finite', 'nbody').map((m): Op => ({ label: 'Truth model', fn: (p) => edits.setTruthModel(p, m) })),
);

function newStore(file: string): PlanDocumentStore {
  const parsed = parsePlanFile(demoPlanText(file), { system });
  return new PlanDocumentStore({ plan: parsed.plan, system, systemRef: REF, file: null }, planIssues);
}

describe('editor documents', () => {
  it('every document the editor produces saves and re-opens with the same content; a refused edit leaves the document unchanged', () => {
    let refused = 0;
    let applied = 0;
    fc.assert(
      fc.property(fc.constantFrom('tessel-to-ochre.plan.json', 'tessel-to-skerry.plan.json'), fc.array(op, { minLength: 8, maxLength: 25 }), (file, ops) => {
        const doc = newStore(file);
        for (const o of ops) {
          const before = doc.get();
          if (o.history) {
            if (o.history === 'undo') doc.undo();
            else doc.redo();
          }
          const r = o.history ? null : doc.edit(o.label, o.fn);
          const after = doc.get();
          if (r) {
            refused++;
            expect(r.issues.length).toBeGreaterThan(0);
            expect(after.plan).toBe(before.plan);
            expect(after.revision).toBe(before.revision);
            expect(after.canUndo).toBe(before.canUndo);
            expect(after.undoLabel).toBe(before.undoLabel);
          } else if (after.revision !== before.revision && !o.history) applied++;
          const text = serializePlanFile(after.plan, REF);
          const reopened = parsePlanFile(text, { system });
          expect(reopened.plan).toEqual(after.plan);
          expect(serializePlanFile(reopened.plan, REF)).toBe(text);
          expect(after.issues.filter((i) => i.severity === 'error')).toEqual([]);
        }
      }),
      { numRuns: 150, seed: FUZZ_SEED, endOnFailure: true },
    );
    // Both kinds of edit were exercised (the generators reach valid and invalid values).
    expect(refused).toBeGreaterThan(200);
    expect(applied).toBeGreaterThan(800);
  });
});
