/**
 * The file formats are declared once (zod, core/io/planFileShape.ts and
 * core/system/systemFileShape.ts): the committed JSON Schemas must be exactly what those
 * declarations emit, and every field a schema declares must be written by the serialisers and
 * read back, so the converters between the file documents and the in-memory models cannot drop
 * a field the declaration gained.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fileJsonSchemaText } from '../../../core/io/fileJsonSchema.ts';
import { parsePlanFile, serializePlanFile, type PlanSystemRef } from '../../../core/io/planFile.ts';
import { parseSystemFile, serializeSystemFile } from '../../../core/io/systemFile.ts';
import { resolveBurns } from '../../../core/io/resolvedBurns.ts';
import type { Plan } from '../../../core/plan/plan.ts';
import { FILE_SCHEMAS, SCHEMA_DIR } from './fileSchemas.ts';
import { samplePlan, stateStartPlan } from './planSamples.ts';

type Json = Record<string, unknown>;
const isObject = (x: unknown): x is Json => typeof x === 'object' && x !== null && !Array.isArray(x);
const schemaOf = (file: string): Json => JSON.parse(readFileSync(new URL(file, SCHEMA_DIR), 'utf8')) as Json;

/** Pointers of every property a schema declares ("#/$defs/stage/properties/dry_kg"), not inside an `if`. */
function declared(node: unknown, at: string, out: string[] = []): string[] {
  if (Array.isArray(node)) node.forEach((x, k) => declared(x, `${at}/${k}`, out));
  else if (isObject(node)) {
    for (const [k, v] of Object.entries(node)) {
      if (k === 'if') continue;
      if (k === 'properties' && isObject(v)) {
        for (const [name, s] of Object.entries(v)) {
          out.push(`${at}/properties/${name}`);
          declared(s, `${at}/properties/${name}`, out);
        }
      } else declared(v, `${at}/${k}`, out);
    }
  }
  return out;
}

/**
 * Marks the property pointers a document uses, following `$ref`, the if/then switches (by the
 * tag's `const`, or `"type": "object"` for a nullable object) and array items.
 */
function used(root: Json, node: Json, at: string, value: unknown, out: Set<string>): void {
  if (typeof node.$ref === 'string') {
    const ref = node.$ref;
    used(root, (root.$defs as Json)[ref.slice('#/$defs/'.length)] as Json, ref, value, out);
    return;
  }
  if (isObject(node.if) && isObject(node.then) && isObject(value)) used(root, node.then, `${at}/then`, value, out);
  if (Array.isArray(node.allOf)) {
    (node.allOf as Json[]).forEach((branch, k) => {
      const test = (branch.if as Json | undefined)?.properties as Record<string, Json> | undefined;
      if (test && isObject(value) && Object.entries(test).every(([tag, c]) => value[tag] === c.const)) {
        used(root, branch.then as Json, `${at}/allOf/${k}/then`, value, out);
      }
    });
  }
  if (isObject(node.properties) && isObject(value)) {
    for (const [name, v] of Object.entries(value)) {
      const s = (node.properties as Record<string, Json>)[name];
      if (!s) continue;
      out.add(`${at}/properties/${name}`);
      used(root, s, `${at}/properties/${name}`, v, out);
    }
  }
  if (isObject(node.items) && Array.isArray(value)) for (const v of value) used(root, node.items, `${at}/items`, v, out);
}

function unusedProperties(file: string, documents: readonly unknown[], exempt: readonly string[]): string[] {
  const schema = schemaOf(file);
  const seen = new Set<string>();
  for (const d of documents) used(schema, schema, '#', d, seen);
  return declared(schema, '#').filter((p) => !seen.has(p) && !exempt.includes(p));
}

describe('committed JSON Schemas', () => {
  for (const { file, shape } of FILE_SCHEMAS) {
    it(`assets/schema/${file} is exactly what its zod declaration emits (regenerate: npm run schema:emit)`, () => {
      expect(readFileSync(new URL(file, SCHEMA_DIR), 'utf8')).toBe(fileJsonSchemaText(shape));
    });
  }
});

describe('every declared field is written and read back', () => {
  const system = parseSystemFile(readFileSync(new URL('../../../assets/systems/ilmar.system.json', import.meta.url), 'utf8')).system;

  it('plan file: the sample plans (both starts, every event kind, both system forms) cover the schema and round-trip', () => {
    // The optional fields the samples leave out.
    const extra = samplePlan();
    extra.events = extra.events.map((ev) => {
      if (ev.type === 'burn' && ev.solve.kind === 'transfer') return { ...ev, solve: { ...ev.solve, retrograde: true } };
      if (ev.type === 'coast' && ev.until.kind === 'apoapsis') return { ...ev, until: { kind: 'apoapsis', body: 'ochre' } };
      return ev;
    });
    extra.truthModel = 'nbody';
    const cases: [Plan, PlanSystemRef][] = [
      [samplePlan(), { kind: 'path', path: '../systems/ilmar.system.json' }],
      [stateStartPlan(), { kind: 'embedded', system }],
      [extra, { kind: 'path', path: 'x.system.json' }],
    ];
    // The first is written with its burns' derived `resolved` blocks, as a save writes them.
    const texts = cases.map(([plan, ref], k) => serializePlanFile(plan, ref, k === 0 ? resolveBurns(system, plan) : undefined));
    texts.forEach((text, k) => {
      const back = parsePlanFile(text);
      expect(back.plan).toEqual(cases[k][0]);
      expect(serializePlanFile(back.plan, back.system, back.resolved)).toBe(text);
    });
    expect(texts[0]).toContain('"resolved"');
    // "$schema" is read and not written back; the embedded system has its own schema (below).
    expect(
      unusedProperties(
        'plan.schema.json',
        texts.map((t) => JSON.parse(t)),
        ['#/properties/$schema'],
      ),
    ).toEqual([]);
  });

  it('system file: the demo system and a variant (masses instead of mu, an explicit calendar) cover the schema and round-trip', () => {
    const demo = serializeSystemFile(system);
    const variant = JSON.parse(demo) as Json & { star: Json; bodies: Json[]; calendar: Json };
    variant.star.mass_kg = (variant.star.mu_m3_s2 as number) / 6.6743e-11;
    delete variant.star.mu_m3_s2;
    variant.bodies[0].mass_kg = (variant.bodies[0].mu_m3_s2 as number) / 6.6743e-11;
    delete variant.bodies[0].mu_m3_s2;
    variant.calendar = { year_s: 3.1e7, day_s: 90000, year_at_epoch: 412, era: 'TR' };
    const variantText = serializeSystemFile(parseSystemFile(JSON.stringify(variant)).system);
    for (const text of [demo, variantText]) expect(serializeSystemFile(parseSystemFile(text).system)).toBe(text);
    expect(JSON.parse(variantText).star.mass_kg).toBeDefined();
    expect(
      unusedProperties(
        'system.schema.json',
        [demo, variantText].map((t) => JSON.parse(t)),
        ['#/properties/$schema'],
      ),
    ).toEqual([]);
  });

  it('the coverage walk notices a field no written file uses', () => {
    // Without the variant, "mass_kg" (star and bodies) and the explicit calendar are never written.
    const demo = JSON.parse(serializeSystemFile(system));
    expect(unusedProperties('system.schema.json', [demo], ['#/properties/$schema'])).toEqual([
      '#/properties/calendar/properties/year_s',
      '#/properties/calendar/properties/day_s',
      '#/properties/star/properties/mass_kg',
      '#/$defs/body/properties/mass_kg',
    ]);
  });
});
