/**
 * "Make a plan from this": a sequence solution as plan events, laid out as the flyby demo plan
 * is (test/fixtures/flybyPlan.ts): the departure from the parking orbit (core/conic
 * planFromWindow for the first leg), and for each leg a correction 3 days after leaving the
 * body, at mid-leg the aim — for a flyby body a direct 'transfer' with `flyby` (the hyperbola
 * leaves along the next leg), coast to periapsis, the flyby marker and the periapsis burn to the
 * next body (an unpowered flyby: the aim keeps |v∞| and no burn is made at periapsis; the next
 * correction pays the mismatch) — and for the last body the mid-course aim at
 * the capture periapsis, coast to periapsis and the capture burn.
 */
import { planFromWindow } from '../../../core/conic/index.ts';
import type { Plan, PlanEvent } from '../../../core/plan/index.ts';
import type { SequenceSolution } from '../../../core/search/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';

const DAY = 86400;
/** Coast after leaving a body's sphere of influence before the correction aimed at the next, s. */
export const CLEAR_OF_BODY = 3 * DAY;

type Burn = Extract<PlanEvent, { type: 'burn' }>;

function burn(id: string, name: string, solve: Burn['solve']): PlanEvent {
  return { type: 'burn', id, name, t: null, frame: 'vnb', dv: [0, 0, 0], solve, mode: 'impulsive', pointing: 'velocity' };
}

export interface SequencePlanOptions {
  parkingAltitude: number;
  /** Capture periapsis altitude at the last body, m, and eccentricity; null: fly past (no capture). */
  captureAltitude: number;
  captureE: number | null;
  /** Unpowered flybys (false): the aim keeps |v∞| (the transfer's flyby with powered: false) and no burn is made at periapsis; the correction after the pass pays the mismatch. Default true. */
  powered?: boolean;
}

/** The plan for a solution: the vehicle, reserve and name of `base`; the target orbit at the last body when it is captured. */
export function sequencePlan(system: StarSystem, solution: SequenceSolution, base: Plan, o: SequencePlanOptions): Plan {
  const name = (id: string): string => system.bodies[system.indexById[id]]?.name ?? id;
  const legs = solution.legs;
  const first = planFromWindow(system, {
    from: legs[0].from,
    to: legs[0].to,
    depart: legs[0].depart,
    arrive: legs[0].arrive,
    parkingAltitude: o.parkingAltitude,
    captureAltitude: o.captureAltitude,
    vehicle: base.vehicle,
    reserve: base.reserve,
    name: base.name,
  });
  const events: PlanEvent[] = [first.events[0]];
  legs.forEach((leg, k) => {
    const n = k + 1;
    const last = k === legs.length - 1;
    const next = legs[k + 1];
    events.push(
      { type: 'coast', id: `leave-${n}`, name: `Leave ${name(leg.from)}`, until: { kind: 'soi-change' } },
      { type: 'coast', id: `clear-${n}`, name: `Drift clear of ${name(leg.from)}`, until: { kind: 'duration', dt: CLEAR_OF_BODY } },
      burn(`correction-${n}`, `Correction towards ${name(leg.to)}`, { kind: 'transfer', to: leg.to, arrive: leg.arrive }),
      { type: 'coast', id: `cruise-${n}`, name: 'Cruise to mid-leg', until: { kind: 'time', t: 0.5 * (leg.depart + leg.arrive) } },
    );
    if (!last) {
      const powered = o.powered !== false;
      events.push(
        burn(`aim-${n}`, `Aim for the ${name(leg.to)} flyby`, {
          kind: 'transfer',
          to: leg.to,
          arrive: leg.arrive,
          flyby: powered ? { next: next.to, arrive: next.arrive } : { next: next.to, arrive: next.arrive, powered: false },
        }),
        { type: 'coast', id: `approach-${n}`, name: `Approach ${name(leg.to)}`, until: { kind: 'periapsis', body: leg.to } },
        { type: 'flyby', id: `flyby-${n}`, name: `${name(leg.to)} flyby`, body: leg.to },
      );
      if (powered) events.push(burn(`periapsis-${n}`, `Periapsis burn to ${name(next.to)}`, { kind: 'transfer', to: next.to, arrive: next.arrive }));
    } else if (o.captureE !== null) {
      events.push(
        burn('mid-course', 'Mid-course correction', { kind: 'transfer', to: leg.to, arrive: leg.arrive, periapsisAltitude: o.captureAltitude }),
        { type: 'coast', id: 'approach-last', name: `Approach ${name(leg.to)}`, until: { kind: 'periapsis', body: leg.to } },
        burn('capture', `${name(leg.to)} capture`, { kind: 'capture', e: o.captureE }),
        { type: 'coast', id: 'final', name: 'Final orbit', until: { kind: 'duration', dt: DAY } },
      );
    } else {
      events.push(burn('mid-course', 'Mid-course correction', { kind: 'transfer', to: leg.to, arrive: leg.arrive, periapsisAltitude: o.captureAltitude }), {
        type: 'coast',
        id: 'approach-last',
        name: `Approach ${name(leg.to)}`,
        until: { kind: 'periapsis', body: leg.to },
      });
    }
  });
  const lastBody = legs[legs.length - 1].to;
  return {
    ...first,
    description: `${solution.legs.map((l) => name(l.from)).join(' → ')} → ${name(lastBody)} from the sequence search.`,
    events,
    target:
      o.captureE === null
        ? null
        : {
            body: lastBody,
            periapsisAltitude: o.captureAltitude,
            e: o.captureE,
            apoapsisAltitude: null,
            i: null,
            tolerance: base.target?.tolerance ?? first.target!.tolerance,
          },
  };
}
