/**
 * System files: text ↔ `StarSystem`.
 *
 * Loading (`parseSystemFile`) runs, in order, stopping at the first stage with errors:
 *  1. JSON syntax, top level must be an object nested at most MAX_JSON_DEPTH levels deep;
 *  2. `format` must be "waymark-system"; `version` must be an integer no newer than
 *     SYSTEM_VERSION; older versions pass through the migration table one step at a time;
 *     at most MAX_BODIES bodies (core/system/limits.ts);
 *  3. JSON Schema (assets/schema/system.schema.json, emitted from the declaration in
 *     core/system/systemFileShape.ts; draft 2020-12, ajv with allErrors, compiled by
 *     fileValidator.ts so the work stays linear in the file): every schema violation is
 *     reported together;
 *  4. semantic checks (core/system/validate.ts): references, masses, geometry; errors and
 *     warnings are reported together;
 *  5. building the model (radians, derived quantities, ephemeris tables).
 * Any failure throws one `ValidationError('system file', issues)` carrying the issues of that
 * stage (with the warnings found so far), paths written like `bodies[3].orbit.e`: the first
 * MAX_LISTED_ISSUES of them, then one counting the rest (core/math/errors.ts).
 * Semantic checks need a schema-valid document, so a file with schema errors reports only
 * those; fix them and the semantic issues (if any) show next.
 *
 * Migrations: `SYSTEM_MIGRATIONS[v]` turns a version-v document into version v + 1. Version 1
 * is the first and current format, so the shipped table is empty; the mechanism is exercised
 * in the tests with a synthetic table passed through `ParseOptions.migrations`.
 *
 * Saving (`serializeSystemFile`): keys in schema order, 2-space indent, trailing newline;
 * numbers of magnitude ≥ 1e6 or < 1e-3 in exponent form ("1.1e11"), with the fewest digits
 * that read back to the same double; angles rounded to 12 significant digits in degrees.
 */

import { migrateDocument, type Migration } from './migrate.ts';
import type { ErrorObject } from 'ajv/dist/2020.js';
import schema from '../../assets/schema/system.schema.json' with { type: 'json' };
import { ValidationError, type ValidationIssue } from '../math/index.ts';
import { MAX_BODIES, overLimitRule } from '../system/index.ts';
import { buildStarSystem, systemToDocument } from '../system/index.ts';
import { compileFileSchema } from './fileValidator.ts';
import { SYSTEM_FORMAT, SYSTEM_VERSION, type SystemDocument } from '../system/index.ts';
import type { StarSystem } from '../system/index.ts';
import { checkSystemDocument } from '../system/index.ts';

const WHAT = 'system file';

export type SystemMigration = Migration;

/** Migration from version v (the key) to v + 1. Empty: version 1 is the first format. */
export const SYSTEM_MIGRATIONS: Readonly<Record<number, SystemMigration>> = {};

export interface ParseOptions {
  /** Migration table to use instead of SYSTEM_MIGRATIONS (tests). */
  migrations?: Readonly<Record<number, SystemMigration>>;
}

export interface ParsedSystem {
  system: StarSystem;
  /** Issues of severity 'warning'; the system loaded regardless. */
  warnings: ValidationIssue[];
  /** Version the file was written in (before migration). */
  fileVersion: number;
}

const validateSchema = compileFileSchema(schema);

function fail(issues: ValidationIssue[]): never {
  throw new ValidationError(WHAT, issues);
}

function err(path: string, rule: string): ValidationIssue {
  return { path, rule, severity: 'error' };
}

function isObject(x: unknown): x is Record<string, unknown> {
  return typeof x === 'object' && x !== null && !Array.isArray(x);
}

/** Reads a system file; throws ValidationError listing every problem of the failing stage. */
export function parseSystemFile(text: string, options: ParseOptions = {}): ParsedSystem {
  if (typeof text !== 'string') fail([err('', 'must be text')]);
  let raw: unknown;
  try {
    // A leading byte-order mark (as some Windows editors save) is not part of the JSON text.
    raw = JSON.parse(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
  } catch (e) {
    fail([err('', `is not valid JSON (${(e as Error).message})`)]);
  }
  if (!isObject(raw)) fail([err('', 'must be a JSON object')]);
  const deep = nestingIssue(raw);
  if (deep) fail([deep]);

  if (!('format' in raw)) fail([err('format', `is required (must be "${SYSTEM_FORMAT}")`)]);
  if (raw.format !== SYSTEM_FORMAT) {
    fail([err('format', `must be "${SYSTEM_FORMAT}" (got ${JSON.stringify(raw.format)}); this is not a system file`)]);
  }
  const { doc, fileVersion } = migrate(raw, options.migrations ?? SYSTEM_MIGRATIONS);
  const size = sizeIssue(doc);
  if (size) fail([size]);

  if (!validateSchema(doc)) fail(schemaIssues(validateSchema.errors ?? []));
  const sysDoc = doc as unknown as SystemDocument;
  const issues = checkSystemDocument(sysDoc);
  if (issues.some((i) => i.severity === 'error')) {
    fail([...issues.filter((i) => i.severity === 'error'), ...issues.filter((i) => i.severity === 'warning')]);
  }
  return { system: buildStarSystem(sysDoc), warnings: issues, fileVersion };
}

/** More bodies than MAX_BODIES (core/system/limits.ts): refused before the schema walks them. */
function sizeIssue(doc: Record<string, unknown>): ValidationIssue | null {
  const bodies = doc.bodies;
  if (Array.isArray(bodies) && bodies.length > MAX_BODIES) return err('bodies', overLimitRule(bodies.length, MAX_BODIES, 'bodies'));
  return null;
}

/**
 * Deepest nesting of arrays and objects a system or plan file may have. The formats need about
 * six levels (a plan embedding a system: system.embedded.bodies[k].orbit.a_m); a deeper file is
 * refused before anything walks it recursively (JSON.stringify, messages quoting a value), which
 * on a file of 10⁵ nested arrays would overflow the stack.
 */
export const MAX_JSON_DEPTH = 64;

interface NestingStep {
  key: string | number;
  up: NestingStep | null;
}

/** An issue naming the first value nested deeper than MAX_JSON_DEPTH, or null. Iterative. */
export function nestingIssue(raw: unknown): ValidationIssue | null {
  const stack: { v: unknown; at: NestingStep | null; depth: number }[] = [{ v: raw, at: null, depth: 0 }];
  while (stack.length > 0) {
    const { v, at, depth } = stack.pop()!;
    if (typeof v !== 'object' || v === null) continue;
    if (depth >= MAX_JSON_DEPTH) {
      const keys: (string | number)[] = [];
      for (let s = at; s; s = s.up) keys.unshift(s.key);
      const path = keys.reduce<string>((p, k) => (typeof k === 'number' ? `${p}[${k}]` : join(p, k)), '');
      return err(path, `is nested too deeply (more than ${MAX_JSON_DEPTH} levels of arrays and objects)`);
    }
    if (Array.isArray(v)) v.forEach((x, i) => stack.push({ v: x, at: { key: i, up: at }, depth: depth + 1 }));
    else for (const [k, x] of Object.entries(v)) stack.push({ v: x, at: { key: k, up: at }, depth: depth + 1 });
  }
  return null;
}

/** Brings a document of any supported version to SYSTEM_VERSION. */
export function migrate(
  raw: Record<string, unknown>,
  table: Readonly<Record<number, SystemMigration>> = SYSTEM_MIGRATIONS,
): { doc: Record<string, unknown>; fileVersion: number } {
  return migrateDocument(WHAT, raw, SYSTEM_VERSION, table);
}

/** "/bodies/3/orbit/e" → "bodies[3].orbit.e". */
export function pointerToPath(pointer: string): string {
  if (pointer === '') return '';
  let out = '';
  for (const part of pointer.slice(1).split('/')) {
    const key = part.replace(/~1/g, '/').replace(/~0/g, '~');
    if (/^\d+$/.test(key)) out += `[${key}]`;
    else out += out === '' ? key : `.${key}`;
  }
  return out;
}

function join(path: string, key: string): string {
  return path === '' ? key : `${path}.${key}`;
}

const TYPE_WORD: Record<string, string> = {
  number: 'a number',
  integer: 'an integer',
  string: 'a string',
  object: 'an object',
  array: 'an array',
  boolean: 'true or false',
};

/**
 * Plain-language issues from ajv errors, in their order, each (path, rule) once. Linear in the
 * number of errors: the oneOf failures are looked up by instance path.
 */
export function schemaIssues(errors: readonly ErrorObject[]): ValidationIssue[] {
  // oneOf failures get one plain rule; drop the errors of their branches.
  const oneOfAt = new Map<string, string[]>();
  for (const e of errors) {
    if (e.keyword !== 'oneOf') continue;
    const list = oneOfAt.get(e.instancePath);
    if (list) list.push(`${e.schemaPath}/`);
    else oneOfAt.set(e.instancePath, [`${e.schemaPath}/`]);
  }
  const out: ValidationIssue[] = [];
  const seen = new Set<string>();
  for (const e of errors) {
    const branchOf = oneOfAt.get(e.instancePath);
    if (branchOf?.some((prefix) => e.schemaPath.startsWith(prefix))) continue;
    const path = pointerToPath(e.instancePath);
    const p = e.params as Record<string, unknown>;
    const parent = (e.parentSchema ?? {}) as Record<string, unknown>;
    let issue: ValidationIssue;
    switch (e.keyword) {
      case 'required':
        issue = err(join(path, String(p.missingProperty)), 'is required');
        break;
      case 'additionalProperties':
        issue = err(path, `unknown field "${String(p.additionalProperty)}"`);
        break;
      case 'const':
        issue = err(path, `must be ${JSON.stringify(p.allowedValue)}`);
        break;
      case 'enum':
        issue = err(path, `must be one of: ${(p.allowedValues as unknown[]).map((x) => JSON.stringify(x)).join(', ')}`);
        break;
      case 'type':
        issue = err(path, tooLarge(e) ?? `must be ${TYPE_WORD[String(p.type)] ?? String(p.type)}`);
        break;
      case 'minimum':
      case 'maximum':
      case 'exclusiveMinimum':
      case 'exclusiveMaximum':
        issue = err(path, `must be ${String(p.comparison)} ${typeof p.limit === 'number' ? writeNumber(p.limit) : String(p.limit)}`);
        break;
      case 'minLength':
        issue = err(path, p.limit === 1 ? 'must not be empty' : `must be at least ${String(p.limit)} characters long`);
        break;
      case 'pattern':
        issue = err(path, typeof parent['x-rule'] === 'string' ? parent['x-rule'] : `must match ${String(p.pattern)}`);
        break;
      case 'not':
        issue = err(path, typeof parent['x-rule'] === 'string' ? parent['x-rule'] : 'is not allowed');
        break;
      case 'oneOf':
        issue = err(path, typeof parent['x-rule-oneOf'] === 'string' ? parent['x-rule-oneOf'] : 'must match exactly one of the allowed forms');
        break;
      default:
        issue = err(path, e.message ?? `breaks the schema rule "${e.keyword}"`);
    }
    const key = `${issue.path}\u0000${issue.rule}`;
    if (!seen.has(key)) {
      seen.add(key);
      out.push(issue);
    }
  }
  return out;
}

/**
 * The rule for a number JSON read as ±Infinity (a literal like 1e999, beyond the largest double,
 * about 1.8e308): "too large", not "must be a number"; null for any other value.
 */
export function tooLarge(e: ErrorObject): string | null {
  const x = e.data;
  if (typeof x !== 'number' || Number.isFinite(x) || Number.isNaN(x)) return null;
  return `is too large: ${x > 0 ? '' : '-'}1.8e308 is the largest magnitude a number can have (it was read as ${x > 0 ? '' : '-'}infinity)`;
}

/** The file text of a system: stable key order, 2-space indent, trailing newline. */
export function serializeSystemFile(system: StarSystem): string {
  return `${writeJson(systemToDocument(system), '')}\n`;
}

function writeNumber(x: number): string {
  if (!Number.isFinite(x)) throw new ValidationError(WHAT, [err('', `cannot write the non-finite number ${x}`)]);
  const a = Math.abs(x);
  if (x !== 0 && (a >= 1e6 || a < 1e-3)) return x.toExponential().replace('e+', 'e');
  return String(x);
}

function writeJson(v: unknown, indent: string): string {
  if (typeof v === 'number') return writeNumber(v);
  if (typeof v === 'string' || typeof v === 'boolean' || v === null) return JSON.stringify(v);
  const inner = `${indent}  `;
  if (Array.isArray(v)) {
    if (v.length === 0) return '[]';
    return `[\n${v.map((x) => inner + writeJson(x, inner)).join(',\n')}\n${indent}]`;
  }
  const entries = Object.entries(v as Record<string, unknown>).filter(([, x]) => x !== undefined);
  if (entries.length === 0) return '{}';
  return `{\n${entries.map(([k, x]) => `${inner}${JSON.stringify(k)}: ${writeJson(x, inner)}`).join(',\n')}\n${indent}}`;
}
