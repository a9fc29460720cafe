/**
 * What "+ Burn" adds at the end of a plan, chosen from the plan as flown (its last evaluation),
 * simple and predictable, with a sentence saying what was chosen:
 * - no evaluation or no target orbit: a zero burn at the end of the last event, to be filled in;
 * - the flight does not end about the target body: a Lambert transfer to it, departing at the
 *   end of the last event and arriving a Hohmann flight time later (between the orbits of the
 *   ship's body and the target's about their common parent: a first guess, never a solve);
 * - it ends about the target body short of the target orbit: a capture burn at the next
 *   periapsis, into the target's eccentricity;
 * - it ends in the target orbit: a zero burn.
 * Times are the end of the last event as flown, moved up to the next whole minute of the shown
 * clock (a departure or arrival typed back reads as shown); a capture sits at the periapsis itself.
 */
import type { BurnEvent, Plan, PlanResult } from '../../../core/plan/index.ts';
import type { StarSystem, SystemCalendar } from '../../../core/system/index.ts';
import { dateParts, findBodyIndex } from '../../../core/system/index.ts';
import { shipStateAt, timeToApsis } from '../../../core/conic/index.ts';
import { hohmann } from '../../../core/orbit/index.ts';
import { duration } from '../format/format.ts';
import { freshId } from './edits.ts';

export type NewBurnKind = 'zero' | 'transfer' | 'capture';

export interface NewBurn {
  burn: BurnEvent;
  kind: NewBurnKind;
  /** What the default chose and why, in the user's words (shown on the new card). */
  why: string;
}

const MINUTE = 60;

/** t moved to a whole minute of the calendar clock `cal` shows: the nearest (`'nearest'`) or the next at or after t (`'up'`). */
export function snapToMinute(cal: SystemCalendar, t: number, how: 'nearest' | 'up' = 'nearest'): number {
  const p = dateParts(cal, t);
  const dayStart = t - p.secondOfDay;
  const m = how === 'up' ? Math.ceil(p.secondOfDay / MINUTE - 1e-9) : Math.round(p.secondOfDay / MINUTE);
  return dayStart + m * MINUTE;
}

/** When the plan's last event ends as flown, s (the plan's start without events; null without an evaluation). */
export function lastEventEnd(plan: Plan, result: PlanResult | null): number | null {
  if (!result) return null;
  const last = plan.events[plan.events.length - 1];
  if (!last) return result.t0;
  if (plan.end === null) return result.t1;
  let end = -Infinity;
  for (const e of result.events) if (e.planEventId === last.id && e.t > end) end = e.t;
  return Number.isFinite(end) ? end : result.t1;
}

/** A burn name not used in the plan: "Burn n" with n one more than the burns already there. */
function burnName(plan: Plan): string {
  const names = new Set(plan.events.map((e) => e.name));
  let n = plan.events.filter((e) => e.type === 'burn').length + 1;
  while (names.has(`Burn ${n}`)) n++;
  return `Burn ${n}`;
}

/** Ancestors of body i, itself first, up to the star. */
function chain(system: StarSystem, i: number): number[] {
  const out: number[] = [];
  for (let k = i; k >= 0; k = system.bodies[k].parentIndex) out.push(k);
  return out;
}

/**
 * A first guess of the flight time from a ship about body `from` (at distance r from it) to body
 * `to`: half the period of the Hohmann ellipse between the two branches' orbits about their
 * common parent (the ship's own distance when it orbits that parent). Null when there is none.
 */
function hohmannTime(system: StarSystem, from: number, r: number, to: number): number | null {
  const a = chain(system, from);
  const b = chain(system, to);
  const common = a.find((k) => b.includes(k));
  if (common === undefined) return null;
  const r1 = from === common ? r : system.bodies[a[a.indexOf(common) - 1]].elements?.a;
  const r2 = system.bodies[b[b.indexOf(common) - 1]]?.elements?.a;
  if (!(r1 && r2)) return null;
  try {
    return hohmann(system.bodies[common].mu, r1, r2).tof;
  } catch {
    return null;
  }
}

/** The burn "+ Burn" adds at the end of `plan` (see the module comment); `cal` is the calendar the times are shown in. */
export function newBurn(plan: Plan, system: StarSystem, result: PlanResult | null, cal: SystemCalendar = system.calendar): NewBurn {
  const end = lastEventEnd(plan, result);
  const base: BurnEvent = {
    type: 'burn',
    id: freshId(plan, 'burn'),
    name: burnName(plan),
    t: end === null ? null : snapToMinute(cal, end, 'up'),
    frame: 'vnb',
    dv: [0, 0, 0],
    solve: { kind: 'fixed' },
    mode: 'impulsive',
    pointing: 'velocity',
  };
  const zero = (reason: string): NewBurn => ({ burn: base, kind: 'zero', why: `Zero Δv to fill in at the end of the plan: ${reason}.` });
  if (!result || end === null) return zero('the plan has not been flown yet');
  if (!plan.target) return zero('the plan has no target orbit');
  const target = findBodyIndex(system, plan.target.body);
  if (target < 0) return zero('the target body is not in the system');
  const name = system.bodies[target].name;
  const state = new Float64Array(6);
  const k = shipStateAt(result, end, state);
  if (k < 0) return zero('the plan has no flight yet');
  // an impulsive burn that is the plan's last event ends the flight: no segment after it holds
  // the state it left, so its resolved Δv is added to the state before it
  const last = plan.events[plan.events.length - 1];
  const row = last?.type === 'burn' && last.mode === 'impulsive' ? result.budget.rows.find((r) => r.planEventId === last.id) : undefined;
  if (row && result.segments[k].t1 <= row.t + 1e-6) for (let j = 0; j < 3; j++) state[3 + j] += row.dvInertial[j];
  const central = result.segments[k].central;
  if (central !== target) {
    const tof = hohmannTime(system, central, Math.hypot(state[0], state[1], state[2]), target);
    if (tof === null || base.t === null) return zero(`no transfer to ${name} could be guessed from here`);
    const arrive = snapToMinute(cal, base.t + tof, 'up');
    return {
      burn: { ...base, solve: { kind: 'transfer', to: plan.target.body, arrive } },
      kind: 'transfer',
      why: `Transfer (Lambert) to ${name}, the plan's target, which the plan does not reach yet; arrival ${duration(arrive - base.t)} later (the Hohmann flight time, a first guess to adjust).`,
    };
  }
  if (result.target?.reached) return zero(`the plan already ends in its target orbit about ${name}`);
  // at least a minute ahead: a plan that ends at a periapsis (after a capture) gets the next one
  let dt = Infinity;
  try {
    dt = timeToApsis(result.segments[k].mu, state, 'periapsis', Infinity, MINUTE);
  } catch {
    dt = Infinity;
  }
  if (!Number.isFinite(dt)) return zero(`no next periapsis about ${name}`);
  const e = plan.target.e ?? 0;
  return {
    burn: { ...base, t: end + dt, solve: { kind: 'capture', e } },
    kind: 'capture',
    why: `Capture about ${name} at the next periapsis (${duration(dt)} after the last event) into eccentricity ${e}: the plan ends about ${name} short of its target orbit.`,
  };
}
