/**
 * The Windows screen's sequence mode: a chain of sister bodies picked in order (Tessel → Moravel
 * → Fennick; a body may come back for a resonant return), a departure range, powered or
 * unpowered flybys, and the request it makes for core/search searchSequence. Starting values
 * follow the command line's `sequence`: departures from the plan's epoch over one synodic period
 * of the first two bodies, parking and capture periapses 100 km above the safe altitudes
 * (core/io/defaults.ts orbitAltitude), flight times from the core's defaults.
 */
import { orbitAltitude, safeAltitude } from '../../../core/io/index.ts';
import { synodicPeriod } from '../../../core/orbit/index.ts';
import type { Plan } from '../../../core/plan/index.ts';
import type { SequenceRequest } from '../../../core/search/index.ts';
import type { Body, StarSystem } from '../../../core/system/index.ts';

export interface SequenceForm {
  /** Body ids in order (≥ 2 for a search). */
  bodies: string[];
  /** Departure range, s from the epoch. */
  departStart: number;
  departEnd: number;
  powered: boolean;
  /** Capture at the last body (false: fly past it, no capture burn). */
  capture: boolean;
  parkingAlt: number;
  captureAlt: number;
  keep: number;
}

/** Solutions kept by default (as `waymark sequence --keep`). */
export const SEQUENCE_FORM_KEEP = 8;

/** The bodies that may follow `bodies` in a chain: the sisters of its first body (all of them for an empty chain), not the last body again. */
export function nextChoices(system: StarSystem, bodies: readonly string[]): Body[] {
  const first = bodies.length > 0 ? system.bodies[system.indexById[bodies[0]]] : undefined;
  const last = bodies[bodies.length - 1];
  return system.bodies.filter((b) => b.index !== 0 && (!first || b.parentIndex === first.parentIndex) && b.id !== last);
}

/** Departure span for a chain: one synodic period of its first two bodies (one period when they share it). */
export function departureSpan(system: StarSystem, bodies: readonly string[]): number {
  const a = system.bodies[system.indexById[bodies[0]]];
  const b = system.bodies[system.indexById[bodies[1] ?? bodies[0]]];
  if (!a || !b) return 0;
  const p1 = a.derived.period;
  const p2 = b.derived.period;
  return p1 === p2 ? p1 : synodicPeriod(p1, p2);
}

/** The starting chain for a plan: its start body, the largest sister body beyond it, then its target (or the outermost sister). */
export function initialSequenceForm(system: StarSystem, plan: Plan): SequenceForm {
  const start = system.bodies[system.indexById[plan.start.body]] ?? system.bodies.find((b) => b.index !== 0)!;
  const sisters = system.bodies.filter((b) => b.index !== 0 && b.parentIndex === start.parentIndex && b.id !== start.id);
  const target = plan.target && sisters.some((b) => b.id === plan.target!.body) ? system.bodies[system.indexById[plan.target.body]] : undefined;
  const last = target ?? [...sisters].sort((x, y) => (y.elements?.a ?? 0) - (x.elements?.a ?? 0))[0];
  // the heaviest sister between the two (by orbit size), as the flyby body
  const lo = Math.min(start.elements?.a ?? 0, last?.elements?.a ?? 0);
  const hi = Math.max(start.elements?.a ?? 0, last?.elements?.a ?? 0);
  const between = sisters.filter((b) => b !== last && (b.elements?.a ?? 0) > lo && (b.elements?.a ?? 0) < hi).sort((x, y) => y.mu - x.mu)[0];
  const bodies = [start.id, ...(between ? [between.id] : []), ...(last ? [last.id] : [])];
  const lastBody = last ?? start;
  return {
    bodies,
    departStart: plan.start.epoch,
    departEnd: plan.start.epoch + departureSpan(system, bodies),
    powered: true,
    capture: true,
    parkingAlt: safeAltitude(start, plan.start.kind === 'parking' ? plan.start.periapsisAltitude : undefined),
    captureAlt: safeAltitude(lastBody, plan.target?.body === lastBody.id ? plan.target.periapsisAltitude : undefined),
    keep: SEQUENCE_FORM_KEEP,
  };
}

/** The chain changed: the departure span and the altitudes follow its first and last bodies. */
export function chainChanged(system: StarSystem, form: SequenceForm): SequenceForm {
  const first = system.bodies[system.indexById[form.bodies[0]]];
  const last = system.bodies[system.indexById[form.bodies[form.bodies.length - 1]]];
  return {
    ...form,
    departEnd: form.bodies.length >= 2 ? form.departStart + departureSpan(system, form.bodies) : form.departEnd,
    parkingAlt: first ? safeAltitude(first, form.parkingAlt) : form.parkingAlt,
    captureAlt: last ? orbitAltitude(last) : form.captureAlt,
  };
}

/** The search the form describes, or a sentence saying what is missing. */
export function sequenceRequest(system: StarSystem, form: SequenceForm): SequenceRequest | string {
  if (form.bodies.length < 2) return 'Pick at least two bodies in order.';
  const unknown = form.bodies.find((id) => system.indexById[id] === undefined);
  if (unknown !== undefined) return `${unknown} is not a body of ${system.name}.`;
  if (!(form.departEnd > form.departStart)) return 'The departure range must end after it starts.';
  return {
    bodies: [...form.bodies],
    departFrom: form.departStart,
    departTo: form.departEnd,
    departAltitude: form.parkingAlt,
    arriveAltitude: form.captureAlt,
    arriveE: form.capture ? 0 : null,
    powered: form.powered,
    keep: form.keep,
  };
}
