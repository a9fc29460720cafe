import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import {
  eccentricToMean,
  eccentricToTrue,
  hyperbolicToMean,
  hyperbolicToTrue,
  meanMotion,
  meanToEccentric,
  meanToHyperbolic,
  meanToTrue,
  solveEllipticKepler,
  trueToEccentric,
  trueToHyperbolic,
  trueToMean,
} from '../../../core/orbit/anomaly.ts';

const DEG = Math.PI / 180;
const EPS = Number.EPSILON;
// Vallado, 4th ed., uses μ⊕ = 398 600.4418 km³/s² (from memory)
const MU_EARTH_VALLADO = 398600.4418e9;

function fieldOf(f: () => unknown): string {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return e.field;
    throw e;
  }
  throw new Error('did not throw');
}

/** angle difference folded into (−π, π] */
const angDiff = (a: number, b: number): number => Math.atan2(Math.sin(a - b), Math.cos(a - b));

describe('published worked examples', () => {
  it('matches Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., Example 2-1: M = 235.4°, e = 0.4 → E = 220.512 074 767 522° (from memory)', () => {
    expect(Math.abs(meanToEccentric(235.4 * DEG, 0.4) / DEG - 220.512074767522)).toBeLessThan(5e-13);
  });

  it('matches Curtis, Orbital Mechanics for Engineering Students, 3rd ed., Example 3.2: M = 3.6029 rad, e = 0.37255 → E = 3.4794 rad (from memory)', () => {
    // the unchecked solver takes M reduced to [−π, π]; the book prints E to 4 decimals
    expect(Math.abs(solveEllipticKepler(3.6029 - 2 * Math.PI, 0.37255) + 2 * Math.PI - 3.4794)).toBeLessThan(5e-5);
  });

  it('matches Vallado, 4th ed., Example 2-3: M = 235.4°, e = 2.4 → H = 1.601 376 144 (from memory)', () => {
    // the book's 1.601 376 144 agrees with ours (1.601 376 144 93...) to the last printed digit, truncated
    expect(Math.abs(meanToHyperbolic(235.4 * DEG, 2.4) - 1.601376144)).toBeLessThan(1e-9);
  });

  it('matches Vallado, 4th ed., Example 2-2: p = 25 512 km, Δt = 53.7874 min → B = tan(ν/2) = 0.817 751 (from memory)', () => {
    const p = 25512e3;
    const M = meanMotion(MU_EARTH_VALLADO, Infinity, p) * 53.7874 * 60; // our parabolic M = √(μ/p³)·Δt
    expect(Math.abs(Math.tan(meanToTrue(M, 1) / 2) - 0.817751)).toBeLessThan(5e-7);
  });
});

describe('elliptic Kepler equation', () => {
  it('solves E − e sin E = M to rounding level for e ∈ [0, 1) and any M (property, residual)', () => {
    fc.assert(
      fc.property(fc.double({ min: -50, max: 50, noNaN: true }), fc.double({ min: 0, max: 0.999999999, noNaN: true }), (M, e) => {
        const E = meanToEccentric(M, e);
        expect(Math.abs(E - e * Math.sin(E) - M)).toBeLessThanOrEqual(6 * EPS * Math.max(1, Math.abs(M)));
      }),
      { numRuns: 2000 },
    );
  });

  it('solveEllipticKepler (the unchecked solver the ephemeris calls) solves E − e sin E = M on [−π, π] to rounding level, e = 0 included, with sin E and cos E (property, residual)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
        fc.oneof(fc.constant(0), fc.double({ min: 0, max: 0.999999999, noNaN: true })),
        (M, e) => {
          const sc = new Float64Array(2);
          const E = solveEllipticKepler(M, e, sc);
          // as for meanToEccentric above: a few ulp of the terms E and e·sin E
          expect(Math.abs(E - e * Math.sin(E) - M)).toBeLessThanOrEqual(6 * EPS * Math.max(1, Math.abs(M)));
          // the sine and cosine it hands back are those of E, to rounding (carried across the last step)
          expect(Math.abs(sc[0] - Math.sin(E))).toBeLessThanOrEqual(4 * EPS);
          expect(Math.abs(sc[1] - Math.cos(E))).toBeLessThanOrEqual(4 * EPS);
        },
      ),
      { numRuns: 2000 },
    );
  });

  it('keeps full relative accuracy as e → 1 and M → 0 (residual from an exact series, analytic)', () => {
    for (const d of [1e-3, 1e-8, 1e-12]) {
      const e = 1 - d;
      const oneMinusE = 1 - e; // exact (Sterbenz), and the 1 − e the solver actually sees
      for (const M of [1e-12, 1e-9, 1e-6, 1e-3, 0.1]) {
        const E = meanToEccentric(M, e);
        // M(E) = (1 − e)E + e(E³/3! − E⁵/5! + ...), summed to convergence independently here
        let series = 0,
          term = (E * E * E) / 6,
          k = 3;
        while (Math.abs(term) > 1e-20 * Math.abs(series) || series === 0) {
          series += term;
          term *= (-E * E) / ((k + 1) * (k + 2));
          k += 2;
          if (k > 60) break;
        }
        const m = oneMinusE * E + e * series;
        expect(Math.abs(m - M) / M).toBeLessThan(1e-14);
      }
    }
  });

  it('preserves revolutions: E(M + 2πk) = E(M) + 2πk, and is odd in M', () => {
    for (const k of [-3, 1, 10]) {
      expect(meanToEccentric(1 + 2 * Math.PI * k, 0.7)).toBeCloseTo(meanToEccentric(1, 0.7) + 2 * Math.PI * k, 12);
    }
    expect(meanToEccentric(-0.4, 0.9)).toBe(-meanToEccentric(0.4, 0.9));
    expect(meanToEccentric(Math.PI, 0.99)).toBeCloseTo(Math.PI, 15);
    expect(meanToEccentric(0.3, 0)).toBe(0.3);
  });

  it('eccentricToMean inverts meanToEccentric (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: -20, max: 20, noNaN: true }), fc.double({ min: 0, max: 0.9999, noNaN: true }), (M, e) => {
        expect(Math.abs(eccentricToMean(meanToEccentric(M, e), e) - M)).toBeLessThan(8 * EPS * Math.max(1, Math.abs(M)));
      }),
      { numRuns: 500 },
    );
  });
});

describe('true ↔ eccentric / hyperbolic anomaly', () => {
  it('agrees with tan(ν/2) = √((1+e)/(1−e))·tan(E/2) (Curtis, Orbital Mechanics for Engineering Students, eq. 3.10b)', () => {
    fc.assert(
      fc.property(fc.double({ min: -3.1, max: 3.1, noNaN: true }), fc.double({ min: 0, max: 0.99, noNaN: true }), (E, e) => {
        const ref = 2 * Math.atan(Math.sqrt((1 + e) / (1 - e)) * Math.tan(E / 2));
        expect(Math.abs(angDiff(eccentricToTrue(E, e), ref))).toBeLessThan(1e-12);
        expect(Math.abs(trueToEccentric(eccentricToTrue(E, e), e) - E)).toBeLessThan(1e-13);
      }),
      { numRuns: 500 },
    );
  });

  it('is continuous across revolutions: ν(E + 2π) = ν(E) + 2π', () => {
    expect(eccentricToTrue(1 + 2 * Math.PI, 0.5)).toBeCloseTo(eccentricToTrue(1, 0.5) + 2 * Math.PI, 13);
    expect(trueToEccentric(-1 - 4 * Math.PI, 0.5)).toBeCloseTo(trueToEccentric(-1, 0.5) - 4 * Math.PI, 13);
  });

  it('agrees with tanh(H/2) = √((e−1)/(e+1))·tan(ν/2) (Curtis eq. 3.44a) and inverts', () => {
    fc.assert(
      fc.property(fc.double({ min: -8, max: 8, noNaN: true }), fc.double({ min: 1.001, max: 20, noNaN: true }), (H, e) => {
        const nu = hyperbolicToTrue(H, e);
        expect(Math.abs(Math.tanh(H / 2) - Math.sqrt((e - 1) / (e + 1)) * Math.tan(nu / 2))).toBeLessThan(1e-13);
        expect(Math.abs(nu)).toBeLessThan(Math.acos(-1 / e));
        if (Math.abs(H) < 6) expect(Math.abs(trueToHyperbolic(nu, e) - H)).toBeLessThan(1e-11 * Math.max(1, Math.abs(H)));
      }),
      { numRuns: 500 },
    );
  });
});

describe('hyperbolic Kepler equation', () => {
  it('solves e sinh H − H = M (property, relative residual)', () => {
    fc.assert(
      // (subnormal M excluded: H = M/(e − 1) is then quantised to a few multiples of 5e-324)
      fc.property(
        fc.double({ min: -1e5, max: 1e5, noNaN: true }).filter((m) => m === 0 || Math.abs(m) > 1e-300),
        fc.double({ min: 1.000001, max: 50, noNaN: true }),
        (M, e) => {
          const H = meanToHyperbolic(M, e);
          const res = e * Math.sinh(H) - H - M;
          // rounding H itself (relative ε) moves e·sinh H by e·cosh H·|H|·ε, hence the (1 + |H|)
          const scale = (1 + Math.abs(H)) * (Math.abs(M) + Math.abs(H) + e * Math.abs(Math.sinh(H)));
          expect(Math.abs(res)).toBeLessThanOrEqual(8 * EPS * scale + 8 * Number.MIN_VALUE);
          expect(Math.abs(hyperbolicToMean(H, e) - M)).toBeLessThanOrEqual(8 * EPS * scale + 8 * Number.MIN_VALUE);
        },
      ),
      { numRuns: 2000 },
    );
  });
});

describe('meanToTrue / trueToMean for every conic', () => {
  it('round-trips ellipse, parabola and hyperbola (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -30, max: 30, noNaN: true }),
        fc.oneof(fc.double({ min: 0, max: 0.999, noNaN: true }), fc.constant(1), fc.double({ min: 1.001, max: 10, noNaN: true })),
        (M, e) => {
          const nu = meanToTrue(M, e);
          expect(Math.abs(trueToMean(nu, e) - M)).toBeLessThan(1e-10 * Math.max(1, Math.abs(M)));
        },
      ),
      { numRuns: 1000 },
    );
  });

  it('parabola: M = (D + D³/3)/2 with D = tan(ν/2) (Barker’s equation)', () => {
    for (const M of [-100, -1, 1e-9, 0.5, 3, 1e4]) {
      const D = Math.tan(meanToTrue(M, 1) / 2);
      // tan(ν/2) near ν = ±π amplifies the rounding of ν by about |D|: allow 1e-13 relative
      expect(Math.abs((D + D ** 3 / 3) / 2 - M)).toBeLessThan(1e-13 * Math.max(1, Math.abs(M)));
    }
    expect(meanToTrue(0, 1)).toBe(0);
  });

  it('the parabolic M joins the elliptic and hyperbolic ones in the limit e → 1 (M_e = M_p·|1 − e²|^{3/2}, analytic)', () => {
    for (const Mp of [-5, -0.3, 0.2, 4]) {
      const nuP = meanToTrue(Mp, 1);
      for (const d of [1e-6, -1e-6]) {
        const e = 1 + d;
        const Me = Mp * Math.abs(1 - e * e) ** 1.5;
        expect(Math.abs(meanToTrue(Me, e) - nuP)).toBeLessThan(1e-4);
      }
    }
  });

  it('elliptic ν keeps the revolution of M', () => {
    expect(meanToTrue(0.5 + 6 * Math.PI, 0.3)).toBeCloseTo(meanToTrue(0.5, 0.3) + 6 * Math.PI, 12);
  });
});

describe('meanMotion', () => {
  it('is √(μ/|a|³) for ellipse and hyperbola and √(μ/p³) for the parabola', () => {
    expect(meanMotion(4, 1)).toBe(2);
    expect(meanMotion(4, -1)).toBe(2);
    expect(meanMotion(8, Infinity, 2)).toBe(1);
    // circular orbit: n·T = 2π with T = 2π√(a³/μ) (Kepler's third law)
    const a = 7.0e6,
      mu = 3.986004418e14;
    expect(meanMotion(mu, a) * 2 * Math.PI * Math.sqrt(a ** 3 / mu)).toBeCloseTo(2 * Math.PI, 13);
  });
});

describe('bad input', () => {
  it('raises InputError naming the field', () => {
    expect(fieldOf(() => meanToEccentric(NaN, 0.1))).toBe('M');
    expect(fieldOf(() => meanToEccentric(1, 1))).toBe('e');
    expect(fieldOf(() => meanToEccentric(1, -0.1))).toBe('e');
    expect(fieldOf(() => meanToHyperbolic(1, 1))).toBe('e');
    expect(fieldOf(() => meanToHyperbolic(Infinity, 2))).toBe('M');
    expect(fieldOf(() => trueToHyperbolic(2.2, 2))).toBe('nu'); // ν∞ = 120° for e = 2
    expect(fieldOf(() => trueToMean(Math.PI, 1))).toBe('nu');
    expect(fieldOf(() => meanToTrue(1, NaN))).toBe('e');
    expect(fieldOf(() => eccentricToTrue(1, 1.2))).toBe('e');
    expect(fieldOf(() => hyperbolicToMean(1e6, 2))).toBe('H');
    expect(fieldOf(() => meanMotion(0, 1))).toBe('mu');
    expect(fieldOf(() => meanMotion(1, 0))).toBe('a');
    expect(fieldOf(() => meanMotion(1, Infinity))).toBe('p');
  });
});
