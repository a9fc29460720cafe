/**
 * A whole route from intent: where the ship is (a circular orbit of a planet or moon), where it
 * must end (an orbit of another), a departure date range and a vehicle — the event sequence
 * built hop by hop (chain.ts), then targeted in the plan's truth model with core/target
 * targetPlan.
 *
 * Hops and the orbits between them:
 * - 'siblings' (siblings.ts): the best porkchop window in the date range; the first hop of a
 *   route lays the parking orbit so the departure burn is tangential.
 * - 'to-moon' (toMoon.ts): the cheapest coast × time-of-flight pair from the ship's conic.
 * - 'to-parent' (toParent.ts): a patched-conic escape against the moon's motion, its size
 *   corrected on the flight to reach the aim periapsis.
 * - Arrivals (arrive.ts): the final orbit in two apsis burns (and a plane burn at a node for an
 *   inclination); an intermediate orbit in one capture burn.
 * Intermediate orbits: from a moon to another planet (or its moon) the route is built two ways
 * and the cheaper patched-conic flight kept — a direct escape from the moon's orbit onto the
 * interplanetary arc (escape.ts), or a stop in a low circular orbit of the home planet (altitude
 * max(2 × safe altitude, 5 % of the radius)) and a departure from it. On the demo system the
 * direct escape wins: Quill → Moravel 13.8 km/s against 16.1 via a low orbit of Tessel, and from
 * Lough the low orbit of Moravel (≈ 16 km/s to capture, ≈ 17 km/s to leave) makes the route
 * impossible for any sensible ship. Neither is the cheapest way: a fall from the moon to a low
 * periapsis at the planet with the departure burn there (no capture; the Oberth effect) would cost
 * a few km/s less, but needs the moon's phase matched to the window. After 'siblings' followed by
 * 'to-moon', an ellipse about the planet from 85 % of the moon's orbit radius to 1.8 times it
 * (within 80 % of the planet's sphere of influence), as the moon demo plan does (captured high in
 * the well, a short transfer to the moon).
 * Propellant: the route is built and targeted with the ship's stages scaled to carry any route
 * (ample.ts) — a burn past the tanks would be flown short and the coast after it would never
 * reach its aim — and the real ship is put back afterwards: its margin is the budget's
 * (carried − needed − reserve); a ship that cannot carry the route gets the route, verdict not
 * met, and "the route needs about 12.4 km/s; the Long Patience carries 6.5 km/s — add propellant
 * or a stage". In finite burns (durations depend on the masses) a ship that carries the built
 * route is targeted as itself. A hop that cannot be built at all is a SolverError('route',
 * 'no-solution') naming the hop's bodies, its departure and what failed, in words.
 * Limits: a departure from an orbit the route did not lay (after a stop in a low orbit) is
 * rarely tangential and costs more. The date range applies to the route's first departure; a
 * later interplanetary window is searched over a range of the same length from the arrival of
 * the hop before. Single-revolution, prograde transfer arcs only. A final inclination is reached
 * with a plane burn in the final orbit (not folded into the capture). Targeting in n-body meets
 * some routes but not all (test/bench/route.bench.ts): met — Tessel → Quill, Skerry → Lough
 * (Δv within 2 % of patched conics); not met — Quill → Tessel (the final leg's Levenberg–
 * Marquardt stalls ≈ 70 km off the 400 km orbit after 30 iterations: the escape burn from Quill,
 * thousands of times more sensitive than the capture burns, dominates the damping; neither a
 * mid-course burn on the fall to Tessel nor the capture burns' times as controls met it) and
 * Tessel → Skerry (the Moravel and Skerry arrivals converge on their B-planes and times, but
 * the n-body approach reaches the 600 km periapsis at 2.28 km/s where the patched conics had
 * ≈ 2.65: the capture frozen at the conic's 1.45 km/s leaves 0.88 km/s, below the 1.17 km/s of
 * the 600 × 500 km ellipse, and the ship falls into Skerry, so the final leg has no flight to
 * start from; the cure belongs to core/target — re-solving the next leg's solved burns (apsis,
 * capture) from the n-body state once an arrival leg converges — as re-targeting a corrected
 * schedule re-reads its goals from the schedule's own patched-conic flight, which is wrong).
 * Targeting in patched conics first and then in n-body changes neither (core/target starts
 * every model from the conic reference flight). The n-body Δv reported is the schedule's own
 * budget (core/target scheduleBudget: every burn counted, whatever its patched-conic reading).
 */
import { InputError, SolverError } from '../math/index.ts';
import { bodyState, formatDate, type StarSystem } from '../system/index.ts';
import { deltaVLeft, type Plan, type PlanTarget } from '../plan/index.ts';
import { targetPlan, type TargetResult } from '../target/index.ts';
import type { RouteHopKind } from './chain.ts';
import { checkIntent, type CheckedIntent, type RouteIntent } from './intent.ts';
import { draftPlan, eventId, situationAfter, type Draft, type Situation } from './draft.ts';
import { escapeEvents } from './escape.ts';
import { evaluate } from '../conic/index.ts';
import { captureDv, captureEvents, finalAim, finalArrivalDv, finalArrivalEvents, type ArrivalAim, type FinalOrbit } from './arrive.ts';
import { bestWindow, siblingsEvents, windowOutsideRange } from './siblings.ts';
import { searchMoonTransfer, toMoonEvents } from './toMoon.ts';
import { toParentEvents } from './toParent.ts';
import { ampleVehicle } from './ample.ts';
import { cross, parkingThrough, planeWithInclination, unit, type V3 } from './geometry.ts';

export interface RouteHop {
  kind: RouteHopKind;
  from: string;
  to: string;
  /** Departure burn and arrival periapsis times, s from the epoch. */
  depart: number;
  arrive: number;
  /** Patched-conic estimate of the hop's burns (departure and arrival), m/s. */
  dv: number;
}

export interface RouteResult {
  /** The targeted plan (truthModel set). */
  plan: Plan;
  hops: RouteHop[];
  /** The targeter's report. */
  target: TargetResult;
  /** Sum of the hops' estimates before targeting, m/s. */
  dvEstimate: number;
  /** One sentence for the designer. */
  message: string;
}

export interface RouteOptions {
  /** Called as the route is built and targeted: fraction done (0…1) and what is being done. */
  onProgress?: (fraction: number, words: string) => void;
  /** Checked between hops and during the targeting; when set, SolverError('route', 'cancelled'). */
  signal?: { aborted: boolean };
}

/** Intermediate orbit at body k before the next hop (see the module comment). */
function intermediateAim(system: StarSystem, k: number, next: RouteHopKind, nextTo: number): ArrivalAim {
  const b = system.bodies[k];
  if (next === 'to-moon') {
    const aM = system.bodies[nextTo].elements?.a ?? 0;
    const rp = Math.max(0.85 * aM, b.radius + 2 * b.safeAlt);
    const ra = Math.max(rp, Math.min(1.8 * aM, 0.8 * b.derived.soiRadius));
    return { altitude: rp - b.radius, e: (ra - rp) / (ra + rp) };
  }
  return { altitude: Math.max(2 * b.safeAlt, 0.05 * b.radius), e: 0 };
}

/** A circular start orbit about body k at time t whose plane is `normal` (tilted to `inclination` about its node when given). */
function startInPlane(draft: Draft, k: number, altitude: number, normal: V3, inclination: number | null, t: number): Situation {
  const h = planeWithInclination(normal, inclination);
  let p = cross(h, [0, 0, 1]);
  if (Math.hypot(p[0], p[1], p[2]) < 1e-9) p = cross(h, [1, 0, 0]);
  const u = unit(p);
  draft.start = parkingThrough(draft.system, k, altitude, h, u, t, 0);
  const b = draft.system.bodies[k];
  const r = b.radius + altitude;
  const vc = Math.sqrt(b.mu / r);
  const q = cross(h, u);
  return { t, central: k, state: Float64Array.from([r * u[0], r * u[1], r * u[2], vc * q[0], vc * q[1], vc * q[2]]) };
}

/** Orbit normal of body k about its parent at time t. */
function orbitNormal(system: StarSystem, k: number, t: number): V3 {
  const s = new Float64Array(6);
  bodyState(system, k, t, s, system.bodies[k].parentIndex);
  return unit(cross(s, [s[3], s[4], s[5]]));
}

const kmps = (v: number, digits = 2): string => `${(v / 1000).toFixed(digits)} km/s`;

/** The detail of a SolverError, without its "solver: reason: " head. */
const detailOf = (e: SolverError): string => e.message.replace(/^[a-z][\w-]*: [a-z-]+: /, '');

/**
 * A hop that cannot be built, in the designer's words: SolverError('route', 'no-solution')
 * naming the hop's bodies and its departure (the date range for the first hop, the arrival of
 * the hop before otherwise) and what failed.
 */
function hopError(system: StarSystem, ci: CheckedIntent, from: string, to: string, sit: Situation | null, e: SolverError): SolverError {
  const cal = system.calendar;
  const when = sit ? `after ${formatDate(cal, sit.t)}` : `between ${formatDate(cal, ci.departAfter)} and ${formatDate(cal, ci.departBefore)}`;
  return new SolverError('route', 'no-solution', `the hop from ${from} to ${to} departing ${when} cannot be built: ${detailOf(e)}`, {
    from,
    to,
    cause: e.message,
  });
}

/**
 * The route's events hop by hop into a new draft. `direct`: a route starting with a moon → planet
 * hop followed by an interplanetary one escapes from the moon straight onto the interplanetary
 * arc (escape.ts) instead of stopping in a low orbit of the planet.
 */
function buildRoute(system: StarSystem, ci: CheckedIntent, options: RouteOptions, direct: boolean): { draft: Draft; hops: RouteHop[]; windowNotes: string[] } {
  const { onProgress, signal } = options;
  // built with the ample vehicle: no burn is cut short while the route is laid (ample.ts)
  const draft: Draft = { system, vehicle: ampleVehicle(ci.vehicle), reserve: ci.reserve, start: null, events: [] };
  const finalOrbit: FinalOrbit = { periapsisAltitude: ci.periapsisAltitude, apoapsisAltitude: ci.apoapsisAltitude, inclination: ci.inclination };
  const hops: RouteHop[] = [];
  // sentences about cheaper windows outside the departure range (siblings.ts windowOutsideRange)
  const windowNotes: string[] = [];
  let sit: Situation | null = null;
  let altitudeHere = ci.fromAltitude;
  const links = ci.links;
  for (let k = 0; k < links.length; k++) {
    if (signal?.aborted) throw new SolverError('route', 'cancelled', 'route cancelled');
    const link = links[k];
    const x = system.indexById[link.from];
    const escapes = direct && k === 0 && link.kind === 'to-parent' && links[1]?.kind === 'siblings';
    if (escapes) k++;
    const arrivalLink = links[k];
    const y = system.indexById[arrivalLink.to];
    const by = system.bodies[y];
    try {
      const last = k === links.length - 1;
      onProgress?.((0.25 * k) / links.length, `Building the hop from ${system.bodies[x].name} to ${by.name}`);
      const aim = last ? finalAim(by, finalOrbit) : intermediateAim(system, y, links[k + 1].kind, system.indexById[links[k + 1].to]);
      let depart: number;
      let dv: number;
      let vArrive: number;
      if (escapes) {
        const P = system.bodies[x].parentIndex;
        const aM = system.bodies[x].elements?.a ?? 0;
        const w = bestWindow(system, P, y, ci.departAfter, ci.departBefore, aM - system.bodies[P].radius, aim);
        const outside = windowOutsideRange(system, P, y, w, ci.departAfter, ci.departBefore, aM - system.bodies[P].radius, aim);
        if (outside) windowNotes.push(outside);
        const leg = escapeEvents(draft, x, y, w, ci.fromAltitude, ci.fromInclination, aim);
        depart = leg.depart;
        dv = leg.dvDepart;
        vArrive = leg.vArrive;
        hops.push({ kind: 'to-parent', from: link.from, to: link.to, depart, arrive: leg.leaveMoon, dv });
        // the interplanetary hop starts where the ship leaves the moon
        depart = leg.leaveMoon;
        dv = 0;
      } else if (link.kind === 'siblings') {
        const span = ci.departBefore - ci.departAfter;
        const after = sit ? Math.max(ci.departAfter, sit.t + 3600) : ci.departAfter;
        const before = Math.max(ci.departBefore, after + span);
        const w = bestWindow(system, x, y, after, before, altitudeHere, aim);
        const outside = windowOutsideRange(system, x, y, w, after, before, altitudeHere, aim);
        if (outside) windowNotes.push(outside);
        const leg = siblingsEvents(draft, x, y, w, altitudeHere, sit ? null : ci.fromInclination, aim, sit);
        depart = leg.depart;
        dv = leg.dvDepart;
        vArrive = leg.vArrive;
      } else {
        if (!sit) {
          const plane = link.kind === 'to-moon' ? orbitNormal(system, y, ci.departAfter) : orbitNormal(system, x, ci.departAfter);
          sit = startInPlane(draft, x, ci.fromAltitude, plane, ci.fromInclination, ci.departAfter);
        }
        if (link.kind === 'to-moon') {
          const leg = searchMoonTransfer(draft, sit, y, aim, signal);
          toMoonEvents(draft, sit, y, leg, aim);
          depart = leg.depart;
          dv = leg.dvDepart;
          vArrive = leg.vArrive;
        } else {
          const tol = last ? 0.25 * (aim.altitude - ci.periapsisAltitude) : Math.max(10e3, 0.1 * aim.altitude);
          const leg = toParentEvents(draft, sit, aim, tol);
          depart = leg.depart;
          dv = leg.dvDepart;
          vArrive = leg.vArrive;
        }
      }
      const arrive = situationAfter(draft).t;
      if (last) {
        dv += finalArrivalDv(by, finalOrbit, vArrive);
        finalArrivalEvents(draft, by, finalOrbit);
      } else {
        dv += captureDv(by, aim, vArrive);
        captureEvents(draft, by, aim);
        // a short coast in the captured orbit so the next hop starts from a settled state
        draft.events.push({
          type: 'coast',
          id: eventId(draft, `Coast about ${by.name}`),
          name: `Coast about ${by.name}`,
          until: { kind: 'duration', dt: 600 },
        });
        altitudeHere = aim.altitude;
      }
      sit = situationAfter(draft);
      hops.push({
        kind: arrivalLink.kind,
        from: escapes ? system.bodies[system.bodies[x].parentIndex].id : arrivalLink.from,
        to: arrivalLink.to,
        depart,
        arrive,
        dv,
      });
    } catch (e) {
      if (!(e instanceof SolverError) || e.reason === 'cancelled') throw e;
      throw hopError(system, ci, system.bodies[x].name, by.name, sit, e);
    }
  }
  return { draft, hops, windowNotes };
}

/** Total Δv of a draft's patched-conic flight with its target (Infinity when it fails or runs short of propellant). */
function flownCost(draft: Draft, target: PlanTarget): number {
  const res = evaluate(draft.system, { ...draftPlan(draft), target }, { samplesPerSegment: 0 });
  if (res.budget.failedBurns.length > 0 || !res.target?.reached) return Number.POSITIVE_INFINITY;
  return res.budget.total;
}

/**
 * The route targeted with the ample vehicle, given back with the designer's ship: the margin of
 * the budget (plan/budget.ts: Δv left − reserve − missing, here carried − needed − reserve), and
 * when the ship cannot carry the Δv the route needs, the verdict not met and the shortfall in words.
 */
function withShip(t: TargetResult, ci: CheckedIntent, carried: number): TargetResult {
  // the reserve as plan/budget.ts reserveFor holds it back: percent of the Δv needed plus an absolute amount
  const marginOf = (needed: number): number => carried - needed - ((ci.reserve.percent / 100) * needed + ci.reserve.absolute);
  const plan = { ...t.plan, vehicle: ci.vehicle };
  const margin = { before: marginOf(t.dv.before), after: marginOf(t.dv.after) };
  if (!(t.dv.after > carried)) return { ...t, plan, margin };
  const shortfall = `the route needs about ${kmps(t.dv.after, 1)}; the ${ci.vehicle.name || 'ship'} carries ${kmps(carried, 1)} — add propellant or a stage`;
  return { ...t, plan, margin, status: 'not-met', message: t.status === 'met' ? shortfall : `${shortfall}; and ${t.message}` };
}

/** Builds and targets a route (see the module comment). InputError for a bad intent; SolverError when no route is found or it is cancelled. */
export function planRoute(system: StarSystem, intent: RouteIntent, options: RouteOptions = {}): RouteResult {
  const ci = checkIntent(system, intent);
  const { onProgress, signal } = options;
  const cancelled = (): void => {
    if (signal?.aborted) throw new SolverError('route', 'cancelled', 'route cancelled');
  };
  const tb0 = system.bodies[ci.to];
  const target: PlanTarget = {
    body: tb0.id,
    periapsisAltitude: ci.periapsisAltitude,
    e: ci.apoapsisGiven ? null : 0,
    apoapsisAltitude: ci.apoapsisGiven ? ci.apoapsisAltitude : null,
    i: ci.inclination,
    tolerance: { periapsisAltitude: 10e3, e: 0.01, i: (0.2 * Math.PI) / 180 },
  };
  // a moon to another planet: both ways are built and the cheaper flight is kept
  const twoWays = ci.links.length > 1 && ci.links[0].kind === 'to-parent' && ci.links[1].kind === 'siblings';
  let built: ReturnType<typeof buildRoute> | null = null;
  let firstError: unknown = null;
  for (const direct of twoWays ? [true, false] : [false]) {
    try {
      const b = buildRoute(system, ci, options, direct);
      if (!built || flownCost(b.draft, target) < flownCost(built.draft, target)) built = b;
    } catch (e) {
      if (e instanceof SolverError && e.reason === 'cancelled') throw e;
      firstError ??= e;
    }
  }
  if (!built) throw firstError;
  const { draft, hops, windowNotes } = built;
  const fb = system.bodies[ci.from];
  const tb = system.bodies[ci.to];
  if (!draft.start) throw new InputError('from', 'gives no start orbit');
  const orbitWords = ci.apoapsisGiven
    ? `a ${(ci.periapsisAltitude / 1000).toFixed(0)} × ${(ci.apoapsisAltitude / 1000).toFixed(0)} km orbit`
    : `a ${(ci.periapsisAltitude / 1000).toFixed(0)} km circular orbit`;
  const plan: Plan = {
    name: ci.name ?? `${fb.name} to ${tb.name}`,
    description: `From a ${(ci.fromAltitude / 1000).toFixed(0)} km orbit of ${fb.name} to ${orbitWords} of ${tb.name}, built as a route of ${hops.length} hop${hops.length === 1 ? '' : 's'}.`,
    vehicle: ci.vehicle,
    start: draft.start,
    events: draft.events,
    target,
    reserve: ci.reserve,
    end: null,
    truthModel: ci.truthModel,
  };
  cancelled();
  onProgress?.(0.5, 'Targeting the route');
  // targeted with the ample vehicle (the impulsive trajectory does not depend on the masses), but
  // in finite burns, whose durations do, with the ship itself when it carries the route
  const ample = draft.vehicle;
  const carried = deltaVLeft(ci.vehicle);
  const ownShip = ci.truthModel === 'finite' && !(evaluate(system, plan, { samplesPerSegment: 0 }).budget.total > carried);
  const targeted = targetPlan(system, ownShip ? plan : { ...plan, vehicle: ample }, {
    model: ci.truthModel,
    signal,
    onProgress: (p) => onProgress?.(0.5 + (0.5 * (p.leg - 1)) / p.legs, `Targeting the ${p.legName}`),
  });
  const result = ownShip ? targeted : withShip(targeted, ci, carried);
  onProgress?.(1, 'Route done');
  const dvEstimate = hops.reduce((s, h) => s + h.dv, 0);
  const cal = system.calendar;
  const met = result.status === 'met';
  const message =
    `${plan.name}: ${hops.length} hop${hops.length === 1 ? '' : 's'}, departing ${formatDate(cal, hops[0].depart)} and arriving ${formatDate(cal, hops[hops.length - 1].arrive)}, ` +
    `${kmps(result.dv.after)} in ${ci.truthModel === 'conic' ? 'patched conics' : ci.truthModel === 'finite' ? 'finite burns' : 'n-body'} (estimate ${kmps(dvEstimate)}), ` +
    `${met ? 'target orbit met' : 'target orbit not met'}${met ? '' : `: ${result.message}`}` +
    windowNotes.map((n) => `; ${n}`).join('');
  return { plan: result.plan, hops, target: result, dvEstimate, message: message.endsWith('.') ? message : `${message}.` };
}
