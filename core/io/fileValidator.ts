/**
 * The JSON Schema validator of a file format: ajv (draft 2020-12) reporting every violation
 * (allErrors, verbose: the wording of systemFile.ts `schemaIssues` reads each error's schema),
 * compiled from the schema with its local references inlined.
 *
 * Why inline: ajv compiles each `$ref`'d definition into a function of its own and, when it
 * fails, joins that function's errors to the ones found so far with `vErrors.concat(...)` —
 * a copy of every earlier error for each failing array item. A file whose ten thousand events
 * each break a rule took 75 s (43 KB) to validate that way: quadratic. With the definitions
 * inlined the validator is one function whose errors are pushed onto one array: linear.
 * The error objects are the same (keyword, instance path, params, the schema they break and its
 * x-rule annotations); only `schemaPath` reads through the inlined copy
 * (`#/properties/events/items/…` instead of `#/$defs/event/…`).
 *
 * The renderer cannot compile at run time (its CSP forbids eval): its build swaps the ajv
 * import for validators generated from the same inlined schemas
 * (app/renderer/build/ajvStandalone.ts calls `inlineLocalRefs` too), so both paths validate
 * alike.
 */
import { Ajv2020, type ErrorObject } from 'ajv/dist/2020.js';

type Json = Record<string, unknown>;

/** Keywords a `$ref` may carry beside it that assert nothing (dropped with the reference). */
const annotation = (k: string): boolean => k === 'description' || k === 'title' || k === '$comment' || k.startsWith('x-');

/**
 * A copy of `schema` with every `{"$ref": "#/$defs/NAME"}` replaced by a copy of that definition
 * (itself inlined). A reference that would recurse into the definition being expanded is left
 * as it is (the `$defs` are kept, so it still resolves). Beside-the-reference keywords that
 * assert something are kept, with the definition joined to them through `allOf`.
 */
export function inlineLocalRefs<T extends object>(schema: T): T {
  const root = schema as Json;
  const defs = (root.$defs && typeof root.$defs === 'object' ? root.$defs : {}) as Json;
  const expanding = new Set<string>();
  const walk = (node: unknown, atRoot: boolean): unknown => {
    if (Array.isArray(node)) return node.map((x) => walk(x, false));
    if (!node || typeof node !== 'object') return node;
    const n = node as Json;
    if (typeof n.$ref === 'string' && n.$ref.startsWith('#/$defs/')) {
      const name = n.$ref.slice('#/$defs/'.length).replace(/~1/g, '/').replace(/~0/g, '~');
      if (Object.hasOwn(defs, name) && !expanding.has(name)) {
        expanding.add(name);
        const body = walk(defs[name], false) as Json;
        expanding.delete(name);
        const rest = Object.keys(n).filter((k) => k !== '$ref');
        if (rest.every(annotation)) return body;
        const out: Json = {};
        for (const k of rest) out[k] = walk(n[k], false);
        out.allOf = [...((out.allOf as unknown[] | undefined) ?? []), body];
        return out;
      }
    }
    const out: Json = {};
    for (const [k, v] of Object.entries(n)) out[k] = atRoot && k === '$defs' ? v : walk(v, false);
    return out;
  };
  return walk(schema, true) as T;
}

export interface FileSchemaValidator {
  (data: unknown): boolean;
  errors?: ErrorObject[] | null;
}

/** The validator of a file schema (see the module comment). */
export function compileFileSchema(schema: object): FileSchemaValidator {
  // strictRequired off: the oneOf branches name properties declared in the enclosing schema.
  const ajv = new Ajv2020({ allErrors: true, verbose: true, strict: true, strictRequired: false, allowUnionTypes: true });
  // Annotation keywords carrying the plain-language rule for pattern / not / oneOf failures.
  ajv.addKeyword({ keyword: 'x-rule', schemaType: 'string' });
  ajv.addKeyword({ keyword: 'x-rule-oneOf', schemaType: 'string' });
  return ajv.compile(inlineLocalRefs(schema));
}
