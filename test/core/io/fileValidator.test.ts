import { readFileSync } from 'node:fs';
import { Ajv2020, type ErrorObject } from 'ajv/dist/2020.js';
import { describe, expect, it } from 'vitest';
import { compileFileSchema, inlineLocalRefs } from '../../../core/io/fileValidator.ts';

// Reference: ajv itself (an npm dependency the project did not write) compiling the committed
// schema as it is, with its $refs, and the same options; the inlined validator must report the
// same errors — same keyword, instance path, params and failing data — on every document
// (only schemaPath reads through the inlined copy, by design).

const json = (rel: string): Record<string, unknown> => JSON.parse(readFileSync(new URL(rel, import.meta.url), 'utf8'));
const planSchema = json('../../../assets/schema/plan.schema.json');
const systemSchema = json('../../../assets/schema/system.schema.json');
const demoPlanDoc = json('../../../assets/plans/tessel-to-ochre.plan.json');
const demoSystemDoc = json('../../../assets/systems/ilmar.system.json');

function plainAjv(schema: object): ReturnType<Ajv2020['compile']> {
  const ajv = new Ajv2020({ allErrors: true, verbose: true, strict: true, strictRequired: false, allowUnionTypes: true });
  ajv.addKeyword({ keyword: 'x-rule', schemaType: 'string' });
  ajv.addKeyword({ keyword: 'x-rule-oneOf', schemaType: 'string' });
  return ajv.compile(schema);
}

/** The errors as comparable keys, sorted (keyword, path, params, data). */
function keys(errors: ErrorObject[] | null | undefined): string[] {
  return (errors ?? []).map((e) => `${e.instancePath} ${e.keyword} ${JSON.stringify(e.params)} ${JSON.stringify(e.data)}`).sort();
}

function same(schema: object, docs: unknown[]): void {
  const mine = compileFileSchema(schema);
  const ref = plainAjv(schema);
  for (const doc of docs) {
    const okMine = mine(doc);
    const okRef = ref(doc);
    expect(okMine).toBe(okRef);
    expect(keys(mine.errors)).toEqual(keys(ref.errors));
  }
}

const clone = <T>(x: T): T => structuredClone(x);
function edit<T>(doc: T, f: (d: any) => void): T {
  const d = clone(doc);
  f(d);
  return d;
}

describe('compileFileSchema: the inlined-refs validator reports what plain ajv reports', () => {
  it('plan files: the demo plan passes both; broken ones give the same errors', () => {
    const bad = [
      edit(demoPlanDoc, (d) => {
        d.format = 'something-else';
      }),
      edit(demoPlanDoc, (d) => {
        delete d.vehicle;
        d.extra = 1;
      }),
      edit(demoPlanDoc, (d) => {
        d.start.periapsis_altitude_m = -5;
        d.start.e = 'round';
        d.start.body = '';
      }),
      edit(demoPlanDoc, (d) => {
        d.events[0].dv_mps = [0, 0];
        d.events[0].mode = 'sideways';
        d.events[1].type = 'nap';
        d.events.push({ type: 'coast', id: 'x' }, 42, null);
      }),
      edit(demoPlanDoc, (d) => {
        d.vehicle.stages[0].isp_s = 0;
        d.vehicle.stages.push({});
        d.target = { body: 7 };
      }),
      [],
      'not a plan',
    ];
    expect(compileFileSchema(planSchema)(demoPlanDoc)).toBe(true);
    same(planSchema, [demoPlanDoc, ...bad]);
    // the broken documents do break the schema, in more than one place each where built so
    const v = compileFileSchema(planSchema);
    for (const d of bad) expect(v(d)).toBe(false);
    v(bad[3]);
    expect((v.errors ?? []).length).toBeGreaterThan(3);
  });

  it('system files: the demo system passes both; broken ones give the same errors', () => {
    const bad = [
      edit(demoSystemDoc, (d) => {
        d.star.mu_m3_s2 = -1;
      }),
      edit(demoSystemDoc, (d) => {
        const b = d.bodies as any[];
        b[0].orbit.e = 1.5;
        b[1].orbit = { a_m: 'far' };
        b[2].id = 'Not An Id!';
        b.push({ id: 'lost' });
      }),
      edit(demoSystemDoc, (d) => {
        d.calendar = null;
        d.version = 2;
      }),
    ];
    expect(compileFileSchema(systemSchema)(demoSystemDoc)).toBe(true);
    same(systemSchema, [demoSystemDoc, ...bad]);
    const v = compileFileSchema(systemSchema);
    for (const d of bad) expect(v(d)).toBe(false);
  });

  it('many failing array items: the same error count as plain ajv (one per broken item and rule)', () => {
    const d = edit(demoPlanDoc, (x) => {
      x.events = Array.from({ length: 200 }, (_, k) => ({ type: 'burn', id: `b${k}`, name: 'b', dv_mps: 'none' }));
    });
    const mine = compileFileSchema(planSchema);
    const ref = plainAjv(planSchema);
    mine(d);
    ref(d);
    expect((mine.errors ?? []).length).toBeGreaterThanOrEqual(200); // at least one per broken event
    expect((mine.errors ?? []).length).toBe((ref.errors ?? []).length);
    expect(keys(mine.errors)).toEqual(keys(ref.errors));
  });
});

describe('inlineLocalRefs', () => {
  it('replaces every local reference in the file schemas (none of them recursive) and keeps $defs', () => {
    for (const s of [planSchema, systemSchema]) {
      const text = JSON.stringify({ ...inlineLocalRefs(s), $defs: undefined });
      expect(text).not.toContain('"$ref"');
      expect(inlineLocalRefs(s).$defs).toEqual(s.$defs);
    }
  });

  it('keeps asserting keywords beside a reference (joined through allOf), drops annotations, leaves recursion as a reference', () => {
    const schema = {
      $schema: 'https://json-schema.org/draft/2020-12/schema',
      $defs: {
        small: { type: 'number', maximum: 10 },
        tree: { type: 'object', properties: { value: { $ref: '#/$defs/small' }, kids: { type: 'array', items: { $ref: '#/$defs/tree' } } } },
      },
      type: 'object',
      properties: {
        a: { $ref: '#/$defs/small', description: 'annotation only' },
        b: { $ref: '#/$defs/small', type: 'number', minimum: 5 },
        t: { $ref: '#/$defs/tree' },
      },
    };
    const inl = inlineLocalRefs(schema) as any;
    expect(inl.properties.a).toEqual({ type: 'number', maximum: 10 });
    expect(inl.properties.b).toEqual({ type: 'number', minimum: 5, allOf: [{ type: 'number', maximum: 10 }] });
    expect(inl.properties.t.properties.kids.items).toEqual({ $ref: '#/$defs/tree' });
    same(schema, [
      { a: 3, b: 7, t: { value: 1, kids: [{ value: 2, kids: [] }] } },
      { a: 30, b: 2, t: { value: 11, kids: [{ value: 'x', kids: [{ value: 99 }] }] } },
      { b: 12 },
    ]);
  });
});
