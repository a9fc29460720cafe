/**
 * Progress of a targeting run as the panel shows it: the live residual series (one point each
 * time a leg's best residual falls) and the fraction for the progress bar. The targeter reports
 * its best residual norm of the leg so far after every flight (core/target targetPlan); a leg is
 * met when every goal is within its tolerance, i.e. about at a residual norm of 1.
 */
import type { TargetProgress } from '../../../core/target/index.ts';

export interface ResidualPoint {
  /** 1-based leg. */
  leg: number;
  /** Flights flown so far (all legs). */
  flights: number;
  /** Best residual norm of the leg so far (tolerance units). */
  residual: number;
}

/** Largest fraction a leg shows before it ends (the last steps below a residual of 1 still run). */
const LEG_CAP = 0.97;

/**
 * How far the run has come, 0..1: legs done, plus the current leg's residual fallen on a log scale
 * from `legStart` (its first residual) towards 1.
 */
export function targetFraction(p: TargetProgress, legStart: number): number {
  if (!(p.legs > 0)) return 0;
  let fall = 0;
  if (Number.isFinite(p.residual) && Number.isFinite(legStart) && legStart > 1 && p.residual > 0) {
    fall = Math.log(legStart / p.residual) / Math.log(legStart);
  } else if (p.residual <= 1) fall = LEG_CAP;
  fall = Math.min(LEG_CAP, Math.max(0, fall));
  return Math.min(1, Math.max(0, (p.leg - 1 + fall) / p.legs));
}

/**
 * The series with `p` added when it says something new: a new leg, or a lower residual than the
 * leg's last point. Returns the same array when nothing is added (a store need not publish).
 * Non-finite residuals (a failed flight) are not drawn.
 */
export function addResidual(series: readonly ResidualPoint[], p: TargetProgress): readonly ResidualPoint[] {
  if (!Number.isFinite(p.residual)) return series;
  const last = series[series.length - 1];
  if (last && last.leg === p.leg && !(p.residual < last.residual)) return series;
  return [...series, { leg: p.leg, flights: p.flights, residual: p.residual }];
}

/** The first residual of a leg in the series (its start), or NaN. */
export function legStart(series: readonly ResidualPoint[], leg: number): number {
  for (const s of series) if (s.leg === leg) return s.residual;
  return Number.NaN;
}
