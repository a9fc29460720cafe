import { describe, expect, it } from 'vitest';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import type { BodyDocument, SystemDocument } from '../../../core/system/document.ts';
import { checkSystemDocument } from '../../../core/system/validate.ts';
import { demoDocument, planet, smallDocument } from './fixtures.ts';

const rules = (doc: SystemDocument, severity: 'error' | 'warning') =>
  checkSystemDocument(doc)
    .filter((i) => i.severity === severity)
    .map((i) => `${i.path}: ${i.rule}`);

function moon(id: string, parent: string, a: number, e = 0, extra: Partial<BodyDocument> = {}): BodyDocument {
  return planet(id, { a_m: a, e }, { parent, mu_m3_s2: 1e11, radius_m: 5e5, min_safe_altitude_m: 1000, ...extra });
}

describe('checkSystemDocument: the demo', () => {
  it('finds nothing in the demo system', () => {
    expect(checkSystemDocument(demoDocument())).toEqual([]);
  });
});

describe('checkSystemDocument: warnings (file still loads)', () => {
  it("warns when a moon's apoapsis leaves its parent's sphere of influence", () => {
    // Planet at 1e11 m with μ 3e14 around μ 1e20: SOI = 1e11 · (3e-6)^0.4 = 6.178e8 m (worked by hand).
    const doc = smallDocument([planet('p', { a_m: 1e11 }), moon('m', 'p', 5.5e8, 0.2)]);
    expect(rules(doc, 'warning')).toEqual(['bodies[1].orbit: apoapsis 660,000 km leaves "p"\'s sphere of influence (617,800 km)']);
    expect(rules(doc, 'error')).toEqual([]);
    const parsed = parseSystemFile(JSON.stringify(doc));
    expect(parsed.warnings.map((w) => w.severity)).toEqual(['warning']);
  });

  it("warns when a moon lies beyond half its parent's Hill radius (but inside the SOI)", () => {
    // μ/M = 1e-3: SOI = 1e11 · 1e-3^0.4 = 6.310e9 m; R_H = 1e11 · (1e-3/3)^(1/3) = 6.934e9 m,
    // half of it 3.467e9 m (worked by hand). A moon at 4e9 m is inside the SOI, outside R_H/2.
    const doc = smallDocument([planet('p', { a_m: 1e11 }, { mu_m3_s2: 1e17, radius_m: 6e7 }), moon('m', 'p', 4e9)], 1e20);
    const w = rules(doc, 'warning');
    expect(w).toHaveLength(1);
    expect(w[0]).toMatch(/^bodies\[1\]\.orbit: apoapsis 4,000,000 km lies beyond half of "p"'s Hill radius \(6,934,000 km\)/);
  });

  it('warns when sibling orbits overlap in distance', () => {
    const doc = smallDocument([planet('p', { a_m: 1e11, e: 0.1 }), planet('q', { a_m: 1.15e11, e: 0.1 })]);
    expect(rules(doc, 'warning')).toEqual([
      'bodies[1].orbit: distance range 103,500,000 km–126,500,000 km overlaps that of sibling "p" (90,000,000 km–110,000,000 km); the orbits may cross',
    ]);
  });

  it('does not warn for nested but separate sibling ranges', () => {
    const doc = smallDocument([planet('p', { a_m: 1e11, e: 0.05 }), planet('q', { a_m: 1.2e11, e: 0.05 })]);
    expect(rules(doc, 'warning')).toEqual([]);
  });

  it('warns when a minimum safe altitude exceeds the radius (likely km written as m)', () => {
    const doc = smallDocument([planet('p', {}, { min_safe_altitude_m: 9e6 })]);
    expect(rules(doc, 'warning')).toEqual(["bodies[0].min_safe_altitude_m: is larger than the body's radius (9,000 km > 6,000 km); check the units"]);
  });

  it('warns when μ and radius give an implausible density', () => {
    // 3e14 m³/s² / G = 4.495e24 kg in a 60 km ball (9.048e14 m³): 4.968e9 kg/m³ (worked by hand).
    const doc = smallDocument([planet('p', {}, { radius_m: 6e4, min_safe_altitude_m: 0 })]);
    const w = rules(doc, 'warning');
    expect(w).toHaveLength(1);
    expect(w[0]).toMatch(/^bodies\[0\]\.radius_m: gives an implausible mean density of 4\.968e\+9 kg\/m³/);
  });

  it("warns when a periapsis dips into the parent's atmosphere (and a moon that close has an SOI smaller than itself)", () => {
    // Moon SOI = 6.55e6 · (1e11/3e14)^0.4 = 266.3 km < its 500 km radius (worked by hand).
    const doc = smallDocument([planet('p', {}), moon('m', 'p', 6.55e6)]);
    expect(rules(doc, 'warning')).toEqual([
      'bodies[1].orbit: periapsis 6,550 km dips below "p"\'s minimum safe altitude (6,100 km from its centre)',
      "bodies[1].orbit: gives a sphere of influence (266.3 km) smaller than the body's radius (500 km)",
    ]);
  });
});

describe('checkSystemDocument: errors', () => {
  it('reports a three-body cycle once, starting at its first member in the file', () => {
    const doc = smallDocument([planet('a', {}, { parent: 'c' }), planet('b', {}, { parent: 'a' }), planet('c', {}, { parent: 'b' })]);
    expect(rules(doc, 'error')).toEqual(['bodies[0].parent: forms a cycle: a → c → b → a']);
  });

  it('reports a child chain hanging off a cycle only through the cycle', () => {
    const doc = smallDocument([planet('a', {}, { parent: 'b' }), planet('b', {}, { parent: 'a' }), planet('c', {}, { parent: 'a' })]);
    expect(rules(doc, 'error')).toEqual(['bodies[0].parent: forms a cycle: a → b → a']);
  });

  it('reports a mass given in kg that is heavier than the parent', () => {
    const doc = smallDocument([planet('p', {}, { mu_m3_s2: undefined, mass_kg: 1e40 })], 1e20);
    expect(rules(doc, 'error')).toEqual(['bodies[0].mass_kg: must give a smaller μ than the parent "sun" (6.674e+29 >= 1.000e+20 m³/s²)']);
  });

  it('rejects a tidally locked home world as the calendar source', () => {
    const doc = smallDocument([planet('p', { a_m: 1e11 }, { rotation_period_s: 2 * Math.PI * Math.sqrt(1e33 / (1e20 + 3e14)) })]);
    doc.calendar = { home: 'p', year_at_epoch: 1 };
    expect(rules(doc, 'error')).toEqual([
      'calendar.home: names "p", whose rotation is (nearly) locked to its orbit so it has no usable day; give calendar.year_s and calendar.day_s',
    ]);
  });
});

describe('checkSystemDocument: atmosphere height', () => {
  it("warns when the air reaches above the body's minimum safe altitude, or beyond its radius (units)", () => {
    const above = smallDocument([planet('p', { a_m: 1e11 }, { atmosphere_height_m: 2e5 })]);
    expect(rules(above, 'warning')).toEqual([
      'bodies[0].atmosphere_height_m: is above "p"\'s minimum safe altitude (200 km > 100 km); the minimum safe altitude is meant to clear the air',
    ]);
    const huge = smallDocument([planet('p', { a_m: 1e11 }, { atmosphere_height_m: 7e6 })]);
    expect(rules(huge, 'warning')).toEqual(['bodies[0].atmosphere_height_m: is larger than "p"\'s radius (7,000 km > 6,000 km); check the units']);
    const fine = smallDocument([planet('p', { a_m: 1e11 }, { atmosphere_height_m: 1e5, surface: false })]);
    expect(checkSystemDocument(fine)).toEqual([]);
  });
});
