/**
 * Logarithmic error axes: a domain of whole decades around the positive values of a series,
 * decade ticks thinned to fit the lane, and labels in the unit a reader expects (mm, m, km for
 * a position error; mm/s, m/s, km/s for a velocity error; a power of ten for a relative energy
 * error). Values at or below zero (an error of exactly zero, e.g. at the start) and values
 * below the domain are drawn on the bottom edge.
 */

export interface LogDomain {
  /** Whole-decade bounds, lo < hi, both > 0. */
  lo: number;
  hi: number;
}

/** Values at or above this are a diverged flight (the core writes Number.MAX_VALUE for non-finite): kept off the domain. */
export const DIVERGED = 1e300;
/** At most this many decades are shown; smaller values sit on the bottom edge. */
export const MAX_DECADES = 9;

/** Whole-decade domain of the positive, finite, non-diverged values (and of `extra`, e.g. a tolerance line); null when there is none. */
export function logDomain(values: ArrayLike<number>, extra: readonly number[] = []): LogDomain | null {
  let lo = Infinity;
  let hi = -Infinity;
  const see = (v: number): void => {
    if (v > 0 && v < DIVERGED && Number.isFinite(v)) {
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  };
  for (let k = 0; k < values.length; k++) see(values[k]);
  if (!(hi > 0)) return null;
  for (const v of extra) see(v);
  let eHi = Math.ceil(Math.log10(hi) - 1e-9);
  let eLo = Math.floor(Math.log10(lo) + 1e-9);
  if (eHi <= eLo) {
    eHi = eLo + 1;
  }
  if (eHi - eLo > MAX_DECADES) eLo = eHi - MAX_DECADES;
  return { lo: 10 ** eLo, hi: 10 ** eHi };
}

/** A value as drawn on a log axis with this domain: clamped into [lo, hi] (zero, negative, non-finite → lo; diverged → hi). */
export function clampLog(v: number, d: LogDomain): number {
  if (Number.isNaN(v) || v <= d.lo) return d.lo;
  if (v >= d.hi) return d.hi;
  return v;
}

/** Decade ticks from lo to hi, every 1, 2, 3 … decades so that at most `maxTicks` remain; both ends included when the step divides the span. */
export function decadeTicks(d: LogDomain, maxTicks: number): number[] {
  const e0 = Math.round(Math.log10(d.lo));
  const e1 = Math.round(Math.log10(d.hi));
  const n = e1 - e0;
  const most = Math.max(2, Math.floor(maxTicks));
  let step = 1;
  while (Math.floor(n / step) + 1 > most) step++;
  const out: number[] = [];
  // anchored at the top decade so the largest error always has its label
  for (let e = e1; e >= e0; e -= step) out.unshift(10 ** e);
  return out;
}

const SUP: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };

/** "10⁻¹²" for 1e-12. */
export function powerOfTen(v: number): string {
  const e = Math.round(Math.log10(v));
  return `10${String(e).replace(/[-0-9]/g, (c) => SUP[c])}`;
}

/** A decade as a length: "1 mm", "10 m", "100 km"; beyond 10⁶ km and below 1 mm as a power of ten. */
export function lengthTick(v: number): string {
  return unitTick(v, 'm');
}

/** A decade as a speed: "1 mm/s", "10 m/s", "1 km/s". */
export function speedTick(v: number): string {
  return unitTick(v, 'm/s');
}

function unitTick(v: number, unit: 'm' | 'm/s'): string {
  const e = Math.round(Math.log10(v));
  if (e >= -3 && e < 0) return `${10 ** (e + 3)} m${unit}`;
  if (e >= 0 && e < 3) return `${10 ** e} ${unit}`;
  if (e >= 3 && e <= 6) return `${10 ** (e - 3)} k${unit}`;
  if (e > 6) return `${powerOfTen(10 ** (e - 3))} k${unit}`;
  return `${powerOfTen(v)} ${unit}`;
}
