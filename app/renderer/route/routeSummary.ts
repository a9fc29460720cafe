/**
 * A proposed route in words for the route panel: each hop (what kind, from → to by name, depart
 * and arrive as calendar dates, its Δv estimate), the total estimate, and the targeting verdict
 * with the planned Δv and margin of the plan as targeted; when the estimate is more than the
 * route's vehicle carries (all stages full, the rocket equation stage by stage), the shortfall.
 * Non-finite numbers read "—", never NaN.
 */
import { stageDeltaVs } from '../../../core/plan/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import { date, speed } from '../format/format.ts';
import { ROUTE_HOP_WORDS, type RouteResult } from './routeCore.ts';

export interface HopLine {
  /** The kind of hop in words (ROUTE_HOP_WORDS). */
  words: string;
  from: string;
  to: string;
  depart: string;
  arrive: string;
  dv: string;
}

export interface RouteSummary {
  hops: HopLine[];
  /** Sum of the hops' estimates, as the route builder gives it. */
  dvEstimate: string;
  met: boolean;
  /** "Every goal met in patched conics" / "Not every goal met …" — the targeter's verdict. */
  verdict: string;
  /** The targeter's own paragraph. */
  targetMessage: string;
  /** Planned Δv of the targeted plan, and its margin after reserves. */
  plannedDv: string;
  margin: string;
  marginNegative: boolean;
  /** The route builder's own words. */
  message: string;
  /** The vehicle's name and its Δv with every stage full. */
  vehicle: string;
  capacity: string;
  /** How much more the estimate needs than the vehicle carries; null when it carries enough. */
  shortfall: string | null;
}

export function routeSummary(system: StarSystem, r: RouteResult, modelWords: string): RouteSummary {
  const cal = system.calendar;
  const name = (id: string): string => system.bodies.find((b) => b.id === id)?.name ?? id;
  const met = r.target.status === 'met';
  const capacity = stageDeltaVs(r.plan.vehicle).reduce((a, b) => a + b, 0);
  const short = r.dvEstimate - capacity;
  return {
    hops: r.hops.map((h) => ({
      words: ROUTE_HOP_WORDS[h.kind] ?? h.kind,
      from: name(h.from),
      to: name(h.to),
      depart: date(cal, h.depart),
      arrive: date(cal, h.arrive),
      dv: speed(h.dv),
    })),
    dvEstimate: speed(r.dvEstimate),
    met,
    verdict: `${met ? 'Every goal met' : 'Not every goal met'} in ${modelWords}`,
    targetMessage: r.target.message,
    plannedDv: speed(r.target.dv.after),
    margin: speed(r.target.margin.after),
    marginNegative: !(r.target.margin.after >= 0),
    message: r.message,
    vehicle: r.plan.vehicle.name,
    capacity: speed(capacity, 0),
    shortfall: short > 0 ? speed(short, 0) : null,
  };
}
