/**
 * Plan files: text ↔ `Plan` (core/plan/plan.ts).
 *
 * Loading (`parsePlanFile`) runs, in order (the first two stop at their first problem; the
 * last three report together):
 *  1. JSON syntax, top level must be an object nested at most MAX_JSON_DEPTH levels deep
 *     (systemFile.ts);
 *  2. `format` must be "waymark-plan"; `version` an integer no newer than PLAN_VERSION; older
 *     versions pass through the migration table one step at a time;
 *     at most MAX_EVENTS events and MAX_STAGES stages (core/system/limits.ts);
 *  3. JSON Schema (assets/schema/plan.schema.json, emitted from the declaration in
 *     planFileShape.ts; draft 2020-12, ajv with allErrors, compiled by fileValidator.ts so
 *     the work stays linear in the file);
 *  4. semantic checks of the document (planSchema.ts `checkPlanDocument`);
 *  5. an embedded system is loaded by the system-file rules (core/io/systemFile.ts; its issues
 *     come back with paths under `system.embedded.`) and the plan is checked against it
 *     (planSchema.ts `checkDocumentAgainstSystem`). A system named by `path` is read by the
 *     caller (the file layer, app/node/files.ts), which then runs `requirePlanFitsSystem`.
 * Stages 3 to 5 run together: the semantic checks and the system checks read the document
 * defensively and check whatever parts are well-formed, so a file with a bad mass, an unknown
 * body and a zero tolerance reports all three. A system named by `path` joins them when the
 * caller passes it (`PlanParseOptions.system`).
 * Any failure throws one `ValidationError('plan file', issues)` with every problem found
 * (errors first, then warnings) — the first MAX_LISTED_ISSUES, then one counting the rest
 * (core/math/errors.ts); paths use the file's field names: `events[2].dv_mps[0]`.
 *
 * Migrations: `PLAN_MIGRATIONS[v]` turns a version-v document into version v + 1. Version 1 is
 * the first format, so the shipped table is empty; the tests exercise the mechanism with a
 * synthetic table passed through `PlanParseOptions.migrations`.
 *
 * Saving (`serializePlanFile`): keys in schema order, 2-space indent, trailing newline, arrays
 * of numbers on one line; every field written (defaults included) except the optional
 * `revs`/`retrograde`/`periapsis_altitude_m` of a transfer, the `body` of an apsis coast and
 * the plan's `truth_model`, written only when set. Numbers are written with the
 * fewest digits that read back to the same double (exponent form for magnitudes ≥ 1e6 or
 * < 1e-3, as in system files). Angles: the degree value written is the shortest decimal whose
 * conversion (deg · π/180) gives back exactly the radian value in memory, so
 * open → save → open gives an equal Plan and save → open → save the same bytes. A radian
 * value that no double in degrees maps to exactly (not one read from a file) is written as
 * its nearest degree value and reads back within 1 ulp.
 *
 * Resolved burns: a burn's optional `resolved` block is derived data (resolvedBurns.ts). It is
 * written only when the caller passes the figures, read into `ParsedPlan.resolved` (never into
 * the Plan), and checked against the recomputed figures by the caller that has the system.
 */

import { migrateDocument, type Migration } from './migrate.ts';
import type { ErrorObject } from 'ajv/dist/2020.js';
import schema from '../../assets/schema/plan.schema.json' with { type: 'json' };
import { ValidationError, type ValidationIssue } from '../math/index.ts';
import { MAX_EVENTS, MAX_STAGES, overLimitRule } from '../system/index.ts';
import { compileFileSchema } from './fileValidator.ts';
import type { BurnEvent, BurnSolve, CoastUntil, Plan, PlanEvent, PlanStart, PlanTarget } from '../plan/index.ts';
import type { StarSystem } from '../system/index.ts';
import {
  PLAN_FORMAT,
  PLAN_VERSION,
  checkDocumentAgainstSystem,
  checkPlanDocument,
  type EventDocument,
  type PlanDocument,
  type SolveDocument,
  type TargetDocument,
  type UntilDocument,
} from './planSchema.ts';
import type { ResolvedBurn, ResolvedBurns } from './resolvedBurns.ts';
import type { ResolvedBurnDocument } from './planSchema.ts';
import { nestingIssue, parseSystemFile, pointerToPath, schemaIssues, serializeSystemFile, tooLarge } from './systemFile.ts';

export { PLAN_FORMAT, PLAN_VERSION, checkDocumentAgainstSystem, checkPlanDocument } from './planSchema.ts';

const WHAT = 'plan file';
const RAD_PER_DEG = Math.PI / 180;

/** Where a plan's system comes from: a system file named relative to the plan file, or embedded. */
export type PlanSystemRef = { kind: 'path'; path: string } | { kind: 'embedded'; system: StarSystem };

export type PlanMigration = Migration;

/** Migration from version v (the key) to v + 1. Empty: version 1 is the first format. */
export const PLAN_MIGRATIONS: Readonly<Record<number, PlanMigration>> = {};

export interface PlanParseOptions {
  /** Migration table to use instead of PLAN_MIGRATIONS (tests). */
  migrations?: Readonly<Record<number, PlanMigration>>;
  /**
   * The system a plan naming its system by `path` flies in, when the caller already has it: the
   * plan is then checked against it as an embedded one is (`checkPlanAgainstSystem`), and its
   * problems are reported with the file's own.
   */
  system?: StarSystem;
}

export interface ParsedPlan {
  plan: Plan;
  /** The system reference as written; an embedded system is already loaded and checked. */
  system: PlanSystemRef;
  /** Issues of severity 'warning' (plan and embedded system); the plan loaded regardless. */
  warnings: ValidationIssue[];
  /** Version the file was written in (before migration). */
  fileVersion: number;
  /**
   * The burns' `resolved` blocks as written, by event id: derived data, not part of the plan. The
   * caller that has the system checks them (resolvedBurns.ts staleResolvedIssues).
   */
  resolved: ResolvedBurns;
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

const errorsFirst = (issues: ValidationIssue[]): ValidationIssue[] => [
  ...issues.filter((i) => i.severity === 'error'),
  ...issues.filter((i) => i.severity === 'warning'),
];

/** Reads a plan file; throws ValidationError listing every problem found (see the module comment). */
export function parsePlanFile(text: string, options: PlanParseOptions = {}): ParsedPlan {
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
  if (!('format' in raw)) fail([err('format', `is required (must be "${PLAN_FORMAT}")`)]);
  if (raw.format !== PLAN_FORMAT) {
    const hint = raw.format === 'waymark-system' ? 'this is a system file, not a plan file' : 'this is not a plan file';
    fail([err('format', `must be "${PLAN_FORMAT}" (got ${JSON.stringify(raw.format)}); ${hint}`)]);
  }
  const { doc, fileVersion } = migratePlan(raw, options.migrations ?? PLAN_MIGRATIONS);
  const size = sizeIssues(doc);
  if (size.length > 0) fail(size);

  // Every problem at once: the schema's, the semantic checks of the parts that are well-formed,
  // and the checks against the system (embedded, or given by the caller).
  const shape = validateSchema(doc) ? [] : planSchemaIssues(validateSchema.errors ?? []);
  const planDoc = doc as unknown as PlanDocument;
  const issues = checkPlanDocument(planDoc);
  const sysDoc = isObject(doc.system) ? doc.system : {};
  let loaded: StarSystem | null = options.system ?? null;
  const embedded = isObject(sysDoc.embedded) && sysDoc.path === undefined; // the schema's oneOf
  if (embedded) {
    try {
      const parsed = parseSystemFile(JSON.stringify(sysDoc.embedded));
      loaded = parsed.system;
      issues.push(...prefixIssues('system.embedded', parsed.warnings));
    } catch (e) {
      if (!(e instanceof ValidationError)) throw e;
      loaded = null;
      issues.push(...prefixIssues('system.embedded', e.issues));
    }
  }
  if (loaded) issues.push(...checkDocumentAgainstSystem(doc, loaded));
  if (shape.length > 0) {
    // A value the schema refused is reported once, by the schema.
    const refused = new Set(shape.map((i) => i.path));
    fail(errorsFirst([...shape, ...issues.filter((i) => !refused.has(i.path))]));
  }
  if (issues.some((i) => i.severity === 'error')) fail(errorsFirst(issues));
  const plan = documentToPlan(planDoc);
  const system: PlanSystemRef = embedded && loaded ? { kind: 'embedded', system: loaded } : { kind: 'path', path: sysDoc.path as string };
  return { plan, system, warnings: issues, fileVersion, resolved: resolvedFromDocument(planDoc) };
}

/** The recorded `resolved` blocks of a checked document, by burn id (SI, in-memory names). */
function resolvedFromDocument(doc: PlanDocument): Map<string, ResolvedBurn> {
  const out = new Map<string, ResolvedBurn>();
  for (const ev of doc.events) {
    if (ev.type !== 'burn' || !ev.resolved) continue;
    const r = ev.resolved;
    out.set(ev.id, {
      model: r.model,
      frame: r.frame,
      dvFrame: vec3(r.dv_frame_mps),
      dvInertial: vec3(r.dv_inertial_mps),
      dv: r.dv_magnitude_mps,
      tStart: r.t_start_s,
      tEnd: r.t_end_s,
      duration: r.duration_s,
      propellantUsed: r.propellant_kg,
      massAfter: r.mass_after_kg,
    });
  }
  return out;
}

/** The note each written `resolved` block carries, for a reader of the file. */
export const RESOLVED_NOTE = 'derived: written by Waymark on save from the plan evaluated in its truth model; recomputed and checked on open';

function resolvedToDocument(r: ResolvedBurn): ResolvedBurnDocument {
  return {
    note: RESOLVED_NOTE,
    model: r.model,
    frame: r.frame,
    dv_frame_mps: vec3(r.dvFrame),
    dv_inertial_mps: vec3(r.dvInertial),
    dv_magnitude_mps: r.dv,
    t_start_s: r.tStart,
    t_end_s: r.tEnd,
    duration_s: r.duration,
    propellant_kg: r.propellantUsed,
    mass_after_kg: r.massAfter,
  };
}

/** More events than MAX_EVENTS or stages than MAX_STAGES (core/system/limits.ts): refused before the schema walks them. */
function sizeIssues(doc: Record<string, unknown>): ValidationIssue[] {
  const out: ValidationIssue[] = [];
  if (Array.isArray(doc.events) && doc.events.length > MAX_EVENTS) out.push(err('events', overLimitRule(doc.events.length, MAX_EVENTS, 'events')));
  const stages = isObject(doc.vehicle) ? doc.vehicle.stages : undefined;
  if (Array.isArray(stages) && stages.length > MAX_STAGES) out.push(err('vehicle.stages', overLimitRule(stages.length, MAX_STAGES, 'stages')));
  return out;
}

/**
 * Checks of an in-memory plan against the system it flies in (planSchema.ts
 * `checkDocumentAgainstSystem` on its file document): paths in the plan file's field names.
 */
export function checkPlanAgainstSystem(plan: Plan, system: StarSystem): ValidationIssue[] {
  return checkDocumentAgainstSystem(planToDocument(plan, { kind: 'path', path: '-' }), system);
}

/**
 * Runs `checkPlanAgainstSystem`; throws ValidationError('plan file', ...) when it finds errors,
 * otherwise returns its warnings.
 */
export function requirePlanFitsSystem(plan: Plan, system: StarSystem): ValidationIssue[] {
  const issues = checkPlanAgainstSystem(plan, system);
  if (issues.some((i) => i.severity === 'error')) fail(errorsFirst(issues));
  return issues;
}

function prefixIssues(prefix: string, issues: readonly ValidationIssue[]): ValidationIssue[] {
  return issues.map((i) => ({
    ...i,
    path: i.path === '' ? prefix : i.path.startsWith('[') ? `${prefix}${i.path}` : `${prefix}.${i.path}`,
  }));
}

/** Brings a plan document of any supported version to PLAN_VERSION. */
export function migratePlan(
  raw: Record<string, unknown>,
  table: Readonly<Record<number, PlanMigration>> = PLAN_MIGRATIONS,
): { doc: Record<string, unknown>; fileVersion: number } {
  return migrateDocument(WHAT, raw, PLAN_VERSION, table);
}

/**
 * Plain-language issues from ajv errors: the system file's wording (systemFile.ts
 * `schemaIssues`), plus the keywords only the plan schema uses. The if/then switches on
 * `type` / `kind` report the branch's own errors; their "must match then" wrapper is dropped.
 */
export function planSchemaIssues(errors: readonly ErrorObject[]): ValidationIssue[] {
  const rest: ErrorObject[] = [];
  const out: ValidationIssue[] = [];
  for (const e of errors) {
    const path = pointerToPath(e.instancePath);
    const p = e.params as Record<string, unknown>;
    if (e.keyword === 'if') continue;
    if (e.keyword === 'minItems' || e.keyword === 'maxItems') {
      const parent = (e.parentSchema ?? {}) as Record<string, unknown>;
      const lo = parent.minItems;
      const hi = parent.maxItems;
      if (lo !== undefined && lo === hi) out.push(err(path, `must have exactly ${String(lo)} ${lo === 1 ? 'item' : 'items'}`));
      else if (e.keyword === 'minItems') out.push(err(path, lo === 1 ? 'must not be empty' : `must have at least ${String(p.limit)} items`));
      else out.push(err(path, `must have at most ${String(p.limit)} items`));
    } else if (e.keyword === 'type' && Array.isArray((e.parentSchema as Record<string, unknown> | undefined)?.type)) {
      const types = (e.parentSchema as { type: string[] }).type;
      out.push(err(path, tooLarge(e) ?? `must be ${types.map((t) => TYPE_WORD[t] ?? t).join(' or ')}`));
    } else rest.push(e);
  }
  const all = [...out, ...schemaIssues(rest)];
  const seen = new Set<string>();
  return all.filter((i) => {
    const key = `${i.path}\u0000${i.rule}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}

const TYPE_WORD: Record<string, string> = {
  number: 'a number',
  integer: 'an integer',
  string: 'a string',
  object: 'an object',
  array: 'an array',
  boolean: 'true or false',
  null: 'null',
};

// ---------------------------------------------------------------------------------------------
// Document ↔ Plan

const toRad = (deg: number): number => deg * RAD_PER_DEG;
const vec3 = (v: readonly number[]): [number, number, number] => [v[0], v[1], v[2]];

/** The in-memory plan of a checked document (radians, defaults filled in). */
export function documentToPlan(doc: PlanDocument): Plan {
  const s = doc.start;
  const start: PlanStart =
    s.kind === 'parking'
      ? {
          kind: 'parking',
          body: s.body,
          epoch: s.epoch_s,
          periapsisAltitude: s.periapsis_altitude_m,
          e: s.e ?? 0,
          i: toRad(s.i_deg ?? 0),
          raan: toRad(s.raan_deg ?? 0),
          argp: toRad(s.argp_deg ?? 0),
          nu: toRad(s.nu_deg ?? 0),
        }
      : { kind: 'state', body: s.body, epoch: s.epoch_s, r: vec3(s.r_m), v: vec3(s.v_mps) };
  return {
    name: doc.name,
    description: doc.description ?? '',
    vehicle: {
      name: doc.vehicle.name,
      payloadMass: doc.vehicle.payload_kg,
      stages: doc.vehicle.stages.map((st) => ({
        name: st.name,
        dryMass: st.dry_kg,
        propellantMass: st.propellant_kg,
        isp: st.isp_s,
        thrust: st.thrust_N,
      })),
    },
    start,
    events: doc.events.map(eventFromDocument),
    target: doc.target === null ? null : targetFromDocument(doc.target),
    reserve: { percent: doc.reserve.percent, absolute: doc.reserve.absolute_mps },
    end: doc.end_s ?? null,
    // Absent stays absent (the default 'conic' is read through `planTruthModel`), so a file
    // without the field saves back without it.
    ...(doc.truth_model === undefined ? {} : { truthModel: doc.truth_model }),
  };
}

function solveFromDocument(s: SolveDocument | undefined): BurnSolve {
  if (!s) return { kind: 'fixed' };
  switch (s.kind) {
    case 'fixed':
      return { kind: 'fixed' };
    case 'transfer': {
      const out: BurnSolve = { kind: 'transfer', to: s.to, arrive: s.arrive_s };
      if (s.revs !== undefined) out.revs = s.revs;
      if (s.retrograde !== undefined) out.retrograde = s.retrograde;
      if (s.periapsis_altitude_m !== undefined) out.periapsisAltitude = s.periapsis_altitude_m;
      if (s.flyby !== undefined) {
        out.flyby = { next: s.flyby.next, arrive: s.flyby.arrive_s };
        if (s.flyby.powered !== undefined) out.flyby.powered = s.flyby.powered;
      }
      return out;
    }
    case 'capture':
      return { kind: 'capture', e: s.e };
    case 'plane':
      return { kind: 'plane', i: toRad(s.i_deg) };
    case 'apsis':
      return { kind: 'apsis', altitude: s.altitude_m };
  }
}

function untilFromDocument(u: UntilDocument): CoastUntil {
  switch (u.kind) {
    case 'time':
      return { kind: 'time', t: u.t_s };
    case 'duration':
      return { kind: 'duration', dt: u.dt_s };
    case 'altitude':
      return { kind: 'altitude', altitude: u.altitude_m };
    case 'node':
      return { kind: 'node', which: u.which };
    case 'periapsis':
    case 'apoapsis':
      return u.body === undefined ? { kind: u.kind } : { kind: u.kind, body: u.body };
    default:
      return { kind: u.kind };
  }
}

function eventFromDocument(ev: EventDocument): PlanEvent {
  switch (ev.type) {
    case 'burn':
      return {
        type: 'burn',
        id: ev.id,
        name: ev.name,
        t: ev.t_s,
        frame: ev.frame,
        dv: vec3(ev.dv_mps),
        solve: solveFromDocument(ev.solve),
        mode: ev.mode ?? 'impulsive',
        pointing: ev.pointing ?? 'velocity',
      };
    case 'coast':
      return { type: 'coast', id: ev.id, name: ev.name, until: untilFromDocument(ev.until) };
    case 'stage':
      return { type: 'stage', id: ev.id, name: ev.name };
    case 'flyby':
      return { type: 'flyby', id: ev.id, name: ev.name, body: ev.body };
  }
}

function targetFromDocument(t: TargetDocument): PlanTarget {
  return {
    body: t.body,
    periapsisAltitude: t.periapsis_altitude_m,
    e: t.e ?? null,
    apoapsisAltitude: t.apoapsis_altitude_m ?? null,
    i: t.i_deg === undefined || t.i_deg === null ? null : toRad(t.i_deg),
    tolerance: {
      periapsisAltitude: t.tolerance.periapsis_altitude_m,
      e: t.tolerance.e,
      i: toRad(t.tolerance.i_deg),
    },
  };
}

// Neighbouring doubles, for the degree search.
const f64 = new Float64Array(1);
const i64 = new BigInt64Array(f64.buffer);
function nextDouble(x: number, dir: 1 | -1): number {
  if (x === 0) return dir * Number.MIN_VALUE;
  f64[0] = x;
  i64[0] += x > 0 === dir > 0 ? 1n : -1n;
  return f64[0];
}

/**
 * The degree value to write for an angle of `rad` radians: the shortest decimal d with
 * d · π/180 === rad exactly, else (no double maps exactly) the nearest, rad · 180/π.
 */
export function degreesForFile(rad: number): number {
  if (rad === 0 || !Number.isFinite(rad)) return rad;
  const d0 = rad / RAD_PER_DEG;
  for (let p = 1; p <= 17; p++) {
    const d = Number(d0.toPrecision(p));
    if (toRad(d) === rad) return d;
  }
  let up = d0;
  let down = d0;
  for (let k = 0; k < 4; k++) {
    up = nextDouble(up, 1);
    down = nextDouble(down, -1);
    if (toRad(up) === rad) return up;
    if (toRad(down) === rad) return down;
  }
  return d0;
}

const deg = degreesForFile;

/** The file document of a plan, keys in schema order, every default written out. */
export function planToDocument(plan: Plan, system: PlanSystemRef): PlanDocument {
  const s = plan.start;
  const start: PlanDocument['start'] =
    s.kind === 'parking'
      ? {
          kind: 'parking',
          body: s.body,
          epoch_s: s.epoch,
          periapsis_altitude_m: s.periapsisAltitude,
          e: s.e,
          i_deg: deg(s.i),
          raan_deg: deg(s.raan),
          argp_deg: deg(s.argp),
          nu_deg: deg(s.nu),
        }
      : { kind: 'state', body: s.body, epoch_s: s.epoch, r_m: vec3(s.r), v_mps: vec3(s.v) };
  return {
    format: PLAN_FORMAT,
    version: PLAN_VERSION,
    name: plan.name,
    description: plan.description,
    // The embedded system is written by the system-file serialiser (see serializePlanFile).
    system: system.kind === 'path' ? { path: system.path } : { embedded: {} },
    vehicle: {
      name: plan.vehicle.name,
      payload_kg: plan.vehicle.payloadMass,
      stages: plan.vehicle.stages.map((st) => ({
        name: st.name,
        dry_kg: st.dryMass,
        propellant_kg: st.propellantMass,
        isp_s: st.isp,
        thrust_N: st.thrust,
      })),
    },
    start,
    events: plan.events.map(eventToDocument),
    target: plan.target === null ? null : targetToDocument(plan.target),
    reserve: { percent: plan.reserve.percent, absolute_mps: plan.reserve.absolute },
    end_s: plan.end,
    truth_model: plan.truthModel,
  };
}

function solveToDocument(s: BurnSolve): SolveDocument {
  switch (s.kind) {
    case 'fixed':
      return { kind: 'fixed' };
    case 'transfer': {
      const out: SolveDocument = { kind: 'transfer', to: s.to, arrive_s: s.arrive };
      if (s.revs !== undefined) out.revs = s.revs;
      if (s.retrograde !== undefined) out.retrograde = s.retrograde;
      if (s.periapsisAltitude !== undefined) out.periapsis_altitude_m = s.periapsisAltitude;
      if (s.flyby !== undefined) {
        out.flyby = { next: s.flyby.next, arrive_s: s.flyby.arrive };
        if (s.flyby.powered !== undefined) out.flyby.powered = s.flyby.powered;
      }
      return out;
    }
    case 'capture':
      return { kind: 'capture', e: s.e };
    case 'plane':
      return { kind: 'plane', i_deg: deg(s.i) };
    case 'apsis':
      return { kind: 'apsis', altitude_m: s.altitude };
  }
}

function untilToDocument(u: CoastUntil): UntilDocument {
  switch (u.kind) {
    case 'time':
      return { kind: 'time', t_s: u.t };
    case 'duration':
      return { kind: 'duration', dt_s: u.dt };
    case 'altitude':
      return { kind: 'altitude', altitude_m: u.altitude };
    case 'node':
      return { kind: 'node', which: u.which };
    case 'periapsis':
    case 'apoapsis':
      return u.body === undefined ? { kind: u.kind } : { kind: u.kind, body: u.body };
    default:
      return { kind: u.kind };
  }
}

function eventToDocument(ev: PlanEvent): EventDocument {
  switch (ev.type) {
    case 'burn': {
      const b: BurnEvent = ev;
      return {
        type: 'burn',
        id: b.id,
        name: b.name,
        t_s: b.t,
        frame: b.frame,
        dv_mps: vec3(b.dv),
        solve: solveToDocument(b.solve),
        mode: b.mode,
        pointing: b.pointing,
      };
    }
    case 'coast':
      return { type: 'coast', id: ev.id, name: ev.name, until: untilToDocument(ev.until) };
    case 'stage':
      return { type: 'stage', id: ev.id, name: ev.name };
    case 'flyby':
      return { type: 'flyby', id: ev.id, name: ev.name, body: ev.body };
  }
}

function targetToDocument(t: PlanTarget): TargetDocument {
  return {
    body: t.body,
    periapsis_altitude_m: t.periapsisAltitude,
    e: t.e,
    apoapsis_altitude_m: t.apoapsisAltitude,
    i_deg: t.i === null ? null : deg(t.i),
    tolerance: {
      periapsis_altitude_m: t.tolerance.periapsisAltitude,
      e: t.tolerance.e,
      i_deg: deg(t.tolerance.i),
    },
  };
}

// ---------------------------------------------------------------------------------------------
// Writing

/**
 * The file text of a plan: stable key order, 2-space indent, trailing newline. An embedded
 * system is written exactly as `serializeSystemFile` writes a system file, indented in place.
 * `resolved` (resolvedBurns.ts resolveBurns, computed by the caller that writes the file): each
 * burn found there gets its derived `resolved` block after its settings; without it none is
 * written. Throws ValidationError when a number is not finite (JSON has no NaN or Infinity).
 */
export function serializePlanFile(plan: Plan, system: PlanSystemRef, resolved?: ResolvedBurns): string {
  const doc = planToDocument(plan, system);
  if (resolved && resolved.size > 0) {
    for (const ev of doc.events) {
      const r = ev.type === 'burn' ? resolved.get(ev.id) : undefined;
      if (ev.type === 'burn' && r) ev.resolved = resolvedToDocument(r);
    }
  }
  const embedded = system.kind === 'embedded' ? serializeSystemFile(system.system).replace(/\n$/, '').split('\n') : null;
  return `${writeJson(doc, '', '', embedded)}\n`;
}

function writeNumber(x: number, path: string): string {
  if (!Number.isFinite(x)) fail([err(path, `cannot be written: ${x} is not a finite number`)]);
  if (Object.is(x, -0)) return '-0';
  const a = Math.abs(x);
  if (x !== 0 && (a >= 1e6 || a < 1e-3)) return x.toExponential().replace('e+', 'e');
  return String(x);
}

function joinPath(path: string, key: string | number): string {
  if (typeof key === 'number') return `${path}[${key}]`;
  return path === '' ? key : `${path}.${key}`;
}

function writeJson(v: unknown, indent: string, path: string, embedded: string[] | null): string {
  if (typeof v === 'number') return writeNumber(v, path);
  if (typeof v === 'string' || typeof v === 'boolean' || v === null) return JSON.stringify(v);
  if (path === 'system.embedded' && embedded) return embedded.map((line, k) => (k === 0 ? line : indent + line)).join('\n');
  const inner = `${indent}  `;
  if (Array.isArray(v)) {
    if (v.length === 0) return '[]';
    if (v.every((x) => typeof x === 'number')) return `[${v.map((x, k) => writeNumber(x, joinPath(path, k))).join(', ')}]`;
    return `[\n${v.map((x, k) => inner + writeJson(x, inner, joinPath(path, k), embedded)).join(',\n')}\n${indent}]`;
  }
  const entries = Object.entries(v as Record<string, unknown>).filter(([, x]) => x !== undefined);
  if (entries.length === 0) return '{}';
  return `{\n${entries.map(([k, x]) => `${inner}${JSON.stringify(k)}: ${writeJson(x, inner, joinPath(path, k), embedded)}`).join(',\n')}\n${indent}}`;
}
