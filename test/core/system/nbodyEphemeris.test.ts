import { describe, expect, it } from 'vitest';
import { InputError, SolverError } from '../../../core/math/errors.ts';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import { bodyState } from '../../../core/system/ephemeris.ts';
import { BARYCENTRE, NBodyEphemeris, buildNBodyEphemeris, initialStates } from '../../../core/system/nbodyEphemeris.ts';
import { demoText, planet, smallSystem } from './fixtures.ts';

const twoBody = smallSystem([planet('p', { a_m: 1.1e11, e: 0.2, i_deg: 5, raan_deg: 30, argp_deg: 70, mean_anomaly_deg: 10 })]);
const T = twoBody.bodies[1].derived.period;
const a = twoBody.bodies[1].elements!.a;

function maxPositionError(eph: NBodyEphemeris, n = 1000): number {
  const x = new Float64Array(6);
  const y = new Float64Array(6);
  let worst = 0;
  for (let k = 0; k <= n; k++) {
    const t = (k / n) * eph.tEnd;
    eph.state(t, 1, x);
    bodyState(twoBody, 1, t, y);
    worst = Math.max(worst, Math.hypot(x[0] - y[0], x[1] - y[1], x[2] - y[2]));
  }
  return worst;
}

describe('n-body ephemeris: the two-body problem (analytic Kepler conic with μ = μ_star + μ_planet)', () => {
  const yoshida = buildNBodyEphemeris(twoBody, { tEnd: T });

  it('matches the conic over one orbit to 1e-7 of a (Yoshida 4, h = T/2000, samples every 10 steps)', () => {
    expect(maxPositionError(yoshida) / a).toBeLessThan(1e-7);
  });

  it('matches the conic velocity over one orbit to 1e-8 of the mean speed (measured 1.7e-9)', () => {
    const x = new Float64Array(6);
    const y = new Float64Array(6);
    const vMean = (2 * Math.PI * a) / T;
    for (let k = 0; k <= 200; k++) {
      const t = (k / 200) * T;
      yoshida.state(t, 1, x);
      bodyState(twoBody, 1, t, y);
      expect(Math.hypot(x[3] - y[3], x[4] - y[4], x[5] - y[5]) / vMean).toBeLessThan(1e-8);
    }
  });

  it('is far less accurate with Verlet at the same step (2nd vs 4th order), yet still close', () => {
    const verlet = buildNBodyEphemeris(twoBody, { tEnd: T, method: 'verlet' });
    const ev = maxPositionError(verlet);
    expect(ev / a).toBeLessThan(1e-4); // second order at T/2000: measured 4.3e-5
    expect(ev).toBeGreaterThan(100 * maxPositionError(yoshida));
  });

  it('conserves total energy to 2e-10 (relative, bounded) over 100 orbits with Yoshida 4 (measured 6.4e-11)', () => {
    const eph = buildNBodyEphemeris(twoBody, { tEnd: 100 * T, stepsPerSample: 200 });
    const E0 = eph.energyAtSample(0);
    // Two-body energy divided by G (analytic): −μ_s μ_p / (2a).
    expect(E0 / (-(1e20 * 3e14) / (2 * a)) - 1).toBeLessThan(1e-12);
    let worstFirst = 0;
    let worstAll = 0;
    for (let k = 0; k < eph.data.samples; k++) {
      const d = Math.abs(eph.energyAtSample(k) / E0 - 1);
      worstAll = Math.max(worstAll, d);
      if (k * eph.data.sampleInterval <= 10 * T) worstFirst = Math.max(worstFirst, d);
    }
    expect(worstAll).toBeLessThan(2e-10);
    // Bounded, not drifting: the last 90 orbits stay within a few times the first 10's excursion.
    expect(worstAll).toBeLessThan(5 * worstFirst + 1e-13);
  });

  it('returns the stored integrator state exactly at sample times', () => {
    const x = new Float64Array(6);
    const d = yoshida.data;
    for (const k of [0, 1, 57, d.samples - 1]) {
      yoshida.state(k * d.sampleInterval, 1, x, BARYCENTRE);
      for (let c = 0; c < 6; c++) expect(x[c]).toBe(d.states[(k * d.count + 1) * 6 + c]);
    }
  });
});

describe('n-body ephemeris: the demo system', () => {
  const demo = parseSystemFile(demoText()).system;
  const year = demo.calendar.yearLength;
  const eph = buildNBodyEphemeris(demo, { tEnd: year });

  it('starts with zero total momentum and the barycentre at the origin, and keeps them (conservation of momentum)', () => {
    const { x0, v0, mus } = initialStates(demo);
    const x = new Float64Array(6);
    for (const t of [0, year / 3, year]) {
      const m = [0, 0, 0, 0, 0, 0];
      for (let i = 0; i < demo.bodies.length; i++) {
        if (t === 0) {
          for (let c = 0; c < 3; c++) {
            m[c] += mus[i] * x0[3 * i + c];
            m[3 + c] += mus[i] * v0[3 * i + c];
          }
        } else {
          eph.state(t, i, x, BARYCENTRE);
          for (let c = 0; c < 6; c++) m[c] += mus[i] * x[c];
        }
      }
      const muSum = mus.reduce((s, v) => s + v, 0);
      // symplectic steps conserve momentum to rounding: positions of up to 1e12 m carry 1.2e-4 m,
      // velocities of ~5e4 m/s 7e-12 m/s (measured 2.4e-5 m and 4.2e-11 m/s after a year)
      expect(Math.hypot(m[0], m[1], m[2]) / muSum).toBeLessThan(1e-4); // m
      expect(Math.hypot(m[3], m[4], m[5]) / muSum).toBeLessThan(2e-10); // m/s
    }
  });

  it('conserves total energy over one home-world year to 1e-12 (measured 8e-14)', () => {
    const E0 = eph.energyAtSample(0);
    let worst = 0;
    for (let k = 0; k < eph.data.samples; k += 7) worst = Math.max(worst, Math.abs(eph.energyAtSample(k) / E0 - 1));
    expect(worst).toBeLessThan(1e-12);
  });

  it('places each moon at its conic relative to its planet at the epoch, and each planet-with-moons off its conic by the subsystem barycentre offset', () => {
    const x = new Float64Array(6);
    const y = new Float64Array(6);
    const q = demo.indexById.quill;
    const te = demo.indexById.tessel;
    eph.state(0, q, x, te);
    bodyState(demo, q, 0, y, te);
    // differences of ~1e11 m barycentric positions (ulp 1.5e-5 m): measured 2.2e-6
    for (let c = 0; c < 6; c++) expect(Math.abs(x[c] - y[c])).toBeLessThan(5e-5);
    eph.state(0, te, x, 0);
    bodyState(demo, te, 0, y, 0);
    const rq = bodyState(demo, q, 0, new Float64Array(6), te);
    const k = demo.bodies[q].mu / (demo.bodies[q].mu + demo.bodies[te].mu);
    for (let c = 0; c < 3; c++) expect(Math.abs(x[c] - y[c] + k * rq[c])).toBeLessThan(5e-5); // measured 6.3e-6 m
  });

  it('stays near the conic ephemeris for the planets over a year (mutual perturbations are small: < 1e-4 of a)', () => {
    const x = new Float64Array(6);
    const y = new Float64Array(6);
    for (const id of ['kiln', 'tessel', 'ochre', 'moravel', 'fennick']) {
      const j = demo.indexById[id];
      eph.state(year, j, x, 0);
      bodyState(demo, j, year, y, 0);
      expect(Math.hypot(x[0] - y[0], x[1] - y[1], x[2] - y[2]) / demo.bodies[j].elements!.a).toBeLessThan(1e-4);
    }
  });

  it('survives structured cloning of its data (for workers)', () => {
    const copy = new NBodyEphemeris(structuredClone(eph.data));
    const x = new Float64Array(6);
    const y = new Float64Array(6);
    copy.state(1.234e7, 3, x, 2);
    eph.state(1.234e7, 3, y, 2);
    expect(Array.from(x)).toEqual(Array.from(y));
  });
});

describe('n-body ephemeris: options and errors', () => {
  it('reports progress up to 1 and can be cancelled', () => {
    const seen: number[] = [];
    buildNBodyEphemeris(twoBody, { tEnd: T / 10, onProgress: (f) => seen.push(f) });
    expect(seen[seen.length - 1]).toBe(1);
    const signal = { aborted: false };
    expect(() =>
      buildNBodyEphemeris(twoBody, {
        tEnd: T,
        signal,
        onProgress: (f) => {
          if (f > 0.5) signal.aborted = true;
        },
      }),
    ).toThrow(SolverError);
  });

  it('uses the default step of 1/2000 of the shortest period, or less', () => {
    const eph = buildNBodyEphemeris(twoBody, { tEnd: T / 3 });
    expect(eph.data.h).toBeLessThanOrEqual(T / 2000);
    expect(eph.data.h).toBeGreaterThan(0.99 * (T / 2000));
    expect(eph.data.sampleInterval * (eph.data.samples - 1)).toBeCloseTo(T / 3, 3);
  });

  it('rejects bad options and out-of-span queries with InputError', () => {
    expect(() => buildNBodyEphemeris(twoBody, { tEnd: 0 })).toThrow(InputError);
    expect(() => buildNBodyEphemeris(twoBody, { tEnd: NaN })).toThrow(InputError);
    expect(() => buildNBodyEphemeris(twoBody, { tEnd: T, method: 'rk4' as 'verlet' })).toThrow(InputError);
    expect(() => buildNBodyEphemeris(twoBody, { tEnd: T, stepsPerSample: 0 })).toThrow(InputError);
    expect(() => buildNBodyEphemeris(twoBody, { tEnd: 1e4 * T, maxStoredValues: 1e6 })).toThrow(/needs .* samples/);
    const eph = buildNBodyEphemeris(twoBody, { tEnd: T / 10 });
    const x = new Float64Array(6);
    expect(() => eph.state(-1, 1, x)).toThrow(InputError);
    expect(() => eph.state(T, 1, x)).toThrow(InputError);
    expect(() => eph.state(0, 2, x)).toThrow(InputError);
    expect(() => eph.state(0, 1, x, 5)).toThrow(InputError);
  });
});
