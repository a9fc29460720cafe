/**
 * Stumpff functions of the universal-variable formulation (Curtis, Orbital Mechanics for
 * Engineering Students, §3.7, eqs. 3.52–3.53; Vallado, Fundamentals of Astrodynamics and
 * Applications, 4th ed., §2.2, as c2 and c3):
 *
 *   C(z) = (1 − cos √z)/z,          S(z) = (√z − sin √z)/√z³        (z > 0)
 *   C(z) = (cosh √−z − 1)/(−z),     S(z) = (sinh √−z − √−z)/√(−z)³  (z < 0)
 *   C(0) = 1/2,                     S(0) = 1/6
 *
 * For |z| < 1 both are summed from their Maclaurin series C = Σ (−z)^k/(2k+2)!,
 * S = Σ (−z)^k/(2k+3)! (ten terms, truncation below 1e-17 relative), which avoids the
 * cancellation in 1 − cos and x − sin x near zero. Elsewhere C uses the half-angle form
 * 2·sin²(√z/2)/z (2·sinh²(√−z/2)/(−z)), free of cancellation at every z. For z below about
 * −5e5 the hyperbolic forms overflow to +Infinity (never NaN).
 */

// Series coefficients, highest power first for Horner: C: 1/(2k+2)!, S: 1/(2k+3)!, k = 0..9,
// with alternating sign folded into the argument (−z).
const C_COEF = [
  1 / 2,
  1 / 24,
  1 / 720,
  1 / 40320,
  1 / 3628800,
  1 / 479001600,
  1 / 87178291200,
  1 / 20922789888000,
  1 / 6402373705728000,
  1 / 2432902008176640000,
];
const S_COEF = [
  1 / 6,
  1 / 120,
  1 / 5040,
  1 / 362880,
  1 / 39916800,
  1 / 6227020800,
  1 / 1307674368000,
  1 / 355687428096000,
  1 / 121645100408832000,
  1 / 51090942171709440000,
];
const C0 = C_COEF[0],
  C1 = C_COEF[1],
  C2 = C_COEF[2],
  C3 = C_COEF[3],
  C4 = C_COEF[4];
const C5 = C_COEF[5],
  C6 = C_COEF[6],
  C7 = C_COEF[7],
  C8 = C_COEF[8],
  C9 = C_COEF[9];
const S0 = S_COEF[0],
  S1 = S_COEF[1],
  S2 = S_COEF[2],
  S3 = S_COEF[3],
  S4 = S_COEF[4];
const S5 = S_COEF[5],
  S6 = S_COEF[6],
  S7 = S_COEF[7],
  S8 = S_COEF[8],
  S9 = S_COEF[9];

/** |z| below this uses the series. */
export const STUMPFF_SERIES_LIMIT = 1;

function seriesC(z: number): number {
  const w = -z;
  return C0 + w * (C1 + w * (C2 + w * (C3 + w * (C4 + w * (C5 + w * (C6 + w * (C7 + w * (C8 + w * C9))))))));
}

function seriesS(z: number): number {
  const w = -z;
  return S0 + w * (S1 + w * (S2 + w * (S3 + w * (S4 + w * (S5 + w * (S6 + w * (S7 + w * (S8 + w * S9))))))));
}

/** Stumpff C(z) (Vallado's c2). */
export function stumpffC(z: number): number {
  if (Math.abs(z) < STUMPFF_SERIES_LIMIT) return seriesC(z);
  if (z > 0) {
    const s = Math.sin(0.5 * Math.sqrt(z));
    return (2 * s * s) / z;
  }
  const s = Math.sinh(0.5 * Math.sqrt(-z));
  return (2 * s * s) / -z;
}

/** Stumpff S(z) (Vallado's c3). */
export function stumpffS(z: number): number {
  if (Math.abs(z) < STUMPFF_SERIES_LIMIT) return seriesS(z);
  if (z > 0) {
    const x = Math.sqrt(z);
    return (x - Math.sin(x)) / (z * x);
  }
  const y = Math.sqrt(-z);
  return (Math.sinh(y) - y) / (-z * y);
}

/**
 * C(z) and S(z) together with one sine/cosine (or sinh/cosh) pair, written to out[0], out[1].
 * Allocation-free; used by the Kepler propagator's inner loop.
 */
export function stumpffCS(z: number, out: Float64Array | number[]): void {
  if (Math.abs(z) < STUMPFF_SERIES_LIMIT) {
    out[0] = seriesC(z);
    out[1] = seriesS(z);
    return;
  }
  if (z > 0) {
    const x = Math.sqrt(z);
    const h = 0.5 * x;
    const s = Math.sin(h);
    const c = Math.cos(h);
    out[0] = (2 * s * s) / z;
    out[1] = (x - 2 * s * c) / (z * x);
    return;
  }
  const y = Math.sqrt(-z);
  const h = 0.5 * y;
  const s = Math.sinh(h);
  const c = Math.cosh(h);
  out[0] = (2 * s * s) / -z;
  out[1] = (2 * s * c - y) / (-z * y);
}
