/**
 * Quantities with units at the edges of the program (command line, UI fields, reports).
 * Inside the core everything is SI: m, s, kg, rad, m/s, m³/s².
 *
 * A quantity is written as a number with an optional unit suffix: `5000km`, `-3.2km/s`,
 * `28.5deg`, `20ms`, `3600s`, `2.5d`, `3.986004418e14`. A vector is comma-separated components,
 * each with its own optional unit: `5000km,10000km,2100km`. Without a suffix a value is SI.
 * `d` is the mean solar day of 86 400 s (common practice), not an invented world's day.
 */
import { InputError } from '../math/index.ts';

export type Dimension = 'length' | 'speed' | 'time' | 'angle' | 'mu' | 'mass' | 'force' | 'accel' | 'none';

const UNITS: Record<Dimension, Record<string, number>> = {
  length: { m: 1, km: 1e3, Mm: 1e6, Gm: 1e9 },
  speed: { 'm/s': 1, 'km/s': 1e3 },
  time: { ms: 1e-3, s: 1, min: 60, h: 3600, d: 86400 },
  angle: { rad: 1, deg: Math.PI / 180 },
  mu: { 'm3/s2': 1, 'km3/s2': 1e9, 'm^3/s^2': 1, 'km^3/s^2': 1e9 },
  mass: { kg: 1, t: 1e3 },
  force: { N: 1, kN: 1e3, MN: 1e6 },
  accel: { 'm/s2': 1, 'm/s^2': 1 },
  none: {},
};

/** The SI unit each dimension is written in when no suffix is given. */
export const SI_UNIT: Record<Dimension, string> = {
  length: 'm',
  speed: 'm/s',
  time: 's',
  angle: 'rad',
  mu: 'm3/s2',
  mass: 'kg',
  force: 'N',
  accel: 'm/s2',
  none: '',
};

const NUMBER = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*)$/;

/** Parses one scalar with an optional unit of the given dimension into SI. */
export function parseQuantity(field: string, text: string, dim: Dimension): number {
  const s = text.trim();
  const m = NUMBER.exec(s);
  if (!m) throw new InputError(field, 'must be a number with an optional unit', text);
  const value = Number(m[1]);
  const unit = m[2].trim();
  if (!Number.isFinite(value)) throw new InputError(field, TOO_LARGE, text);
  if (unit === '') return value;
  const factor = UNITS[dim][unit];
  if (factor === undefined) {
    const allowed = Object.keys(UNITS[dim]);
    throw new InputError(field, allowed.length ? `has unknown unit "${unit}" (use one of: ${allowed.join(', ')})` : `takes no unit (got "${unit}")`);
  }
  const si = value * factor;
  if (!Number.isFinite(si)) throw new InputError(field, TOO_LARGE, text);
  return si;
}

/** The rule of a number past the largest double (1e999 reads as Infinity): say so, not "not a number". */
const TOO_LARGE = 'is too large: 1.8e308 is the largest magnitude a number can have';

/** Parses a comma-separated vector of `n` components, each with an optional unit, into SI. */
export function parseVector(field: string, text: string, dim: Dimension, n = 3): number[] {
  const parts = text.split(',');
  if (parts.length !== n) throw new InputError(field, `must have ${n} comma-separated components`, text);
  return parts.map((p, i) => parseQuantity(`${field}[${i}]`, p, dim));
}

/**
 * Parses `A..B` into two values with END > START: quantities of dimension `dim` (either may
 * carry a unit), or whatever `parse(field, text)` reads (e.g. calendar dates at the command
 * line). The ends' errors name `<field>.start` and `<field>.end`.
 */
export function parseRange(field: string, text: string, dim: Dimension | ((field: string, text: string) => number)): [number, number] {
  const parts = text.split('..');
  if (parts.length !== 2 || parts[0].trim() === '' || parts[1].trim() === '') throw new InputError(field, 'must be a range written START..END', text);
  const parse = typeof dim === 'function' ? dim : (f: string, t: string): number => parseQuantity(f, t, dim);
  const a = parse(`${field}.start`, parts[0]);
  const b = parse(`${field}.end`, parts[1]);
  if (!(b > a)) throw new InputError(field, 'must have END > START', text);
  return [a, b];
}
