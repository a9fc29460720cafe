/**
 * Huge numbers and singular flights: a result that is not finite, or whose precision is gone, is
 * a typed error naming the reason (the command line's exit 3), never a state that looks
 * plausible or an Infinity printed as "—"; a value too large for a double is called too large.
 */
import { describe, expect, it } from 'vitest';
import { parseQuantity } from '../../core/io/units.ts';
import { parsePlanFile } from '../../core/io/planFile.ts';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import { InputError, SolverError, ValidationError } from '../../core/math/errors.ts';
import { correctPlan } from '../../core/nbody/correct.ts';
import { elementsToState, stateToElements } from '../../core/orbit/elements.ts';
import { eccentricToMean, meanToEccentric, eccentricToTrue } from '../../core/orbit/anomaly.ts';
import { hohmann } from '../../core/orbit/hohmann.ts';
import { KEPLER_MAX_REVOLUTIONS, propagateKepler } from '../../core/orbit/kepler.ts';
import { solveLambert } from '../../core/orbit/lambert.ts';
import { demoPlan } from '../fixtures/demoPlan.ts';
import { demoSystem } from '../core/plan/helpers.ts';
import { demoPlanText, demoSystemDoc } from '../fuzz/files.ts';
import { runCli } from '../app/cli/runCli.ts';

type Doc = Record<string, any>;

const MU = 3.986004418e14;
const EPS = Number.EPSILON;

function thrown(f: () => unknown): Error {
  try {
    f();
  } catch (e) {
    return e as Error;
  }
  throw new Error('no error');
}

const norm = (s: ArrayLike<number>, o = 0): number => Math.hypot(s[o], s[o + 1], s[o + 2]);

describe('Kepler: Δt past what double precision resolves', () => {
  // a low orbit: a = 7,000 km, e = 0.1, period about 5,830 s
  const el = { a: 7e6, e: 0.1, i: 0.4, raan: 0.3, argp: 1.1, nu: 0.7 };
  const s0 = Array.from(elementsToState(MU, el));

  it('regression (Δt = 1e300 s gave |r| = 1.1e285 km on a bound orbit; Δt ≥ 1e20 s the initial state unchanged): SolverError precision-lost', () => {
    for (const dt of [1e20, 1e300, -1e300, 8.5e19]) {
      const e = thrown(() => propagateKepler(MU, s0, dt));
      expect(e).toBeInstanceOf(SolverError);
      expect((e as SolverError).reason).toBe('precision-lost');
      expect(e.message).toContain('revolutions');
    }
  });

  it("bound orbits reduce Δt modulo the period: 2⁴⁰ revolutions and a quarter land a quarter of a mean anomaly on, within the phase the period's rounding allows", () => {
    const T = 2 * Math.PI * Math.sqrt(el.a ** 3 / MU);
    const k = 2 ** 40;
    expect(k).toBeLessThan(KEPLER_MAX_REVOLUTIONS);
    const s = propagateKepler(MU, s0, k * T + 0.25 * T);
    // the orbit is kept: a and e of the end state at rounding level (4e-16 seen; allow 1e-14)
    const e1 = stateToElements(MU, [s[0], s[1], s[2]], [s[3], s[4], s[5]]);
    expect(Math.abs(e1.a / el.a - 1)).toBeLessThan(1e-14);
    expect(Math.abs(e1.e - el.e)).toBeLessThan(1e-14);
    // the phase (Kepler's equation, anomaly.ts, an independent route): M0 + π/2. Its uncertainty
    // is the rounding of T here and in the propagator (about ε of T each) times k revolutions:
    // allow 2π·k·4ε of phase (8.3e-4 of the radius seen against 5.4e-3 allowed)
    const E0 = 2 * Math.atan(Math.sqrt((1 - el.e) / (1 + el.e)) * Math.tan(el.nu / 2));
    const M1 = eccentricToMean(E0, el.e) + Math.PI / 2;
    const nu1 = eccentricToTrue(meanToEccentric(M1, el.e), el.e);
    const ref = elementsToState(MU, { ...el, nu: nu1 });
    const phaseTol = 2 * Math.PI * k * 4 * EPS;
    const posTol = (phaseTol * norm(ref, 3) * T) / (2 * Math.PI) / norm(ref); // a phase error moves the body along at |v|
    expect(Math.hypot(s[0] - ref[0], s[1] - ref[1], s[2] - ref[2]) / norm(ref)).toBeLessThan(posTol);
  });

  it('just past the limit of revolutions is refused, just inside answers', () => {
    const T = 2 * Math.PI * Math.sqrt(el.a ** 3 / MU);
    expect(() => propagateKepler(MU, s0, 1.01 * KEPLER_MAX_REVOLUTIONS * T)).toThrow(/precision-lost/);
    const s = propagateKepler(MU, s0, 0.99 * KEPLER_MAX_REVOLUTIONS * T);
    expect(norm(s)).toBeGreaterThan(el.a * (1 - el.e) * (1 - 1e-12));
    expect(norm(s)).toBeLessThan(el.a * (1 + el.e) * (1 + 1e-12));
  });
});

describe('Kepler: a radial fall through the centre', () => {
  const R = 1e7;
  // free fall from rest at R reaches the centre at t = π·√(R³/8μ) (the cycloid r = (R/2)(1 + cos η),
  // t = √(R³/8μ)(η + sin η) at η = π; Bate, Mueller & White, ch. 4, from memory)
  const tff = Math.PI * Math.sqrt(R ** 3 / (8 * MU));

  it('regression (a fall from rest passed through r = 0 silently, bouncing out again): SolverError collision with the time of the fall', () => {
    // just before: on the cycloid, r = R·cos²(η/2) with η from t by bisection (7e-14 relative
    // seen at 0.999 of the fall, where r ≈ 0.018 R; allow 1e-12)
    const t = 0.999 * tff;
    let lo = 0;
    let hi = Math.PI;
    for (let i = 0; i < 100; i++) {
      const m = 0.5 * (lo + hi);
      if (Math.sqrt(R ** 3 / (8 * MU)) * (m + Math.sin(m)) < t) lo = m;
      else hi = m;
    }
    const before = propagateKepler(MU, [R, 0, 0, 0, 0, 0], t);
    expect(Math.abs(before[0] / (R * Math.cos(lo / 2) ** 2) - 1)).toBeLessThan(1e-12);
    for (const dt of [1.001 * tff, 1.5 * tff, 1e300, -1.5 * tff]) {
      const e = thrown(() => propagateKepler(MU, [R, 0, 0, 0, 0, 0], dt));
      expect(e).toBeInstanceOf(SolverError);
      expect((e as SolverError).reason).toBe('collision');
      // the reported time is the free fall's (1e-12: a few ulps through acos and √)
      expect(Math.abs(Math.abs((e as SolverError).inputs.tCollision as number) / tff - 1)).toBeLessThan(1e-12);
    }
  });

  it('a radial fall along any direction (r ∥ v to rounding) is caught; an escape outward is not, but flown backward it came from the centre', () => {
    const u = [0.36, -0.48, 0.8];
    const r0 = 2e7;
    const v0 = 1.5 * Math.sqrt((2 * MU) / r0); // hyperbolic, radial
    const out = [r0 * u[0], r0 * u[1], r0 * u[2], v0 * u[0], v0 * u[1], v0 * u[2]];
    expect(norm(propagateKepler(MU, out, 1e6))).toBeGreaterThan(r0);
    // the time since the centre: ∫ dr/v(r) from 0 to r0 with v² = v0² + 2μ(1/r − 1/r0)
    // (energy conservation), by Simpson's rule in s = √r (the integrand 2s/v is smooth there)
    const n = 20000;
    const f = (s: number): number => (s === 0 ? 0 : (2 * s) / Math.sqrt(v0 * v0 + 2 * MU * (1 / (s * s) - 1 / r0)));
    const h = Math.sqrt(r0) / n;
    let sum = f(0) + f(Math.sqrt(r0));
    for (let k = 1; k < n; k++) sum += (k % 2 ? 4 : 2) * f(k * h);
    const tau = (sum * h) / 3;
    expect(norm(propagateKepler(MU, out, -0.999 * tau))).toBeLessThan(0.01 * r0);
    const e = thrown(() => propagateKepler(MU, out, -1.001 * tau));
    expect((e as SolverError).reason).toBe('collision');
    // Simpson with 20,000 intervals on this smooth integrand, and rounding: 3e-15 seen; allow 1e-12
    expect(Math.abs(-((e as SolverError).inputs.tCollision as number) / tau - 1)).toBeLessThan(1e-12);
  });
});

describe('Hohmann and Lambert with huge values', () => {
  it('regression (Hohmann with r2 = 1e300 printed "—" and exited 0): SolverError non-finite naming the value', () => {
    const e = thrown(() => hohmann(MU, 7e6, 1e300));
    expect(e).toBeInstanceOf(SolverError);
    expect((e as SolverError).reason).toBe('non-finite');
    expect(e.message).toMatch(/transfer time is too large.*r2 = 1e\+300 m/);
    // large but representable: answered (vis-viva at r1 toward escape speed)
    const h = hohmann(MU, 7e6, 1e100);
    expect(Number.isFinite(h.tof)).toBe(true);
    expect(h.dv1 / (Math.sqrt((2 * MU) / 7e6) - Math.sqrt(MU / 7e6))).toBeCloseTo(1, 12);
  });

  it('regression (1e300 vectors were refused as "coincident points"): Lambert says the radius is too large', () => {
    const e = thrown(() => solveLambert(MU, [1e300, 0, 0], [0, 1e300, 0], 3600));
    expect(e).toBeInstanceOf(InputError);
    expect((e as InputError).field).toBe('r1');
    expect((e as InputError).rule).toMatch(/^is too large \(\|r1\| = 1\.000e\+300 m/);
    expect(thrown(() => solveLambert(MU, [7e6, 0, 0], [0, 1e300, 0], 3600)).message).toMatch(/^r2 is too large/);
  });
});

describe('numbers too large for a double', () => {
  it('regression (1e999 in a file, read as Infinity, was called "must be a number"): "is too large"', () => {
    const sys = demoSystemDoc() as Doc;
    const text = JSON.stringify(sys).replace(`"radius_m":${sys.bodies[0].radius_m}`, '"radius_m":1e999');
    let e = thrown(() => parseSystemFile(text)) as ValidationError;
    expect(e).toBeInstanceOf(ValidationError);
    expect(e.issues).toEqual([
      { path: 'bodies[0].radius_m', rule: 'is too large: 1.8e308 is the largest magnitude a number can have (it was read as infinity)', severity: 'error' },
    ]);
    // a field that may also be null (type [number, null]) says the same, with the sign
    const plan = demoPlanText('tessel-to-ochre.plan.json').replace(/"end_s": [^,\n]+/, '"end_s": -1e999');
    expect(plan).toContain('-1e999');
    e = thrown(() => parsePlanFile(plan)) as ValidationError;
    expect(e.issues[0]).toMatchObject({ path: 'end_s', rule: 'is too large: -1.8e308 is the largest magnitude a number can have (it was read as -infinity)' });
  });

  it('a command-line value past the largest double, or made so by its unit, is too large (1e308 Gm was Infinity)', () => {
    expect(thrown(() => parseQuantity('--r2', '1e999', 'length')).message).toBe(
      '--r2 is too large: 1.8e308 is the largest magnitude a number can have (got "1e999")',
    );
    expect(thrown(() => parseQuantity('--r2', '1e308Gm', 'length')).message).toMatch(/^--r2 is too large/);
    expect(parseQuantity('--r2', '1e299Gm', 'length')).toBe(1e308);
  });
});

describe('messages that name what the user can change', () => {
  it("regression (correct suggested options.desired…, which are no options): it names the plan's burns and the target", () => {
    const plan = structuredClone(demoPlan);
    plan.target = { ...plan.target!, body: 'fennick' };
    const e = thrown(() => correctPlan(demoSystem(), plan));
    expect(e).toBeInstanceOf(InputError);
    expect(e.message).not.toContain('options.');
    expect(e.message).toContain("never reaches Fennick's sphere of influence");
    expect(e.message).toContain("change the plan's burns");
  });
});

describe('the command line maps the new errors to exit 3', () => {
  it('calc kepler --dt 1e300 and calc hohmann --r2 1e300 exit 3 with the reason', async () => {
    const [k, h] = await Promise.all([
      runCli(['calc', 'kepler', `--mu=${MU}`, '--r=7000km,0,0', '--v=0,7.5km/s,0', '--dt=1e300']),
      runCli(['calc', 'hohmann', `--mu=${MU}`, '--r1=7000km', '--r2=1e300']),
    ]);
    expect(k.code).toBe(3);
    expect(k.stderr).toContain('kepler: precision-lost');
    expect(h.code).toBe(3);
    expect(h.stderr).toContain('hohmann: non-finite');
    expect(h.stdout).toBe('');
  });
});
