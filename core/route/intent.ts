/**
 * What the designer asks a route for (RouteIntent) and its checks: each refusal is an InputError
 * whose field is the intent's own path ('to.periapsisAltitude') and whose rule reads in the
 * designer's words ("must be at least Skerry's safe altitude 8 km"). An altitude not given
 * defaults to the body's minimum safe altitude (the system file's atmosphere top or terrain).
 */
import { InputError } from '../math/index.ts';
import type { StarSystem } from '../system/index.ts';
import { checkVehicle, type ReservePolicy, type TruthModel, type Vehicle } from '../plan/index.ts';
import { routeChain, type RouteLink } from './chain.ts';

export interface RouteIntent {
  /** Where the ship is: a circular orbit of a planet or moon. */
  from: { body: string; altitude: number /* m above mean radius, circular */; inclination?: number | null /* rad */ };
  /** Where it must end: an orbit of a planet or moon. */
  to: { body: string; periapsisAltitude: number /* m */; apoapsisAltitude?: number | null; inclination?: number | null /* rad */ };
  /** Departure date range, s from the system epoch. */
  departAfter: number;
  departBefore: number;
  vehicle: Vehicle;
  reserve?: ReservePolicy;
  name?: string;
  /** Model the route is targeted in; default 'conic'. */
  truthModel?: TruthModel;
}

/** An intent checked, with defaults filled in and bodies resolved to indices. */
export interface CheckedIntent {
  from: number;
  to: number;
  fromAltitude: number;
  fromInclination: number | null;
  periapsisAltitude: number;
  /** Equal to the periapsis altitude for a circular target. */
  apoapsisAltitude: number;
  /** The designer gave an apoapsis (the target names it rather than e = 0). */
  apoapsisGiven: boolean;
  inclination: number | null;
  departAfter: number;
  departBefore: number;
  vehicle: Vehicle;
  reserve: ReservePolicy;
  name: string | null;
  truthModel: TruthModel;
  links: RouteLink[];
}

const MODELS: readonly TruthModel[] = ['conic', 'finite', 'nbody'];
/** An orbit's apoapsis must stay within this fraction of the body's sphere of influence (common practice: well inside, where the two-body orbit holds). */
export const SOI_FRACTION = 0.5;

const km = (m: number): string => `${Number((m / 1000).toPrecision(6))} km`;

function altitudeOf(system: StarSystem, k: number, field: string, value: unknown): number {
  const b = system.bodies[k];
  if (value === undefined || value === null) return b.safeAlt;
  if (typeof value !== 'number' || !Number.isFinite(value)) throw new InputError(field, 'must be a finite altitude in metres', value);
  if (value < b.safeAlt) throw new InputError(field, `must be at least ${b.name}'s safe altitude ${km(b.safeAlt)}`, value);
  const limit = SOI_FRACTION * b.derived.soiRadius - b.radius;
  if (!(value < limit)) throw new InputError(field, `must be below ${km(limit)} (half ${b.name}'s sphere of influence)`, value);
  return value;
}

function inclinationOf(field: string, value: unknown): number | null {
  if (value === undefined || value === null) return null;
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0 || value > Math.PI)
    throw new InputError(field, 'must be an inclination from 0 to 180°', value);
  return value;
}

/** Checks an intent (see the module comment); throws InputError naming the field. */
export function checkIntent(system: StarSystem, intent: RouteIntent): CheckedIntent {
  if (!intent || typeof intent !== 'object') throw new InputError('intent', 'must be an object', intent);
  if (!intent.from || typeof intent.from !== 'object') throw new InputError('from', 'must give a body and an altitude');
  if (!intent.to || typeof intent.to !== 'object') throw new InputError('to', 'must give a body and a target orbit');
  let links: RouteLink[];
  try {
    links = routeChain(system, intent.from.body, intent.to.body);
  } catch (e) {
    if (e instanceof InputError) throw new InputError(`${e.field}.body`, e.rule, e.value);
    throw e;
  }
  const from = system.indexById[intent.from.body];
  const to = system.indexById[intent.to.body];
  const fromAltitude = altitudeOf(system, from, 'from.altitude', intent.from.altitude);
  const fromInclination = inclinationOf('from.inclination', intent.from.inclination);
  const periapsisAltitude = altitudeOf(system, to, 'to.periapsisAltitude', intent.to.periapsisAltitude);
  const apoGiven = intent.to.apoapsisAltitude !== undefined && intent.to.apoapsisAltitude !== null;
  let apoapsisAltitude = periapsisAltitude;
  if (apoGiven) {
    apoapsisAltitude = altitudeOf(system, to, 'to.apoapsisAltitude', intent.to.apoapsisAltitude);
    if (apoapsisAltitude < periapsisAltitude)
      throw new InputError('to.apoapsisAltitude', `must be at least the periapsis altitude ${km(periapsisAltitude)}`, apoapsisAltitude);
  }
  const inclination = inclinationOf('to.inclination', intent.to.inclination);
  for (const f of ['departAfter', 'departBefore'] as const) {
    if (typeof intent[f] !== 'number' || !Number.isFinite(intent[f])) throw new InputError(f, 'must be a date (s from the epoch)', intent[f]);
  }
  if (!(intent.departBefore > intent.departAfter))
    throw new InputError('departBefore', 'must be after the earliest departure (an empty date range)', intent.departBefore);
  checkVehicle(intent.vehicle, 'vehicle');
  const reserve = intent.reserve ?? { percent: 5, absolute: 50 };
  if (!(reserve.percent >= 0 && reserve.absolute >= 0)) throw new InputError('reserve', 'must hold a percent and an absolute amount, both at least 0', reserve);
  const truthModel = intent.truthModel ?? 'conic';
  if (!MODELS.includes(truthModel)) throw new InputError('truthModel', `must be one of ${MODELS.join(', ')}`, truthModel);
  if (intent.name !== undefined && typeof intent.name !== 'string') throw new InputError('name', 'must be text', intent.name);
  return {
    from,
    to,
    fromAltitude,
    fromInclination,
    periapsisAltitude,
    apoapsisAltitude,
    apoapsisGiven: apoGiven,
    inclination,
    departAfter: intent.departAfter,
    departBefore: intent.departBefore,
    vehicle: intent.vehicle,
    reserve,
    name: intent.name ?? null,
    truthModel,
    links,
  };
}
