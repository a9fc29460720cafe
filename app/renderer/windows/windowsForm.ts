/**
 * The Windows screen's form: which bodies it offers (every planet and moon, grouped under their
 * planets), its starting values for a plan (the defaults the command line's `windows` uses too,
 * core/io/defaults.ts), the leg searched for the chosen pair (core/search/pair.ts) and the
 * altitude fields, which refuse an altitude below the body's minimum safe altitude.
 */
import { orbitAltitude, porkchopRanges, safeAltitude } from '../../../core/io/index.ts';
import type { Plan } from '../../../core/plan/index.ts';
import type { PorkchopPair, PorkchopRequest } from '../../../core/search/index.ts';
import type { Body, StarSystem } from '../../../core/system/index.ts';
import { numberKind, type FieldKind } from '../plan/fieldKinds.ts';
import { UNITS } from '../plan/fieldText.ts';

export interface BodyGroup {
  /** The planet (a body that orbits the star). */
  planet: Body;
  /** The planet and then its moons (and theirs), in file order. */
  bodies: Body[];
}

/** Every body with an orbit, each planet followed by its moons. */
export function bodyGroups(system: StarSystem): BodyGroup[] {
  const B = system.bodies;
  const planetOf = (b: Body): number => {
    let k = b.index;
    while (B[k].parentIndex > 0) k = B[k].parentIndex;
    return k;
  };
  return B.filter((b) => b.parentIndex === 0).map((planet) => ({
    planet,
    bodies: B.filter((b) => b.index !== 0 && planetOf(b) === planet.index),
  }));
}

/** The name shown in the body lists: "Quill (moon of Tessel)" for a moon. */
export function bodyLabel(system: StarSystem, b: Body): string {
  return b.parentIndex > 0 ? `${b.name} (moon of ${system.bodies[b.parentIndex].name})` : b.name;
}

export interface WindowsForm {
  from: string;
  to: string;
  /** Departure range, s from the epoch. */
  departStart: number;
  departEnd: number;
  /** Flight-time range, s. */
  tofMin: number;
  tofMax: number;
  gridN: number;
  /** Parking and capture periapsis altitudes of the leg's bodies, m (never below their safe altitudes). */
  parkingAlt: number;
  captureAlt: number;
}

/** The leg searched for the pair (ids), or null when the pair cannot be searched (the same body, an unknown id). */
export function legOf(system: StarSystem, from: string, to: string): PorkchopPair | null {
  const a = system.indexById[from];
  const b = system.indexById[to];
  if (a === undefined || b === undefined || a === 0 || b === 0 || a === b) return null;
  return porkchopRanges(system, a, b).pair;
}

/** The values that follow the pair: flight times, and the plan's altitudes where they belong to the leg's bodies and are safe. */
export function pairDefaults(
  system: StarSystem,
  plan: Plan,
  from: string,
  to: string,
): Pick<WindowsForm, 'tofMin' | 'tofMax' | 'parkingAlt' | 'captureAlt'> | null {
  const leg = legOf(system, from, to);
  if (!leg) return null;
  const A = system.bodies[leg.from];
  const B = system.bodies[leg.to];
  const planParking = plan.start.kind === 'parking' && plan.start.body === A.id ? plan.start.periapsisAltitude : undefined;
  const planCapture = plan.target && plan.target.body === B.id ? plan.target.periapsisAltitude : undefined;
  const parkingAlt = safeAltitude(A, planParking);
  const r = porkchopRanges(system, leg.from, leg.to, plan.start.epoch, parkingAlt);
  return { tofMin: r.tof.min, tofMax: r.tof.max, parkingAlt, captureAlt: safeAltitude(B, planCapture) };
}

/** The form for a plan: from its start body to its target (else the first other body), the shared default ranges. */
export function initialWindowsForm(system: StarSystem, plan: Plan, gridN: number): WindowsForm {
  const from = plan.start.body;
  const others = system.bodies.filter((b) => b.index !== 0 && b.id !== from);
  const target = plan.target?.body;
  const to =
    target && target !== from && system.indexById[target] !== undefined
      ? target
      : ((others.find((b) => b.parentIndex === system.bodies[system.indexById[from]]?.parentIndex) ?? others[0])?.id ?? '');
  const leg = legOf(system, from, to);
  if (!leg) {
    // nothing to search (a system of one planet): a form that names the start body only
    const alt = orbitAltitude(system.bodies[system.indexById[from] ?? 0]);
    return { from, to, departStart: plan.start.epoch, departEnd: plan.start.epoch, tofMin: 0, tofMax: 0, gridN, parkingAlt: alt, captureAlt: alt };
  }
  const p = pairDefaults(system, plan, from, to)!;
  const r = porkchopRanges(system, leg.from, leg.to, plan.start.epoch, p.parkingAlt);
  return { from, to, departStart: r.depart.start, departEnd: r.depart.end, gridN, ...p };
}

/** The search a form describes (total Δv over departure × flight time), or null when it names no leg. */
export function windowsRequest(system: StarSystem, form: WindowsForm): PorkchopRequest | null {
  const leg = legOf(system, form.from, form.to);
  if (!leg) return null;
  return {
    from: leg.from,
    to: leg.to,
    depart: { start: form.departStart, end: form.departEnd, n: form.gridN },
    secondAxis: 'tof',
    second: { start: form.tofMin, end: form.tofMax, n: form.gridN },
    parkingAltitude: form.parkingAlt,
    arrivalAltitude: form.captureAlt,
    metric: 'total',
  };
}

/** An altitude field that refuses values below `body`'s minimum safe altitude. */
export function altitudeKind(label: string, body: Body | undefined): FieldKind {
  const base = numberKind(label, UNITS.km);
  return {
    ...base,
    parse(text) {
      const p = base.parse(text);
      if (!p.ok || !body || (p.value as number) >= body.safeAlt) return p;
      return { ok: false, message: `${label} must be at least ${body.name}'s minimum safe altitude, ${(body.safeAlt / 1e3).toLocaleString('en-US')} km` };
    },
  };
}
