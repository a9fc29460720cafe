/**
 * The n-body flight's fixed-step states as a sampled ephemeris (the shape the OEM and CSV
 * writers take): consecutive states with the same origin body form one span. The ship's mass
 * is not integrated by the n-body flight's impulsive burns, so each sample takes the mass of the
 * patched-conic segment at that time (the same burns, the same propellant).
 */
import type { SampledEphemeris, EphemerisSpan } from '../conic/index.ts';
import type { NBodyStates } from './verify.ts';
import type { PlanResult } from '../plan/index.ts';

/** Ship mass at time t from the patched-conic segments (mass at the segment's start; last mass after the end). */
export function massAt(result: PlanResult, t: number): number {
  const segs = result.segments;
  if (segs.length === 0) return 0;
  if (t <= segs[0].t0) return segs[0].mass0;
  for (const s of segs) {
    if (t < s.t1) return s.kind === 'burn' ? s.mass0 + ((s.mass1 - s.mass0) * (t - s.t0)) / (s.t1 - s.t0) : s.mass0;
  }
  return segs[segs.length - 1].mass1;
}

export function nbodyStatesToEphemeris(states: NBodyStates, conic: PlanResult, step: number): SampledEphemeris {
  const n = states.t.length;
  const spans: EphemerisSpan[] = [];
  let k = 0;
  while (k < n) {
    const origin = states.origin[k];
    let end = k + 1;
    while (end < n && states.origin[end] === origin) end++;
    const m = end - k;
    const t = states.t.slice(k, end);
    const s = states.state.slice(6 * k, 6 * end);
    const mass = new Float64Array(m);
    for (let j = 0; j < m; j++) mass[j] = massAt(conic, t[j]);
    spans.push({ center: origin, t, states: s, mass });
    k = end;
  }
  return { step, spans };
}
