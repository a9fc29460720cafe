/** Shared inputs of the mission tests: the demo system, a small textbook-constant system, plans. */
import { readFileSync } from 'node:fs';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import type { Plan, PlanEvent, PlanStart, Vehicle } from '../../../core/plan/plan.ts';
import { buildStarSystem } from '../../../core/system/build.ts';
import type { BodyDocument, SystemDocument } from '../../../core/system/document.ts';
import type { StarSystem } from '../../../core/system/model.ts';

let demo: StarSystem | null = null;

/** The Ilmar demo system (assets/systems/ilmar.system.json). */
export function demoSystem(): StarSystem {
  if (!demo) demo = parseSystemFile(readFileSync(new URL('../../../assets/systems/ilmar.system.json', import.meta.url), 'utf8')).system;
  return demo;
}

/** Textbook constants used as reference inputs (Curtis, Orbital Mechanics for Engineering Students, Table A.1 / A.2, from memory). */
export const MU_SUN = 1.32712e20;
export const MU_EARTH = 3.986e14;
export const R_EARTH = 6.378e6;
export const AU = 1.496e11;

export function body(id: string, parent: string, mu: number, radius: number, safeAlt: number, orbit: Partial<BodyDocument['orbit']>): BodyDocument {
  return {
    id,
    name: id[0].toUpperCase() + id.slice(1),
    parent,
    mu_m3_s2: mu,
    radius_m: radius,
    min_safe_altitude_m: safeAlt,
    orbit: { a_m: AU, e: 0, i_deg: 0, raan_deg: 0, argp_deg: 0, mean_anomaly_deg: 0, ...orbit },
  };
}

/** A sun with an Earth-like planet "loam" at 1 AU (circular, in the reference plane) plus extra bodies. */
export function testSystem(extra: BodyDocument[] = []): StarSystem {
  const doc: SystemDocument = {
    format: 'waymark-system',
    version: 1,
    name: 'Test',
    epoch: { label: 'Year 1, day 1' },
    calendar: { year_s: 365 * 86400, day_s: 86400, year_at_epoch: 1 },
    star: { id: 'sun', name: 'Sun', mu_m3_s2: MU_SUN, radius_m: 6.96e8, min_safe_altitude_m: 1e9 },
    bodies: [body('loam', 'sun', MU_EARTH, R_EARTH, 100e3, {}), ...extra],
  };
  return buildStarSystem(doc);
}

/** A one-stage vehicle with plenty of Δv (≈ 11 km/s). */
export const bigVehicle: Vehicle = {
  name: 'test ship',
  payloadMass: 1000,
  stages: [{ name: 'main', dryMass: 1000, propellantMass: 48000, isp: 450, thrust: 1e6 }],
};

export function plan(start: PlanStart, events: PlanEvent[], extra: Partial<Plan> = {}): Plan {
  return {
    name: 'test',
    description: '',
    vehicle: bigVehicle,
    start,
    events,
    target: null,
    reserve: { percent: 0, absolute: 0 },
    end: null,
    ...extra,
  };
}

export function stateStart(bodyId: string, r: number[], v: number[], epoch = 0): PlanStart {
  return { kind: 'state', body: bodyId, epoch, r: [r[0], r[1], r[2]], v: [v[0], v[1], v[2]] };
}

export function impulsive(id: string, t: number | null, dv: [number, number, number], frame: 'vnb' | 'rtn' | 'inertial' = 'vnb'): PlanEvent {
  return { type: 'burn', id, name: id, t, frame, dv, solve: { kind: 'fixed' }, mode: 'impulsive', pointing: 'velocity' };
}

/** Every number in a value tree (typed arrays included) is finite. */
export function allFinite(x: unknown, path = 'result'): string | null {
  if (typeof x === 'number') return Number.isFinite(x) ? null : path;
  if (ArrayBuffer.isView(x)) {
    const a = x as unknown as ArrayLike<number>;
    for (let i = 0; i < a.length; i++) if (!Number.isFinite(a[i])) return `${path}[${i}]`;
    return null;
  }
  if (Array.isArray(x)) {
    for (let i = 0; i < x.length; i++) {
      const p = allFinite(x[i], `${path}[${i}]`);
      if (p) return p;
    }
    return null;
  }
  if (x && typeof x === 'object') {
    for (const [k, v] of Object.entries(x)) {
      const p = allFinite(v, `${path}.${k}`);
      if (p) return p;
    }
  }
  return null;
}
