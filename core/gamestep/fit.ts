/**
 * Small fits used by the game-step check: the power law of error growth over a window (least
 * squares on log e = log A + q·log τ), a straight-line trend, and the energy drift per orbit
 * (the mean change of a sampled series over one orbital period, which removes the error's
 * periodic part at the orbit's own period; Hairer, Lubich & Wanner, Geometric Numerical
 * Integration, 2nd ed., ch. X, for why symplectic methods show only that periodic part).
 */

export interface PowerLawFit {
  /** Growth exponent q in e ≈ A·τ^q. */
  order: number;
  /** Coefficient A (units of e per s^q). */
  coefficient: number;
  /** Coefficient of determination of the log–log fit (1: a perfect power law). */
  r2: number;
  /** Points used. */
  points: number;
}

/** Fewest points for a log–log fit; fewer give a straight line through the last point. */
export const MIN_FIT_POINTS = 4;

/**
 * Fits e ≈ A·τ^q to the points with τ ≥ fromFraction·max τ and e > 0. With fewer than
 * MIN_FIT_POINTS usable points: linear growth through the last usable point (q = 1), r2 = 0;
 * with none: A = 0.
 */
export function fitPowerLaw(tau: ArrayLike<number>, e: ArrayLike<number>, fromFraction = 1 / 16): PowerLawFit {
  let tMax = 0;
  for (let i = 0; i < tau.length; i++) if (tau[i] > tMax) tMax = tau[i];
  const lo = fromFraction * tMax;
  let n = 0,
    sx = 0,
    sy = 0,
    sxx = 0,
    sxy = 0,
    syy = 0;
  let lastT = 0,
    lastE = 0;
  for (let i = 0; i < tau.length; i++) {
    if (!(tau[i] > 0 && tau[i] >= lo && e[i] > 0 && Number.isFinite(e[i]))) continue;
    const x = Math.log(tau[i]);
    const y = Math.log(e[i]);
    n++;
    sx += x;
    sy += y;
    sxx += x * x;
    sxy += x * y;
    syy += y * y;
    if (tau[i] >= lastT) {
      lastT = tau[i];
      lastE = e[i];
    }
  }
  const vx = sxx - (sx * sx) / Math.max(n, 1);
  if (n < MIN_FIT_POINTS || !(vx > 0)) {
    return { order: 1, coefficient: lastT > 0 ? lastE / lastT : 0, r2: 0, points: n };
  }
  const q = (sxy - (sx * sy) / n) / vx;
  const b = (sy - q * sx) / n;
  const vy = syy - (sy * sy) / n;
  const ssRes = Math.max(0, vy - q * (sxy - (sx * sy) / n));
  const r2 = vy > 0 ? 1 - ssRes / vy : 1;
  return { order: q, coefficient: Math.exp(b), r2, points: n };
}

/** Value of a power-law fit at τ ≥ 0. */
export function powerLawAt(f: PowerLawFit, tau: number): number {
  return tau > 0 ? f.coefficient * tau ** f.order : 0;
}

/** Least-squares slope of y against t (0 with fewer than 2 distinct t). */
export function trendSlope(t: ArrayLike<number>, y: ArrayLike<number>): number {
  const n = Math.min(t.length, y.length);
  if (n < 2) return 0;
  let st = 0,
    sy = 0;
  for (let i = 0; i < n; i++) {
    st += t[i];
    sy += y[i];
  }
  const mt = st / n;
  const my = sy / n;
  let num = 0,
    den = 0;
  for (let i = 0; i < n; i++) {
    num += (t[i] - mt) * (y[i] - my);
    den += (t[i] - mt) * (t[i] - mt);
  }
  return den > 0 ? num / den : 0;
}

export interface DriftEstimate {
  /** Change of y per orbital period. */
  perOrbit: number;
  /** 'per-orbit': mean of y(t) − y(t − T) over the samples a period in; 'trend': slope × T (span shorter than a period). */
  method: 'per-orbit' | 'trend';
}

/** Drift per orbit of a series y(t) (t ascending) for an orbit of period T (finite, > 0). */
export function driftPerOrbit(t: ArrayLike<number>, y: ArrayLike<number>, period: number): DriftEstimate {
  const n = Math.min(t.length, y.length);
  if (n >= 2 && t[n - 1] - t[0] >= period) {
    let sum = 0;
    let count = 0;
    let j = 0;
    for (let i = 0; i < n; i++) {
      const tb = t[i] - period;
      if (tb < t[0]) continue;
      while (j + 1 < n && t[j + 1] <= tb) j++;
      const k = Math.min(j + 1, n - 1);
      const w = t[k] > t[j] ? (tb - t[j]) / (t[k] - t[j]) : 0;
      sum += y[i] - (y[j] + w * (y[k] - y[j]));
      count++;
    }
    if (count > 0) return { perOrbit: sum / count, method: 'per-orbit' };
  }
  return { perOrbit: trendSlope(t, y) * period, method: 'trend' };
}
