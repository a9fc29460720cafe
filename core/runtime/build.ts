/**
 * Runtime ephemeris data for a span: the tracks of every body of the system (bodies.ts) and of any
 * ships (ship.ts), with the system's name, its star's id (the origin of the axes) and its epoch's
 * label (time zero), ready for format.ts to write.
 */
import { InputError } from '../math/index.ts';
import type { StarSystem } from '../system/index.ts';
import { type BodyFitOptions, fitBodyTracks, requireSpan } from './bodies.ts';
import type { RuntimeEphemeris } from './model.ts';
import { type ShipInput, fitShipTrack } from './ship.ts';

export interface RuntimeOptions {
  /** Span of the data, s from the system's epoch (every ship's arcs must lie within it). */
  t0: number;
  t1: number;
  /** Tolerance and degree of the bodies' tracks. */
  bodies?: BodyFitOptions;
  /** Ships' paths. */
  ships?: ShipInput[];
}

/** Fits the bodies (and ships) of `system` over [options.t0, options.t1]. */
export function runtimeEphemeris(system: StarSystem, options: RuntimeOptions): RuntimeEphemeris {
  const { t0, t1 } = options;
  requireSpan(t0, t1);
  const tracks = fitBodyTracks(system, t0, t1, options.bodies);
  const names = new Set(tracks.map((t) => t.name));
  (options.ships ?? []).forEach((ship, k) => {
    if (names.has(ship.name)) throw new InputError(`ships[${k}].name`, 'must differ from every body id and other ship name', ship.name);
    const first = ship.arcs?.[0]?.t0;
    const last = ship.arcs?.[ship.arcs.length - 1]?.t1;
    if (first < t0 || last > t1) throw new InputError(`ships[${k}].arcs`, `must lie within the span [${t0}, ${t1}] s`, [first, last]);
    const track = fitShipTrack(system, ship);
    names.add(track.name);
    tracks.push(track);
  });
  return { system: system.name, origin: system.bodies[0].id, epoch: system.epoch.label, t0, t1, tracks };
}
