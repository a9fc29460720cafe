/**
 * What the retargeting's Timeline lane draws, read off a RetargetResult's error curves
 * (core/handoff: |r_game − r_plan| along the flight, m): the game flying the plan's own burns and
 * flying the retargeted schedule, each split into runs so extrapolated stretches (long coasts
 * estimated by step scaling) are drawn dashed, and one log domain for both.
 *
 * A stretch between two samples is extrapolated when either of its ends is: a line is solid only
 * where both ends were flown at every step. Neighbouring runs share their boundary sample, so the
 * curve is continuous. Samples that are not finite (a flight that diverged) break the line.
 */
import type { ErrorCurve, RetargetResult } from '../../../core/handoff/index.ts';
import { logDomain, type LogDomain } from '../gamestep/logAxis.ts';

export interface CurveRun {
  extrapolated: boolean;
  /** First and last sample index, inclusive. */
  from: number;
  to: number;
}

export interface RetargetCurve {
  key: 'before' | 'after';
  label: string;
  t: Float64Array;
  values: Float64Array;
  runs: CurveRun[];
  /** Largest finite value and the last one, m (NaN when none). */
  max: number;
  end: number;
}

export interface RetargetLaneData {
  curves: RetargetCurve[];
  domain: LogDomain | null;
  hasExtrapolated: boolean;
}

/** The curves' labels in the lane and its legend. */
export const CURVE_LABELS = { before: "game: plan's burns", after: 'game: retargeted' } as const;

/** Runs of one kind (flown / extrapolated) over the samples (see the module comment). */
export function splitExtrapolated(flags: ArrayLike<number>): CurveRun[] {
  const n = flags.length;
  if (n === 0) return [];
  if (n === 1) return [{ extrapolated: flags[0] !== 0, from: 0, to: 0 }];
  const runs: CurveRun[] = [];
  for (let k = 0; k < n - 1; k++) {
    const extrapolated = flags[k] !== 0 || flags[k + 1] !== 0;
    const last = runs[runs.length - 1];
    if (last && last.extrapolated === extrapolated) last.to = k + 1;
    else runs.push({ extrapolated, from: k, to: k + 1 });
  }
  return runs;
}

function curve(key: RetargetCurve['key'], c: ErrorCurve): RetargetCurve {
  let max = Number.NaN;
  for (let i = 0; i < c.error.length; i++) if (Number.isFinite(c.error[i]) && !(c.error[i] <= max)) max = c.error[i];
  const last = c.error.length ? c.error[c.error.length - 1] : Number.NaN;
  return {
    key,
    label: CURVE_LABELS[key],
    t: c.t,
    values: c.error,
    runs: splitExtrapolated(c.extrapolated),
    max,
    end: Number.isFinite(last) ? last : Number.NaN,
  };
}

/** The lane's data: the plan's burns flown by the game (when compared) and the retargeted schedule. */
export function retargetLaneData(r: RetargetResult): RetargetLaneData {
  const curves = [...(r.curves.before ? [curve('before', r.curves.before)] : []), curve('after', r.curves.after)];
  const all = new Float64Array(curves.reduce((n, c) => n + c.values.length, 0));
  let k = 0;
  for (const c of curves) {
    all.set(c.values, k);
    k += c.values.length;
  }
  return { curves, domain: logDomain(all), hasExtrapolated: curves.some((c) => c.runs.some((x) => x.extrapolated)) };
}
