/**
 * Drawing samples of a coast: points of the conic evenly spaced in the universal anomaly χ
 * (χ = √a·ΔE on an ellipse, √(−a)·ΔH on a hyperbola), so they crowd near periapsis where the
 * path bends, not evenly in time. For each χ the time and position are explicit — the universal
 * Kepler equation √μ·Δt = σ0·χ²·C(ψ) + (1 − α·r0)·χ³·S(ψ) + r0·χ and the Lagrange coefficients
 * f = 1 − χ²C/r0, g = Δt − χ³S/√μ (Curtis, Orbital Mechanics for Engineering Students, §3.7) —
 * so sampling needs no iteration beyond one Kepler solve for the end point.
 *
 * A coast longer than one period of an ellipse is drawn over its first full revolution (the
 * curve closes; later revolutions retrace it), so the last sample time is then t0 + period.
 */
import { keplerCoefficients } from '../orbit/index.ts';
import { stumpffCS } from '../orbit/index.ts';

const coef = new Float64Array(5);
const cs = new Float64Array(2);
const TWO_PI = 2 * Math.PI;

/**
 * Writes `n` sample times (t0 … t0 + span, or one period) into outT and positions (xyz
 * interleaved) into outXyz, for the conic through `state` (relative to the central body) at t0.
 * n ≥ 2; allocation-free.
 */
export function sampleConic(mu: number, state: ArrayLike<number>, t0: number, span: number, n: number, outT: Float64Array, outXyz: Float64Array): void {
  if (n <= 0) return;
  const x = state[0],
    y = state[1],
    z = state[2];
  const vx = state[3],
    vy = state[4],
    vz = state[5];
  const r0 = Math.sqrt(x * x + y * y + z * z);
  const v2 = vx * vx + vy * vy + vz * vz;
  const sqmu = Math.sqrt(mu);
  const sigma0 = (x * vx + y * vy + z * vz) / sqmu;
  const alpha = 2 / r0 - v2 / mu;
  if (n === 1 || !(span > 0)) {
    for (let j = 0; j < n; j++) {
      outT[j] = t0;
      outXyz[3 * j] = x;
      outXyz[3 * j + 1] = y;
      outXyz[3 * j + 2] = z;
    }
    return;
  }
  let chiEnd: number;
  let tSpan = span;
  if (alpha > 0) {
    const period = TWO_PI / (sqmu * alpha * Math.sqrt(alpha));
    if (span >= period) {
      tSpan = period;
      chiEnd = TWO_PI / Math.sqrt(alpha);
    } else {
      keplerCoefficients(mu, state, span, coef);
      // reduced modulo the period: add back the revolution removed (span < period: at most one)
      chiEnd = coef[4];
      if (span > 0.5 * period) chiEnd += TWO_PI / Math.sqrt(alpha);
    }
  } else {
    keplerCoefficients(mu, state, span, coef);
    chiEnd = coef[4];
  }
  const oneMinus = 1 - alpha * r0;
  for (let j = 0; j < n; j++) {
    const chi = (chiEnd * j) / (n - 1);
    const chi2 = chi * chi;
    stumpffCS(alpha * chi2, cs);
    const c2 = cs[0];
    const c3 = cs[1];
    let dt = (sigma0 * chi2 * c2 + oneMinus * chi2 * chi * c3 + r0 * chi) / sqmu;
    if (j === n - 1) dt = tSpan;
    const f = 1 - (chi2 * c2) / r0;
    const g = dt - (chi2 * chi * c3) / sqmu;
    outT[j] = t0 + dt;
    outXyz[3 * j] = f * x + g * vx;
    outXyz[3 * j + 1] = f * y + g * vy;
    outXyz[3 * j + 2] = f * z + g * vz;
  }
}
