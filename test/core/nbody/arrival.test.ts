import { describe, expect, it } from 'vitest';
import { evaluate } from '../../../core/conic/evaluate.ts';
import { InputError } from '../../../core/math/errors.ts';
import {
  type ConicArrival,
  PROBE_MAX,
  burnActions,
  compareArrival,
  conicArrival,
  conicStart,
  probePeriapsis,
  stateRelativeTo,
} from '../../../core/nbody/arrival.ts';
import { NBodyModel, type NBodyState } from '../../../core/nbody/model.ts';
import type { PlanResult } from '../../../core/plan/result.ts';
import { bodyState } from '../../../core/system/ephemeris.ts';
import { findBodyIndex } from '../../../core/system/model.ts';
import { demoPlan } from '../../fixtures/demoPlan.ts';
import { demoSystem } from '../plan/helpers.ts';

const sys = demoSystem();
const K = findBodyIndex(sys, 'tessel');
const QUILL = findBodyIndex(sys, 'quill');
const MU = sys.bodies[K].mu;
const RADIUS = sys.bodies[K].radius;
const T0 = 3.0e6;
const twoBody = new NBodyModel(sys, { gravity: 'two-body' });

type V3 = [number, number, number];
const rotZ = (a: number, p: V3): V3 => [Math.cos(a) * p[0] - Math.sin(a) * p[1], Math.sin(a) * p[0] + Math.cos(a) * p[1], p[2]];
const rotX = (a: number, p: V3): V3 => [p[0], Math.cos(a) * p[1] - Math.sin(a) * p[2], Math.sin(a) * p[1] + Math.cos(a) * p[2]];

/**
 * A hyperbola about Tessel from v∞ and impact parameter b (a = −μ/v∞², e = √(1 + (b v∞²/μ)²),
 * p = a(1 − e²); perifocal state r = p/(1 + e cos ν)(cos ν, sin ν), v = √(μ/p)(−sin ν, e + cos ν);
 * Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., §2.2, from memory), turned so
 * its incoming asymptote is +x, then tilted by inc about x. Also the analytic time from ν to
 * periapsis: tanh(H/2) = √((e−1)/(e+1)) tan(ν/2), M = e sinh H − H, Δt = −M/√(μ/|a|³).
 */
function hyperbola(vinf: number, b: number, nu: number, inc = 0): { state: number[]; rp: number; e: number; toPeri: number } {
  const a = -MU / (vinf * vinf);
  const q = (b * vinf * vinf) / MU;
  const e = Math.sqrt(1 + q * q);
  const p = a * (1 - e * e);
  const r = p / (1 + e * Math.cos(nu));
  const k = Math.sqrt(MU / p);
  const turn = -Math.acos(1 / e);
  const x = rotX(inc, rotZ(turn, [r * Math.cos(nu), r * Math.sin(nu), 0]));
  const v = rotX(inc, rotZ(turn, [-k * Math.sin(nu), k * (e + Math.cos(nu)), 0]));
  const H = 2 * Math.atanh(Math.sqrt((e - 1) / (e + 1)) * Math.tan(nu / 2));
  const M = e * Math.sinh(H) - H;
  return { state: [...x, ...v], rp: -a * (e - 1), e, toPeri: -M / Math.sqrt(MU / (-a * -a * -a)) };
}

describe('probePeriapsis against the analytic hyperbola (two-body mode)', () => {
  it('from the incoming leg: periapsis time from the hyperbolic Kepler equation, r_p = a(1 − e) with a from vis-viva and e from h', () => {
    const h = hyperbola(3500, 2.0e7, -1.4, 0.5);
    const s = Float64Array.from(h.state);
    // vis-viva a = 1/(2/r − v²/μ) and e = √(1 − h²/(μa)) from the state itself
    const r = Math.hypot(s[0], s[1], s[2]);
    const v2 = s[3] * s[3] + s[4] * s[4] + s[5] * s[5];
    const a = 1 / (2 / r - v2 / MU);
    const hv: V3 = [s[1] * s[5] - s[2] * s[4], s[2] * s[3] - s[0] * s[5], s[0] * s[4] - s[1] * s[3]];
    const e = Math.sqrt(1 - (hv[0] ** 2 + hv[1] ** 2 + hv[2] ** 2) / (MU * a));
    const rp = a * (1 - e);
    expect(Math.abs(rp - h.rp) / h.rp).toBeLessThan(1e-12); // two constructions of one number: rounding
    expect(h.toPeri).toBeGreaterThan(1e-3);
    expect(h.toPeri).toBeLessThan(PROBE_MAX);

    const out = probePeriapsis(twoBody, T0, s, K);
    expect(out.method).toBe('probe');
    // the probe flies RK45 at rtol 1e-10 and locates x·v = 0 to the event tolerance: r_p to
    // ~1e-10 relative or better (measured 6e-12), the time to ~1e-5 s of 1.6e3 s (measured 6e-6 s)
    expect(Math.abs(out.report.altitude + RADIUS - rp) / rp).toBeLessThan(1e-10);
    expect(Math.abs(out.report.t - (T0 + h.toPeri))).toBeLessThan(1e-4);
    expect(Math.abs(out.report.e - e)).toBeLessThan(1e-10); // e of order 2: same relative size as r_p (measured 2e-11)
    expect(Math.abs(out.report.i - 0.5)).toBeLessThan(1e-12); // the plane is kept: inclination to rounding and integration error
    expect(out.stats.pieces).toBe(1);
    expect(out.spans.length).toBeGreaterThan(0);
  });

  it('at periapsis already: no probe is flown, the report is the state itself', () => {
    const h = hyperbola(3500, 2.0e7, 0, 0.2);
    const out = probePeriapsis(twoBody, T0, Float64Array.from(h.state), K);
    expect(out.method).toBe('probe');
    expect(out.stats.pieces).toBe(0);
    expect(out.report.t).toBe(T0);
    expect(Math.abs(out.report.altitude + RADIUS - h.rp) / h.rp).toBeLessThan(1e-12); // |x| at ν = 0: rounding
  });

  it('periapsis farther than PROBE_MAX: the osculating conic answers (analytic r_p and time, no flight)', () => {
    // v∞ = 250 m/s from about 2.2e9 m: some 100 days out
    const h = hyperbola(250, 3.0e7, -0.999 * Math.acos(-1 / Math.sqrt(1 + ((3.0e7 * 250 * 250) / MU) ** 2)));
    expect(h.toPeri).toBeGreaterThan(PROBE_MAX);
    const out = probePeriapsis(twoBody, T0, Float64Array.from(h.state), K);
    expect(out.method).toBe('osculating');
    expect(out.stats.pieces).toBe(0);
    // conic formulas on a state of ~1e9 m: r_p loses a few digits to the near-cancelling energy
    // (v² − 2μ/r) and the time is M/n with M ~ 1e2: both measured ~1e-11 relative
    expect(Math.abs(out.report.altitude + RADIUS - h.rp) / h.rp).toBeLessThan(1e-10);
    expect(Math.abs(out.report.t - (T0 + h.toPeri)) / h.toPeri).toBeLessThan(1e-10);
  });
});

describe('compareArrival on two hand-built hyperbolas (analytic differences)', () => {
  it('n-body and conic arrivals differing only in impact parameter: ΔB·T = Δb, ΔB·R = 0, Δr_p from r_p = μ/v∞²(√(1 + (b v∞²/μ)²) − 1)', () => {
    const vinf = 4200;
    const b = 1.6e7;
    const db = 2.5e5;
    const c = hyperbola(vinf, b, 0);
    const n = hyperbola(vinf, b + db, 0);
    const conic: ConicArrival = { target: K, t: T0, state: Float64Array.from(c.state), periapsisAltitude: c.rp - RADIUS, e: c.e, i: 0 };
    const at: NBodyState = { t: T0, origin: K, x: Float64Array.from(n.state.slice(0, 3)), v: Float64Array.from(n.state.slice(3)) };
    const { comparison: cmp } = compareArrival(twoBody, at, conic);
    expect(cmp.target).toBe(K);
    expect(cmp.method).toBe('probe');
    const rpOf = (bb: number): number => (MU / (vinf * vinf)) * (Math.sqrt(1 + ((bb * vinf * vinf) / MU) ** 2) - 1);
    // both states are at periapsis, so these are conic formulas on the states: rounding only (1e-12 of b or r_p)
    expect(Math.abs(cmp.difference.altitude - (rpOf(b + db) - rpOf(b)))).toBeLessThan(1e-12 * b);
    expect(cmp.difference.t).toBe(0);
    expect(Math.abs(cmp.difference.i)).toBeLessThan(1e-15);
    expect(Math.abs(cmp.difference.e - (n.e - c.e))).toBeLessThan(1e-12);
    expect(cmp.bPlane).not.toBeNull();
    expect(Math.abs(cmp.bPlane!.dbt - db)).toBeLessThan(1e-12 * b);
    expect(Math.abs(cmp.bPlane!.dbr)).toBeLessThan(1e-12 * b);
    expect(Math.abs(cmp.bPlane!.offset - db)).toBeLessThan(1e-12 * b);
    // the miss distance is |Δx| between the two periapsis states
    const miss = Math.hypot(n.state[0] - c.state[0], n.state[1] - c.state[1], n.state[2] - c.state[2]);
    expect(cmp.missDistance).toBe(miss);
  });

  it('an elliptic arrival has no B-plane', () => {
    const r = RADIUS + 5e5;
    const st = Float64Array.from([r, 0, 0, 0, 1.1 * Math.sqrt(MU / r), 0]);
    const conic: ConicArrival = { target: K, t: T0, state: st, periapsisAltitude: 5e5, e: 0.21, i: 0 };
    const at: NBodyState = { t: T0, origin: K, x: st.slice(0, 3), v: st.slice(3) };
    const { comparison } = compareArrival(twoBody, at, conic);
    expect(comparison.bPlane).toBeNull();
    // e = v²r/μ − 1 at periapsis: 1.21 − 1
    expect(Math.abs(comparison.nbody.e - 0.21)).toBeLessThan(1e-14);
  });
});

describe('stateRelativeTo', () => {
  it('re-expresses an n-body state about another body by the ephemeris difference (x_k = x_o − (R_k − R_o))', () => {
    const at: NBodyState = { t: T0, origin: K, x: Float64Array.from([1e8, -2e7, 3e6]), v: Float64Array.from([120, 900, -40]) };
    const out = stateRelativeTo(twoBody, at, QUILL);
    const q = new Float64Array(6);
    const o = new Float64Array(6);
    bodyState(sys, QUILL, T0, q, 0);
    bodyState(sys, K, T0, o, 0);
    // the reference goes through star-centred positions of 1.1e11 m (ulp 1.5e-5 m): a few ulps there;
    // velocities of ~3e4 m/s (ulp 4e-12 m/s)
    for (let i = 0; i < 3; i++) expect(Math.abs(out[i] - (at.x[i] - (q[i] - o[i])))).toBeLessThan(1e-4);
    for (let i = 0; i < 3; i++) expect(Math.abs(out[i + 3] - (at.v[i] - (q[i + 3] - o[i + 3])))).toBeLessThan(1e-10);
  });
});

describe('the conic result as n-body input', () => {
  const result = evaluate(sys, demoPlan, { samplesPerSegment: 0 });

  it('conicStart is the first segment’s start state; a result without segments is refused', () => {
    const s = conicStart(result);
    expect(s.t).toBe(result.segments[0].t0);
    expect(s.origin).toBe(result.segments[0].central);
    expect(Array.from(s.x)).toEqual(Array.from(result.segments[0].state0.subarray(0, 3)));
    expect(() => conicStart({ ...result, segments: [] } as PlanResult)).toThrow(InputError);
  });

  it('conicArrival lies at a periapsis about the target (r·v = 0) at the reported altitude', () => {
    const arr = conicArrival(sys, demoPlan, result)!;
    expect(arr).not.toBeNull();
    const s = arr.state;
    const r = Math.hypot(s[0], s[1], s[2]);
    const v = Math.hypot(s[3], s[4], s[5]);
    // the periapsis event time is located to 1e-7 s: the flight-path angle r·v/(r v) is then ~1e-10 at most (measured 3e-12)
    expect(Math.abs(s[0] * s[3] + s[1] * s[4] + s[2] * s[5]) / (r * v)).toBeLessThan(1e-10);
    // the same |x| computed twice (rounding on ~1e7 m)
    expect(Math.abs(r - sys.bodies[arr.target].radius - arr.periapsisAltitude)).toBeLessThan(1e-6);
    expect(conicArrival(sys, { ...demoPlan, target: null }, result)).toBeNull();
  });

  it('burnActions flies each budgeted burn with its inertial Δv (impulses at their conic time)', () => {
    const { actions } = burnActions(demoPlan, result);
    expect(actions.length).toBe(result.budget.rows.length);
    for (const a of actions) {
      if (a.kind !== 'impulse') continue;
      const row = result.budget.rows.find((r) => r.planEventId === a.id)!;
      expect(a.t).toBe(row.t);
      expect(Math.hypot(...a.dv)).toBeCloseTo(row.dv - (row.dvMissing ?? 0), 6); // magnitude of the delivered Δv, to µm/s
    }
  });
});
