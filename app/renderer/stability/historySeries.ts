/**
 * What the stability charts draw, read off a StabilityResult: time in calendar years, and per
 * body three panels — the semi-major axis as its change from the epoch value in percent (the
 * changes are parts per million of a, which an axis in Gm would not show), the eccentricity,
 * and the inclination in degrees — plus the run's relative energy error. Each panel has a
 * padded linear domain and a few ticks with labels (d3's tick choice; a power-of-ten form for
 * tiny or huge values).
 */
import * as d3 from 'd3';
import type { StarSystem } from '../../../core/system/index.ts';
import type { StabilityResult } from '../../../core/checks/index.ts';

export type PanelKey = 'a' | 'e' | 'i' | 'energy';

export interface Tick {
  v: number;
  label: string;
}

export interface HistoryPanel {
  key: PanelKey;
  values: Float64Array;
  domain: [number, number];
  ticks: Tick[];
}

export interface BodyHistory {
  index: number;
  name: string;
  /** "about Ilmar". */
  about: string;
  /** Names of the moons flown inside it (merged), if any. */
  merged: string[];
  /** Epoch semi-major axis, m (the a panel is relative to it). */
  a0: number;
  panels: HistoryPanel[];
}

export interface Histories {
  years: Float64Array;
  /** Span, years. */
  span: number;
  bodies: BodyHistory[];
  energy: HistoryPanel;
  /** Time-axis ticks, years. */
  yearTicks: Tick[];
}

/** Column headings of the body panels. */
export const PANEL_TITLES: Record<PanelKey, string> = {
  a: 'a − a₀, % of a₀',
  e: 'eccentricity',
  i: 'inclination, °',
  energy: 'relative energy error',
};

/** Padded domain of the finite values: a flat series gets a band around its value. */
export function paddedDomain(values: ArrayLike<number>): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (let k = 0; k < values.length; k++) {
    const v = values[k];
    if (!Number.isFinite(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (!(hi >= lo)) return [0, 1];
  const scale = Math.max(Math.abs(lo), Math.abs(hi));
  const span = hi - lo;
  if (span <= scale * 1e-9 || span === 0) {
    const pad = scale > 0 ? scale * 1e-6 : 1e-12;
    return [lo - pad, hi + pad];
  }
  return [lo - 0.08 * span, hi + 0.08 * span];
}

/** Tick labels: d3's precision for ordinary ranges; "2.0e−4" below 10⁻³ or from 10⁶ up; "0" for zero. */
export function tickLabels(values: number[], lo: number, hi: number, count: number): string[] {
  const big = Math.max(Math.abs(lo), Math.abs(hi));
  const span = hi - lo;
  const exp = big >= 1e6 || (big < 1e-3 && big > 0) || (span > 0 && span < big * 1e-5);
  if (exp) {
    // enough digits for neighbouring ticks to differ
    const step = values.length > 1 ? Math.abs(values[1] - values[0]) : span;
    const digits = Math.min(12, Math.max(1, Math.ceil(Math.log10(big / Math.max(step, 1e-300)))));
    return values.map((v) => (v === 0 || Math.abs(v) < step * 1e-6 ? '0' : v.toExponential(digits).replace(/-/g, '\u2212')));
  }
  const f = d3.tickFormat(lo, hi, count);
  return values.map((v) => f(v).replace(/-/g, '\u2212'));
}

/** About `count` (at most count + 1) ticks inside [lo, hi], labelled. */
export function linearTicks(lo: number, hi: number, count: number): Tick[] {
  let vs = d3.ticks(lo, hi, count);
  // d3 may return up to about twice the count asked for: a small panel has no room for them
  while (vs.length > count + 1) vs = vs.filter((_, k) => k % 2 === 0);
  const labels = tickLabels(vs, lo, hi, count);
  return vs.map((v, k) => ({ v, label: labels[k] }));
}

function panel(key: PanelKey, values: Float64Array, ticks: number): HistoryPanel {
  const domain = paddedDomain(values);
  return { key, values, domain, ticks: linearTicks(domain[0], domain[1], ticks) };
}

/** Ticks of a year axis over [0, span], about `count` of them; digits grouped in threes. */
export function yearTicks(span: number, count: number): Tick[] {
  const n = Math.max(1, count);
  let vs = d3.ticks(0, span, n);
  while (vs.length > n + 1) vs = vs.filter((_, k) => k % 2 === 0);
  return vs.map((v) => ({ v, label: d3.format(',')(v).replace(/,/g, '\u202f') }));
}

/** Least room per year label on an axis, px. */
export const YEAR_LABEL_PX = 48;

/** Panels per body and the energy panel (see the module comment); `ticks`: about how many per panel. */
export function histories(system: StarSystem, r: StabilityResult, ticks = 3): Histories {
  const Y = system.calendar.yearLength;
  const years = Float64Array.from(r.t, (t) => t / Y);
  const span = r.span / Y;
  const RAD = 180 / Math.PI;
  const bodies = r.bodies.map((b) => {
    const a0 = b.history.a.length ? b.history.a[0] : b.a.initial;
    const aRel = Float64Array.from(b.history.a, (a) => (a0 !== 0 ? ((a - a0) / Math.abs(a0)) * 100 : 0));
    return {
      index: b.index,
      name: b.name,
      about: `about ${system.bodies[b.parent]?.name ?? '?'}`,
      merged: b.merged.map((k) => system.bodies[k]?.name ?? `body ${k}`),
      a0,
      panels: [
        panel('a', aRel, ticks),
        panel('e', b.history.e, ticks),
        panel(
          'i',
          Float64Array.from(b.history.i, (i) => i * RAD),
          ticks,
        ),
      ],
    };
  });
  return { years, span, bodies, energy: panel('energy', r.energy.history, ticks), yearTicks: yearTicks(span, 6) };
}
