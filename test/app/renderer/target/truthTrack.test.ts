import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseSystemFile } from '../../../../core/io/systemFile.ts';
import { bodyPosition } from '../../../../core/system/index.ts';
import { trackPosition, trackStateAt, truthPaths } from '../../../../app/renderer/target/truthTrack.ts';

const root = new URL('../../../../', import.meta.url);
const system = parseSystemFile(readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8')).system;
const tessel = system.bodies.findIndex((b) => b.id === 'tessel');
const DAY = 86400;

/** Samples about Tessel (a point 7 000 km from it), then about the star (a point 1.5e11 m out), at known times. */
function samples() {
  const t = Float64Array.from([0, 600, 1200, 1800, 40 * DAY, 80 * DAY]);
  const origin = Int32Array.from([tessel, tessel, tessel, 0, 0, 0]);
  const star = new Float64Array(3 * t.length);
  const b = [0, 0, 0];
  for (let k = 0; k < t.length; k++) {
    if (origin[k] === tessel) {
      bodyPosition(system, tessel, t[k], b);
      star.set([b[0] + 7e6, b[1], b[2] + 1e5 * k], 3 * k);
    } else star.set([1.5e11, 1e9 * k, 0], 3 * k);
  }
  return { t, star, origin };
}

describe('the n-body path for the System view', () => {
  it('puts each run of samples in the frame of the body it was flown about, joined at the change', () => {
    const s = samples();
    const paths = truthPaths(system, s);
    expect(paths.map((p) => p.central)).toEqual([tessel, 0]);
    // about Tessel: the offsets put in, back out of the ephemeris (to rounding of 1e11-m numbers)
    const a = paths[0].points;
    expect(a.length).toBe(9);
    for (let k = 0; k < 3; k++) {
      expect(a[3 * k]).toBeCloseTo(7e6, -1);
      expect(a[3 * k + 1]).toBeCloseTo(0, -1);
      expect(a[3 * k + 2]).toBeCloseTo(1e5 * k, -1);
    }
    // about the star: starts with Tessel's last sample (so the paths join), then its own three
    const b = paths[1].points;
    expect(b.length).toBe(12);
    expect(Array.from(b.slice(0, 3))).toEqual(Array.from(s.star.slice(6, 9)));
    expect(Array.from(b.slice(3))).toEqual(Array.from(s.star.slice(9)));
  });

  it('places the ship between samples by linear interpolation, and nowhere outside them', () => {
    const s = samples();
    const out = [0, 0, 0];
    // halfway from 40 d to 80 d: halfway from y = 4e9 to 5e9
    expect(trackPosition(s, 60 * DAY, out)).toBe(true);
    expect(out).toEqual([1.5e11, 4.5e9, 0]);
    expect(trackPosition(s, 80 * DAY, out)).toBe(true);
    expect(out[1]).toBe(5e9);
    expect(trackPosition(s, 0, out)).toBe(true);
    expect(out[0]).toBe(s.star[0]);
    expect(trackPosition(s, -1, out)).toBe(false);
    expect(trackPosition(s, 80 * DAY + 1, out)).toBe(false);
    expect(trackPosition({ t: new Float64Array(0), star: new Float64Array(0) }, 0, out)).toBe(false);
  });
});

describe('the ship state on the n-body samples (where a burn marker sits and its arrows point)', () => {
  // A circular orbit 7 000 km from Tessel's centre, sampled every 3° of arc as the flight samples it
  const mu = system.bodies[tessel].mu;
  const R = 7e6;
  const w = Math.sqrt(mu / R ** 3);
  const STEP = (3 * Math.PI) / 180;
  const n = 121;
  const t = new Float64Array(n);
  const star = new Float64Array(3 * n);
  const origin = new Int32Array(n).fill(tessel);
  const b = [0, 0, 0];
  for (let k = 0; k < n; k++) {
    t[k] = 1000 + (k * STEP) / w;
    bodyPosition(system, tessel, t[k], b);
    star.set([b[0] + R * Math.cos(w * (t[k] - 1000)), b[1] + R * Math.sin(w * (t[k] - 1000)), b[2]], 3 * k);
  }
  const samples = { t, star, origin };

  it('about the body flown about: the position on the circle and the velocity within half the sample spacing of the tangent', () => {
    const s = new Float64Array(6);
    for (const tq of [t[10], t[10] + (0.3 / w) * STEP, t[57] - 1e-3]) {
      expect(trackStateAt(system, samples, tq, s)).toBe(tessel);
      // the chord between samples 3° apart: within R(1 − cos 1.5°) ≈ 2.4 km of the circle, at its ends on it (to rounding of 1e11-m numbers)
      expect(Math.abs(Math.hypot(s[0], s[1], s[2]) - R)).toBeLessThan(R * (1 - Math.cos(STEP / 2)) + 1);
      // the analytic velocity at tq: tangent, speed ωR; the chord's direction is within half the spacing (1.5°) of it
      const th = w * (tq - 1000);
      const v = [-w * R * Math.sin(th), w * R * Math.cos(th), 0];
      const dot = (s[3] * v[0] + s[4] * v[1] + s[5] * v[2]) / (Math.hypot(s[3], s[4], s[5]) * Math.hypot(...v));
      expect(Math.acos(Math.min(1, dot))).toBeLessThan(STEP / 2 + 1e-6);
      // its speed: the chord over the time between, 2R·sin(1.5°)/Δt = ωR·sinc(1.5°), 1.1e-4 below ωR
      expect(Math.hypot(s[3], s[4], s[5]) / (w * R)).toBeCloseTo(Math.sin(STEP / 2) / (STEP / 2), 6);
    }
  });

  it('nowhere outside the samples', () => {
    const s = new Float64Array(6);
    expect(trackStateAt(system, samples, t[0] - 1, s)).toBe(-1);
    expect(trackStateAt(system, samples, t[n - 1] + 1, s)).toBe(-1);
    expect(trackStateAt(system, { t: t.subarray(0, 1), star, origin }, t[0], s)).toBe(-1);
  });
});
