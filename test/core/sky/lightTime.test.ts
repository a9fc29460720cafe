import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { evaluate, shipStateAt } from '../../../core/conic/index.ts';
import { parsePlanFile, parseSystemFile } from '../../../core/io/index.ts';
import { SPEED_OF_LIGHT, lightTimeAt, lightTimes } from '../../../core/sky/lightTime.ts';
import { bodyPosition, bodyState } from '../../../core/system/index.ts';

const root = new URL('../../../', import.meta.url);
const system = parseSystemFile(readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8')).system;

describe('light time', () => {
  it('c is 299 792 458 m/s, exact by the definition of the metre', () => {
    expect(SPEED_OF_LIGHT).toBe(299792458);
  });

  it('1 au (149 597 870 700 m, IAU 2012 Resolution B2, exact) takes 499.004784 s (common practice: about 8 min 19 s)', () => {
    // the star (index 0) sits at the origin: a ship 1 au from it along a skewed direction
    const au = 149_597_870_700;
    const [x, y, z] = [au * 0.6, au * -0.48, au * 0.64];
    const tau = lightTimeAt(system, 0, 0, x, y, z);
    // 499.004783836… s: the published figure to its 6 decimals (half a unit of the last place)
    expect(Math.abs(tau - 499.004784)).toBeLessThan(5e-7);
    expect(Math.floor(tau / 60)).toBe(8);
    expect(Math.round(tau - 480)).toBe(19);
  });

  it('is the distance to the body at each sample divided by c (distances built by hand)', () => {
    const tessel = system.indexById.tessel;
    const ts = [0, 86400, 3.1e7];
    const offsets = [
      [1e9, 0, 0],
      [-3e10, 4e10, 0],
      [2e8, -5e8, 7e7],
    ];
    const ship = new Float64Array(9);
    const p = [0, 0, 0];
    const want: number[] = [];
    ts.forEach((t, k) => {
      bodyPosition(system, tessel, t, p);
      for (let j = 0; j < 3; j++) ship[3 * k + j] = p[j] + offsets[k][j];
      want.push(Math.sqrt(offsets[k][0] ** 2 + offsets[k][1] ** 2 + offsets[k][2] ** 2) / 299792458);
    });
    const got = lightTimes(system, tessel, ts, ship);
    // adding a 2e8 m offset to a 1.1e11 m position and taking it off again rounds by ~1.5e-5 m: 3e-14 of the smallest offset; 1e-12 leaves room for hypot
    got.forEach((g, k) => expect(Math.abs(g - want[k]) / want[k]).toBeLessThan(1e-12));
    expect(Math.abs(got[1] - 50e9 / 299792458)).toBeLessThan(1e-6);
  });

  it('rejects bad arguments with InputError', () => {
    expect(() => lightTimes(system, 99, [0], [1, 2, 3])).toThrow(/body/);
    expect(() => lightTimes(system, 1, [0, 1], [1, 2, 3])).toThrow(/shipStar/);
    expect(() => lightTimes(system, 1, [0], [Number.NaN, 2, 3])).toThrow(/finite/);
  });

  it('on the demo, one light-time iteration (the body where it was when the light left it) changes the readout by < 0.1 s', () => {
    const plan = parsePlanFile(readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8')).plan;
    const r = evaluate(system, plan);
    const tessel = system.indexById.tessel;
    const s6 = new Float64Array(6);
    const c6 = new Float64Array(6);
    const b6 = new Float64Array(6);
    let worst = 0;
    let farthest = 0;
    for (let k = 0; k <= 400; k++) {
      const t = r.t0 + ((r.t1 - r.t0) * k) / 400;
      const seg = shipStateAt(r, t, s6);
      bodyState(system, r.segments[seg].central, t, c6);
      const [x, y, z] = [s6[0] + c6[0], s6[1] + c6[1], s6[2] + c6[2]];
      const tau = lightTimeAt(system, tessel, t, x, y, z);
      bodyState(system, tessel, t - tau, b6);
      const retarded = Math.hypot(x - b6[0], y - b6[1], z - b6[2]) / SPEED_OF_LIGHT;
      worst = Math.max(worst, Math.abs(retarded - tau));
      farthest = Math.max(farthest, tau);
    }
    // the shift is at most v·τ/c: Tessel's speed about Ilmar is at most √(μ(1+e)/(a(1−e))) ≈ 30.5 km/s (at periapsis; 31 km/s bounds it) and τ the farthest light time seen
    expect(worst).toBeLessThanOrEqual((31e3 * farthest) / SPEED_OF_LIGHT);
    expect(worst).toBeLessThan(0.1);
    expect(worst).toBeGreaterThan(0);
  });
});
