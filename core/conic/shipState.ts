/**
 * The ship's state at a time of a flown plan (`PlanResult`): the one definition that the System
 * view, the time cursor and the exports (through ephemerisSampler.ts) all read.
 *
 * - Coasts: the universal-variable Kepler propagation of the segment's exact conic (`state0`,
 *   `mu`) to t (core/orbit/kepler.ts), exact whatever the time.
 * - Finite burns (no conic): a cubic Hermite interpolant through the segment's drawing samples
 *   (positions), with the exact velocities at both ends (state0 of this segment and of the next)
 *   and three-point non-uniform finite-difference velocities at the interior samples (cubic
 *   Hermite spline with finite-difference tangents, e.g. Burden & Faires, Numerical Analysis,
 *   §3.5 and §4.1). Accuracy is that of the samples' spacing; burns are short, so this is
 *   normally far below drawing and export precision, but it is an interpolation, not the
 *   integrated state.
 * - Mass: constant on coasts; linear in time across a finite burn (exact at constant thrust and
 *   Isp, i.e. for one stage).
 *
 * States are relative to the segment's central body. Everything here is allocation-free (module
 * scratch), so the views can call it every frame.
 */
import { propagateKepler } from '../orbit/index.ts';
import type { PlanResult, TrajectorySegment } from '../plan/index.ts';

/** Index of the segment flown at time t (the last one starting at or before t, clamped to the first/last), or −1 when there are none. */
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
 * Writes the ship's [r, v] relative to its central body at time t into out6 and returns the
 * segment index (−1 when the result has no segments; out6 untouched). Before the flight the
 * ship is at its start state, after it at the end of the last segment; at an instant where the
 * state jumps (an impulsive burn, staging) it is the state just after.
 */
export function shipStateAt(result: PlanResult, t: number, out6: Float64Array): number {
  const segs = result.segments;
  const k = segmentIndexAt(segs, t);
  if (k >= 0) segmentStateAt(segs, k, t, out6);
  return k;
}

/** State [r, v] on segment k of `segments` at time t (clamped to the segment's span) into out6. */
export function segmentStateAt(segments: readonly TrajectorySegment[], k: number, t: number, out6: Float64Array): Float64Array {
  const s = segments[k];
  const tc = t < s.t0 ? s.t0 : t > s.t1 ? s.t1 : t;
  if (s.kind === 'coast') {
    if (tc === s.t0) for (let c = 0; c < 6; c++) out6[c] = s.state0[c];
    else propagateKepler(s.mu, s.state0, tc - s.t0, out6);
  } else {
    burnNodes(s, segments[k + 1]);
    hermite(s, segments[k + 1], tc, out6);
  }
  return out6;
}

/** Ship mass on segment `seg` at time t, kg (see the file comment). */
export function segmentMassAt(seg: TrajectorySegment, t: number): number {
  if (seg.kind === 'coast' || seg.t1 <= seg.t0) return seg.mass0;
  const f = Math.min(1, Math.max(0, (t - seg.t0) / (seg.t1 - seg.t0)));
  return seg.mass0 + f * (seg.mass1 - seg.mass0);
}

// ---------------------------------------------------------------------------------------------
// Interpolation nodes of a finite burn, read in place (nothing is copied):
//   node 0            the segment's start state (velocity known);
//   nodes 1 … m       the drawing samples strictly inside (t0, t1): samples jLo … jLo + m − 1;
//   node m + 1        when END_NEXT: the next segment's start (contiguous, same central body;
//                     velocity known); when END_SAMPLE: the last drawing sample, if it lies at t1.

const END_NONE = 0;
const END_NEXT = 1;
const END_SAMPLE = 2;
let jLo = 0;
let m = 0;
let endKind = END_NONE;
let nodeCount = 1;

function burnNodes(seg: TrajectorySegment, next: TrajectorySegment | undefined): void {
  const T = seg.sampleT;
  const eps = 1e-12 * Math.max(1, Math.abs(seg.t1 - seg.t0));
  let j = 0;
  while (j < T.length && !(T[j] > seg.t0 + eps)) j++;
  jLo = j;
  while (j < T.length && T[j] < seg.t1 - eps) j++;
  m = j - jLo;
  const last = T.length - 1;
  if (next && next.central === seg.central && Math.abs(next.t0 - seg.t1) <= eps) endKind = END_NEXT;
  else if (last >= 0 && Math.abs(T[last] - seg.t1) <= eps) endKind = END_SAMPLE;
  else endKind = END_NONE;
  nodeCount = 1 + m + (endKind === END_NONE ? 0 : 1);
}

function nodeT(seg: TrajectorySegment, i: number): number {
  if (i === 0) return seg.t0;
  if (i <= m) return seg.sampleT[jLo + i - 1];
  return seg.t1;
}

/** Component c (0..2) of node i's position. */
function nodeR(seg: TrajectorySegment, next: TrajectorySegment | undefined, i: number, c: number): number {
  if (i === 0) return seg.state0[c];
  if (i <= m) return seg.samples[3 * (jLo + i - 1) + c];
  if (endKind === END_NEXT) return next!.state0[c];
  return seg.samples[3 * (seg.sampleT.length - 1) + c];
}

/** Component c (0..2) of node i's velocity: known at the ends, else three-point differences (one-sided at the last node). */
function nodeV(seg: TrajectorySegment, next: TrajectorySegment | undefined, i: number, c: number): number {
  if (i === 0) return seg.state0[3 + c];
  if (i === nodeCount - 1) {
    if (endKind === END_NEXT) return next!.state0[3 + c];
    return (nodeR(seg, next, i, c) - nodeR(seg, next, i - 1, c)) / (nodeT(seg, i) - nodeT(seg, i - 1));
  }
  const h0 = nodeT(seg, i) - nodeT(seg, i - 1);
  const h1 = nodeT(seg, i + 1) - nodeT(seg, i);
  return (
    (-h1 / (h0 * (h0 + h1))) * nodeR(seg, next, i - 1, c) +
    ((h1 - h0) / (h0 * h1)) * nodeR(seg, next, i, c) +
    (h0 / (h1 * (h0 + h1))) * nodeR(seg, next, i + 1, c)
  );
}

/** Cubic Hermite interpolation of position over the nodes set by burnNodes, and its derivative for velocity. */
function hermite(seg: TrajectorySegment, next: TrajectorySegment | undefined, t: number, out: Float64Array): void {
  const n = nodeCount;
  if (n === 1) {
    // a zero-length burn: hold the start state
    for (let c = 0; c < 6; c++) out[c] = seg.state0[c];
    return;
  }
  // the interval [node i, node i + 1] holding t: the first with t ≤ t(i + 1), else the last
  let lo = 0;
  let hi = n - 2;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (t > nodeT(seg, mid + 1)) lo = mid + 1;
    else hi = mid;
  }
  const i = lo;
  const ta = nodeT(seg, i);
  const h = nodeT(seg, i + 1) - ta;
  const s = Math.min(1, Math.max(0, (t - ta) / h));
  const s2 = s * s;
  const s3 = s2 * s;
  const h00 = 2 * s3 - 3 * s2 + 1;
  const h10 = s3 - 2 * s2 + s;
  const h01 = -2 * s3 + 3 * s2;
  const h11 = s3 - s2;
  const d00 = (6 * s2 - 6 * s) / h;
  const d10 = 3 * s2 - 4 * s + 1;
  const d01 = (-6 * s2 + 6 * s) / h;
  const d11 = 3 * s2 - 2 * s;
  for (let c = 0; c < 3; c++) {
    const r0 = nodeR(seg, next, i, c);
    const r1 = nodeR(seg, next, i + 1, c);
    const v0 = nodeV(seg, next, i, c);
    const v1 = nodeV(seg, next, i + 1, c);
    out[c] = h00 * r0 + h10 * h * v0 + h01 * r1 + h11 * h * v1;
    out[3 + c] = d00 * r0 + d10 * v0 + d01 * r1 + d11 * v1;
  }
}
