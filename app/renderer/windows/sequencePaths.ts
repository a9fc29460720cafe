/**
 * The legs of the sequence solution picked in the Windows screen, for the System view: each leg
 * the Lambert arc between its bodies (core/orbit solveLambert, Izzo's method; the revolution and
 * branch whose departure v∞ matches the solution's) sampled along the two-body conic
 * (core/orbit propagateKepler), positions relative to the common parent. `pickedSequence` is the
 * one shared value: the Windows screen sets it, the System view draws it.
 */
import { propagateKepler, solveLambert } from '../../../core/orbit/index.ts';
import type { SequenceSolution } from '../../../core/search/index.ts';
import { bodyState, type StarSystem } from '../../../core/system/index.ts';
import { Observable } from '../state/observable.ts';

export interface SequencePath {
  /** Index of the central body (the bodies' common parent). */
  central: number;
  /** Positions relative to the central body, m: x, y, z per sample. */
  points: Float64Array;
  /** The leg, for labels and tests. */
  from: string;
  to: string;
}

/** The solution the Windows screen's sequence mode shows, with its system (null: none). */
export const pickedSequence = new Observable<{ system: StarSystem; solution: SequenceSolution } | null>(null);

/** Samples per leg: smooth at the System view's sizes (a leg turns at most about one revolution here). */
export const SEQUENCE_SAMPLES = 160;

/** Each leg of the solution as a sampled Lambert arc about the bodies' parent. A leg without a solution is left out. */
export function sequencePaths(system: StarSystem, solution: SequenceSolution, samples = SEQUENCE_SAMPLES): SequencePath[] {
  const out: SequencePath[] = [];
  const s1 = new Float64Array(6);
  const s2 = new Float64Array(6);
  const state = new Float64Array(6);
  const at = new Float64Array(6);
  for (const leg of solution.legs) {
    const a = system.indexById[leg.from];
    const b = system.indexById[leg.to];
    if (a === undefined || b === undefined) continue;
    const central = system.bodies[a].parentIndex;
    if (central < 0) continue;
    const mu = system.bodies[central].mu;
    bodyState(system, a, leg.depart, s1, central);
    bodyState(system, b, leg.arrive, s2, central);
    const period = system.bodies[a].derived.period;
    const revs = Math.max(0, Math.floor(leg.tof / Math.min(period, system.bodies[b].derived.period)));
    let best: Float64Array | number[] | null = null;
    let miss = Number.POSITIVE_INFINITY;
    try {
      for (const sol of solveLambert(mu, s1.subarray(0, 3), s2.subarray(0, 3), leg.tof, { revs })) {
        const m = Math.abs(Math.hypot(sol.v1[0] - s1[3], sol.v1[1] - s1[4], sol.v1[2] - s1[5]) - leg.vInfDepart);
        if (m < miss) {
          miss = m;
          best = sol.v1;
        }
      }
    } catch {
      continue; // no arc for this leg (cannot happen for a leg the search solved; nothing is drawn then)
    }
    if (!best) continue;
    state.set([s1[0], s1[1], s1[2], best[0], best[1], best[2]]);
    const points = new Float64Array(3 * samples);
    for (let k = 0; k < samples; k++) {
      propagateKepler(mu, state, (leg.tof * k) / (samples - 1), at);
      points[3 * k] = at[0];
      points[3 * k + 1] = at[1];
      points[3 * k + 2] = at[2];
    }
    out.push({ central, points, from: leg.from, to: leg.to });
  }
  return out;
}
