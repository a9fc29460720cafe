import { describe, expect, it } from 'vitest';
import { parseQuantity, parseRange, parseVector } from '../../../core/io/units.ts';
import { InputError } from '../../../core/math/errors.ts';

describe('units', () => {
  it('converts suffixes to SI (definitions of the units, common practice)', () => {
    expect(parseQuantity('r', '5000km', 'length')).toBe(5e6);
    expect(parseQuantity('v', '-3.2km/s', 'speed')).toBe(-3200);
    expect(parseQuantity('t', '2d', 'time')).toBe(172800);
    expect(parseQuantity('t', '3600', 'time')).toBe(3600);
    expect(parseQuantity('i', '180deg', 'angle')).toBeCloseTo(Math.PI, 15);
    expect(parseQuantity('mu', '398600km3/s2', 'mu')).toBe(3.986e14);
    expect(parseQuantity('mu', '3.986004418e14', 'mu')).toBe(3.986004418e14);
  });
  it('reads time in ms, s, min, h and d (SI prefix milli-; 60 s, 3600 s and the 86 400 s mean solar day, common practice)', () => {
    expect(parseQuantity('dt', '20ms', 'time')).toBe(20e-3);
    expect(parseQuantity('dt', '1000ms', 'time')).toBe(1);
    expect(parseQuantity('dt', '2min', 'time')).toBe(120);
    expect(parseQuantity('dt', '1.5h', 'time')).toBe(5400);
    // ms is a unit of time only: a length or a speed refuses it and lists its own units
    expect(() => parseQuantity('r', '20ms', 'length')).toThrow(/r has unknown unit "ms" \(use one of: m, km, Mm, Gm\)/);
  });
  it('parses vectors with per-component units and leading minus signs', () => {
    expect(parseVector('r2', '-14600km,2500km,7000km', 'length')).toEqual([-14.6e6, 2.5e6, 7e6]);
    expect(parseVector('v', '1,2km/s,-3', 'speed')).toEqual([1, 2000, -3]);
  });
  it('parses ranges', () => {
    expect(parseRange('tof', '100d..300d', 'time')).toEqual([8640000, 25920000]);
    // any reader of the ends, given the ends' field names (the command line reads calendar dates so)
    const seen: string[] = [];
    const hex = (field: string, t: string): number => {
      seen.push(field);
      return parseInt(t, 16);
    };
    expect(parseRange('depart', 'a..ff', hex)).toEqual([10, 255]);
    expect(seen).toEqual(['depart.start', 'depart.end']);
  });
  it('names the field and the rule on bad input', () => {
    expect(() => parseQuantity('r', '12parsec', 'length')).toThrow(/r has unknown unit "parsec"/);
    expect(() => parseVector('r1', '1,2', 'length')).toThrow(/r1 must have 3 comma-separated components/);
    expect(() => parseQuantity('x', 'abc', 'none')).toThrow(InputError);
    expect(() => parseRange('tof', '300d..100d', 'time')).toThrow(/END > START/);
    expect(() => parseRange('tof', '100d..', 'time')).toThrow(/tof must be a range written START..END/);
    expect(() => parseRange('tof', '1..2..3', 'time')).toThrow(/START..END/);
  });
});
