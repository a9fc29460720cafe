/**
 * The JSON Schema of a file format, emitted from its zod declaration (planFileShape.ts,
 * core/system/systemFileShape.ts) with zod's own converter (`z.toJSONSchema`, draft 2020-12, the
 * input side: optional fields are not required) and these rewrites, chosen so ajv reports one
 * plain error per broken field (the wording is in systemFile.ts `schemaIssues` and planFile.ts
 * `planSchemaIssues`):
 * - a tagged union (`z.discriminatedUnion`) becomes `required` + `enum` of the tag and an
 *   `allOf` of if/then switches, one per tag value: a bad tag gives one "must be one of" error,
 *   a good tag only the errors of its own branch (a plain `oneOf` reports every branch);
 * - a nullable value becomes `"type": [T, "null"]` (with an if/then when T is a `$ref`), so a
 *   wrong value gives one "must be T or null" error instead of an `anyOf` and its branches;
 * - a `const` or `enum` carries no `type` (the allowed values say it; one error, not two);
 * - a tuple of equal items becomes `items` + `minItems` = `maxItems` ("must have exactly 3 items");
 * - a record of unknown values is just `"type": "object"`;
 * - keys are put in a fixed reading order (description first, `$defs` last).
 * JSON Schema keywords zod has no method for (`oneOf` of `required` lists, `not`) and the
 * `x-rule` annotations are written in `.meta()` and copied through as they are.
 *
 * Imported only by the schema writer and its test (test/core/io/fileSchemas.ts): zod is a
 * development dependency and never loaded at run time.
 */
import * as z from 'zod';

type Json = Record<string, unknown>;

/** The JSON Schema of a zod file declaration, as a plain object. */
export function fileJsonSchema(shape: z.ZodType): Json {
  const raw = z.toJSONSchema(shape, { target: 'draft-2020-12', io: 'input', override: rewrite }) as Json;
  return ordered(raw) as Json;
}

/** The text of the schema file: 2-space indent, trailing newline. */
export function fileJsonSchemaText(shape: z.ZodType): string {
  return `${JSON.stringify(fileJsonSchema(shape), null, 2)}\n`;
}

/** JSON type of a zod schema kind, for a nullable `$ref`. */
const JSON_TYPE: Record<string, string> = { object: 'object', number: 'number', string: 'string', boolean: 'boolean', array: 'array' };

function replace(target: Json, next: Json): void {
  for (const k of Object.keys(target)) delete target[k];
  Object.assign(target, next);
}

function rewrite(ctx: { zodSchema: z.core.$ZodTypes; jsonSchema: z.core.JSONSchema.BaseSchema }): void {
  const js = ctx.jsonSchema as Json;
  const def = ctx.zodSchema._zod.def;
  // A schema that only annotates a named one (`.meta()` on it) is a `$ref` to it plus its own
  // annotations. zod also leaves there the parent's union (`oneOf`) once the parent is rewritten:
  // drop it. Anything else would be a constraint added to a named schema, which needs a name of
  // its own.
  if (typeof js.$ref === 'string') {
    if (def.type === 'union') delete js.oneOf;
    const extra = Object.keys(js).filter((k) => k !== '$ref' && k !== 'description' && !k.startsWith('x-'));
    if (extra.length > 0) throw new Error(`a refinement of ${js.$ref} adds ${extra.join(', ')}: give it its own name`);
    return;
  }
  if (def.type === 'union' && 'discriminator' in def && typeof def.discriminator === 'string') {
    const tag = def.discriminator;
    const branches = js.oneOf as Json[];
    const values = def.options.map((o) => {
      const v = [...(o._zod.propValues?.[tag] ?? [])];
      if (v.length !== 1) throw new Error(`each branch of the union on "${tag}" needs exactly one tag value`);
      return v[0];
    });
    const { oneOf: _, ...meta } = js;
    replace(js, {
      ...meta,
      type: 'object',
      required: [tag],
      properties: { [tag]: { enum: values } },
      allOf: branches.map((then, k) => ({ if: { properties: { [tag]: { const: values[k] } } }, then })),
    });
  } else if (def.type === 'nullable') {
    const [inner, nul] = js.anyOf as Json[];
    if (nul?.type !== 'null') throw new Error('unexpected nullable form');
    const { anyOf: _, ...meta } = js;
    if (typeof inner.$ref === 'string') {
      const t = JSON_TYPE[(def.innerType as z.core.$ZodTypes)._zod.def.type];
      if (!t) throw new Error(`nullable reference to a ${(def.innerType as z.core.$ZodTypes)._zod.def.type}`);
      // biome-ignore lint/suspicious/noThenProperty: `then` is the JSON Schema keyword (if/then, draft 2020-12), not a thenable
      replace(js, { ...meta, type: [t, 'null'], if: { type: t }, then: inner });
    } else if (typeof inner.type === 'string') {
      replace(js, { ...inner, ...meta, type: [inner.type, 'null'] });
    } else throw new Error('nullable of a schema without a single type');
  } else if ('const' in js || 'enum' in js) {
    delete js.type;
  } else if (Array.isArray(js.prefixItems) && js.items === false) {
    const items = js.prefixItems as Json[];
    if (items.every((x) => JSON.stringify(x) === JSON.stringify(items[0]))) {
      delete js.prefixItems;
      js.items = items[0];
    }
  } else if (def.type === 'record') {
    delete js.propertyNames;
    if (JSON.stringify(js.additionalProperties) === '{}') delete js.additionalProperties;
  }
}

/** Reading order of a schema's keys; any other key goes just before `$defs`. */
const KEY_ORDER = [
  '$schema',
  '$id',
  'title',
  'description',
  '$ref',
  'type',
  'additionalProperties',
  'required',
  'const',
  'enum',
  'pattern',
  'minLength',
  'minimum',
  'exclusiveMinimum',
  'maximum',
  'exclusiveMaximum',
  'not',
  'items',
  'minItems',
  'maxItems',
  'properties',
  'if',
  'then',
  'allOf',
  'oneOf',
  'x-rule',
  'x-rule-oneOf',
  '$defs',
];

/** A schema with its keys in KEY_ORDER, recursively (maps of schemas keep their own order). */
function ordered(node: unknown): unknown {
  if (Array.isArray(node)) return node.map(ordered);
  if (!node || typeof node !== 'object') return node;
  const src = node as Json;
  const keys = Object.keys(src).sort((a, b) => rank(a) - rank(b));
  const out: Json = {};
  for (const k of keys) {
    const v = src[k];
    if ((k === 'properties' || k === '$defs') && v && typeof v === 'object') {
      out[k] = Object.fromEntries(Object.entries(v as Json).map(([name, s]) => [name, ordered(s)]));
    } else if (k === 'required' || k === 'enum' || k === 'const') out[k] = v;
    else out[k] = ordered(v);
  }
  return out;
}

function rank(key: string): number {
  const k = KEY_ORDER.indexOf(key);
  return k < 0 ? KEY_ORDER.length - 1.5 : k; // unknown keys just before $defs
}
