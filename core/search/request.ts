/**
 * What a porkchop grid is asked to compute: plain data (structured-cloneable, JSON-friendly),
 * so the same request travels to Node worker threads and browser Web Workers unchanged.
 *
 * Grid axes
 * - Rows: departure times `depart.start .. depart.end` (s from the epoch), `depart.n` samples.
 * - Columns: `second` — times of flight (axis 'tof', s) or arrival times (axis 'arrival', s
 *   from the epoch), `second.n` samples.
 * - Samples are evenly spaced and include both ends: value k of an axis of n samples is
 *   start + (end − start)·k/(n − 1); an axis of one sample is `start` alone (`axisValue`).
 */
import { InputError, requireFinite, requireNonNegative } from '../math/index.ts';

/** What "best" means on a grid and for windows. */
export type PorkchopMetric = 'total' | 'departure' | 'arrival' | 'c3';

export const PORKCHOP_METRICS: readonly PorkchopMetric[] = ['total', 'departure', 'arrival', 'c3'];

/** One evenly sampled axis, both ends included. */
export interface GridAxis {
  start: number;
  end: number;
  n: number;
}

export interface PorkchopRequest {
  /** Index of the departure body in `StarSystem.bodies`. */
  from: number;
  /** Index of the arrival body. */
  to: number;
  /** Departure times, s from the epoch. */
  depart: GridAxis;
  /** Meaning of the second axis: 'tof' (time of flight, s) or 'arrival' (arrival time, s from the epoch). */
  secondAxis: 'tof' | 'arrival';
  /** Times of flight (s) or arrival times (s from the epoch), per `secondAxis`. */
  second: GridAxis;
  /** Parking-orbit periapsis altitude above the departure body's mean radius, m. */
  parkingAltitude: number;
  /** Parking-orbit eccentricity (the burn is at its periapsis); default 0. */
  parkingEccentricity?: number;
  /** Periapsis altitude of the arrival hyperbola and target orbit above the arrival body's mean radius, m. */
  arrivalAltitude: number;
  /** Target-orbit eccentricity (capture burn at periapsis), or 'flyby' for no capture burn; default 0. */
  arrivalEccentricity?: number | 'flyby';
  /** Largest number of complete revolutions on the transfer arc; default 0. */
  maxRevs?: number;
  /** Retrograde transfer arcs (clockwise about +z); default false. */
  retrograde?: boolean;
  /** What "best" means (picks the revolution count/branch per cell and ranks windows); default 'total'. */
  metric?: PorkchopMetric;
}

/** Largest number of samples along one axis. */
export const MAX_AXIS_SAMPLES = 20000;
/** Largest number of revolutions a request may ask for (the planes store revs in an Int8Array). */
export const MAX_REVS = 50;

/** Value k of an axis: start + (end − start)·k/(n − 1), or start when n = 1. */
export function axisValue(axis: GridAxis, k: number): number {
  return axis.n === 1 ? axis.start : axis.start + ((axis.end - axis.start) * k) / (axis.n - 1);
}

/** All values of an axis. */
export function axisValues(axis: GridAxis): Float64Array {
  const out = new Float64Array(axis.n);
  for (let k = 0; k < axis.n; k++) out[k] = axisValue(axis, k);
  return out;
}

/** Spacing of an axis (0 for a single sample). */
export function axisStep(axis: GridAxis): number {
  return axis.n === 1 ? 0 : (axis.end - axis.start) / (axis.n - 1);
}

function checkAxis(field: string, axis: GridAxis): void {
  if (axis === null || typeof axis !== 'object') throw new InputError(field, 'must be an object { start, end, n }', axis);
  requireFinite(`${field}.start`, axis.start);
  requireFinite(`${field}.end`, axis.end);
  if (!Number.isInteger(axis.n) || axis.n < 1 || axis.n > MAX_AXIS_SAMPLES) {
    throw new InputError(`${field}.n`, `must be an integer from 1 to ${MAX_AXIS_SAMPLES}`, axis.n);
  }
  if (axis.n > 1 && !(axis.end > axis.start)) throw new InputError(`${field}.end`, 'must be > start when n > 1', axis.end);
  if (axis.n === 1 && axis.end < axis.start) throw new InputError(`${field}.end`, 'must be >= start', axis.end);
}

function checkEccentricity(field: string, e: number): void {
  requireNonNegative(field, e);
  if (!(e < 1)) throw new InputError(field, 'must be < 1 (closed orbit)', e);
}

/**
 * Checks the request's own fields (not the bodies: see transfer.ts) and returns a copy with
 * every default filled in. InputError names the field and the rule.
 */
export function normalizeRequest(request: PorkchopRequest): Required<PorkchopRequest> {
  if (request === null || typeof request !== 'object') throw new InputError('request', 'must be an object', request);
  for (const f of ['from', 'to'] as const) {
    if (!Number.isInteger(request[f]) || request[f] < 0) throw new InputError(f, 'must be a body index (integer >= 0)', request[f]);
  }
  checkAxis('depart', request.depart);
  if (request.secondAxis !== 'tof' && request.secondAxis !== 'arrival') {
    throw new InputError('secondAxis', "must be 'tof' or 'arrival'", request.secondAxis);
  }
  checkAxis('second', request.second);
  if (request.secondAxis === 'tof' && !(request.second.start > 0)) {
    throw new InputError('second.start', 'must be a time of flight > 0', request.second.start);
  }
  requireNonNegative('parkingAltitude', request.parkingAltitude);
  requireNonNegative('arrivalAltitude', request.arrivalAltitude);
  const parkingEccentricity = request.parkingEccentricity ?? 0;
  checkEccentricity('parkingEccentricity', parkingEccentricity);
  const arrivalEccentricity = request.arrivalEccentricity ?? 0;
  if (arrivalEccentricity !== 'flyby') checkEccentricity('arrivalEccentricity', arrivalEccentricity);
  const maxRevs = request.maxRevs ?? 0;
  if (!Number.isInteger(maxRevs) || maxRevs < 0 || maxRevs > MAX_REVS) {
    throw new InputError('maxRevs', `must be an integer from 0 to ${MAX_REVS}`, maxRevs);
  }
  const retrograde = request.retrograde ?? false;
  if (typeof retrograde !== 'boolean') throw new InputError('retrograde', 'must be a boolean', retrograde);
  const metric = request.metric ?? 'total';
  if (!PORKCHOP_METRICS.includes(metric)) throw new InputError('metric', `must be one of ${PORKCHOP_METRICS.join(', ')}`, metric);
  return {
    from: request.from,
    to: request.to,
    depart: { start: request.depart.start, end: request.depart.end, n: request.depart.n },
    secondAxis: request.secondAxis,
    second: { start: request.second.start, end: request.second.end, n: request.second.n },
    parkingAltitude: request.parkingAltitude,
    parkingEccentricity,
    arrivalAltitude: request.arrivalAltitude,
    arrivalEccentricity,
    maxRevs,
    retrograde,
    metric,
  };
}
