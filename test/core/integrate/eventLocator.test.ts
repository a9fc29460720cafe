import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import { rk45 } from '../../../core/integrate/rk45.ts';
import { type Ellipse, meanMotion, period, posError, stateAt, timeOfTrueAnomaly, twoBodyOde } from './twoBody.ts';

// Earth's μ (Vallado, 4th ed., Table D-3, from memory) as a realistic reference input.
const MU = 3.986004418e14;
const O: Ellipse = { mu: MU, a: 8.0e6, e: 0.3, i: 0.5, raan: 1.0, argp: 0.7, M0: 0.3 };
const P = period(O);
const TOL = 1e-10;
const f = twoBodyOde(MU);

/** Radial velocity r·v: rises through zero at periapsis, falls at apoapsis. */
const radialRate = (_t: number, y: Float64Array) => y[0] * y[3] + y[1] * y[4] + y[2] * y[5];

/** The brief's event precision: |Δt| ≤ 1e-9·max(1, |t|). */
function expectTimeClose(t: number, ref: number): void {
  expect(Math.abs(t - ref)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(ref)));
}

/** Analytic true anomalies where the orbit crosses the x–z plane (y = 0): u = ω + ν with sin Ω cos u + cos Ω cos i sin u = 0. */
function xzCrossingAnomalies(o: Ellipse): number[] {
  const u0 = Math.atan2(-Math.sin(o.raan), Math.cos(o.raan) * Math.cos(o.i));
  return [u0 - o.argp, u0 + Math.PI - o.argp];
}

describe('event location on the dense output', () => {
  it('finds every periapsis passage at the analytic time (Kepler: t_p = (2πk − M0)/n) to 1e-9 relative', () => {
    const N = 5;
    const r = rk45(f, 0, stateAt(O, 0), N * P, { rtol: TOL, atol: TOL, events: [{ g: radialRate, direction: 1, name: 'periapsis' }] });
    expect(r.status).toBe('done');
    expect(r.events).toHaveLength(N);
    const n = meanMotion(O);
    r.events.forEach((hit, k) => {
      expect(hit.name).toBe('periapsis');
      expect(hit.direction).toBe(1);
      expect(hit.index).toBe(0);
      expectTimeClose(hit.t, (2 * Math.PI * (k + 1) - O.M0) / n);
      // The state at the hit is the periapsis state: r = a(1 − e).
      expect(Math.abs(Math.hypot(hit.y[0], hit.y[1], hit.y[2]) - O.a * (1 - O.e)) / O.a).toBeLessThan(1e-8);
    });
  });

  it('direction filter: rising only → periapses, falling only → apoapses, both → 2N alternating', () => {
    const N = 4;
    const run = (direction: 1 | -1 | 0) => rk45(f, 0, stateAt(O, 0), N * P, { rtol: TOL, atol: TOL, events: [{ g: radialRate, direction }] }).events;
    const up = run(1),
      down = run(-1),
      both = run(0);
    expect(up).toHaveLength(N);
    expect(down).toHaveLength(N);
    expect(both).toHaveLength(2 * N);
    expect(up.every((h) => h.direction === 1)).toBe(true);
    expect(down.every((h) => h.direction === -1)).toBe(true);
    for (let k = 1; k < both.length; k++) expect(both[k].direction).toBe(-both[k - 1].direction as 1 | -1);
    // Apoapsis at M = π (analytic).
    const n = meanMotion(O);
    down.forEach((hit, k) => expectTimeClose(hit.t, (Math.PI * (2 * k + 1) - O.M0) / n));
  });

  it('crossings of the x–z plane: 2N in N orbits, each at the analytic time to 1e-9 relative', () => {
    const N = 10;
    const r = rk45(f, 0, stateAt(O, 0), N * P, { rtol: TOL, atol: TOL, events: [{ g: (_t, y) => y[1], name: 'x-z plane' }] });
    expect(r.events).toHaveLength(2 * N);
    const refs: number[] = [];
    for (const nu of xzCrossingAnomalies(O)) {
      let t = timeOfTrueAnomaly(O, nu, 0);
      while (t < N * P) {
        refs.push(t);
        t += P;
      }
    }
    refs.sort((a, b) => a - b);
    expect(refs).toHaveLength(2 * N);
    r.events.forEach((hit, k) => {
      expectTimeClose(hit.t, refs[k]);
      expect(Math.abs(hit.y[1]) / O.a).toBeLessThan(1e-9);
      // The hit lies on the far side of the crossing: g is zero or already has its new sign.
      expect(hit.direction * hit.y[1]).toBeGreaterThanOrEqual(0);
    });
  });

  it('node crossings (z = 0): ascending and descending at ω + ν = 0, π (analytic)', () => {
    const N = 3;
    const r = rk45(f, 0, stateAt(O, 0), N * P, { rtol: TOL, atol: TOL, events: [{ g: (_t, y) => y[2], direction: 1, name: 'ascending node' }] });
    expect(r.events).toHaveLength(N);
    const t1 = timeOfTrueAnomaly(O, -O.argp, 0);
    r.events.forEach((hit, k) => expectTimeClose(hit.t, t1 + k * P));
  });

  it('terminal event stops at the first hit; restarting from it does not stop at once', () => {
    const ev = [{ g: (_t: number, y: Float64Array) => y[1], terminal: true, name: 'x-z plane' }];
    const r = rk45(f, 0, stateAt(O, 0), 10 * P, { rtol: TOL, atol: TOL, events: ev, dense: true });
    expect(r.status).toBe('event');
    expect(r.message).toMatch(/terminal event "x-z plane"/);
    expect(r.events).toHaveLength(1);
    const first = Math.min(...xzCrossingAnomalies(O).map((nu) => timeOfTrueAnomaly(O, nu, 0)));
    expectTimeClose(r.t, first);
    expect(Array.from(r.y)).toEqual(Array.from(r.events[0].y));
    expect(posError(r.y, stateAt(O, r.t)) / O.a).toBeLessThan(1e-8);
    expect(r.dense!.tEnd).toBe(r.t);
    const again = rk45(f, r.t, r.y, 10 * P, { rtol: TOL, atol: TOL, events: ev });
    expect(again.status).toBe('event');
    expect(again.t - r.t).toBeGreaterThan(0.1 * P);
  });

  it('terminal and non-terminal together: non-terminal hits before the terminal one are kept, later ones are not', () => {
    const r = rk45(f, 0, stateAt(O, 0), 10 * P, {
      rtol: TOL,
      atol: TOL,
      events: [
        { g: (_t, y) => y[1], name: 'plane' },
        { g: radialRate, direction: 1, terminal: true, name: 'periapsis' },
      ],
    });
    expect(r.status).toBe('event');
    const tp = (2 * Math.PI - O.M0) / meanMotion(O);
    expectTimeClose(r.t, tp);
    const last = r.events[r.events.length - 1];
    expect(last.name).toBe('periapsis');
    expect(r.events.slice(0, -1).every((h) => h.name === 'plane' && h.t < tp)).toBe(true);
    const planes = xzCrossingAnomalies(O)
      .flatMap((nu) => [timeOfTrueAnomaly(O, nu, 0), timeOfTrueAnomaly(O, nu, 0) + P])
      .filter((t) => t < tp);
    expect(r.events.length - 1).toBe(planes.length);
  });

  it('locates events on a backward solve', () => {
    const r = rk45(f, 3 * P, stateAt(O, 3 * P), 0, { rtol: TOL, atol: TOL, events: [{ g: radialRate, direction: 0 }] });
    expect(r.events).toHaveLength(6);
    // Going backward, periapsis is crossed with r·v falling (+ → −).
    const n = meanMotion(O);
    const peri = r.events.filter((h) => h.direction === -1).map((h) => h.t);
    expect(peri).toHaveLength(3);
    peri.forEach((t, k) => expectTimeClose(t, (2 * Math.PI * (3 - k) - O.M0) / n));
  });

  it('a zero exactly at the start is not an event (g(t0) = 0)', () => {
    const r = rk45(
      (_t, _y, dy) => {
        dy[0] = 1;
      },
      0,
      [0],
      3,
      { events: [{ g: (_t, y) => Math.sin(Math.PI * y[0]) }] },
    );
    expect(r.events.map((h) => h.t)).toHaveLength(2);
    expectTimeClose(r.events[0].t, 1);
    expectTimeClose(r.events[1].t, 2);
  });

  it('rejects malformed event specs with InputError', () => {
    expect(() => rk45(f, 0, stateAt(O, 0), P, { events: [{} as never] })).toThrow(InputError);
    expect(() => rk45(f, 0, stateAt(O, 0), P, { events: [{ g: radialRate, direction: 2 as never }] })).toThrow(/events\[0\].direction must be 1, -1 or 0/);
  });
});
