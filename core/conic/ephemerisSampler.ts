/**
 * Samples a flown plan (`PlanResult`) at a fixed time step into states [r, v] and masses, for
 * the exports (CCSDS OEM, CSV) and anything else that needs an evenly spaced ephemeris.
 *
 * - Coasts: each sample is the universal-variable Kepler propagation of the segment's exact
 *   conic (`state0`, `mu`) to the sample time (core/orbit/kepler.ts), so the samples are exact
 *   whatever the step.
 * - Finite burns (no conic): a cubic Hermite interpolant through the segment's drawing
 *   samples (positions), with the exact velocities at both ends (state0 of this segment and of
 *   the next) and three-point finite-difference velocities at the interior samples. Accuracy
 *   is that of the drawing samples' spacing; burns are short, so this is normally far below
 *   the export precision, but it is an interpolation, not the integrated state.
 * - Mass: constant on coasts; linear in time across a finite burn (exact at constant thrust and
 *   Isp, i.e. for one stage).
 * - Re-centring: with `center` a body index, each state is moved from the segment's central
 *   body to that body with the analytic ephemeris (core/system/ephemeris.ts `bodyState`).
 *
 * Times: the grid is t0 + k·step (t0 = the result's start), plus the start and end of each span.
 * With `center: 'central'` the samples are grouped in spans of consecutive segments around one
 * central body; a span's last time (the SOI crossing) is also the next span's first time, each
 * in its own centre. At an instant where the state jumps (an impulsive burn, staging) the
 * sample shows the state just after it.
 */

import { InputError } from '../math/index.ts';
import { propagateKepler } from '../orbit/index.ts';
import { bodyState } from '../system/index.ts';
import type { StarSystem } from '../system/index.ts';
import type { PlanResult, TrajectorySegment } from '../plan/index.ts';

/** Most samples one call may produce. */
export const MAX_EPHEMERIS_SAMPLES = 5_000_000;

export interface EphemerisSampleOptions {
  /** Time step, s (> 0). */
  step: number;
  /**
   * 'central' (default): states relative to each segment's central body, one span per run of
   * segments around the same body. A body index: every state relative to that body, one span.
   */
  center?: 'central' | number;
}

export interface EphemerisSpan {
  /** Index of the body the states are relative to. */
  center: number;
  /** Sample times, s from the system epoch, increasing. */
  t: Float64Array;
  /** States, 6 per sample: x, y, z (m), vx, vy, vz (m/s). */
  states: Float64Array;
  /** Ship mass per sample, kg. */
  mass: Float64Array;
}

export interface SampledEphemeris {
  step: number;
  spans: EphemerisSpan[];
}

const tmp6 = new Float64Array(6);
const body6 = new Float64Array(6);

/** Samples the trajectory of `result` at a fixed step (see the file comment). */
export function sampleEphemeris(system: StarSystem, result: PlanResult, options: EphemerisSampleOptions): SampledEphemeris {
  const step = options.step;
  if (typeof step !== 'number' || !Number.isFinite(step) || !(step > 0)) throw new InputError('step', 'must be a finite number > 0', step);
  const center = options.center ?? 'central';
  if (center !== 'central' && !(Number.isInteger(center) && center >= 0 && center < system.bodies.length)) {
    throw new InputError('center', `must be 'central' or a body index 0..${system.bodies.length - 1}`, center);
  }
  const segs = result.segments;
  if (segs.length === 0) return { step, spans: [] };
  const t0 = segs[0].t0;
  const total = (segs[segs.length - 1].t1 - t0) / step;
  if (!(total <= MAX_EPHEMERIS_SAMPLES)) {
    throw new InputError('step', `gives about ${Math.ceil(total)} samples, more than ${MAX_EPHEMERIS_SAMPLES}; use a larger step`, step);
  }

  // Spans: runs of segments [a, b) sharing a central body (or everything, for a fixed centre).
  const runs: { a: number; b: number; center: number }[] = [];
  if (center === 'central') {
    let a = 0;
    for (let k = 1; k <= segs.length; k++) {
      if (k === segs.length || segs[k].central !== segs[a].central) {
        runs.push({ a, b: k, center: segs[a].central });
        a = k;
      }
    }
  } else runs.push({ a: 0, b: segs.length, center });

  const spans: EphemerisSpan[] = [];
  const burnCache = new Map<TrajectorySegment, BurnNodes>();
  for (const run of runs) {
    const ts = segs[run.a].t0;
    const te = segs[run.b - 1].t1;
    const times = gridTimes(t0, step, ts, te);
    const n = times.length;
    const states = new Float64Array(6 * n);
    const mass = new Float64Array(n);
    let k = run.a;
    for (let j = 0; j < n; j++) {
      const t = times[j];
      // The segment holding t: t0 <= t < t1, or the last one at the span's end.
      while (k < run.b - 1 && t >= segs[k].t1) k++;
      const seg = segs[k];
      if (seg.kind === 'coast') coastState(seg, t, tmp6);
      else {
        let nodes = burnCache.get(seg);
        if (!nodes) burnCache.set(seg, (nodes = burnNodes(seg, segs[k + 1])));
        hermite(nodes, t, tmp6);
      }
      if (seg.central !== run.center) {
        bodyState(system, seg.central, t, body6, run.center);
        for (let c = 0; c < 6; c++) tmp6[c] += body6[c];
      }
      states.set(tmp6, 6 * j);
      mass[j] = massAt(seg, t);
    }
    spans.push({ center: run.center, t: times, states, mass });
  }
  return { step, spans };
}

/** ts, te and every t0 + k·step strictly between them. */
function gridTimes(t0: number, step: number, ts: number, te: number): Float64Array {
  const eps = 1e-9 * step;
  const out: number[] = [ts];
  let k = Math.floor((ts - t0) / step) + 1;
  for (;;) {
    const t = t0 + k * step;
    if (t >= te - eps) break;
    if (t > ts + eps) out.push(t);
    k++;
  }
  if (te > ts) out.push(te);
  return Float64Array.from(out);
}

function massAt(seg: TrajectorySegment, t: number): number {
  if (seg.kind === 'coast' || seg.t1 <= seg.t0) return seg.mass0;
  const f = Math.min(1, Math.max(0, (t - seg.t0) / (seg.t1 - seg.t0)));
  return seg.mass0 + f * (seg.mass1 - seg.mass0);
}

function coastState(seg: TrajectorySegment, t: number, out: Float64Array): void {
  const dt = t - seg.t0;
  if (dt === 0) out.set(seg.state0.subarray(0, 6));
  else propagateKepler(seg.mu, seg.state0, dt, out);
}

/** Interpolation nodes of a finite burn: times, positions and velocities. */
interface BurnNodes {
  ts: number[];
  rs: number[][];
  vs: number[][];
}

/** Nodes of a finite-burn segment (see the file comment). */
function burnNodes(seg: TrajectorySegment, next: TrajectorySegment | undefined): BurnNodes {
  // The start state, the interior drawing samples, the end (the next segment's start when
  // contiguous and around the same body, else the last drawing sample).
  const ts: number[] = [seg.t0];
  const rs: number[][] = [[seg.state0[0], seg.state0[1], seg.state0[2]]];
  const vk: (number[] | null)[] = [[seg.state0[3], seg.state0[4], seg.state0[5]]];
  const span = seg.t1 - seg.t0;
  const eps = 1e-12 * Math.max(1, Math.abs(span));
  for (let j = 0; j < seg.sampleT.length; j++) {
    const tj = seg.sampleT[j];
    if (tj > seg.t0 + eps && tj < seg.t1 - eps) {
      ts.push(tj);
      rs.push([seg.samples[3 * j], seg.samples[3 * j + 1], seg.samples[3 * j + 2]]);
      vk.push(null);
    }
  }
  if (next && next.central === seg.central && Math.abs(next.t0 - seg.t1) <= eps) {
    ts.push(seg.t1);
    rs.push([next.state0[0], next.state0[1], next.state0[2]]);
    vk.push([next.state0[3], next.state0[4], next.state0[5]]);
  } else {
    const m = seg.sampleT.length - 1;
    if (m >= 0 && Math.abs(seg.sampleT[m] - seg.t1) <= eps) {
      ts.push(seg.t1);
      rs.push([seg.samples[3 * m], seg.samples[3 * m + 1], seg.samples[3 * m + 2]]);
      vk.push(null);
    }
  }
  const n = ts.length;
  // Velocities where unknown: three-point non-uniform differences (one-sided at an end).
  const vs = vk.map((known, j) => {
    if (known) return known;
    const v = [0, 0, 0];
    if (j === 0 || j === n - 1) {
      const a = j === 0 ? 0 : n - 2;
      const h = ts[a + 1] - ts[a];
      for (let c = 0; c < 3; c++) v[c] = (rs[a + 1][c] - rs[a][c]) / h;
    } else {
      const h0 = ts[j] - ts[j - 1];
      const h1 = ts[j + 1] - ts[j];
      for (let c = 0; c < 3; c++) {
        v[c] = (-h1 / (h0 * (h0 + h1))) * rs[j - 1][c] + ((h1 - h0) / (h0 * h1)) * rs[j][c] + (h0 / (h1 * (h0 + h1))) * rs[j + 1][c];
      }
    }
    return v;
  });
  return { ts, rs, vs };
}

/** Cubic Hermite interpolation of position, and its derivative for velocity. */
function hermite(nodes: BurnNodes, t: number, out: Float64Array): void {
  const { ts, rs, vs } = nodes;
  const n = ts.length;
  if (n === 1) {
    // A zero-length burn: hold the start state.
    for (let c = 0; c < 3; c++) {
      out[c] = rs[0][c];
      out[3 + c] = vs[0][c];
    }
    return;
  }
  let i = 0;
  while (i < n - 2 && t > ts[i + 1]) i++;
  const h = ts[i + 1] - ts[i];
  const s = Math.min(1, Math.max(0, (t - ts[i]) / h));
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
  const v0 = vs[i];
  const v1 = vs[i + 1];
  for (let c = 0; c < 3; c++) {
    out[c] = h00 * rs[i][c] + h10 * h * v0[c] + h01 * rs[i + 1][c] + h11 * h * v1[c];
    out[3 + c] = d00 * rs[i][c] + d10 * v0[c] + d01 * rs[i + 1][c] + d11 * v1[c];
  }
}
