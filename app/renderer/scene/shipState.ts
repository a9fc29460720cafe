/**
 * The ship's state at any time of a PlanResult, for drawing: the segment containing t (binary
 * search over segment start times), then the exact conic of a coast (universal-variable Kepler
 * propagation of the segment's state0, as result.ts defines it) or linear interpolation of a
 * finite burn's samples. Before the plan starts the ship is at its start state; after it ends,
 * at the end of the last segment. Allocation-free per call.
 */
import type { PlanResult, TrajectorySegment } from '../../../core/plan/index.ts';
import { propagateKepler } from '../../../core/orbit/index.ts';

/** Index of the segment flown at time t (clamped to the first/last), or −1 when there are none. */
export function segmentIndexAt(segments: readonly TrajectorySegment[], t: number): number {
  const n = segments.length;
  if (n === 0) return -1;
  if (t <= segments[0].t0) return 0;
  if (t >= segments[n - 1].t1) return n - 1;
  let lo = 0;
  let hi = n - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (segments[mid].t0 <= t) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/**
 * Writes the ship's [r, v] relative to the segment's central body at time t into out6 and
 * returns the segment index (−1 when the result has no segments; out6 untouched).
 */
export function shipStateAt(result: PlanResult, t: number, out6: Float64Array): number {
  const segs = result.segments;
  const k = segmentIndexAt(segs, t);
  if (k < 0) return -1;
  const s = segs[k];
  const tc = t < s.t0 ? s.t0 : t > s.t1 ? s.t1 : t;
  if (s.kind === 'coast') {
    if (tc === s.t0) for (let j = 0; j < 6; j++) out6[j] = s.state0[j];
    else propagateKepler(s.mu, s.state0, tc - s.t0, out6);
    return k;
  }
  interpolateSamples(s, tc, out6);
  return k;
}

function interpolateSamples(s: TrajectorySegment, t: number, out6: Float64Array): void {
  const T = s.sampleT;
  const P = s.samples;
  const n = T.length;
  if (n === 0) {
    for (let j = 0; j < 6; j++) out6[j] = s.state0[j];
    return;
  }
  if (n === 1) {
    out6[0] = P[0];
    out6[1] = P[1];
    out6[2] = P[2];
    out6[3] = s.state0[3];
    out6[4] = s.state0[4];
    out6[5] = s.state0[5];
    return;
  }
  let lo = 0;
  let hi = n - 2;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (T[mid] <= t) lo = mid;
    else hi = mid - 1;
  }
  const dt = T[lo + 1] - T[lo];
  const f = dt > 0 ? Math.min(1, Math.max(0, (t - T[lo]) / dt)) : 0;
  const a = 3 * lo;
  const b = a + 3;
  for (let j = 0; j < 3; j++) {
    out6[j] = P[a + j] + f * (P[b + j] - P[a + j]);
    out6[3 + j] = dt > 0 ? (P[b + j] - P[a + j]) / dt : s.state0[3 + j];
  }
}
