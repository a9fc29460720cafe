/**
 * runtimeEphemeris (core/runtime/build.ts): the file's header fields from the system, the tracks'
 * order (bodies in the system's order without the star, then the ships), and its input checks.
 */
import { describe, expect, it } from 'vitest';
import { runtimeEphemeris } from '../../../core/runtime/index.ts';
import { demoFlight, demoShipInput, ilmar } from './demoShip.ts';

const system = ilmar();
const flight = demoFlight(system);
const t0 = flight.segments[0].t0;
const t1 = flight.segments[flight.segments.length - 1].t1;
const ship = () => demoShipInput(flight);

describe('runtimeEphemeris', () => {
  it('names the system, its star (the origin) and its epoch; bodies first (system body j is track j − 1), then the ships', () => {
    const data = runtimeEphemeris(system, { t0, t1, ships: [ship()] });
    expect(data.system).toBe('Ilmar');
    expect(data.origin).toBe('ilmar');
    expect(data.epoch).toBe(system.epoch.label);
    expect([data.t0, data.t1]).toEqual([t0, t1]);
    expect(data.tracks.map((t) => t.name)).toEqual([...system.bodies.slice(1).map((b) => b.id), 'long-patience']);
    expect(data.tracks.map((t) => t.kind)).toEqual([...system.bodies.slice(1).map(() => 'body'), 'ship']);
    expect(runtimeEphemeris(system, { t0, t1 }).tracks).toHaveLength(system.bodies.length - 1);
  });

  it('refuses a ship named like a body, a ship outside the span and an empty span, naming the field', () => {
    expect(() => runtimeEphemeris(system, { t0, t1, ships: [{ ...ship(), name: 'ochre' }] })).toThrow(/^ships\[0\]\.name must differ/);
    expect(() => runtimeEphemeris(system, { t0, t1, ships: [ship(), ship()] })).toThrow(/^ships\[1\]\.name must differ/);
    expect(() => runtimeEphemeris(system, { t0: t0 + 100, t1, ships: [ship()] })).toThrow(/^ships\[0\]\.arcs must lie within the span/);
    expect(() => runtimeEphemeris(system, { t0, t1: t0 })).toThrow(/^t1 must be later than t0/);
    expect(() => runtimeEphemeris(system, { t0, t1, bodies: { tolerance: 0 } })).toThrow(/^tolerance must be > 0/);
  });
});
