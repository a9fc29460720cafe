import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import { CIRCULAR_TOLERANCE, EQUATORIAL_TOLERANCE, type Elements, elementsToState, stateToElements } from '../../../core/orbit/elements.ts';

const DEG = Math.PI / 180;
const KM = 1e3;
// Curtis uses μ⊕ = 398 600 km³/s²; Vallado, 4th ed., 398 600.4418 km³/s² (from memory)
const MU_CURTIS = 398600e9;
const MU_VALLADO = 398600.4418e9;
const TWO_PI = 2 * Math.PI;

const angDiff = (a: number, b: number): number => Math.atan2(Math.sin(a - b), Math.cos(a - b));
const split = (s: ArrayLike<number>): [number[], number[]] => [
  [s[0], s[1], s[2]],
  [s[3], s[4], s[5]],
];

function fieldOf(f: () => unknown): string {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return e.field;
    throw e;
  }
  throw new Error('did not throw');
}

/** |printed − computed| within half a unit of the last printed digit. */
function expectPrinted(computed: number, printed: number, decimals: number): void {
  expect(Math.abs(computed - printed)).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-12 * Math.abs(printed));
}

describe('published worked examples', () => {
  it('matches Curtis, Orbital Mechanics for Engineering Students, 3rd ed., Example 4.3 (state → elements) (from memory)', () => {
    // r = −6045 I − 3490 J + 2500 K km, v = −3.457 I + 6.618 J + 2.533 K km/s
    const el = stateToElements(MU_CURTIS, [-6045 * KM, -3490 * KM, 2500 * KM], [-3.457 * KM, 6.618 * KM, 2.533 * KM]);
    const h = Math.sqrt(el.p * MU_CURTIS) / 1e6; // km²/s
    expect(Math.abs(h - 58310)).toBeLessThanOrEqual(5); // printed 58 310 (4 significant digits)
    expectPrinted(el.e, 0.1712, 4);
    expectPrinted(el.i / DEG, 153.2, 1);
    expectPrinted(el.raan / DEG, 255.3, 1);
    expectPrinted(el.argp / DEG, 20.07, 2);
    expectPrinted(el.nu / DEG, 28.45, 2);
    expectPrinted(el.a / KM, 8788, 0);
  });

  it('matches Curtis, 3rd ed., Example 4.7 (elements → state, hyperbola) (from memory)', () => {
    // h = 80 000 km²/s, e = 1.4, i = 30°, Ω = 40°, ω = 60°, θ = 30°
    const h = 80000e6;
    const s = elementsToState(MU_CURTIS, { p: (h * h) / MU_CURTIS, e: 1.4, i: 30 * DEG, raan: 40 * DEG, argp: 60 * DEG, nu: 30 * DEG });
    [-4040, 4815, 3629].forEach((x, k) => expectPrinted(s[k] / KM, x, 0));
    expectPrinted(s[3] / KM, -10.39, 2);
    expectPrinted(s[4] / KM, -4.772, 3);
    expectPrinted(s[5] / KM, 1.744, 3);
  });

  it('matches Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., Example 2-5 (RV2COE) (from memory)', () => {
    // r = 6524.834 I + 6862.875 J + 6448.296 K km, v = 4.901327 I + 5.533756 J − 1.976341 K km/s
    const el = stateToElements(MU_VALLADO, [6524.834 * KM, 6862.875 * KM, 6448.296 * KM], [4.901327 * KM, 5.533756 * KM, -1.976341 * KM]);
    // p = 11 067.790 km and a = 36 127.343 km as printed agree to 6 significant digits here
    // (0.008 km and 0.005 km apart; the recalled input digits or the book's canonical units
    // may account for it), the angles to every printed digit.
    expect(Math.abs(el.p / KM / 11067.79 - 1)).toBeLessThan(1e-6);
    expect(Math.abs(el.a / KM / 36127.343 - 1)).toBeLessThan(1e-6);
    expectPrinted(el.e, 0.832853, 6);
    expectPrinted(el.i / DEG, 87.87, 2);
    expectPrinted(el.raan / DEG, 227.898, 3);
    expectPrinted(el.argp / DEG, 53.38, 2);
    expectPrinted(el.nu / DEG, 92.335, 3);
  });

  it('matches Vallado, 4th ed., Example 2-6 (COE2RV) (from memory)', () => {
    // p = 11 067.790 km, e = 0.83285, i = 87.87°, Ω = 227.89°, ω = 53.38°, ν = 92.335°
    const s = elementsToState(MU_VALLADO, { p: 11067.79 * KM, e: 0.83285, i: 87.87 * DEG, raan: 227.89 * DEG, argp: 53.38 * DEG, nu: 92.335 * DEG });
    [6525.368, 6861.532, 6449.119].forEach((x, k) => expectPrinted(s[k] / KM, x, 3));
    [4.902279, 5.53314, -1.97571].forEach((x, k) => expectPrinted(s[k + 3] / KM, x, 6));
  });
});

describe('analytic checks', () => {
  it('a circular equatorial orbit has r = a, v = √(μ/a), e = 0 and ν = true longitude', () => {
    const mu = 3e14,
      a = 7e6;
    const s = elementsToState(mu, { a, e: 0, i: 0, raan: 0, argp: 0, nu: Math.PI / 2 });
    // to rounding: cos of the double nearest π/2 is 6e-17, so x ≈ 4e-10 m; 2ε of a and of v
    const eps = Number.EPSILON;
    expect(Math.abs(s[0])).toBeLessThan(2 * eps * a);
    expect(Math.abs(s[1] - a)).toBeLessThan(2 * eps * a);
    expect(Math.abs(s[3] + Math.sqrt(mu / a))).toBeLessThan(2 * eps * Math.sqrt(mu / a));
    const el = stateToElements(mu, [a, 0, 0], [0, 0, Math.sqrt(mu / a)]); // polar circular
    expect(el.e).toBeLessThan(1e-15);
    expect(el.i).toBeCloseTo(Math.PI / 2, 15);
    expect(el.a / a).toBeCloseTo(1, 14);
  });

  it('periapsis and apoapsis radii are p/(1 ± e) (conic equation)', () => {
    const mu = 3e14,
      p = 9e6,
      e = 0.4;
    const peri = elementsToState(mu, { p, e, i: 0.3, raan: 1, argp: 2, nu: 0 });
    const apo = elementsToState(mu, { p, e, i: 0.3, raan: 1, argp: 2, nu: Math.PI });
    expect(Math.hypot(peri[0], peri[1], peri[2]) / (p / (1 + e))).toBeCloseTo(1, 15);
    expect(Math.hypot(apo[0], apo[1], apo[2]) / (p / (1 - e))).toBeCloseTo(1, 15);
  });

  it('a parabola (e = 1) needs p and has escape speed everywhere: v² = 2μ/r', () => {
    const mu = 3e14,
      p = 1e7;
    for (const nu of [-2, 0, 1, 2.5]) {
      const s = elementsToState(mu, { p, e: 1, i: 0.2, raan: 0.3, argp: 0.4, nu });
      const r = Math.hypot(s[0], s[1], s[2]);
      const v2 = s[3] ** 2 + s[4] ** 2 + s[5] ** 2;
      expect(v2 / ((2 * mu) / r)).toBeCloseTo(1, 14);
      const el = stateToElements(mu, ...split(s));
      expect(Math.abs(el.e - 1)).toBeLessThan(1e-14);
      expect(el.p / p).toBeCloseTo(1, 14);
      // e may come out 1 − 1e-16 (then ν is wrapped into [0, 2π) as for any ellipse)
      expect(Math.abs(angDiff(el.nu, nu))).toBeLessThan(1e-12);
      expect(Math.abs(el.a)).toBeGreaterThan(1e20); // Infinity only when e comes out exactly 1
    }
  });
});

// element generators away from the singular tolerances
const angle = fc.double({ min: 0, max: TWO_PI - 1e-9, noNaN: true });
const incl = fc.double({ min: 1e-5, max: Math.PI - 1e-5, noNaN: true });

function expectElementsClose(
  got: Elements,
  want: { a?: number; p: number; e: number; i: number; raan: number; argp: number; nu: number },
  angTol: number,
): void {
  expect(Math.abs(got.p / want.p - 1)).toBeLessThan(1e-12);
  expect(Math.abs(got.e - want.e)).toBeLessThan(1e-12 * Math.max(1, want.e));
  expect(Math.abs(got.i - want.i)).toBeLessThan(1e-12);
  expect(Math.abs(angDiff(got.raan, want.raan))).toBeLessThan(angTol);
  expect(Math.abs(angDiff(got.argp, want.argp))).toBeLessThan(angTol);
  expect(Math.abs(angDiff(got.nu, want.nu))).toBeLessThan(angTol);
  expect(got.i).toBeGreaterThanOrEqual(0);
  expect(got.i).toBeLessThanOrEqual(Math.PI);
  expect(got.raan).toBeGreaterThanOrEqual(0);
  expect(got.raan).toBeLessThan(TWO_PI);
  expect(got.argp).toBeGreaterThanOrEqual(0);
  expect(got.argp).toBeLessThan(TWO_PI);
}

describe('round trips elements → state → elements (property)', () => {
  const mu = 3e14;

  it('ellipses, e ∈ [1e-6, 0.99]', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e6, max: 1e11, noNaN: true }),
        fc.double({ min: 1e-6, max: 0.99, noNaN: true }),
        incl,
        angle,
        angle,
        angle,
        (a, e, i, raan, argp, nu) => {
          const s = elementsToState(mu, { a, e, i, raan, argp, nu });
          const el = stateToElements(mu, ...split(s));
          // ω and ν alone are conditioned like ε/e (ω + ν stays sharp), Ω like ε/sin i
          expectElementsClose(el, { p: a * (1 - e * e), e, i, raan, argp, nu }, 1e-12 / Math.min(e, Math.sin(i)));
          expect(Math.abs(el.a / a - 1)).toBeLessThan(1e-11);
          expect(el.nu).toBeGreaterThanOrEqual(0);
          expect(el.nu).toBeLessThan(TWO_PI);
        },
      ),
      { numRuns: 500 },
    );
  });

  it('hyperbolas, e ∈ [1.01, 10], ν inside the asymptotes', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e6, max: 1e9, noNaN: true }),
        fc.double({ min: 1.01, max: 10, noNaN: true }),
        incl,
        angle,
        angle,
        fc.double({ min: -0.98, max: 0.98, noNaN: true }),
        (p, e, i, raan, argp, f) => {
          const nu = f * Math.acos(-1 / e);
          const s = elementsToState(mu, { p, e, i, raan, argp, nu });
          const el = stateToElements(mu, ...split(s));
          expectElementsClose(el, { p, e, i, raan, argp, nu }, 1e-11 / Math.sin(i));
          expect(el.a).toBeLessThan(0);
          expect(Math.abs(el.a / (p / (1 - e * e)) - 1)).toBeLessThan(1e-11);
          expect(Math.abs(el.nu)).toBeLessThan(Math.acos(-1 / e));
        },
      ),
      { numRuns: 500 },
    );
  });

  it('near-circular and near-equatorial orbits reproduce the state (state → elements → state)', () => {
    const small = fc.oneof(fc.constant(0), fc.double({ min: 0, max: 1e-9, noNaN: true }));
    fc.assert(
      fc.property(
        fc.double({ min: 1e6, max: 1e9, noNaN: true }),
        small,
        fc.oneof(
          small,
          small.map((d) => Math.PI - d),
          incl,
        ),
        angle,
        angle,
        angle,
        (a, e, i, raan, argp, nu) => {
          const s = elementsToState(mu, { a, e, i, raan, argp, nu });
          const back = elementsToState(mu, stateToElements(mu, ...split(s)));
          const r = Math.hypot(s[0], s[1], s[2]);
          const v = Math.hypot(s[3], s[4], s[5]);
          for (let k = 0; k < 3; k++) {
            expect(Math.abs(back[k] - s[k])).toBeLessThan(1e-12 * r);
            expect(Math.abs(back[k + 3] - s[k + 3])).toBeLessThan(1e-12 * v);
          }
        },
      ),
      { numRuns: 500 },
    );
  });
});

describe('singular-case conventions', () => {
  const mu = 3e14,
    a = 8e6;

  it('circular inclined: ω = 0 and ν is the argument of latitude ω + ν', () => {
    const el = stateToElements(mu, ...split(elementsToState(mu, { a, e: 0, i: 0.5, raan: 1, argp: 0.7, nu: 0.4 })));
    expect(el.e).toBeLessThan(CIRCULAR_TOLERANCE);
    expect(el.argp).toBe(0);
    expect(el.raan).toBeCloseTo(1, 14);
    expect(el.nu).toBeCloseTo(1.1, 14);
  });

  it('equatorial prograde: Ω = 0, ω is the longitude of periapsis Ω + ω', () => {
    const el = stateToElements(mu, ...split(elementsToState(mu, { a, e: 0.1, i: 0, raan: 1, argp: 0.7, nu: 0.4 })));
    expect(el.i).toBe(0);
    expect(el.raan).toBe(0);
    expect(el.argp).toBeCloseTo(1.7, 14);
    expect(el.nu).toBeCloseTo(0.4, 13);
  });

  it('equatorial retrograde (i = π): Ω = 0, ω measured from +x in the direction of motion (ω − Ω)', () => {
    const el = stateToElements(mu, ...split(elementsToState(mu, { a, e: 0.1, i: Math.PI, raan: 1, argp: 0.7, nu: 0.4 })));
    expect(Math.sin(el.i)).toBeLessThan(EQUATORIAL_TOLERANCE);
    expect(el.raan).toBe(0);
    expect(Math.abs(angDiff(el.argp, 0.7 - 1))).toBeLessThan(1e-13);
    expect(el.nu).toBeCloseTo(0.4, 13);
  });

  it('circular equatorial: Ω = ω = 0 and ν is the true longitude', () => {
    const pro = stateToElements(mu, ...split(elementsToState(mu, { a, e: 0, i: 0, raan: 1, argp: 0.7, nu: 0.4 })));
    expect([pro.raan, pro.argp]).toEqual([0, 0]);
    expect(pro.nu).toBeCloseTo(2.1, 14);
    const retro = stateToElements(mu, ...split(elementsToState(mu, { a, e: 0, i: Math.PI, raan: 1, argp: 0.7, nu: 0.4 })));
    expect([retro.raan, retro.argp]).toEqual([0, 0]);
    expect(Math.abs(angDiff(retro.nu, 0.7 + 0.4 - 1))).toBeLessThan(1e-13);
  });
});

describe('bad input', () => {
  const mu = 3e14;
  it('stateToElements raises InputError naming the field', () => {
    expect(fieldOf(() => stateToElements(0, [1, 0, 0], [0, 1, 0]))).toBe('mu');
    expect(fieldOf(() => stateToElements(-1, [1, 0, 0], [0, 1, 0]))).toBe('mu');
    expect(fieldOf(() => stateToElements(NaN, [1, 0, 0], [0, 1, 0]))).toBe('mu');
    expect(fieldOf(() => stateToElements(mu, [NaN, 0, 0], [0, 1, 0]))).toBe('r[0]');
    expect(fieldOf(() => stateToElements(mu, [1, 0, 0], [0, Infinity, 0]))).toBe('v[1]');
    expect(fieldOf(() => stateToElements(mu, [0, 0, 0], [0, 1, 0]))).toBe('r');
    expect(fieldOf(() => stateToElements(mu, [7e6, 0, 0], [3e3, 0, 0]))).toBe('v'); // rectilinear
    expect(fieldOf(() => stateToElements(mu, [7e6, 0, 0], [0, 0, 0]))).toBe('v');
  });

  it('elementsToState raises InputError naming the field', () => {
    const base = { a: 7e6, e: 0.1, i: 0.1, raan: 0, argp: 0, nu: 0 };
    expect(fieldOf(() => elementsToState(0, base))).toBe('mu');
    expect(fieldOf(() => elementsToState(mu, { ...base, e: -0.1 }))).toBe('e');
    expect(fieldOf(() => elementsToState(mu, { ...base, i: NaN }))).toBe('i');
    expect(fieldOf(() => elementsToState(mu, { ...base, nu: Infinity }))).toBe('nu');
    expect(fieldOf(() => elementsToState(mu, { ...base, e: 1 }))).toBe('p');
    expect(fieldOf(() => elementsToState(mu, { ...base, a: -7e6 }))).toBe('a');
    expect(fieldOf(() => elementsToState(mu, { ...base, e: 1.5 }))).toBe('a');
    expect(fieldOf(() => elementsToState(mu, { ...base, a: undefined }))).toBe('a');
    expect(fieldOf(() => elementsToState(mu, { ...base, p: -1 }))).toBe('p');
    expect(fieldOf(() => elementsToState(mu, { p: 1e7, e: 2, i: 0, raan: 0, argp: 0, nu: 2.2 }))).toBe('nu'); // ν∞ = 120°
  });

  it('elementsToState writes into out and ignores a when p is given', () => {
    const out = new Float64Array(6);
    const s = elementsToState(mu, { a: 123, p: 7e6, e: 0, i: 0, raan: 0, argp: 0, nu: 0 }, out);
    expect(s).toBe(out);
    expect(out[0]).toBe(7e6);
  });
});
