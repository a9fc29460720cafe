import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseSystemFile } from '../../../../core/io/systemFile.ts';
import { bodyPosition } from '../../../../core/system/index.ts';
import { trackPosition, truthPaths } from '../../../../app/renderer/target/truthTrack.ts';

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
