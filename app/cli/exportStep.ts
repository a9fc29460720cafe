/**
 * The step of the exported ephemeris when `--step` is not given: one per span (a run of segments
 * about one central body), small enough to resolve the orbit flown there. Rule (stated in
 * `waymark fly --help` and the README):
 *
 * - an elliptic span: its osculating period about the central body divided by 64, the shortest
 *   over the span's segments (a burn changes the orbit), so each orbit gets at least 64 points;
 * - a hyperbolic (or parabolic) span: the span's duration divided by 64 (the time to cross the
 *   sphere of influence, or to the plan's end), so the pass gets at least 64 points;
 * - never more than the span's duration / 64 either.
 * The n-body flight is sampled on one grid at the smallest of these steps, then each of its spans
 * keeps every k-th sample, k = ⌊span step / grid step⌋ (`thinToSpanSteps`), so a long cruise is
 * not written at the parking orbit's step.
 * The period comes from vis-viva, a = 1 / (2/r − v²/μ), P = 2π √(a³/μ) (common practice).
 */
import { sampleEphemeris, type EphemerisSpan, type SampledEphemeris } from '../../core/conic/index.ts';
import type { PlanResult } from '../../core/plan/index.ts';
import type { StarSystem } from '../../core/system/index.ts';

/** Points per orbital period (and per hyperbolic pass) the default step gives at least. */
export const POINTS_PER_ORBIT = 64;

export interface SpanStep {
  /** Segments [a, b) of the result. */
  a: number;
  b: number;
  center: number;
  t0: number;
  t1: number;
  /** Step of the span, s. */
  step: number;
  /** The shortest osculating period in the span, s (null: no closed orbit in the span). */
  period: number | null;
}

/** Each span's default step (see the file comment). */
export function defaultSpanSteps(result: PlanResult): SpanStep[] {
  const segs = result.segments;
  const out: SpanStep[] = [];
  let a = 0;
  for (let k = 1; k <= segs.length; k++) {
    if (k < segs.length && segs[k].central === segs[a].central) continue;
    const t0 = segs[a].t0;
    const t1 = segs[k - 1].t1;
    let period: number | null = null;
    for (let j = a; j < k; j++) {
      const s = segs[j].state0;
      const r = Math.hypot(s[0], s[1], s[2]);
      const v2 = s[3] * s[3] + s[4] * s[4] + s[5] * s[5];
      const inv = 2 / r - v2 / segs[j].mu; // 1/a: > 0 elliptic
      if (inv > 0) {
        const p = 2 * Math.PI * Math.sqrt(1 / (inv * inv * inv) / segs[j].mu);
        if (period === null || p < period) period = p;
      }
    }
    const byDuration = t1 > t0 ? (t1 - t0) / POINTS_PER_ORBIT : Number.POSITIVE_INFINITY;
    const step = Math.min(period === null ? Number.POSITIVE_INFINITY : period / POINTS_PER_ORBIT, byDuration);
    out.push({ a, b: k, center: segs[a].central, t0, t1, step: Number.isFinite(step) ? step : 1, period });
    a = k;
  }
  return out;
}

/**
 * An ephemeris on one fine grid (`gridStep`) thinned span by span: a span keeps every k-th
 * sample (its first and last always), k = ⌊step / gridStep⌋ with step the smallest default step
 * of the patched-conic spans about the same centre that overlap it (the grid's own when none).
 */
export function thinToSpanSteps(eph: SampledEphemeris, gridStep: number, steps: readonly SpanStep[]): SampledEphemeris {
  const spans = eph.spans.map((span): EphemerisSpan => {
    const n = span.t.length;
    if (n < 3) return span;
    const t0 = span.t[0];
    const t1 = span.t[n - 1];
    let step = Number.POSITIVE_INFINITY;
    for (const s of steps) if (s.center === span.center && s.t0 < t1 && s.t1 > t0) step = Math.min(step, s.step);
    const k = Number.isFinite(step) ? Math.max(1, Math.floor(step / gridStep + 1e-9)) : 1;
    if (k === 1) return span;
    const keep: number[] = [];
    for (let j = 0; j < n - 1; j += k) keep.push(j);
    keep.push(n - 1);
    const t = new Float64Array(keep.length);
    const states = new Float64Array(6 * keep.length);
    const mass = new Float64Array(keep.length);
    keep.forEach((j, i) => {
      t[i] = span.t[j];
      states.set(span.states.subarray(6 * j, 6 * j + 6), 6 * i);
      mass[i] = span.mass[j];
    });
    return { center: span.center, t, states, mass };
  });
  return { step: eph.step, spans };
}

/** The patched-conic ephemeris sampled span by span, each at its own step (one span per run of segments, as sampleEphemeris makes them). */
export function sampleBySpan(system: StarSystem, result: PlanResult, steps: readonly SpanStep[]): SampledEphemeris {
  const spans: EphemerisSpan[] = [];
  for (const s of steps) {
    // a finite burn that ends a span is interpolated from its own drawing samples, as at the plan's end
    const part = sampleEphemeris(system, { ...result, segments: result.segments.slice(s.a, s.b) }, { step: s.step });
    spans.push(...part.spans);
  }
  return { step: Math.min(...steps.map((s) => s.step)), spans };
}
