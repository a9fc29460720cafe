import { describe, expect, it } from 'vitest';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import { InputError } from '../../../core/math/errors.ts';
import { buildStarSystem, systemToDocument } from '../../../core/system/build.ts';
import type { SystemDocument } from '../../../core/system/document.ts';
import { demoText, planet, smallDocument } from './fixtures.ts';

const G = 6.6743e-11; // CODATA 2018 recommended value (from memory)

function fieldOf(doc: SystemDocument): string {
  try {
    buildStarSystem(doc);
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as InputError).field;
  }
  return 'no error';
}

describe('document → model', () => {
  it('puts the star first and the bodies after it in file order, a parent listed after its child included', () => {
    const doc = smallDocument([planet('moon', { a_m: 4e8 }, { parent: 'world', mu_m3_s2: 5e12 }), planet('world', {}), planet('far', { a_m: 3e11 })]);
    const s = buildStarSystem(doc);
    expect(s.bodies.map((b) => b.id)).toEqual(['sun', 'moon', 'world', 'far']);
    expect(s.bodies.map((b) => b.index)).toEqual([0, 1, 2, 3]);
    expect(s.bodies.map((b) => b.parentIndex)).toEqual([-1, 2, 0, 0]);
    expect(s.bodies[0].children).toEqual([2, 3]);
    expect(s.bodies[2].children).toEqual([1]);
    expect(s.indexById).toEqual({ sun: 0, moon: 1, world: 2, far: 3 });
    expect(s.bodies[0].elements).toBeNull();
  });

  it('converts degrees to radians and takes μ = G·m for a mass in kg (CODATA 2018 G)', () => {
    const doc = smallDocument([planet('p', { i_deg: 30, raan_deg: 90, argp_deg: -45, mean_anomaly_deg: 180 }, { mu_m3_s2: undefined, mass_kg: 6e24 })]);
    const p = buildStarSystem(doc).bodies[1];
    expect(p.elements!.i).toBeCloseTo(Math.PI / 6, 15);
    expect(p.elements!.raan).toBeCloseTo(Math.PI / 2, 15);
    expect(p.elements!.argp).toBeCloseTo(-Math.PI / 4, 15);
    expect(p.elements!.M0).toBeCloseTo(Math.PI, 15);
    expect(p.mu / (G * 6e24) - 1).toBe(0);
    expect(p.massKg).toBe(6e24);
    expect(buildStarSystem(smallDocument([planet('q', {})])).bodies[1].massKg).toBeNull();
  });

  it('counts depth in the body tree', () => {
    const { system } = parseSystemFile(demoText());
    const depth = Object.fromEntries(system.bodies.map((b) => [b.id, b.derived.depth]));
    expect(depth).toEqual({ ilmar: 0, kiln: 1, tessel: 1, quill: 2, ochre: 1, moravel: 1, skerry: 2, lough: 2, fennick: 1 });
  });

  it('stores SOI and Hill radius per body, Infinity for the star', () => {
    const { system } = parseSystemFile(demoText());
    const star = system.bodies[0];
    expect(star.derived.soiRadius).toBe(Infinity);
    expect(star.derived.period).toBe(Infinity);
    const t = system.bodies[system.indexById.tessel];
    expect(t.derived.soiRadius).toBeCloseTo(t.elements!.a * (t.mu / star.mu) ** 0.4, -3);
    expect(t.derived.hillRadius).toBeCloseTo(t.elements!.a * (1 - t.elements!.e) * Math.cbrt(t.mu / (3 * star.mu)), -3);
  });

  it("takes a home calendar's year from the home body's orbit and its day from the mean solar day (common practice)", () => {
    const doc = smallDocument([planet('home', { a_m: 1.2e11 }, { rotation_period_s: 90000 })]);
    doc.calendar = { home: 'home', year_at_epoch: 7, era: 'AE' };
    const s = buildStarSystem(doc);
    // Kepler's third law with μ_star + μ_body; solar day 1/(1/P_rot − 1/P_orb) for prograde rotation
    const year = 2 * Math.PI * Math.sqrt(1.2e11 ** 3 / (1e20 + 3e14));
    // the same formulas evaluated in another order: a few roundings apart
    expect(Math.abs(s.calendar.yearLength / year - 1)).toBeLessThan(1e-15);
    expect(Math.abs(s.calendar.dayLength / (1 / (1 / 90000 - 1 / year)) - 1)).toBeLessThan(1e-15);
    expect([s.calendar.yearAtEpoch, s.calendar.era, s.calendar.homeIndex]).toEqual([7, 'AE', 1]);
  });

  it('refuses structural breakage with InputError naming the field', () => {
    expect(fieldOf(smallDocument([planet('a', {}), planet('a', {})]))).toBe('bodies[1].id');
    expect(fieldOf(smallDocument([planet('sun', {})]))).toBe('bodies[0].id');
    expect(fieldOf(smallDocument([planet('a', {}, { parent: 'nowhere' })]))).toBe('bodies[0].parent');
    expect(fieldOf(smallDocument([planet('a', {}, { parent: 'b' }), planet('b', {}, { parent: 'a' })]))).toBe('bodies[0].parent');
    const locked = smallDocument([planet('a', {})]);
    locked.calendar = { home: 'a', year_at_epoch: 1 };
    expect(fieldOf(locked)).toBe('calendar.home'); // no rotation period
    const star = smallDocument([planet('a', {}, { rotation_period_s: 1e5 })]);
    star.calendar = { home: 'sun', year_at_epoch: 1 };
    expect(fieldOf(star)).toBe('calendar.home');
  });
});

describe('model → document', () => {
  it('round-trips the demo system to an equal model', () => {
    const { system } = parseSystemFile(demoText());
    const back = buildStarSystem(systemToDocument(system));
    expect(back.bodies).toEqual(system.bodies);
    expect(back.calendar).toEqual(system.calendar);
    expect(back.name).toBe(system.name);
  });

  it('writes degrees to 12 significant digits, so round values read back as written', () => {
    const doc = smallDocument([planet('p', { i_deg: 28.5, raan_deg: 0.1, argp_deg: 359.9, mean_anomaly_deg: -12.345 })]);
    const out = systemToDocument(buildStarSystem(doc)).bodies[0].orbit;
    expect([out.i_deg, out.raan_deg, out.argp_deg, out.mean_anomaly_deg]).toEqual([28.5, 0.1, 359.9, -12.345]);
  });

  it('keeps what the file gave: mass or μ, explicit calendar lengths, optional fields left out', () => {
    const doc = smallDocument([planet('p', {}, { mu_m3_s2: undefined, mass_kg: 4.5e24 })]);
    delete (doc.bodies[0] as { mu_m3_s2?: number }).mu_m3_s2;
    const out = systemToDocument(buildStarSystem(doc));
    expect(out.bodies[0].mass_kg).toBe(4.5e24);
    expect('mu_m3_s2' in out.bodies[0]).toBe(false);
    expect(out.star.mu_m3_s2).toBe(1e20);
    expect(out.calendar).toEqual({ year_s: 360 * 86400, day_s: 86400, year_at_epoch: 100 });
    expect('description' in out).toBe(false);
    expect('colour' in out.bodies[0]).toBe(false);
    expect('rotation_period_s' in out.bodies[0]).toBe(false);
    expect(out.bodies[0].orbit.i_deg).toBe(0);
  });
});

describe('atmosphere and surface', () => {
  it('builds airless bodies with a surface by default, the star without one, and writes the fields back only when set', () => {
    const doc = smallDocument([planet('p', { a_m: 1e11 }), planet('g', { a_m: 2e11 }, { atmosphere_height_m: 5e4, surface: false })]);
    const sys = buildStarSystem(doc);
    expect([sys.bodies[0].hasSurface, sys.bodies[1].hasSurface, sys.bodies[2].hasSurface]).toEqual([false, true, false]);
    expect([sys.bodies[1].atmosphereHeight, sys.bodies[2].atmosphereHeight]).toEqual([0, 5e4]);
    const back = systemToDocument(sys);
    expect('atmosphere_height_m' in back.bodies[0]).toBe(false);
    expect('surface' in back.bodies[0]).toBe(false);
    expect(back.bodies[1].atmosphere_height_m).toBe(5e4);
    expect(back.bodies[1].surface).toBe(false);
  });
});
