/**
 * One progress fraction over a whole retargeting (core/handoff retargetForGame), whose stages
 * each report their own fraction from 0 (or none): each stage fills its band of the bar, and the
 * bar never moves back (a second leg or flight of a stage restarts its own fraction).
 */
import type { RetargetProgress } from '../../../core/handoff/index.ts';

/**
 * The bar's band per stage: flying the plan's own burns (one flight, long coasts extrapolated),
 * the legs (a few such flights), the verification (every step by default: the longest), and the
 * search for a step that works (only when the goals are not met).
 */
export const RETARGET_BANDS: Readonly<Record<RetargetProgress['stage'], readonly [number, number]>> = {
  before: [0, 0.2],
  leg: [0.2, 0.4],
  verify: [0.4, 0.95],
  recommend: [0.95, 1],
};

/** The bar's fraction after report `p`, given the fraction shown before it (`last`). */
export function retargetFraction(p: RetargetProgress, last: number): number {
  const [a, b] = RETARGET_BANDS[p.stage];
  const f = p.fraction === null || !Number.isFinite(p.fraction) ? 0 : Math.min(1, Math.max(0, p.fraction));
  return Math.max(last, a + f * (b - a));
}
