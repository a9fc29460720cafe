/**
 * Evaluation of runtime data in memory (core/runtime/evaluate.ts): which arc and piece a time
 * reads (the later one at a shared boundary), the chain of centres, and its input checks.
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/index.ts';
import { runtimeEphemeris, trackAbsolutePosition, trackCenter, trackIndex, trackPosition } from '../../../core/runtime/index.ts';
import { demoFlight, demoShipInput, ilmar } from './demoShip.ts';

const system = ilmar();
const flight = demoFlight(system);
const t0 = flight.segments[0].t0;
const t1 = flight.segments[flight.segments.length - 1].t1;
const data = runtimeEphemeris(system, { t0, t1, ships: [demoShipInput(flight)] });
const ship = trackIndex(data, 'long-patience');

describe('evaluate', () => {
  it('finds tracks by name (−1 for none)', () => {
    expect(trackIndex(data, 'tessel')).toBe(system.indexById.tessel - 1);
    expect(ship).toBe(data.tracks.length - 1);
    expect(trackIndex(data, 'venus')).toBe(-1);
  });

  it('at a shared arc boundary reads the later arc; the star-relative position adds each centre once', () => {
    const soi = data.tracks[ship].arcs[1].t0;
    expect(trackCenter(data, ship, soi)).toBe(-1);
    expect(trackCenter(data, ship, soi - 1e-6)).toBe(system.indexById.tessel - 1);
    // ship about Ochre: its own position plus Ochre's (Ochre's centre is the star)
    const t = data.tracks[ship].arcs[2].t0 + 1000;
    const own = trackPosition(data, ship, t, new Float64Array(3));
    const ochre = trackPosition(data, system.indexById.ochre - 1, t, new Float64Array(3));
    const abs = trackAbsolutePosition(data, ship, t, new Float64Array(3));
    for (let c = 0; c < 3; c++) expect(abs[c]).toBe(0 + own[c] + ochre[c]);
  });

  it('refuses a time outside the track’s span and a bad track index (InputError naming the field)', () => {
    expect(() => trackPosition(data, 0, t1 + 1, new Float64Array(3))).toThrow(InputError);
    expect(() => trackPosition(data, 0, t0 - 1, new Float64Array(3))).toThrow(/^t must lie in the span of track 'kiln'/);
    expect(() => trackPosition(data, 0, Number.NaN, new Float64Array(3))).toThrow(/^t must lie/);
    expect(() => trackPosition(data, 99, t0, new Float64Array(3))).toThrow(/^track must be a track index in \[0, 8\]/);
    expect(() => trackPosition(data, -1, t0, new Float64Array(3))).toThrow(InputError);
  });
});
