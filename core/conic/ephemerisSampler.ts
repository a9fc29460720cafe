/**
 * Samples a flown plan (`PlanResult`) at a fixed time step into states [r, v] and masses, for
 * the exports (CCSDS OEM, CSV) and anything else that needs an evenly spaced ephemeris.
 *
 * - State and mass: those of the ship on its segment (shipState.ts `segmentStateAt`,
 *   `segmentMassAt`: the exact Kepler propagation on a coast, a cubic Hermite interpolant of the
 *   drawing samples across a finite burn), the same definition the System view draws.
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
import { bodyState } from '../system/index.ts';
import type { StarSystem } from '../system/index.ts';
import type { PlanResult } from '../plan/index.ts';
import { segmentMassAt, segmentStateAt } from './shipState.ts';

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
      segmentStateAt(segs, k, t, tmp6);
      if (seg.central !== run.center) {
        bodyState(system, seg.central, t, body6, run.center);
        for (let c = 0; c < 6; c++) tmp6[c] += body6[c];
      }
      states.set(tmp6, 6 * j);
      mass[j] = segmentMassAt(seg, t);
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
