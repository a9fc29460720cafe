/**
 * The bodies' tracks (core/runtime/bodies.ts) of the Ilmar system over the demo plan's span,
 * against the conic ephemeris they were fitted to (core/system: bodyStateRelativeToParent,
 * bodyState) at random times: positions within the stated error, velocities (the derivative
 * series) against the ephemeris velocity and against central differences of the fitted positions.
 */
import { describe, expect, it } from 'vitest';
import { InputError, stream } from '../../../core/math/index.ts';
import { BODY_TOLERANCE, fitBodyTracks, trackAbsolutePosition, trackPosition, trackVelocity } from '../../../core/runtime/index.ts';
import type { RuntimeEphemeris } from '../../../core/runtime/index.ts';
import { bodyState, bodyStateRelativeToParent } from '../../../core/system/index.ts';
import { demoFlight, ilmar } from './demoShip.ts';

const system = ilmar();
const flight = demoFlight(system);
const t0 = flight.segments[0].t0;
const t1 = flight.segments[flight.segments.length - 1].t1;
const tracks = fitBodyTracks(system, t0, t1);
const data: RuntimeEphemeris = { system: system.name, origin: system.bodies[0].id, epoch: system.epoch.label, t0, t1, tracks };
const SAMPLES = 1000;

describe('bodies of Ilmar over the demo span', () => {
  it('one track per body but the star, in the system order, each relative to its parent', () => {
    expect(tracks.map((t) => t.name)).toEqual(system.bodies.slice(1).map((b) => b.id));
    for (const [k, tr] of tracks.entries()) {
      const parent = system.bodies[k + 1].parentIndex;
      expect(tr.arcs).toHaveLength(1);
      expect(tr.arcs[0].centerIndex).toBe(parent - 1);
      expect(tr.arcs[0].center).toBe(system.bodies[parent].id);
      expect(tr.tolerance).toBe(BODY_TOLERANCE);
    }
    expect(tracks.find((t) => t.name === 'quill')!.arcs[0].center).toBe('tessel');
    expect(tracks.find((t) => t.name === 'skerry')!.arcs[0].center).toBe('moravel');
  });

  it(`positions at ${SAMPLES} random times per body are within the stated maxError, and maxError ≤ tolerance (1 m)`, () => {
    const rng = stream(412, 0);
    const p = new Float64Array(3);
    const s = new Float64Array(6);
    for (const [k, tr] of tracks.entries()) {
      expect(tr.maxError).toBeLessThanOrEqual(tr.tolerance);
      let worst = 0;
      for (let i = 0; i < SAMPLES; i++) {
        const t = rng.uniform(t0, t1);
        trackPosition(data, k, t, p);
        bodyStateRelativeToParent(system, k + 1, t, s);
        worst = Math.max(worst, Math.hypot(p[0] - s[0], p[1] - s[1], p[2] - s[2]));
      }
      expect(worst, tr.name).toBeLessThanOrEqual(tr.maxError);
      // the statement is the fit's own error, not a loose bound: random times reach most of it
      // where the series' truncation sets it (not for Moravel and Fennick, one piece each at the
      // roundoff floor of 16 ulps of 10¹² m, which random times rarely meet)
      if (tr.maxError > 0.01 * tr.tolerance) expect(worst, tr.name).toBeGreaterThan(0.9 * tr.maxError);
    }
  });

  it('positions relative to the star (the chain of centres added) agree with the ephemeris within the chain’s summed maxError', () => {
    const rng = stream(412, 1);
    const p = new Float64Array(3);
    const s = new Float64Array(6);
    for (let k = 0; k < tracks.length; k++) {
      let allowed = 0;
      for (let j = k + 1; j > 0; j = system.bodies[j].parentIndex) allowed += tracks[j - 1].maxError;
      for (let i = 0; i < SAMPLES; i++) {
        const t = rng.uniform(t0, t1);
        trackAbsolutePosition(data, k, t, p);
        bodyState(system, k + 1, t, s, 0);
        // plus the roundoff of adding the moon's position to its planet's (an ulp of |r|)
        expect(Math.hypot(p[0] - s[0], p[1] - s[1], p[2] - s[2])).toBeLessThanOrEqual(allowed + 4 * Number.EPSILON * Math.hypot(s[0], s[1], s[2]));
      }
    }
  });

  it('velocity (the derivative series) agrees with the ephemeris velocity within (N+1)²·(2/L)·maxError (Markov’s inequality for the error’s leading term T_{N+1})', () => {
    const rng = stream(412, 2);
    const v = new Float64Array(3);
    const s = new Float64Array(6);
    for (const [k, tr] of tracks.entries()) {
      const L = tr.arcs[0].length!;
      const allowed = (tr.degree + 1) ** 2 * (2 / L) * tr.maxError;
      let worst = 0;
      for (let i = 0; i < SAMPLES; i++) {
        const t = rng.uniform(t0, t1);
        trackVelocity(data, k, t, v);
        bodyStateRelativeToParent(system, k + 1, t, s);
        worst = Math.max(worst, Math.hypot(v[0] - s[3], v[1] - s[4], v[2] - s[5]));
      }
      expect(worst, tr.name).toBeLessThanOrEqual(allowed);
    }
  });

  it('velocity agrees with central differences of the fitted positions (h = 1 s, inside one piece): within h²/6·|r‴| + 4ε|r|/h', () => {
    const rng = stream(412, 3);
    const h = 1;
    const pp = new Float64Array(3);
    const pm = new Float64Array(3);
    const v = new Float64Array(3);
    const s = new Float64Array(6);
    for (const [k, tr] of tracks.entries()) {
      const arc = tr.arcs[0];
      const L = arc.length!;
      const mu = system.bodies[k + 1].derived.orbitMu;
      for (let i = 0; i < 200; i++) {
        // a time at least h inside a piece, so both differences read the same polynomial
        const piece = Math.floor(rng.uniform(0, arc.count));
        const t = arc.t0 + piece * L + rng.uniform(h, L - h);
        trackPosition(data, k, t + h, pp);
        trackPosition(data, k, t - h, pm);
        trackVelocity(data, k, t, v);
        bodyStateRelativeToParent(system, k + 1, t, s);
        const r = Math.hypot(s[0], s[1], s[2]);
        const speed = Math.hypot(s[3], s[4], s[5]);
        // the series' third derivative: the two-body jerk |μ(v/r³ − 3(r·v)r/r⁵)| ≤ 4μ|v|/r³, plus
        // the fit error's by Markov's inequality applied three times, (N+1)⁶(2/L)³·maxError;
        // roundoff: Clenshaw's sum rounds each position by a few ulps of |r| (≲ 4ε|r|), so the
        // difference over 2h by ≲ 4ε|r|/h (measured: up to a third of it)
        const jerk = (4 * mu * speed) / r ** 3 + (tr.degree + 1) ** 6 * (2 / L) ** 3 * tr.maxError;
        const allowed = (h * h * jerk) / 6 + (4 * Number.EPSILON * r) / h;
        for (let c = 0; c < 3; c++) expect(Math.abs((pp[c] - pm[c]) / (2 * h) - v[c]), tr.name).toBeLessThanOrEqual(allowed);
      }
    }
  });

  it('a tighter tolerance costs more pieces and is still met', () => {
    const fine = fitBodyTracks(system, t0, t1, { tolerance: 0.01 });
    for (const [k, tr] of fine.entries()) {
      expect(tr.maxError).toBeLessThanOrEqual(0.01);
      expect(tr.arcs[0].count).toBeGreaterThanOrEqual(tracks[k].arcs[0].count);
    }
    expect(fine.reduce((n, t) => n + t.arcs[0].count, 0)).toBeGreaterThan(tracks.reduce((n, t) => n + t.arcs[0].count, 0));
  });
});

describe('bad input', () => {
  it('tolerance ≤ 0, t1 ≤ t0, a bad degree are InputErrors naming the field', () => {
    expect(() => fitBodyTracks(system, t0, t1, { tolerance: 0 })).toThrow(InputError);
    expect(() => fitBodyTracks(system, t0, t1, { tolerance: -1 })).toThrow(/^tolerance must be > 0/);
    expect(() => fitBodyTracks(system, t1, t0)).toThrow(/^t1 must be later than t0/);
    expect(() => fitBodyTracks(system, t0, t0)).toThrow(InputError);
    expect(() => fitBodyTracks(system, t0, Number.NaN)).toThrow(/^t1 must be a finite number/);
    expect(() => fitBodyTracks(system, t0, t1, { degree: 0 })).toThrow(/^degree must be an integer/);
  });
});
