/**
 * Edits of a plan as pure functions Plan → Plan (a new object; the input is never changed).
 * The editor calls them through the document store, which records each on the undo history.
 */
import type {
  BurnEvent,
  CoastEvent,
  Plan,
  PlanEvent,
  PlanStart,
  PlanTarget,
  ReservePolicy,
  Stage,
  StageEvent,
  TruthModel,
  Vehicle,
} from '../../../core/plan/index.ts';
import { planTruthModel } from '../../../core/plan/index.ts';

function clone(plan: Plan): Plan {
  return structuredClone(plan);
}

/** A fresh event id of the form `<prefix>-<n>` not used in the plan. */
export function freshId(plan: Plan, prefix: string): string {
  const used = new Set(plan.events.map((e) => e.id));
  for (let n = 1; ; n++) {
    const id = `${prefix}-${n}`;
    if (!used.has(id)) return id;
  }
}

export type NewEventKind = 'burn' | 'coast' | 'stage';

/**
 * The event a user gets from "Add burn / coast / staging" without context: valid, small, easy to
 * change (a zero burn at the end of the event before it; plan/newBurn.ts chooses a burn that
 * fits the end of a flown plan).
 */
export function newEvent(plan: Plan, kind: NewEventKind): PlanEvent {
  switch (kind) {
    case 'burn': {
      const n = plan.events.filter((e) => e.type === 'burn').length + 1;
      const b: BurnEvent = {
        type: 'burn',
        id: freshId(plan, 'burn'),
        name: `Burn ${n}`,
        t: null,
        frame: 'vnb',
        dv: [0, 0, 0],
        solve: { kind: 'fixed' },
        mode: 'impulsive',
        pointing: 'velocity',
      };
      return b;
    }
    case 'coast': {
      const c: CoastEvent = { type: 'coast', id: freshId(plan, 'coast'), name: 'Coast', until: { kind: 'duration', dt: 3600 } };
      return c;
    }
    case 'stage': {
      const s: StageEvent = { type: 'stage', id: freshId(plan, 'stage'), name: 'Staging' };
      return s;
    }
  }
}

/** Inserts a new event after index `after` (−1: at the start; default: at the end): `event` when given, else newEvent's. */
export function addEvent(plan: Plan, kind: NewEventKind, after = plan.events.length - 1, event?: PlanEvent): Plan {
  const next = clone(plan);
  next.events.splice(Math.max(0, Math.min(after + 1, next.events.length)), 0, event ? structuredClone(event) : newEvent(plan, kind));
  return next;
}

/**
 * Where a new event goes, as the index of the event it follows (addEvent's `after`): at the end
 * unless the user has put an insertion point after an event (`afterId`) or at the start
 * (`'start'`). An insertion point after an event no longer in the plan means the end.
 */
export type InsertionPoint = null | 'start' | { afterId: string };
export function insertionAfter(plan: Plan, point: InsertionPoint): number {
  if (point === null) return plan.events.length - 1;
  if (point === 'start') return -1;
  const i = plan.events.findIndex((e) => e.id === point.afterId);
  return i < 0 ? plan.events.length - 1 : i;
}

export function insertEvent(plan: Plan, event: PlanEvent, at: number): Plan {
  const next = clone(plan);
  next.events.splice(Math.max(0, Math.min(at, next.events.length)), 0, structuredClone(event));
  return next;
}

export function deleteEvent(plan: Plan, id: string): Plan {
  const i = plan.events.findIndex((e) => e.id === id);
  if (i < 0) return plan;
  const next = clone(plan);
  next.events.splice(i, 1);
  return next;
}

/** Moves an event by `delta` places (−1 up, +1 down); out of range is a no-op. */
export function moveEvent(plan: Plan, id: string, delta: number): Plan {
  const i = plan.events.findIndex((e) => e.id === id);
  const j = i + delta;
  if (i < 0 || j < 0 || j >= plan.events.length || delta === 0) return plan;
  const next = clone(plan);
  const [ev] = next.events.splice(i, 1);
  next.events.splice(j, 0, ev);
  return next;
}

/** Replaces the event with this id by `event` (same id kept). */
export function replaceEvent(plan: Plan, id: string, event: PlanEvent): Plan {
  const i = plan.events.findIndex((e) => e.id === id);
  if (i < 0) return plan;
  const next = clone(plan);
  next.events[i] = { ...structuredClone(event), id } as PlanEvent;
  return next;
}

export function setVehicle(plan: Plan, patch: Partial<Omit<Vehicle, 'stages'>>): Plan {
  const next = clone(plan);
  Object.assign(next.vehicle, patch);
  return next;
}

export function updateStage(plan: Plan, index: number, patch: Partial<Stage>): Plan {
  if (!plan.vehicle.stages[index]) return plan;
  const next = clone(plan);
  Object.assign(next.vehicle.stages[index], patch);
  return next;
}

export function addStage(plan: Plan): Plan {
  const next = clone(plan);
  const last = plan.vehicle.stages[plan.vehicle.stages.length - 1];
  next.vehicle.stages.push(
    last ? { ...last, name: `Stage ${plan.vehicle.stages.length + 1}` } : { name: 'Stage 1', dryMass: 1000, propellantMass: 4000, isp: 320, thrust: 20000 },
  );
  return next;
}

export function removeStage(plan: Plan, index: number): Plan {
  if (!plan.vehicle.stages[index]) return plan;
  const next = clone(plan);
  next.vehicle.stages.splice(index, 1);
  return next;
}

export function moveStage(plan: Plan, index: number, delta: number): Plan {
  const j = index + delta;
  if (!plan.vehicle.stages[index] || j < 0 || j >= plan.vehicle.stages.length || delta === 0) return plan;
  const next = clone(plan);
  const [st] = next.vehicle.stages.splice(index, 1);
  next.vehicle.stages.splice(j, 0, st);
  return next;
}

export function setReserve(plan: Plan, patch: Partial<ReservePolicy>): Plan {
  const next = clone(plan);
  Object.assign(next.reserve, patch);
  return next;
}

export function setStart(plan: Plan, start: PlanStart): Plan {
  const next = clone(plan);
  next.start = structuredClone(start);
  return next;
}

export function setTarget(plan: Plan, target: PlanTarget | null): Plan {
  const next = clone(plan);
  next.target = target === null ? null : structuredClone(target);
  return next;
}

export function setPlanInfo(plan: Plan, patch: Partial<Pick<Plan, 'name' | 'description' | 'end'>>): Plan {
  const next = clone(plan);
  Object.assign(next, patch);
  return next;
}

/** Sets the model the plan's burns are targeted in and its readouts show; the same model is a no-op (no undo step). */
export function setTruthModel(plan: Plan, model: TruthModel): Plan {
  if (planTruthModel(plan) === model) return plan;
  const next = clone(plan);
  next.truthModel = model;
  return next;
}

/**
 * Puts a transfer built from a porkchop pick (core/conic/fromWindow.ts: departure burn,
 * coasts, mid-course burn, coast to periapsis, capture burn) into a plan, replacing the plan's
 * own transfer:
 * - the start becomes the pick's parking orbit (phased for the new departure);
 * - the events up to and including the plan's first capture burn are replaced by the pick's
 *   (all events when the plan has no capture burn); the events after it (plane changes, trims,
 *   the final coast) are kept;
 * - staging events of the replaced part keep their place after the same-numbered burn
 *   (a "drop the kick stage" after the departure burn stays after the new departure burn);
 * - the vehicle, reserve, name and target orbit stay (the pick's target is used when the plan
 *   has none). Ids that would clash are renamed.
 */
export function applyTransfer(plan: Plan, transfer: Plan): Plan {
  const next = clone(plan);
  const cut = plan.events.findIndex((e) => e.type === 'burn' && e.solve.kind === 'capture');
  const replaced = cut < 0 ? plan.events : plan.events.slice(0, cut + 1);
  const tail = cut < 0 ? [] : plan.events.slice(cut + 1);
  // Staging of the replaced part, keyed by the number of burns before it.
  const staging: { afterBurns: number; event: PlanEvent }[] = [];
  let burns = 0;
  for (const e of replaced) {
    if (e.type === 'burn') burns++;
    else if (e.type === 'stage') staging.push({ afterBurns: burns, event: e });
  }
  const head: PlanEvent[] = [];
  burns = 0;
  const place = (n: number) => {
    for (const s of staging) if (s.afterBurns === n) head.push(structuredClone(s.event));
  };
  place(0);
  for (const e of transfer.events) {
    head.push(structuredClone(e));
    if (e.type === 'burn') place(++burns);
  }
  for (const s of staging) if (s.afterBurns > burns) head.push(structuredClone(s.event));
  // Unique ids: the kept tail wins, new events are renamed on a clash.
  const used = new Set(tail.map((e) => e.id));
  for (const e of head) {
    if (used.has(e.id)) {
      let n = 2;
      while (used.has(`${e.id}-${n}`)) n++;
      e.id = `${e.id}-${n}`;
    }
    used.add(e.id);
  }
  next.events = [...head, ...structuredClone(tail)];
  next.start = structuredClone(transfer.start);
  next.target = plan.target ? structuredClone(plan.target) : structuredClone(transfer.target);
  return next;
}

/** Sets a burn's time (s from the epoch); anything but a burn with this id is a no-op. */
export function retimeBurn(plan: Plan, id: string, t: number): Plan {
  const i = plan.events.findIndex((e) => e.id === id);
  const ev = plan.events[i];
  if (ev?.type !== 'burn' || ev.t === t) return plan;
  const next = clone(plan);
  (next.events[i] as BurnEvent).t = t;
  return next;
}
