/**
 * The sky lanes' readings of a flight: the patched-conic flight placed where core/conic puts the
 * ship (plus its central body's ephemeris), the n-body samples interpolated between positions
 * built by hand, the default body, the light series against distance / c, and the words.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  LIGHT_POINTS,
  conicFlight,
  defaultLightBody,
  lightSeries,
  lightTimeOn,
  passText,
  samplesFlight,
  shadowLabel,
  shadowTitle,
  skyData,
} from '../../../../app/renderer/timeline/skySeries.ts';
import { evaluate, shipStateAt } from '../../../../core/conic/index.ts';
import { parsePlanFile, parseSystemFile } from '../../../../core/io/index.ts';
import { bodyPosition, bodyState } from '../../../../core/system/index.ts';

const root = new URL('../../../../', import.meta.url);
const system = parseSystemFile(readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8')).system;
const plan = parsePlanFile(readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8')).plan;
const result = evaluate(system, plan);
const C = 299_792_458;

describe('sky lanes: the flight read', () => {
  it('the patched-conic flight is the ship relative to its central body plus that body relative to the star', () => {
    const f = conicFlight(system, result, 'patched conics')!;
    expect([f.t0, f.t1]).toEqual([result.t0, result.t1]);
    const out = new Float64Array(6);
    const s = new Float64Array(6);
    const c = new Float64Array(6);
    for (const frac of [0, 0.01, 0.5, 1]) {
      const t = result.t0 + frac * (result.t1 - result.t0);
      f.shipAt(t, out);
      const k = shipStateAt(result, t, s);
      bodyState(system, result.segments[k].central, t, c);
      // the same sums in the same order: identical
      for (let j = 0; j < 6; j++) expect(out[j]).toBe(s[j] + c[j]);
    }
  });

  it('n-body samples: linear between positions built by hand, the chord as velocity, clamped at the ends', () => {
    const t = Float64Array.from([0, 10, 10, 30]);
    const star = Float64Array.from([0, 0, 0, 100, 0, 0, 100, 0, 0, 100, 40, 0]);
    const f = samplesFlight({ t, star }, 'n-body')!;
    const out = new Float64Array(6);
    f.shipAt(5, out);
    expect([...out]).toEqual([50, 0, 0, 10, 0, 0]);
    f.shipAt(20, out);
    expect([...out]).toEqual([100, 20, 0, 0, 2, 0]);
    f.shipAt(-3, out);
    expect(out[0]).toBe(0);
    f.shipAt(99, out);
    expect(out[1]).toBe(40);
    expect(samplesFlight({ t: Float64Array.from([1]), star: new Float64Array(3) }, 'n-body')).toBeNull();
  });

  it('the default body is the home world the calendar names (Tessel), else the plan start body', () => {
    expect(system.bodies[defaultLightBody(system, plan)].name).toBe('Tessel');
    const noHome = { ...system, calendar: { ...system.calendar, homeIndex: -1 } };
    expect(defaultLightBody(noHome, { ...plan, start: { ...plan.start, body: 'ochre' } })).toBe(system.indexById.ochre);
  });

  it('the light series is the distance to the body over c at evenly spaced times', () => {
    const f = conicFlight(system, result, 'patched conics')!;
    const ochre = system.indexById.ochre;
    const s = lightSeries(system, f, ochre);
    expect(s.t.length).toBe(LIGHT_POINTS);
    expect(s.t[0]).toBe(result.t0);
    expect(s.t[LIGHT_POINTS - 1]).toBeCloseTo(result.t1, 3);
    const out = new Float64Array(6);
    const b = [0, 0, 0];
    for (const k of [0, 123, LIGHT_POINTS - 1]) {
      f.shipAt(s.t[k], out);
      bodyPosition(system, ochre, s.t[k], b);
      // distance over c written out here: rounding only (1e-12 relative)
      expect(s.v[k]).toBeCloseTo(Math.hypot(out[0] - b[0], out[1] - b[1], out[2] - b[2]) / C, 9);
    }
    expect(lightTimeOn(system, f, ochre, result.t0 - 1e6)).toBe(s.v[0]);
  });

  it('the readouts of the demo: eclipses by Tessel first, the words with units', () => {
    const sky = skyData(system, conicFlight(system, result, 'patched conics')!, system.calendar.homeIndex);
    expect(sky.passes[0].bodyName).toBe('Tessel');
    expect(sky.eclipses).toBeGreaterThan(1);
    expect(shadowLabel(sky)).toMatch(/^\d+× \d+(\.\d)? (h|min)$/);
    expect(shadowTitle(sky)).toMatch(/eclipses \(Tessel \d+, Ochre \d+\), .* in shadow\. Conical shadow model/);
    expect(passText({ body: 2, bodyName: 'Tessel', kind: 'umbra', t0: 0, t1: 42 * 60 })).toBe("in Tessel's umbra 42 min 00 s");
    expect(shadowLabel({ eclipses: 0, inShadow: 0 })).toBe('none');
  });
});
