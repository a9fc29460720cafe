/**
 * Vite plugin: replaces ajv's run-time schema compiler with validators generated at build time.
 *
 * Why: ajv compiles a schema into JavaScript with `new Function`, which the renderer's
 * Content-Security-Policy (script-src 'self', no 'unsafe-eval') forbids. The core's file
 * parsers call `new Ajv2020(options).compile(schema)` at import time; in the renderer bundle,
 * `ajv/dist/2020.js` resolves to a small module whose `compile` returns the validator that
 * ajv's standalone code generator (ajv.js.org, "Standalone validation code") produced for the
 * schema with the same `$id`, from every schema in assets/schema/. The generated validators are
 * compiled with allErrors and verbose on (the options the core's parsers use) from the schemas
 * with their local references inlined (core/io `inlineLocalRefs`, as the core's parsers compile
 * them: validation stays linear in the file), so their `errors` arrays carry the same objects
 * (keyword, instancePath, schemaPath, params, parentSchema).
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { createRequire } from 'node:module';
import type { Plugin } from 'vite';
import { inlineLocalRefs } from '../../../core/io/index.ts';

const VIRTUAL = '\0waymark-ajv-standalone';

/** Annotation keywords ("x-…") used anywhere in a schema. */
function annotationKeywords(node: unknown, out: Set<string>): Set<string> {
  if (Array.isArray(node)) for (const x of node) annotationKeywords(x, out);
  else if (node && typeof node === 'object') {
    for (const [k, v] of Object.entries(node)) {
      if (k.startsWith('x-')) out.add(k);
      annotationKeywords(v, out);
    }
  }
  return out;
}

/** Generates the ESM source of the replacement module for the schemas in `schemaDir`. */
export function standaloneModuleSource(schemaDir: string): string {
  const require = createRequire(import.meta.url);
  const { Ajv2020 } = require('ajv/dist/2020.js') as typeof import('ajv/dist/2020.js');
  const standaloneCode = (require('ajv/dist/standalone/index.js') as { default: (ajv: unknown, refs: Record<string, string>) => string }).default;
  const schemas = readdirSync(schemaDir)
    .filter((f) => f.endsWith('.schema.json'))
    .sort()
    .map((f) => inlineLocalRefs(JSON.parse(readFileSync(join(schemaDir, f), 'utf8')) as { $id?: string }));
  const ajv = new Ajv2020({ allErrors: true, verbose: true, strict: false, code: { source: true, esm: true } });
  const keywords = new Set<string>();
  for (const s of schemas) annotationKeywords(s, keywords);
  for (const k of keywords) ajv.addKeyword({ keyword: k, schemaType: ['string', 'number', 'boolean', 'object', 'array'] });
  const refs: Record<string, string> = {};
  const ids: string[] = [];
  schemas.forEach((s, i) => {
    if (!s.$id) throw new Error(`schema ${i} in ${schemaDir} has no $id`);
    ajv.addSchema(s);
    refs[`v${i}`] = s.$id;
    ids.push(s.$id);
  });
  // The generator emits require() for ajv's run-time helpers even in ESM mode; turn them into imports.
  const requires = new Map<string, string>();
  const body = standaloneCode(ajv, refs).replace(/require\((["'])([^"']+)\1\)/g, (_m, _q, mod: string) => {
    if (!requires.has(mod)) requires.set(mod, `__ajvRuntime${requires.size}`);
    return requires.get(mod)!;
  });
  const imports = [...requires].map(([mod, local]) => `import * as ${local} from ${JSON.stringify(mod)};`).join('\n');
  const code = `${imports}\n${body}`;
  const table = ids.map((id, i) => `  ${JSON.stringify(id)}: v${i},`).join('\n');
  return `${code}
const byId = {
${table}
};
function wrap(fn) {
  const v = (data) => { const ok = fn(data); v.errors = fn.errors ?? null; return ok; };
  v.errors = null;
  return v;
}
export class Ajv2020 {
  constructor(_options) {}
  addKeyword(_definition) { return this; }
  addSchema(_schema) { return this; }
  compile(schema) {
    const fn = byId[schema && schema.$id];
    if (!fn) throw new Error('no build-time validator for schema ' + (schema && schema.$id));
    return wrap(fn);
  }
}
export default Ajv2020;
`;
}

export function ajvStandalone(schemaDir: string): Plugin {
  return {
    name: 'waymark-ajv-standalone',
    enforce: 'pre',
    resolveId(source) {
      if (source === 'ajv/dist/2020.js' || source === 'ajv/dist/2020') return VIRTUAL;
      return null;
    },
    load(id) {
      if (id === VIRTUAL) return standaloneModuleSource(schemaDir);
      return null;
    },
  };
}
