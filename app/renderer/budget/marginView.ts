/**
 * The margin as the Budget and the status line show it. A margin is a valid figure only when
 * every burn was solved: a burn that failed to solve flies a zero solved Δv, which leaves more
 * Δv over and would show a margin better than the plan's. Then the margin reads "not valid"
 * with the burns named, and the plan does not hold whatever the number's sign.
 */
import type { Budget } from '../../../core/plan/index.ts';
import { speed } from '../format/format.ts';

export interface MarginView {
  /** The margin figure is the plan's (no burn failed to solve). */
  valid: boolean;
  /** The plan holds on its budget: valid and margin ≥ 0. */
  holds: boolean;
  /** What the value cell shows: "412.3 m/s", or "not valid" when a burn failed to solve. */
  text: string;
  /** Why it is not valid, in the user's words ("Apoapsis trim (burn 5) failed to solve: its Δv is not counted"); '' when valid. */
  reason: string;
  /** 'ok', 'tight' (under 5 % of the planned total, common practice for a warning), 'bad'. */
  tone: 'ok' | 'tight' | 'bad';
}

export function marginView(b: Budget): MarginView {
  const failed = b.failedBurns;
  if (failed.length > 0) {
    const names = failed.map((f) => `${f.name || f.planEventId} (burn ${f.row})`).join(', ');
    return {
      valid: false,
      holds: false,
      text: 'not valid',
      reason: `${names} failed to solve: ${failed.length > 1 ? 'their' : 'its'} Δv is not counted (${speed(b.margin)} without it)`,
      tone: 'bad',
    };
  }
  const tone = b.margin < 0 ? 'bad' : b.margin < 0.05 * Math.max(1, b.total) ? 'tight' : 'ok';
  return { valid: true, holds: b.margin >= 0, text: speed(b.margin), reason: '', tone };
}
