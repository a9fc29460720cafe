/**
 * The n-body flight of the plan's truth report as paths for the System view: its drawing samples
 * (positions relative to the star) re-expressed, run by run, relative to the body the flight was
 * integrated about at each sample (Tessel at departure, the star in cruise, Ochre at arrival), the
 * way the plan's own path is drawn in its central body's frame, so a parking or target orbit
 * closes around its planet in 32-bit vertex positions. Reading the ephemeris at the sample times
 * is all this does; the ship's place on the path at a time is interpolated between samples.
 */
import type { NBodyResult } from '../../../core/nbody/index.ts';
import { bodyPosition, type StarSystem } from '../../../core/system/index.ts';

/** The n-body flight's drawing samples. */
export type NBodySamples = NonNullable<NBodyResult['samples']>;

export interface TruthPath {
  /** Body whose frame the positions are in. */
  central: number;
  /** Positions relative to the central body, m, 3 per point. */
  points: Float64Array;
}

/** One path per run of samples about the same body; a run starts with the previous run's last sample, so the paths join. */
export function truthPaths(system: StarSystem, samples: Pick<NBodySamples, 't' | 'star' | 'origin'>): TruthPath[] {
  const { t, star, origin } = samples;
  const out: TruthPath[] = [];
  const b = [0, 0, 0];
  let k = 0;
  while (k < t.length) {
    const central = origin[k];
    let end = k;
    while (end < t.length && origin[end] === central) end++;
    const from = k > 0 ? k - 1 : k;
    const pts = new Float64Array(3 * (end - from));
    for (let i = from, j = 0; i < end; i++, j += 3) {
      if (central === 0) b[0] = b[1] = b[2] = 0;
      else bodyPosition(system, central, t[i], b);
      pts[j] = star[3 * i] - b[0];
      pts[j + 1] = star[3 * i + 1] - b[1];
      pts[j + 2] = star[3 * i + 2] - b[2];
    }
    if (pts.length >= 6) out.push({ central, points: pts });
    k = end;
  }
  return out;
}

/**
 * The ship's position relative to the star at time t (m, into out3), interpolated linearly
 * between the samples around t; false outside the samples' span.
 */
export function trackPosition(samples: Pick<NBodySamples, 't' | 'star'>, t: number, out3: Float64Array | number[]): boolean {
  const ts = samples.t;
  const n = ts.length;
  if (n === 0 || !(t >= ts[0] && t <= ts[n - 1])) return false;
  // last sample at or before t (binary search)
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (ts[mid] <= t) lo = mid;
    else hi = mid;
  }
  const s = samples.star;
  const dt = ts[hi] - ts[lo];
  const f = dt > 0 ? Math.min(1, Math.max(0, (t - ts[lo]) / dt)) : 1;
  for (let j = 0; j < 3; j++) out3[j] = s[3 * lo + j] + f * (s[3 * hi + j] - s[3 * lo + j]);
  return true;
}

/**
 * The ship's state at time t on the n-body samples, relative to the body the flight was integrated
 * about there (written into out6: position m, velocity m/s); returns that body, or −1 outside the
 * samples. The position is interpolated between the samples around t; the velocity is their
 * chord (samples lie about 3° of arc apart, so its direction is good to a degree or so: enough to
 * point a burn's frame arrows, not for physics). Ask just before a burn for the state it starts from.
 */
export function trackStateAt(system: StarSystem, samples: Pick<NBodySamples, 't' | 'star' | 'origin'>, t: number, out6: Float64Array | number[]): number {
  const ts = samples.t;
  const n = ts.length;
  if (n < 2 || !(t >= ts[0] && t <= ts[n - 1])) return -1;
  // last sample at or before t, and the next one at a later time (binary search)
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (ts[mid] <= t) lo = mid;
    else hi = mid;
  }
  if (ts[lo] > t || lo === n - 1) lo = Math.max(0, hi - 1);
  while (hi < n - 1 && !(ts[hi] > ts[lo])) hi++;
  while (lo > 0 && !(ts[hi] > ts[lo])) lo--;
  const dt = ts[hi] - ts[lo];
  if (!(dt > 0)) return -1;
  const central = samples.origin[lo];
  const a = [0, 0, 0];
  const b = [0, 0, 0];
  if (central !== 0) {
    bodyPosition(system, central, ts[lo], a);
    bodyPosition(system, central, ts[hi], b);
  }
  const f = Math.min(1, Math.max(0, (t - ts[lo]) / dt));
  const s = samples.star;
  for (let j = 0; j < 3; j++) {
    const p0 = s[3 * lo + j] - a[j];
    const p1 = s[3 * hi + j] - b[j];
    out6[j] = p0 + f * (p1 - p0);
    out6[3 + j] = (p1 - p0) / dt;
  }
  return central;
}
