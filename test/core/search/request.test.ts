import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import { axisStep, axisValue, axisValues, MAX_AXIS_SAMPLES, MAX_REVS, normalizeRequest, type PorkchopRequest } from '../../../core/search/request.ts';

const DAY = 86400;
const base: PorkchopRequest = {
  from: 2,
  to: 4,
  depart: { start: 0, end: 600 * DAY, n: 25 },
  secondAxis: 'tof',
  second: { start: 50 * DAY, end: 500 * DAY, n: 10 },
  parkingAltitude: 300e3,
  arrivalAltitude: 400e3,
};

function field(r: unknown): string {
  try {
    normalizeRequest(r as PorkchopRequest);
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as InputError).field;
  }
  return 'no error';
}

describe('grid axes', () => {
  it('sample evenly with both ends included; one sample is the start', () => {
    const a = { start: 10, end: 40, n: 4 };
    expect(Array.from(axisValues(a))).toEqual([10, 20, 30, 40]);
    expect(axisStep(a)).toBe(10);
    // the end is hit exactly, not by accumulating steps (0.1 is not a binary fraction)
    const b = { start: 0, end: 1, n: 11 };
    expect(axisValue(b, 10)).toBe(1);
    expect(axisValue(b, 3)).toBe(0.3);
    expect(axisValue({ start: 5, end: 9, n: 1 }, 0)).toBe(5);
    expect(axisStep({ start: 5, end: 5, n: 1 })).toBe(0);
  });
});

describe('porkchop request', () => {
  it('fills the defaults: circular orbits at both ends, single revolution, prograde, ranked by total Δv', () => {
    const r = normalizeRequest(base);
    expect(r).toEqual({ ...base, parkingEccentricity: 0, arrivalEccentricity: 0, maxRevs: 0, retrograde: false, metric: 'total' });
    // a copy: the axes are not shared with the caller's object
    expect(r.depart).not.toBe(base.depart);
    expect(normalizeRequest({ ...base, arrivalEccentricity: 'flyby' }).arrivalEccentricity).toBe('flyby');
  });

  it('accepts an arrival-time axis starting before the departures (those cells are unsolved, not an error)', () => {
    expect(field({ ...base, secondAxis: 'arrival', second: { start: 0, end: 900 * DAY, n: 30 } })).toBe('no error');
  });

  it('rejects each bad field with InputError naming it', () => {
    expect(field(null)).toBe('request');
    expect(field({ ...base, from: -1 })).toBe('from');
    expect(field({ ...base, to: 1.5 })).toBe('to');
    expect(field({ ...base, depart: null })).toBe('depart');
    expect(field({ ...base, depart: { start: NaN, end: 1, n: 2 } })).toBe('depart.start');
    expect(field({ ...base, depart: { start: 10, end: 5, n: 3 } })).toBe('depart.end');
    expect(field({ ...base, depart: { start: 10, end: 5, n: 1 } })).toBe('depart.end');
    expect(field({ ...base, depart: { start: 0, end: 5, n: 0 } })).toBe('depart.n');
    expect(field({ ...base, depart: { start: 0, end: 5, n: MAX_AXIS_SAMPLES + 1 } })).toBe('depart.n');
    expect(field({ ...base, secondAxis: 'arrive' })).toBe('secondAxis');
    expect(field({ ...base, second: { start: 0, end: 5 * DAY, n: 3 } })).toBe('second.start');
    expect(field({ ...base, parkingAltitude: -1 })).toBe('parkingAltitude');
    expect(field({ ...base, arrivalAltitude: Infinity })).toBe('arrivalAltitude');
    expect(field({ ...base, parkingEccentricity: 1 })).toBe('parkingEccentricity');
    expect(field({ ...base, arrivalEccentricity: -0.1 })).toBe('arrivalEccentricity');
    expect(field({ ...base, maxRevs: 1.5 })).toBe('maxRevs');
    expect(field({ ...base, maxRevs: MAX_REVS + 1 })).toBe('maxRevs');
    expect(field({ ...base, retrograde: 'yes' })).toBe('retrograde');
    expect(field({ ...base, metric: 'cheapest' })).toBe('metric');
    expect(field({ ...base, depart: { start: 0, end: 5, n: MAX_AXIS_SAMPLES }, maxRevs: MAX_REVS })).toBe('no error');
  });
});
