/**
 * The author's readouts on the Timeline (core/sky): the one-way light time from the ship to a
 * chosen body over the flight, and the ship's shadow passes (conical shadow model), read off the
 * flight the Timeline shows: the plan's evaluation or the finite-burn flight (patched conics, the
 * exact conic of each coast, core/conic shipStateAt), or the n-body flight's drawing samples
 * (positions relative to the star, linear between samples about 3° of arc apart; their chord
 * gives the velocity, used only to pace the shadow search). Computed once per flight and body
 * (cached), off the edit: see Timeline.svelte.
 */
import { shipStateAt } from '../../../core/conic/index.ts';
import type { Plan, PlanResult } from '../../../core/plan/index.ts';
import { lightTimeAt, type ShadowPass, type ShipAt, shadowPasses } from '../../../core/sky/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import { bodyState, findBodyIndex } from '../../../core/system/index.ts';
import { duration } from '../format/format.ts';
import type { Series } from './series.ts';

/** A flight the sky lanes read: where the ship is (star-relative) over [t0, t1], and the model's words. */
export interface SkyFlight {
  shipAt: ShipAt;
  t0: number;
  t1: number;
  /** Words of the model ("patched conics", "n-body"). */
  model: string;
}

export interface SkyData {
  model: string;
  /** The body the light time is to. */
  body: number;
  bodyName: string;
  /** One-way light time to the body, s. */
  light: Series;
  passes: ShadowPass[];
  eclipses: number;
  /** Time in shadow, s. */
  inShadow: number;
}

/** Points of the light-time series: the curve is smooth over a flight (a parking orbit's wobble is r/c, hundredths of a second). */
export const LIGHT_POINTS = 400;

/** The flight of a patched-conic result, star-relative; empty results have no flight (null). */
export function conicFlight(system: StarSystem, result: PlanResult, model: string): SkyFlight | null {
  if (result.segments.length === 0 || !(result.t1 >= result.t0)) return null;
  const s6 = new Float64Array(6);
  const c6 = new Float64Array(6);
  return {
    t0: result.t0,
    t1: result.t1,
    model,
    shipAt: (t, out) => {
      const k = shipStateAt(result, t, s6);
      bodyState(system, result.segments[k].central, t, c6, 0);
      for (let j = 0; j < 6; j++) out[j] = s6[j] + c6[j];
    },
  };
}

/** The flight of n-body drawing samples (times and star-relative positions), clamped at both ends; null with fewer than 2 samples. */
export function samplesFlight(samples: { t: Float64Array; star: Float64Array }, model: string, t1 = Infinity): SkyFlight | null {
  const ts = samples.t;
  const n = ts.length;
  if (n < 2 || !(ts[n - 1] > ts[0])) return null;
  const star = samples.star;
  return {
    t0: ts[0],
    t1: Math.min(ts[n - 1], t1),
    model,
    shipAt: (t, out) => {
      // last sample at or before t with a later one after it
      let lo = 0;
      let hi = n - 1;
      if (t <= ts[0]) hi = 1;
      else if (t >= ts[n - 1]) lo = n - 2;
      else
        while (hi - lo > 1) {
          const mid = (lo + hi) >> 1;
          if (ts[mid] <= t) lo = mid;
          else hi = mid;
        }
      while (hi < n - 1 && !(ts[hi] > ts[lo])) hi++;
      while (lo > 0 && !(ts[hi] > ts[lo])) lo--;
      const dt = ts[hi] - ts[lo];
      const f = dt > 0 ? Math.min(1, Math.max(0, (t - ts[lo]) / dt)) : 0;
      for (let j = 0; j < 3; j++) {
        const a = star[3 * lo + j];
        const b = star[3 * hi + j];
        out[j] = a + f * (b - a);
        out[3 + j] = dt > 0 ? (b - a) / dt : 0;
      }
    },
  };
}

/** The body the light time is to by default: the system's home body when it names one, else the plan's start body, else the star. */
export function defaultLightBody(system: StarSystem, plan: Plan): number {
  const home = system.calendar.homeIndex;
  if (home >= 0 && home < system.bodies.length) return home;
  const start = findBodyIndex(system, plan.start.body);
  return start >= 0 ? start : 0;
}

const pos6 = new Float64Array(6);

/** The light time (s) from the ship to `body` at time t of the flight (exact at t: no series interpolation). */
export function lightTimeOn(system: StarSystem, flight: SkyFlight, body: number, t: number): number {
  const tc = Math.min(flight.t1, Math.max(flight.t0, t));
  flight.shipAt(tc, pos6);
  return lightTimeAt(system, body, tc, pos6[0], pos6[1], pos6[2]);
}

/** The light-time series over the flight: LIGHT_POINTS evenly spaced times. */
export function lightSeries(system: StarSystem, flight: SkyFlight, body: number, points = LIGHT_POINTS): Series {
  const n = flight.t1 > flight.t0 ? Math.max(2, points) : 1;
  const t = new Float64Array(n);
  const v = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    t[k] = n === 1 ? flight.t0 : flight.t0 + ((flight.t1 - flight.t0) * k) / (n - 1);
    v[k] = lightTimeOn(system, flight, body, t[k]);
  }
  return { t, v };
}

/** Both readouts of a flight (see the module comment). */
export function skyData(system: StarSystem, flight: SkyFlight, body: number): SkyData {
  const shadow = shadowPasses(system, flight.shipAt, flight.t0, flight.t1, { model: 'conical' });
  return {
    model: flight.model,
    body,
    bodyName: system.bodies[body]?.name ?? 'a body',
    light: lightSeries(system, flight, body),
    passes: shadow.passes,
    eclipses: shadow.eclipses,
    inShadow: shadow.inShadow,
  };
}

/** A light time in words with units: "0.02 s", "12.4 s", "13 min 52 s", "1 h 05 min". */
export function lightTimeText(s: number): string {
  return duration(s);
}

/** A shadow pass in words: "in Tessel's umbra 37 min 12 s". */
export function passText(p: ShadowPass): string {
  return `in ${p.bodyName}'s ${p.kind} ${duration(p.t1 - p.t0)}`;
}

/** The sunlight lane's count beside its title: "13× 9.2 h" (eclipses and the time in shadow), "none". */
export function shadowLabel(sky: Pick<SkyData, 'eclipses' | 'inShadow'>): string {
  if (sky.eclipses === 0) return 'none';
  const h = sky.inShadow / 3600;
  const total = h >= 1 ? `${h.toFixed(1)} h` : `${Math.max(1, Math.round(sky.inShadow / 60))} min`;
  return `${sky.eclipses}× ${total}`;
}

/** The sunlight lane's tooltip: eclipses per body, time in shadow, the shadow model and the flight's model. */
export function shadowTitle(sky: Pick<SkyData, 'passes' | 'eclipses' | 'inShadow' | 'model'>): string {
  const per = new Map<string, number>();
  // an eclipse begins where a pass of a body does not continue the one before it
  const lastEnd = new Map<string, number>();
  for (const p of sky.passes) {
    if (lastEnd.get(p.bodyName) !== p.t0) per.set(p.bodyName, (per.get(p.bodyName) ?? 0) + 1);
    lastEnd.set(p.bodyName, p.t1);
  }
  const list = [...per].map(([name, k]) => `${name} ${k}`).join(', ');
  const head =
    sky.eclipses === 0 ? 'Sunlight all the flight' : `${sky.eclipses} eclipse${sky.eclipses === 1 ? '' : 's'} (${list}), ${duration(sky.inShadow)} in shadow`;
  return `${head}. Conical shadow model (the star a disc, each body a sphere): penumbra light, umbra dark; the flight in ${sky.model}`;
}
