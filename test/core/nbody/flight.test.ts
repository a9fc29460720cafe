import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import { type NBodyAction, flyNBody, sortActions } from '../../../core/nbody/flight.ts';
import { NBodyModel, type NBodyState } from '../../../core/nbody/model.ts';
import { propagateKepler } from '../../../core/orbit/kepler.ts';
import { bodyState } from '../../../core/system/ephemeris.ts';
import { findBodyIndex } from '../../../core/system/model.ts';
import { demoSystem } from '../plan/helpers.ts';

const sys = demoSystem();
const TESSEL = findBodyIndex(sys, 'tessel');
const tessel = sys.bodies[TESSEL];
const MU = tessel.mu;
const T0 = 2.0e6; // s from the epoch: any time; the demo ephemerides are defined everywhere

type V3 = [number, number, number];
/** Circular orbit of radius r about Tessel at angle u from the node, plane tilted by inc about x (analytic). */
function circular(r: number, inc: number, u: number): { x: V3; v: V3 } {
  const w = Math.sqrt(MU / r);
  const c = Math.cos(u),
    s = Math.sin(u);
  const ci = Math.cos(inc),
    si = Math.sin(inc);
  return { x: [r * c, r * s * ci, r * s * si], v: [-w * s, w * c * ci, w * c * si] };
}
const state = (t: number, origin: number, x: ArrayLike<number>, v: ArrayLike<number>): NBodyState => ({
  t,
  origin,
  x: Float64Array.from(x),
  v: Float64Array.from(v),
});
const dist = (a: ArrayLike<number>, b: ArrayLike<number>): number => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);

describe('flyNBody in the two-body mode (only the origin pulls) against analytic two-body motion', () => {
  const model = new NBodyModel(sys, { gravity: 'two-body' });
  const r = tessel.radius + 400e3;
  const period = 2 * Math.PI * Math.sqrt((r * r * r) / MU);

  it('a coast of 3.4 revolutions of a circular orbit stays on the analytic circle (angle n·t)', () => {
    const c0 = circular(r, 0.6, 0.2);
    const dt = 3.4 * period;
    const res = flyNBody(model, state(T0, TESSEL, c0.x, c0.v), [], T0 + dt);
    expect(res.status).toBe('done');
    expect(res.soiChanges).toEqual([]);
    expect(res.state.origin).toBe(TESSEL);
    expect(res.state.t).toBe(T0 + dt);
    const c1 = circular(r, 0.6, 0.2 + (2 * Math.PI * dt) / period);
    // RK45 at rtol 1e-10: the local errors add up along track to a few 1e-9 of r
    // over 3.4 revolutions (measured 7e-9); 1e-8 bounds it, and a wrong μ, frame or
    // time would miss by orders of magnitude more
    expect(dist(res.state.x, c1.x) / r).toBeLessThan(1e-8);
    expect(dist(res.state.v, c1.v) / Math.hypot(...c1.v)).toBeLessThan(1e-8);
  });

  it('an impulse adds exactly its Δv at its instant: checkpoint before it, Kepler after it (universal variables, Vallado 4th ed. §2.3)', () => {
    const c0 = circular(r, 0.3, -1.0);
    const tb = T0 + 0.7 * period;
    const dv: V3 = [180, -95, 40];
    const actions: NBodyAction[] = [
      // listed burn first: checkpoints at the same instant are taken before the burn
      { kind: 'impulse', t: tb, id: 'b', dv },
      { kind: 'checkpoint', t: tb, id: 'at' },
    ];
    const upTo = flyNBody(model, state(T0, TESSEL, c0.x, c0.v), actions, tb);
    const before = upTo.checkpoints.get('at')!;
    // the end state of a flight ending at the burn carries the burn: v_end − v_before = Δv to
    // rounding of one addition on |v| ≈ 7.7 km/s (ulp ~1e-12 m/s)
    for (let i = 0; i < 3; i++) expect(Math.abs(upTo.state.v[i] - before.v[i] - dv[i])).toBeLessThan(1e-11);
    for (let i = 0; i < 3; i++) expect(upTo.state.x[i]).toBe(before.x[i]);
    const cb = circular(r, 0.3, -1.0 + (2 * Math.PI * (tb - T0)) / period);
    expect(dist(before.x, cb.x) / r).toBeLessThan(1e-9); // 0.7 revolution of RK45 at rtol 1e-10 (measured 1.5e-10)

    // after the burn: Kepler from the analytic pre-burn state plus Δv
    const dt2 = 5400;
    const full = flyNBody(model, state(T0, TESSEL, c0.x, c0.v), actions, tb + dt2);
    const post = propagateKepler(MU, [...cb.x, cb.v[0] + dv[0], cb.v[1] + dv[1], cb.v[2] + dv[2]], dt2);
    // integration error of the whole 1.3-revolution flight at rtol 1e-10 (measured 1.2e-9)
    expect(dist(full.state.x, post) / r).toBeLessThan(5e-9);
  });

  it('stops at an impact with the body at the analytic free-fall time t = √(r0³/2μ)·(√(x(1−x)) + acos √x), x = R/r0 (radial Kepler orbit)', () => {
    const r0 = 4 * tessel.radius;
    const res = flyNBody(model, state(T0, TESSEL, [0, 0, r0], [0, 0, 0]), [], T0 + 1e5);
    expect(res.status).toBe('impact');
    expect(res.impact!.body).toBe(TESSEL);
    const x = tessel.radius / r0;
    const tFall = Math.sqrt((r0 * r0 * r0) / (2 * MU)) * (Math.sqrt(x * (1 - x)) + Math.acos(Math.sqrt(x)));
    // integration error of the fall at rtol 1e-10 plus the event's time tolerance (measured 4e-6 s
    // and 0.04 m); the radial speed at impact is ~8 km/s, so 1e-4 s is under a metre
    expect(Math.abs(res.impact!.t - T0 - tFall)).toBeLessThan(1e-4);
    expect(Math.abs(Math.hypot(...res.state.x) - tessel.radius)).toBeLessThan(1);
  });
});

describe('flyNBody: a sphere-of-influence exit changes the origin, not the flight', () => {
  const model = new NBodyModel(sys);
  const R = tessel.derived.soiRadius;
  const r = tessel.radius + 300e3;
  // a hyperbolic escape leaving Tessel's orbital plane steeply (v∞ ≈ 2.6 km/s)
  const vp = Math.sqrt(2500 * 2500 + (2 * MU) / r);
  const x0: V3 = [r, 0, 0];
  const v0: V3 = [0, 0.35 * vp, 0.94 * vp];

  it('exits at |x| = R_soi, and the state about the star is the state about Tessel plus Tessel’s ephemeris state at that time', () => {
    const res = flyNBody(model, state(T0, TESSEL, x0, v0), [], T0 + 10 * 86400);
    expect(res.soiChanges.length).toBe(1);
    const ch = res.soiChanges[0];
    expect(ch.kind).toBe('exit');
    expect(ch.body).toBe(TESSEL);
    expect(res.state.origin).toBe(0);
    const tc = ch.t;

    // just before the exit the flight is still about Tessel, a hair inside the sphere
    const eps = 1e-3;
    const inside = flyNBody(model, state(T0, TESSEL, x0, v0), [], tc - eps);
    expect(inside.state.origin).toBe(TESSEL);
    const vr = Math.hypot(...inside.state.v);
    // event time located to ~1e-7 s (Brent) plus the ms gap at a few km/s: under 10 m of 6.6e8 m
    expect(Math.abs(Math.hypot(...inside.state.x) - R)).toBeLessThan(vr * eps + 1);

    // the same flight integrated about the star from the start (the coordinate change done by hand)
    const p0 = new Float64Array(6);
    bodyState(sys, TESSEL, T0, p0, 0);
    const star0 = state(T0, 0, [x0[0] + p0[0], x0[1] + p0[1], x0[2] + p0[2]], [v0[0] + p0[3], v0[1] + p0[4], v0[2] + p0[5]]);
    const atTc = flyNBody(model, star0, [], tc);
    expect(atTc.soiChanges).toEqual([]); // the star has no SOI to leave
    const pc = new Float64Array(6);
    bodyState(sys, TESSEL, tc, pc, 0);
    const rel: V3 = [atTc.state.x[0] - pc[0], atTc.state.x[1] - pc[1], atTc.state.x[2] - pc[2]];
    // the crossing is at the radius in the star-centred flight too: the two flights differ by
    // integration error only (rtol 1e-10 of the 1.1e11 m heliocentric distance ≈ 10 m; measured 0.25 m)
    expect(Math.abs(Math.hypot(...rel) - R)).toBeLessThan(10);

    // after the exit both flights are about the star and agree to integration error
    const tEnd = tc + 2 * 86400;
    const a = flyNBody(model, state(T0, TESSEL, x0, v0), [], tEnd);
    const b = flyNBody(model, star0, [], tEnd);
    expect(a.state.origin).toBe(0);
    // rtol 1e-10 on the star-centred flight's |x| ≈ 1.1e11 m: ~10 m (measured 0.44 m)
    expect(dist(a.state.x, b.state.x)).toBeLessThan(10);
    // ... and rtol × ~30 km/s heliocentric speed ≈ 3e-6 m/s (measured 1.2e-6 m/s)
    expect(dist(a.state.v, b.state.v)).toBeLessThan(1e-5);
  });
});

describe('flyNBody: the state recorded at each SOI change', () => {
  const model = new NBodyModel(sys);
  const R = tessel.derived.soiRadius;
  // an inbound hyperbola about Tessel from 1.2 R_soi (v∞ 2.6 km/s, aimed 60 000 km off the centre: periapsis ≈ 30 000 km,
  // inside Quill’s orbit but far from it), put about the star by hand
  const vInf = 2600;
  const r0 = 1.2 * R;
  const x0: V3 = [r0, 60e6, 0];
  const vr = Math.sqrt(vInf * vInf + (2 * MU) / Math.hypot(...x0));
  const v0: V3 = [-vr, 0, 0];
  const p0 = new Float64Array(6);
  bodyState(sys, TESSEL, T0, p0, 0);
  const start = state(T0, 0, [x0[0] + p0[0], x0[1] + p0[1], x0[2] + p0[2]], [v0[0] + p0[3], v0[1] + p0[4], v0[2] + p0[5]]);
  // the pass is through and out again in about 6 days (it crosses Quill’s sphere on the way; only Tessel’s changes are read)
  const res = flyNBody(model, start, [], T0 + 30 * 86400);
  const isTessel = (c: { body: number }) => c.body === TESSEL;

  it('entry and exit are at |r| = R_soi about the body entered or left, to the event locator’s time tolerance', () => {
    const changes = res.soiChanges.filter(isTessel);
    expect(changes.map((c) => c.kind)).toEqual(['entry', 'exit']);
    for (const c of changes) {
      const r = Math.hypot(c.state[0], c.state[1], c.state[2]);
      const v = Math.hypot(c.state[3], c.state[4], c.state[5]);
      // the event time is refined to EVENT_TIME_TOL·|t| = 1e-12 × 2e6 s (integrate/eventLocator.ts), a few such
      // steps past the crossing: ≤ 1e-5 s at ≤ 4 km/s ≈ 0.04 m; the 1 m adds the dense output's
      // error at rtol 1e-10 about the 7e8 m sphere (0.07 m); measured 0.011 m (entry) and 0.014 m (exit)
      expect(Math.abs(r - R)).toBeLessThan(v * 1e-5 + 0.1);
    }
    // inbound at entry (r·v < 0), outbound at exit (r·v > 0)
    const [entry, exit] = changes;
    expect(entry.state[0] * entry.state[3] + entry.state[1] * entry.state[4] + entry.state[2] * entry.state[5]).toBeLessThan(0);
    expect(exit.state[0] * exit.state[3] + exit.state[1] * exit.state[4] + exit.state[2] * exit.state[5]).toBeGreaterThan(0);
  });

  it('the entry state is the star-centred flight at that time less Tessel’s ephemeris state (a change of coordinates only)', () => {
    const entry = res.soiChanges.find((c) => c.kind === 'entry' && isTessel(c));
    expect(entry).toBeDefined();
    if (!entry) return;
    // the same flight up to the entry time, still about the star: no crossing has happened yet at tc − 1 ms
    const before = flyNBody(model, start, [], entry.t - 1e-3);
    expect(before.state.origin).toBe(0);
    const pc = new Float64Array(6);
    bodyState(sys, TESSEL, before.state.t, pc, 0);
    const dt = entry.t - before.state.t;
    const vrel: V3 = [before.state.v[0] - pc[3], before.state.v[1] - pc[4], before.state.v[2] - pc[5]];
    // carried over the last millisecond in a straight line (the pull over 1 ms moves it by ~1e-10 m)
    const rel: V3 = [before.state.x[0] - pc[0] + vrel[0] * dt, before.state.x[1] - pc[1] + vrel[1] * dt, before.state.x[2] - pc[2] + vrel[2] * dt];
    // the two flights share their steps up to the crossing and differ by the dense output's
    // error and rounding: rtol 1e-10 of the 1.1e11 m heliocentric distance bounds that by ~10 m;
    // 1 m keeps near what it achieves (measured 4e-4 m)
    expect(dist(rel, entry.state)).toBeLessThan(1);
    // velocities: rtol × 30 km/s heliocentric speed ≈ 3e-6 m/s (measured 6e-7 m/s)
    expect(dist(vrel, entry.state.slice(3))).toBeLessThan(1e-5);
  });
});

describe('flyNBody: inputs', () => {
  const model = new NBodyModel(sys);
  const s = state(T0, TESSEL, [7e6, 0, 0], [0, 7500, 0]);
  it('refuses an end before the start and a bad sampling step, naming the field', () => {
    expect(() => flyNBody(model, s, [], T0 - 1)).toThrow(InputError);
    expect(() => flyNBody(model, s, [], T0 - 1)).toThrow(/^tEnd/);
    expect(() => flyNBody(model, s, [], Number.NaN)).toThrow(/^tEnd/);
    expect(() => flyNBody(model, s, [], T0 + 10, { step: 0 })).toThrow(/^options\.step/);
  });

  it('sortActions: by time, checkpoints before burns at the same instant, stable otherwise', () => {
    const acts: NBodyAction[] = [
      { kind: 'impulse', t: 5, id: 'b1', dv: [0, 0, 0] },
      { kind: 'checkpoint', t: 5, id: 'c1' },
      { kind: 'impulse', t: 1, id: 'b0', dv: [0, 0, 0] },
      { kind: 'impulse', t: 5, id: 'b2', dv: [0, 0, 0] },
    ];
    expect(sortActions(acts).map((a) => a.id)).toEqual(['b0', 'c1', 'b1', 'b2']);
  });
});
