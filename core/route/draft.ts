/**
 * The plan a route builds, hop by hop: its start, its events so far, and where the ship is at the
 * end of them (the patched-conic evaluation of the events so far, core/conic evaluate — each hop
 * is built from the state the previous one leaves, so the hops chain whatever each one flew).
 */
import { SolverError } from '../math/index.ts';
import type { StarSystem } from '../system/index.ts';
import type { Plan, PlanEvent, PlanStart, ReservePolicy, Vehicle } from '../plan/index.ts';
import { evaluate, shipStateAt } from '../conic/index.ts';

export interface Draft {
  system: StarSystem;
  vehicle: Vehicle;
  reserve: ReservePolicy;
  start: PlanStart | null;
  events: PlanEvent[];
}

/** Where the ship is: time, central body index and state [r, v] relative to it. */
export interface Situation {
  t: number;
  central: number;
  state: Float64Array;
}

/** A plan id from a name, unique within the draft ("Capture at Skerry" → "capture-at-skerry", then "-2"...). */
export function eventId(draft: Draft, name: string): string {
  const base =
    name
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-|-$/g, '') || 'event';
  let id = base;
  for (let k = 2; draft.events.some((e) => e.id === id); k++) id = `${base}-${k}`;
  return id;
}

/** The draft as a plan (no target) with `extra` events appended. */
export function draftPlan(draft: Draft, extra: PlanEvent[] = []): Plan {
  if (!draft.start) throw new SolverError('route', 'no-solution', 'the route has no start yet');
  return {
    name: 'route draft',
    description: '',
    vehicle: draft.vehicle,
    start: draft.start,
    events: [...draft.events, ...extra],
    target: null,
    reserve: draft.reserve,
    end: null,
  };
}

const ERROR_FLAGS = new Set(['solve-failed', 'impact', 'out-of-order', 'condition-not-met', 'atmosphere-entry']);

/** A failed flight's flag in the designer's words: the event's name rather than its index, and what the failure means. */
function flightInWords(draft: Draft, flag: { code: string; message: string; planEventId: string | null }): string {
  const ev = draft.events.find((e) => e.id === flag.planEventId);
  const name = ev ? `'${ev.name}'` : 'the flight';
  if (flag.code === 'condition-not-met' && ev?.type === 'coast') {
    const u = ev.until;
    const where = 'body' in u && typeof u.body === 'string' ? (draft.system.bodies[draft.system.indexById[u.body]]?.name ?? u.body) : null;
    const goal = u.kind === 'periapsis' && where ? `a periapsis at ${where}` : `its ${u.kind}`;
    return `${name} never reaches ${goal} (the flight before it does not lead there)`;
  }
  return `${name}: ${flag.message.replace(/^events\[\d+\]: /, '')}`;
}

/**
 * Flies the draft with `extra` appended and returns where the ship is at the end; SolverError
 * ('route', 'no-solution') when the flight hits an error (a burn not solved, an impact, a coast
 * condition never met), in the flight's own words. A `trial` flight (a step of a search) may
 * end in an impact or an atmosphere entry: its conic there still says how far off it is.
 */
export function situationAfter(draft: Draft, extra: PlanEvent[] = [], trial = false): Situation {
  const result = evaluate(draft.system, draftPlan(draft, extra), { samplesPerSegment: 0 });
  const bad = result.flags.find((f) => ERROR_FLAGS.has(f.code) && !(trial && (f.code === 'impact' || f.code === 'atmosphere-entry')));
  if (bad) throw new SolverError('route', 'no-solution', flightInWords(draft, bad), { event: bad.planEventId });
  const state = new Float64Array(6);
  const k = shipStateAt(result, result.t1, state);
  if (k < 0) throw new SolverError('route', 'no-solution', 'the flight has no trajectory');
  return { t: result.t1, central: result.segments[k].central, state };
}
