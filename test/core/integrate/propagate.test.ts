import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import { DEFAULT_LONG_COAST_REVS, DEFAULT_STEPS_PER_REV, DOP853_RTOL, type PropagateRequest, propagate } from '../../../core/integrate/propagate.ts';
import { type Ellipse, meanMotion, period, posError, specificEnergy, stateAt, twoBodyAccel } from './twoBody.ts';

// Earth's μ (Vallado, 4th ed., Table D-3, from memory) as a realistic reference input.
const MU = 3.986004418e14;
const O: Ellipse = { mu: MU, a: 8.0e6, e: 0.3, i: 0.5, raan: 1.0, argp: 0.7, M0: 0.3 };
const P = period(O);
const S0 = stateAt(O, 0);
const base = (over: Partial<PropagateRequest> = {}): PropagateRequest => ({
  accel: twoBodyAccel(MU),
  t0: 0,
  x0: S0.subarray(0, 3),
  v0: S0.subarray(3),
  tEnd: 2 * P,
  ...over,
});
const radialRate = (_t: number, y: Float64Array) => y[0] * y[3] + y[1] * y[4] + y[2] * y[5];
const periTime = (o: Ellipse, k: number) => (2 * Math.PI * k - o.M0) / meanMotion(o);

describe('propagate: the front door picks the integrator and records why', () => {
  it("'auto' picks rk45 with reason 'default' above rtol 1e-10 and matches the analytic orbit", () => {
    const r = propagate(base({ rtol: 1e-9, atol: 1e-9 }));
    expect(r.status).toBe('done');
    expect(r.spans).toHaveLength(1);
    expect(r.spans[0]).toMatchObject({ t0: 0, t1: 2 * P, method: 'rk45', reason: 'default' });
    expect(r.spans[0].stats.accepted).toBeGreaterThan(0);
    expect(r.t).toBe(2 * P);
    const ex = stateAt(O, 2 * P);
    // two revolutions at rtol 1e-9: measured 2.0e-8 (position) and 2.6e-8 (velocity) relative
    expect(posError(r.x, ex) / O.a).toBeLessThan(1e-7);
    expect(posError(r.v, ex.subarray(3)) / Math.sqrt(MU / O.a)).toBeLessThan(1e-7);
  });

  it("'auto' at rtol ≤ 1e-10 (the n-body default) picks dop853 with its reason and matches the analytic orbit", () => {
    expect(DOP853_RTOL).toBe(1e-10);
    const at = propagate(base({ rtol: 1e-10, atol: 1e-10 }));
    expect(at.spans[0]).toMatchObject({ method: 'dop853', reason: 'tight tolerance: rtol 1e-10 ≤ 1e-10' });
    const ex = stateAt(O, 2 * P);
    // measured 1.3e-10 (position) and 5.9e-10 (velocity) relative after two revolutions
    expect(posError(at.x, ex) / O.a).toBeLessThan(1e-9);
    expect(posError(at.v, ex.subarray(3)) / Math.sqrt(MU / O.a)).toBeLessThan(3e-9);
    const r = propagate(base({ rtol: 1e-12, atol: 1e-12, dense: true }));
    expect(r.status).toBe('done');
    expect(r.spans).toHaveLength(1);
    expect(r.spans[0]).toMatchObject({ t0: 0, t1: 2 * P, method: 'dop853', reason: 'tight tolerance: rtol 1e-12 ≤ 1e-10' });
    // Two revolutions at rtol 1e-12: DOP853 reaches ~1e-12 relative (analytic Kepler); 1e-10 leaves margin.
    expect(posError(r.x, ex) / O.a).toBeLessThan(1e-10);
    expect(posError(r.dense!.at(0.7 * P), stateAt(O, 0.7 * P)) / O.a).toBeLessThan(1e-10);
    // Explicitly requested, the same method with the caller's reason.
    expect(propagate(base({ method: 'dop853', rtol: 1e-9, atol: 1e-9 })).spans[0]).toMatchObject({ method: 'dop853', reason: 'requested by caller' });
  });

  it('maxStep bounds the steps of rk45 and dop853 (at least span/maxStep accepted steps, fewer without it)', () => {
    const maxStep = P / 400;
    for (const method of ['rk45', 'dop853'] as const) {
      const free = propagate(base({ method, rtol: 1e-9, atol: 1e-9 }));
      const bound = propagate(base({ method, rtol: 1e-9, atol: 1e-9, maxStep }));
      expect(free.spans[0].stats.accepted, method).toBeLessThan(800);
      expect(bound.spans[0].stats.accepted, method).toBeGreaterThanOrEqual(800);
      // shorter steps only shrink the error: two revolutions at rtol 1e-9 stay within 1e-7 of the orbit
      expect(posError(bound.x, stateAt(O, 2 * P)) / O.a, method).toBeLessThan(1e-7);
    }
  });

  it("a long coast (2400 revolutions > 500) is flown by a symplectic method, reason 'long coast: 2400 revolutions > 500'", () => {
    // Small orbit (period 10 s) so 2400 revolutions at the default 1000 steps per revolution stay quick.
    const a = 100,
      Ps = 10;
    const mu = (4 * Math.PI ** 2 * a ** 3) / Ps ** 2;
    const o: Ellipse = { mu, a, e: 0.2, i: 0.1, raan: 0, argp: 0.4, M0: 0 };
    const s = stateAt(o, 0);
    const T = 2400 * Ps;
    const r = propagate({ accel: twoBodyAccel(mu), t0: 0, x0: s.subarray(0, 3), v0: s.subarray(3), tEnd: T, period: Ps });
    expect(DEFAULT_LONG_COAST_REVS).toBe(500);
    expect(r.spans).toHaveLength(1);
    expect(r.spans[0].method).toBe('yoshida4');
    expect(r.spans[0].reason).toBe('long coast: 2400 revolutions > 500');
    expect(r.spans[0].stats.accepted).toBe(2400 * DEFAULT_STEPS_PER_REV);
    expect(r.status).toBe('done');
    expect(r.t).toBe(T);
    const E0 = specificEnergy(mu, s.subarray(0, 3), s.subarray(3));
    expect(Math.abs(specificEnergy(mu, r.x, r.v) - E0) / Math.abs(E0)).toBeLessThan(1e-9);
    expect(posError(r.x, stateAt(o, T)) / a).toBeLessThan(1e-4);
  });

  it('the revolution threshold is the caller’s: longCoastRevs 5 over 10 revolutions', () => {
    const r = propagate(base({ tEnd: 10 * P, period: P, longCoastRevs: 5, fixedStep: P / 500 }));
    expect(r.spans[0].method).toBe('yoshida4');
    expect(r.spans[0].reason).toBe('long coast: 10 revolutions > 5');
    expect(r.spans[0].stats.accepted).toBe(5000);
    // Under the threshold: rk45.
    expect(propagate(base({ tEnd: 4 * P, period: P, longCoastRevs: 5 })).spans[0].method).toBe('rk45');
  });

  it('step budget exceeded → the fallback is a recorded span with its reason, and it finishes the flight', () => {
    const r = propagate(base({ tEnd: 5 * P, maxSteps: 50, period: P }));
    expect(r.spans).toHaveLength(2);
    const [a, b] = r.spans;
    expect(a.method).toBe('rk45');
    expect(a.reason).toBe('default');
    expect(a.stats.accepted + a.stats.rejected).toBe(50);
    expect(b.method).toBe('yoshida4');
    expect(b.reason).toMatch(/^RK45 failed: step-budget at t=[0-9.e+-]+; fell back to yoshida4 with h=7\.1\d*$/);
    expect(b.t0).toBe(a.t1);
    expect(b.t1).toBe(5 * P);
    expect(r.status).toBe('done');
    expect(r.message).toMatch(/step budget of 50 steps exhausted/);
    expect(posError(r.x, stateAt(O, 5 * P)) / O.a).toBeLessThan(1e-6);
  });

  it('without a period the fallback uses the step RK45 last proposed, and says so', () => {
    const r = propagate(base({ tEnd: 5 * P, maxSteps: 50 }));
    expect(r.spans.map((s) => s.method)).toEqual(['rk45', 'yoshida4']);
    const h = Number(/with h=([0-9.e+-]+)$/.exec(r.spans[1].reason)![1]);
    expect(h).toBeGreaterThan(1);
    expect(r.spans[1].stats.accepted).toBe(Math.ceil((5 * P - r.spans[1].t0) / h - 1e-9));
  });

  it('fallback: false keeps the adaptive method’s failure under auto (one span, its status)', () => {
    const r = propagate(base({ tEnd: 5 * P, maxSteps: 50, period: P, rtol: 1e-10, atol: 1e-10, fallback: false }));
    expect(r.spans).toHaveLength(1);
    expect(r.spans[0]).toMatchObject({ method: 'dop853', reason: 'tight tolerance: rtol 1e-10 ≤ 1e-10' });
    expect(r.status).toBe('step-budget');
    expect(r.t).toBeLessThan(5 * P);
    expect(posError(r.x, stateAt(O, r.t)) / O.a).toBeLessThan(1e-8);
  });

  it('an explicit request is honoured: rk45 with a small budget does not fall back', () => {
    const r = propagate(base({ method: 'rk45', maxSteps: 50 }));
    expect(r.spans).toHaveLength(1);
    expect(r.spans[0]).toMatchObject({ method: 'rk45', reason: 'requested by caller' });
    expect(r.status).toBe('step-budget');
    expect(r.t).toBeLessThan(2 * P);
    expect(posError(r.x, stateAt(O, r.t)) / O.a).toBeLessThan(1e-6);
  });

  it('an explicit fixed method is honoured even for a long coast, with its step', () => {
    const r = propagate(base({ method: 'verlet', fixedStep: 5, period: P, longCoastRevs: 1 }));
    expect(r.spans).toHaveLength(1);
    expect(r.spans[0]).toMatchObject({ method: 'verlet', reason: 'requested by caller' });
    expect(r.spans[0].stats.accepted).toBe(Math.ceil((2 * P) / 5));
    expect(posError(r.x, stateAt(O, 2 * P)) / O.a).toBeLessThan(1e-3);
    // Without fixedStep the step comes from the period.
    const q = propagate(base({ method: 'rk4', period: P }));
    expect(q.spans[0].stats.accepted).toBe(2 * DEFAULT_STEPS_PER_REV);
  });

  it('events on rk45 and on fixed-step spans (Hermite interpolant) at the analytic periapsis times', () => {
    const ev = [{ g: radialRate, direction: 1 as const, name: 'periapsis' }];
    const rk = propagate(base({ tEnd: 3 * P, method: 'rk45', rtol: 1e-11, atol: 1e-11, events: ev }));
    expect(rk.events).toHaveLength(3);
    rk.events.forEach((h, k) => expect(Math.abs(h.t - periTime(O, k + 1))).toBeLessThan(1e-9 * h.t));
    const fx = propagate(base({ tEnd: 3 * P, method: 'yoshida4', fixedStep: P / 2000, events: ev }));
    expect(fx.events).toHaveLength(3);
    fx.events.forEach((h, k) => {
      expect(h.name).toBe('periapsis');
      expect(Math.abs(h.t - periTime(O, k + 1))).toBeLessThan(1e-9 * h.t);
    });
    expect(fx.spans[0].stats.fevals).toBe(3 * 6000 + 1 + 6001); // method + one per step end (+ start) for the interpolant
  });

  it('a terminal event stops a fixed-step span at the event, state from the interpolant', () => {
    const r = propagate(base({ tEnd: 3 * P, method: 'yoshida4', fixedStep: P / 2000, events: [{ g: radialRate, direction: 1, terminal: true }] }));
    expect(r.status).toBe('event');
    expect(r.events).toHaveLength(1);
    expect(Math.abs(r.t - periTime(O, 1))).toBeLessThan(1e-9 * r.t);
    expect(r.spans[0].t1).toBe(r.t);
    expect(posError(r.x, stateAt(O, r.t)) / O.a).toBeLessThan(1e-8);
  });

  it('events and dense output continue across a fallback', () => {
    const r = propagate(base({ tEnd: 5 * P, maxSteps: 50, period: P, dense: true, events: [{ g: radialRate, direction: 1 }] }));
    expect(r.spans).toHaveLength(2);
    expect(r.events).toHaveLength(5);
    // The hits fall in the Yoshida 4 span at h = P/1000, whose own error (~1e-8 of the orbit)
    // bounds the event time accuracy.
    r.events.forEach((h, k) => expect(Math.abs(h.t - periTime(O, k + 1))).toBeLessThan(1e-8 * h.t));
    const d = r.dense!;
    expect(d.tStart).toBe(0);
    expect(d.tEnd).toBe(5 * P);
    for (const t of [0.1 * P, r.spans[0].t1 * 0.99, r.spans[0].t1 * 1.01, 4.3 * P]) {
      expect(posError(d.at(t), stateAt(O, t)) / O.a).toBeLessThan(1e-6);
    }
  });

  it('a cancelled flight says so', () => {
    const signal = { aborted: true };
    expect(propagate(base({ signal })).status).toBe('cancelled');
    expect(propagate(base({ signal, method: 'verlet', fixedStep: 1 })).status).toBe('cancelled');
  });

  it('bad input → InputError with field and rule', () => {
    const cases: [string, Partial<PropagateRequest>, RegExp][] = [
      ['t0 NaN', { t0: NaN }, /^t0 must be a finite number/],
      ['tEnd Infinity', { tEnd: Infinity }, /^tEnd must be a finite number/],
      ['x0 NaN', { x0: [1, NaN, 0] }, /^x0\[1\] must be a finite number/],
      ['v0 length', { v0: [1, 2] }, /^v0 must have 3 components/],
      ['method', { method: 'euler' as never }, /^method must be one of auto, rk45, symplectic-euler/],
      ['rtol 0', { rtol: 0 }, /^rtol must be > 0/],
      ['atol negative', { atol: -1e-9 }, /^atol must be > 0/],
      ['fixedStep 0', { method: 'verlet', fixedStep: 0 }, /^fixedStep must be > 0/],
      ['fixedStep NaN', { method: 'verlet', fixedStep: NaN }, /^fixedStep must be a finite number/],
      ['fixed without step', { method: 'verlet' }, /^fixedStep must be given for method verlet when period is not/],
      ['period negative', { period: -5 }, /^period must be > 0/],
      ['longCoastRevs 0', { longCoastRevs: 0 }, /^longCoastRevs must be > 0/],
      ['maxSteps fractional', { maxSteps: 2.5 }, /^maxSteps must be an integer >= 1/],
      ['maxStep 0', { maxStep: 0 }, /^maxStep must be > 0/],
      ['maxStep Infinity', { maxStep: Infinity }, /^maxStep must be a finite number/],
      ['fallback', { fallback: 'no' as never }, /^fallback must be true or false/],
      ['accel', { accel: undefined as never }, /^accel must be a function/],
    ];
    for (const [label, over, msg] of cases) {
      const fn = () => propagate(base(over));
      expect(fn, label).toThrow(InputError);
      expect(fn, label).toThrow(msg);
    }
  });
});
