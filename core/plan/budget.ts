/**
 * The Δv budget: per-burn rows (built by the evaluation) summed into totals, the reserve the
 * plan's policy holds back, and the margin.
 *
 * - total: Σ of the rows' requested Δv (the Δv the plan needs).
 * - reserve = percent/100 · total + absolute (the policy of plan.ts ReservePolicy).
 * - dvLeft: what the vehicle can still deliver after the last event (vehicle.ts deltaVLeft).
 * - margin = dvLeft − reserve − missing, where missing is the Δv that burns could not deliver
 *   (out of propellant): a plan that cannot be flown shows how far it is from closing.
 * - failedBurns: the burns the evaluation could not solve or fly as planned (their rows carry a
 *   'solve-failed' error flag; a failed solve flies a zero solved Δv). Their Δv is not the Δv
 *   the plan needs, so the margin is not a valid figure while any is listed: the plan does not
 *   hold, whatever the margin's sign (a burn counted as 0 m/s would otherwise improve it).
 * Flags: 'negative-margin' (error) when margin < 0.
 */
import type { ReservePolicy } from './plan.ts';
import type { Budget, BudgetRow, Flag } from './result.ts';

/** Reserve required by the policy for a plan needing `total` m/s. */
export function reserveFor(policy: ReservePolicy, total: number): number {
  return (policy.percent / 100) * total + policy.absolute;
}

export interface BudgetTotals {
  /** Δv capacity of the full vehicle before the first burn, m/s. */
  capacity: number;
  /** Δv left after the last event, m/s. */
  dvLeft: number;
  /** Ship mass at the end, kg. */
  finalMass: number;
}

/** Sums the rows into a Budget and returns the plan-level budget flags. */
export function summarizeBudget(rows: BudgetRow[], totals: BudgetTotals, policy: ReservePolicy): { budget: Budget; flags: Flag[] } {
  let total = 0;
  let propellantUsed = 0;
  let missing = 0;
  const failedBurns: Budget['failedBurns'] = [];
  rows.forEach((r, k) => {
    total += r.dv;
    propellantUsed += r.propellantUsed;
    missing += r.dvMissing ?? 0;
    if (r.flags.some((f) => f.code === 'solve-failed')) failedBurns.push({ planEventId: r.planEventId, name: r.name, row: k + 1 });
  });
  const reserve = reserveFor(policy, total);
  const margin = totals.dvLeft - reserve - missing;
  const flags: Flag[] = [];
  if (margin < 0) {
    flags.push({
      code: 'negative-margin',
      severity: 'error',
      message:
        `the plan does not close: margin ${margin.toFixed(1)} m/s ` +
        `(Δv left ${totals.dvLeft.toFixed(1)} m/s, reserve ${reserve.toFixed(1)} m/s` +
        (missing > 0 ? `, ${missing.toFixed(1)} m/s missing` : '') +
        ')',
      planEventId: null,
    });
  }
  return {
    budget: {
      rows,
      total,
      capacity: totals.capacity,
      reserve,
      dvLeft: totals.dvLeft,
      margin,
      propellantUsed,
      finalMass: totals.finalMass,
      failedBurns,
    },
    flags,
  };
}
