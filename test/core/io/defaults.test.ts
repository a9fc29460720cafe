import { describe, expect, it } from 'vitest';
import {
  ALTITUDE_MARGIN,
  DEPARTURE_SPAN_RECURRENCES,
  INTEGRATOR_NAMES,
  integratorName,
  orbitAltitude,
  parseIntegrator,
  porkchopRanges,
  requireSafeAltitude,
  safeAltitude,
  slug,
  TOF_SPAN_HOHMANN,
  type IntegratorId,
} from '../../../core/io/defaults.ts';
import { GAME_INTEGRATORS } from '../../../core/gamestep/index.ts';
import { dateParts } from '../../../core/system/index.ts';
import { InputError } from '../../../core/math/errors.ts';
import { demoSystem } from '../search/fixtures.ts';

const sys = demoSystem();
const body = (id: string) => sys.bodies[sys.indexById[id]];
const DAY = 86400;

describe('defaults: orbit altitudes', () => {
  it("put every parking and capture orbit above the body's minimum safe altitude", () => {
    for (const b of sys.bodies.slice(1)) {
      expect(orbitAltitude(b)).toBe(b.safeAlt + ALTITUDE_MARGIN);
      expect(safeAltitude(b, undefined)).toBeGreaterThanOrEqual(b.safeAlt);
      expect(safeAltitude(b, b.safeAlt - 1)).toBeGreaterThanOrEqual(b.safeAlt);
      expect(safeAltitude(b, Number.NaN)).toBeGreaterThanOrEqual(b.safeAlt);
      expect(safeAltitude(b, b.safeAlt)).toBe(b.safeAlt);
    }
  });

  it("never carry Moravel's 400 km capture below its 1000 km safe altitude (the issue's case)", () => {
    const moravel = body('moravel');
    expect(moravel.safeAlt).toBe(1000e3); // the demo file's value
    expect(safeAltitude(moravel, 400e3)).toBe(1100e3);
    expect(() => requireSafeAltitude('Capture altitude', moravel, 400e3)).toThrow(InputError);
    expect(() => requireSafeAltitude('Capture altitude', moravel, 400e3)).toThrow(/Moravel's minimum safe altitude, 1,000 km/);
    expect(() => requireSafeAltitude('Capture altitude', moravel, 1000e3)).not.toThrow();
  });
});

describe('defaults: porkchop ranges', () => {
  it('span 1.5 synodic periods and 0.5–2 Hohmann times for sister planets (Kepler III and the Hohmann ellipse, analytic)', () => {
    const A = body('tessel');
    const B = body('ochre');
    const mu = sys.bodies[0].mu;
    const period = (a: number) => 2 * Math.PI * Math.sqrt((a * a * a) / mu);
    const synodic = 1 / Math.abs(1 / period(A.elements!.a) - 1 / period(B.elements!.a));
    const at = (A.elements!.a + B.elements!.a) / 2;
    const tH = Math.PI * Math.sqrt((at * at * at) / mu);
    const cal = sys.calendar;
    const r = porkchopRanges(sys, A.index, B.index, 10 * DAY);
    // departures start and end at the start of a day of the system's calendar (the one the app
    // and the command line print), so each end moves by less than one calendar day
    expect(r.depart.start).toBeLessThanOrEqual(10 * DAY);
    expect(10 * DAY - r.depart.start).toBeLessThan(cal.dayLength);
    expect(dateParts(cal, r.depart.start).secondOfDay).toBe(0);
    expect(dateParts(cal, r.depart.end).secondOfDay).toBe(0);
    expect(Math.abs(r.depart.end - r.depart.start - DEPARTURE_SPAN_RECURRENCES * synodic)).toBeLessThanOrEqual(cal.dayLength + DAY / 2);
    // flight times are durations: whole standard days, half a day either way
    expect(Math.abs(r.tof.min - TOF_SPAN_HOHMANN[0] * tH)).toBeLessThanOrEqual(DAY / 2);
    expect(Math.abs(r.tof.max - TOF_SPAN_HOHMANN[1] * tH)).toBeLessThanOrEqual(DAY / 2);
    expect(r.pair.through).toBeNull();
  });

  it("follow the leg for a moon of another planet, with the capture above the leg body's safe altitude", () => {
    const r = porkchopRanges(sys, body('tessel').index, body('skerry').index);
    expect(sys.bodies[r.pair.to].id).toBe('moravel');
    expect(r.captureAltitude).toBeGreaterThanOrEqual(body('moravel').safeAlt);
    const direct = porkchopRanges(sys, body('tessel').index, body('moravel').index);
    expect(r.tof).toEqual(direct.tof);
  });

  it('use the moon period and the planet-centred Hohmann time for a planet to its moon (analytic)', () => {
    const T = body('tessel');
    const Q = body('quill');
    const r = porkchopRanges(sys, T.index, Q.index, 0, 500e3);
    const rp = T.radius + 500e3;
    const at = (rp + Q.elements!.a) / 2;
    const tH = Math.PI * Math.sqrt((at * at * at) / T.mu);
    expect(Math.abs(r.tof.max - 2 * tH)).toBeLessThanOrEqual(DAY / 2);
    // the range starts at the epoch (a day's start) and ends at the start of a calendar day
    expect(r.depart.start).toBe(0);
    expect(Math.abs(r.depart.end - 1.5 * 2 * Math.PI * Math.sqrt(Q.elements!.a ** 3 / T.mu))).toBeLessThanOrEqual(sys.calendar.dayLength + DAY / 2);
  });
});

describe('defaults: integrator names', () => {
  const ids = Object.keys(INTEGRATOR_NAMES) as IntegratorId[];

  it('give each id one display name, and no two the same name or slug', () => {
    expect(new Set(ids.map((i) => INTEGRATOR_NAMES[i])).size).toBe(ids.length);
    // a slug may be its own id (explicit-euler), never another's id or slug
    for (const i of ids) for (const j of ids) if (i !== j) expect([j, slug(INTEGRATOR_NAMES[j])]).not.toContain(slug(INTEGRATOR_NAMES[i]));
    for (const g of GAME_INTEGRATORS) expect(ids).toContain(g);
    expect(INTEGRATOR_NAMES['symplectic-euler']).toBe('semi-implicit Euler');
  });

  it('read the id, the slug of the name or the name itself; refuse anything else naming the choices', () => {
    for (const g of GAME_INTEGRATORS) {
      expect(parseIntegrator('--integrator', g, GAME_INTEGRATORS)).toBe(g);
      expect(parseIntegrator('--integrator', slug(INTEGRATOR_NAMES[g]), GAME_INTEGRATORS)).toBe(g);
      expect(parseIntegrator('--integrator', INTEGRATOR_NAMES[g], GAME_INTEGRATORS)).toBe(g);
      expect(integratorName(g)).toBe(INTEGRATOR_NAMES[g]);
    }
    expect(parseIntegrator('--integrator', 'Semi-Implicit Euler', GAME_INTEGRATORS)).toBe('symplectic-euler');
    expect(() => parseIntegrator('--integrator', 'leapfrog', GAME_INTEGRATORS)).toThrow(/semi-implicit-euler/);
    expect(() => parseIntegrator('--integrator', 'yoshida4', GAME_INTEGRATORS)).toThrow(InputError); // not a game integrator
    expect(integratorName('unknown-method')).toBe('unknown-method');
  });
});
