/**
 * Bad input at scale, system files: the CI budget of the system fuzz target (test/fuzz/
 * systemCases.ts: random valid files varied from the demo, one field broken, truncated, garbage,
 * deeply nested, very large), and the cases that failed once, kept as regressions.
 */
import { describe, expect, it } from 'vitest';
import { ValidationError } from '../../core/math/errors.ts';
import { MAX_JSON_DEPTH, parseSystemFile } from '../../core/io/systemFile.ts';
import { MAX_OVERLAP_WARNINGS } from '../../core/system/validate.ts';
import { demoSystemDoc } from '../fuzz/files.ts';
import { deepText, withRawValue, type Json } from '../fuzz/json.ts';
import { TARGETS } from '../fuzz/targets.ts';
import { count, runBudget } from './budget.ts';

type Doc = Record<string, any>;

function refusal(text: string): ValidationError {
  try {
    parseSystemFile(text);
  } catch (e) {
    if (e instanceof ValidationError) return e;
    throw e;
  }
  throw new Error('the file loaded');
}

describe('system files, fuzzed', () => {
  it('every case loads (and the demo plan then evaluates or is refused) or is refused naming the field; never another exception or a NaN', () => {
    const outcomes = runBudget(TARGETS.system, 800);
    // the mix is real: some files load and fly, most broken ones are refused
    expect(count(outcomes, 'loaded')).toBeGreaterThan(25);
    expect(count(outcomes, 'refused')).toBeGreaterThan(200);
  });
});

describe('system files: cases kept as regressions', () => {
  it('regression (10⁵ nested arrays in bodies[1].description overflowed the stack in JSON.stringify): refused naming the field', () => {
    const doc = demoSystemDoc();
    for (const kind of ['array', 'object'] as const) {
      const e = refusal(withRawValue(doc, ['bodies', 1, 'description'], deepText(100_000, kind)));
      expect(e.issues).toHaveLength(1);
      expect(e.issues[0].path.startsWith('bodies[1].description')).toBe(true);
      expect(e.issues[0].rule).toContain(`more than ${MAX_JSON_DEPTH} levels`);
    }
  });

  it('regression (a deeply nested format value, 6,334 arrays: RangeError from the message quoting it): refused naming format', () => {
    const e = refusal(withRawValue(demoSystemDoc(), ['format'], deepText(6334, 'array')));
    expect(e.issues[0].path.startsWith('format')).toBe(true);
  });

  it('regression (long run: a mass_kg of 5e-324 passes the schema, G·mass underflows to 0 and an InputError escaped parseSystemFile): refused naming mass_kg', () => {
    const doc = demoSystemDoc() as Doc;
    delete doc.bodies[2].mu_m3_s2;
    doc.bodies[2].mass_kg = 5e-324;
    const e = refusal(JSON.stringify(doc));
    expect(e.issues.some((i) => i.severity === 'error' && i.path === 'bodies[2].mass_kg' && i.rule.includes('too small'))).toBe(true);
  });

  it('a document that is one deep array (JSON.parse copes) is refused as not an object', () => {
    expect(refusal(deepText(200_000, 'array')).issues[0].rule).toBe('must be a JSON object');
  });

  it('regression (1,000 asteroids on overlapping orbits: 277,879 warnings, 17 s to load): overlap warnings are capped and counted', () => {
    const doc = demoSystemDoc() as Doc;
    for (let i = 0; i < 1000; i++) {
      doc.bodies.push({
        id: `rock-${i}`,
        name: `Rock ${i}`,
        parent: 'ilmar',
        mu_m3_s2: 1e6,
        radius_m: 1e4,
        min_safe_altitude_m: 0,
        orbit: { a_m: 2e11 + 1e8 * i, e: 0.2, i_deg: 0, raan_deg: 0, argp_deg: 0, mean_anomaly_deg: (7 * i) % 360 },
      });
    }
    const { warnings, system } = parseSystemFile(JSON.stringify(doc));
    expect(system.bodies).toHaveLength(1 + 8 + 1000);
    const overlaps = warnings.filter((w) => w.rule.includes('overlaps that of sibling'));
    expect(overlaps).toHaveLength(MAX_OVERLAP_WARNINGS);
    const rest = warnings.find((w) => w.path === 'bodies' && w.rule.includes('more pairs of sibling orbits overlap'));
    expect(rest).toBeDefined();
    expect(Number(/^(\d+) more/.exec(rest!.rule)![1])).toBeGreaterThan(100_000);
  });

  it("a moon whose orbit leaves its planet's sphere of influence is a warning, not an error (the file loads)", () => {
    const doc = demoSystemDoc() as Doc;
    const k = doc.bodies.findIndex((b: Doc) => b.id === 'quill');
    doc.bodies[k].orbit.a_m = 1.2e9; // Tessel's SOI is about 6.8e8 m
    const { warnings } = parseSystemFile(JSON.stringify(doc));
    const w = warnings.find((x) => x.path === `bodies[${k}].orbit` && x.rule.includes('sphere of influence'));
    expect(w?.severity).toBe('warning');
  });

  it('a parent cycle, an unknown parent, a duplicate id, e ≥ 1 and a negative μ are errors naming the field', () => {
    const base = demoSystemDoc() as Doc;
    const q = base.bodies.findIndex((b: Doc) => b.id === 'quill');
    const t = base.bodies.findIndex((b: Doc) => b.id === 'tessel');
    const cases: [string, (d: Doc) => void, string, RegExp][] = [
      ['cycle', (d) => (d.bodies[t].parent = 'quill'), `bodies[${t}].parent`, /cycle/],
      ['unknown parent', (d) => (d.bodies[q].parent = 'nowhere'), `bodies[${q}].parent`, /names no body/],
      ['duplicate id', (d) => (d.bodies[q].id = 'tessel'), `bodies[${q}].id`, /duplicates/],
      ['e = 1', (d) => (d.bodies[q].orbit.e = 1), `bodies[${q}].orbit.e`, /< 1/],
      ['negative μ', (d) => (d.bodies[q].mu_m3_s2 = -2.5e12), `bodies[${q}].mu_m3_s2`, /> 0/],
    ];
    for (const [, change, path, rule] of cases) {
      const d = demoSystemDoc() as Doc;
      change(d);
      const e = refusal(JSON.stringify(d as Json));
      expect(e.issues.some((i) => i.severity === 'error' && i.path === path && rule.test(i.rule))).toBe(true);
    }
  });
});
