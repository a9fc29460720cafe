/**
 * System-file cases: random valid files made by varying the demo system, valid files with one
 * field broken, truncated files, garbage, deeply nested and very large JSON; and the runner
 * that reads each with `parseSystemFile`, checks the answer against the case's expectation and,
 * when the file loads and still has the demo plan's bodies, evaluates the demo plan in it.
 */
import { ValidationError, type ValidationIssue } from '../../core/math/errors.ts';
import { parsePlanFile, requirePlanFitsSystem } from '../../core/io/planFile.ts';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import type { Plan } from '../../core/plan/plan.ts';
import { G_NEWTON } from '../../core/system/document.ts';
import { laplaceSoiRadius } from '../../core/system/derived.ts';
import type { StarSystem } from '../../core/system/model.ts';
import { built, type Draw } from './draw.ts';
import { evaluateChecked } from './evaluation.ts';
import { checkExpectation, type Expectation, type FileCase } from './expect.ts';
import { demoPlanText, demoSystemDoc, demoSystemText } from './files.ts';
import { clone, deepText, deleteAt, fields, getAt, pathText, setAt, withRawValue, type Field, type Json, type Key } from './json.ts';
import { CaseFailure, typedOrFail } from './verdict.ts';

type Doc = Record<string, any>;

// --- random valid systems ------------------------------------------------------------------------

/** The demo system with some bodies dropped and the rest moved, resized and reweighted. */
export function randomSystemDoc(d: Draw): Doc {
  const doc = demoSystemDoc() as Doc;
  // drop bodies (with their moons)
  const dropped = new Set<string>();
  for (const b of doc.bodies) if (d.bool(0.12)) dropped.add(b.id);
  let grew = true;
  while (grew) {
    grew = false;
    for (const b of doc.bodies) {
      if (!dropped.has(b.id) && dropped.has(b.parent)) {
        dropped.add(b.id);
        grew = true;
      }
    }
  }
  doc.bodies = doc.bodies.filter((b: Doc) => !dropped.has(b.id));
  for (const b of doc.bodies) {
    if (!d.bool(0.6)) continue;
    const o = b.orbit;
    o.a_m *= d.log(0.6, 1.6);
    o.e = d.pick([o.e, d.uniform(0, 0.3), d.uniform(0, 0.9), 1 - d.log(1e-9, 1e-2)]);
    o.i_deg = d.pick([o.i_deg, d.uniform(0, 180)]);
    o.raan_deg = d.uniform(-360, 360);
    o.argp_deg = d.uniform(-360, 360);
    o.mean_anomaly_deg = d.uniform(-360, 360);
    b.radius_m *= d.log(0.5, 2);
    b.min_safe_altitude_m = d.pick([0, b.min_safe_altitude_m, b.min_safe_altitude_m * d.log(0.1, 10)]);
    const mu = b.mu_m3_s2 * d.log(0.1, 10);
    if (d.bool(0.2)) {
      delete b.mu_m3_s2;
      b.mass_kg = mu / G_NEWTON;
    } else b.mu_m3_s2 = mu;
    if (d.bool(0.2)) delete b.rotation_period_s;
    else if (d.bool(0.3)) b.rotation_period_s = d.pick([-1, 1]) * d.log(1, 1e8);
  }
  const home = doc.bodies.find((b: Doc) => b.id === doc.calendar.home);
  if (!home || home.rotation_period_s === undefined || d.bool(0.2)) {
    const year = d.log(1e5, 1e10);
    doc.calendar = { year_s: year, day_s: year / d.log(1, 2000), year_at_epoch: d.int(-1000, 1000) };
  }
  if (d.bool(0.2)) {
    doc.star.mass_kg = doc.star.mu_m3_s2 / G_NEWTON;
    delete doc.star.mu_m3_s2;
  }
  return doc;
}

// --- one field broken ------------------------------------------------------------------------------

/** Paths whose errors count as naming a change made at `path` (the body, its moons, the calendar it sets). */
function related(doc: Doc, path: string): string[] {
  const out = [path];
  const m = /^(bodies\[(\d+)\]|star)/.exec(path);
  if (!m) return out;
  out.push(m[1]);
  const id = m[1] === 'star' ? doc.star?.id : doc.bodies?.[Number(m[2])]?.id;
  (Array.isArray(doc.bodies) ? doc.bodies : []).forEach((b: Doc, j: number) => {
    if (b && b.parent === id) out.push(`bodies[${j}]`);
  });
  if (doc.calendar?.home === id) out.push('calendar');
  return out;
}

function otherType(d: Draw, v: Json): Json {
  if (typeof v === 'number') return d.pick<Json>(['12', true, null, {}, [], '']);
  if (typeof v === 'string') return d.pick<Json>([12, true, null, {}, []]);
  if (typeof v === 'boolean') return d.pick<Json>([1, 'true', null]);
  if (Array.isArray(v)) return d.pick<Json>(['x', 1, {}, null]);
  return d.pick<Json>(['x', 1, [], null]);
}

export const ODD_NUMBERS = [-1, 0, 1e-300, 1, 1 - 1e-16, 1 + 1e-15, 2, 180.0000001, 360.0000001, 721, 1e13 + 1, 1.01e17, 1.01e27, 1e38, -1e9 - 1, 1e20];
export const HUGE_NUMBERS = [1e308, -1e308, 1.7976931348623157e308, 5e-324, -5e-324, 1e300];
/** Non-numbers written where a number belongs: strings, and raw tokens JSON does not have or overflows. */
export const NAN_TEXTS = ['"NaN"', '"Infinity"', '"-Infinity"', '"1e999"', 'NaN', 'Infinity', '1e999', '-1e999'];

/** Replaces a random numeric field by text; raw tokens that are not JSON can only be refused as a document. */
export function nanTextCase(d: Draw, doc: Doc, numeric: Field[], label: string, base = ''): FileCase {
  const f = d.pick(numeric);
  const raw = d.pick(NAN_TEXTS);
  const notJson = raw === 'NaN' || raw === 'Infinity';
  return { label: `${label}: ${f.path} = ${raw}`, text: withRawValue(doc, f.keys, raw), expect: { kind: 'reject', paths: notJson ? [] : [base + f.path] } };
}

/** Common breakages of a document: truncation, garbage, deep nesting. */
export function brokenTextCase(d: Draw, doc: Json, text: string, label: string): FileCase {
  const how = d.pick(['truncate', 'flip', 'garbage', 'deep-field', 'deep-document', 'bom', 'empty'] as const);
  switch (how) {
    case 'truncate': {
      // the text ends "}\n": cutting at least two characters always breaks the JSON
      const n = d.int(0, text.length - 2);
      return { label: `${label}: truncated to ${n} of ${text.length} characters`, text: text.slice(0, n), expect: { kind: 'reject', paths: [] } };
    }
    case 'flip': {
      const chars = [...text];
      const k = d.int(1, 8);
      for (let i = 0; i < k; i++) chars[d.int(0, chars.length - 1)] = String.fromCharCode(d.int(0, 0xffff));
      return { label: `${label}: ${k} characters replaced`, text: chars.join(''), expect: { kind: 'any' } };
    }
    case 'garbage':
      return { label: `${label}: garbage`, text: d.text(400), expect: { kind: 'reject', paths: [] } };
    case 'deep-field': {
      const all = fields(doc);
      const f = d.pick(all);
      const depth = Math.round(d.log(100, 100_000));
      const kind = d.pick(['array', 'object'] as const);
      return {
        label: `${label}: ${f.path} nested ${depth} ${kind}s deep`,
        text: withRawValue(doc, f.keys, deepText(depth, kind)),
        expect: { kind: 'reject', paths: [f.path] },
      };
    }
    case 'deep-document': {
      const depth = Math.round(d.log(1000, 200_000));
      const kind = d.pick(['array', 'object'] as const);
      return { label: `${label}: document of ${depth} nested ${kind}s`, text: deepText(depth, kind), expect: { kind: 'reject', paths: [] } };
    }
    case 'bom':
      return { label: `${label}: with a byte-order mark`, text: `\uFEFF${text}`, expect: { kind: 'any' } };
    case 'empty':
      return { label: `${label}: empty`, text: d.pick(['', ' ', '\n', 'null', '[]', '0', '"x"', '{}']), expect: { kind: 'reject', paths: [] } };
  }
}

function parentChain(doc: Doc, k: number): number[] {
  const byId = new Map<string, number>(doc.bodies.map((b: Doc, j: number) => [b.id, j]));
  const chain = [k];
  for (let j = byId.get(doc.bodies[k].parent); j !== undefined && chain.length < 50; j = byId.get(doc.bodies[j].parent)) chain.push(j);
  return chain;
}

function systemMutation(d: Draw, doc: Doc): FileCase {
  const all = fields(doc);
  const numeric = all.filter((f) => typeof f.value === 'number');
  const nb = doc.bodies.length;
  const bodyIdx = () => d.int(0, nb - 1);
  const kinds = [
    'wrong-type',
    'nan-text',
    'huge',
    'odd-number',
    'negative-mass',
    'e-unbound',
    'moon-outside-soi',
    'cycle',
    'unknown-parent',
    'self-parent',
    'duplicate-id',
    'remove',
    'unknown-field',
    'version',
    'large',
  ] as const;
  const kind = d.pick(kinds);
  const set = (keys: Key[], v: Json, label: string, expect: Expectation): FileCase => {
    const c = clone(doc);
    setAt(c, keys, v);
    return { label, text: JSON.stringify(c, null, d.pick([0, 2])), expect };
  };
  switch (kind) {
    case 'wrong-type': {
      const f = d.pick(all);
      const v = otherType(d, f.value);
      return set(f.keys, v, `${f.path}: ${JSON.stringify(f.value)?.slice(0, 40)} → ${JSON.stringify(v)}`, { kind: 'reject', paths: [f.path] });
    }
    case 'nan-text':
      return nanTextCase(d, doc, numeric, 'system');
    case 'huge':
    case 'odd-number': {
      const f = d.pick(numeric);
      const v = d.pick(kind === 'huge' ? HUGE_NUMBERS : ODD_NUMBERS);
      return set(f.keys, v, `${f.path}: ${f.value} → ${v}`, { kind: 'named', paths: related(doc, f.path) });
    }
    case 'negative-mass': {
      if (nb === 0 || d.bool(0.2)) {
        const key = 'mu_m3_s2' in doc.star ? 'mu_m3_s2' : 'mass_kg';
        return set(['star', key], -doc.star[key] * d.log(1e-6, 1), `star.${key} negative`, { kind: 'reject', paths: [`star.${key}`] });
      }
      const k = bodyIdx();
      const key = 'mu_m3_s2' in doc.bodies[k] ? 'mu_m3_s2' : 'mass_kg';
      return set(['bodies', k, key], -d.pick([0, 1, doc.bodies[k][key]]), `bodies[${k}].${key} negative`, { kind: 'reject', paths: [`bodies[${k}].${key}`] });
    }
    case 'e-unbound': {
      if (nb === 0) break;
      const k = bodyIdx();
      const e = d.pick([1, 1 + 1e-15, 1.5, 10]);
      return set(['bodies', k, 'orbit', 'e'], e, `bodies[${k}].orbit.e = ${e}`, { kind: 'reject', paths: [`bodies[${k}].orbit.e`] });
    }
    case 'moon-outside-soi': {
      // a moon whose apoapsis lies beyond its parent's sphere of influence loads, with a warning
      const moons = doc.bodies.map((b: Doc, k: number) => ({ b, k })).filter(({ b }: { b: Doc }) => b.parent !== doc.star.id);
      if (moons.length === 0) break;
      const { b, k } = d.pick<{ b: Doc; k: number }>(moons);
      const p = doc.bodies.find((x: Doc) => x.id === b.parent);
      const g = p.parent === doc.star.id ? doc.star : doc.bodies.find((x: Doc) => x.id === p.parent);
      const mu = (x: Doc) => x.mu_m3_s2 ?? G_NEWTON * x.mass_kg;
      if (!g || p.parent !== doc.star.id) break;
      const soi = laplaceSoiRadius(p.orbit.a_m, mu(p), mu(g));
      const a = (soi * d.uniform(1.05, 3)) / (1 + b.orbit.e);
      return set(['bodies', k, 'orbit', 'a_m'], a, `bodies[${k}] (moon of ${p.id}) at a = ${a.toExponential(3)} beyond the SOI ${soi.toExponential(3)}`, {
        kind: 'warn',
        paths: [`bodies[${k}].orbit`],
        rule: 'sphere of influence',
      });
    }
    case 'cycle': {
      if (nb < 1) break;
      const c = clone(doc);
      const k = bodyIdx();
      const chain = parentChain(c, k);
      // point the top of the chain (a planet) back at k: every body of the chain is on the cycle
      const top = chain[chain.length - 1];
      c.bodies[top].parent = c.bodies[k].id;
      const paths = chain.map((j) => `bodies[${j}].parent`);
      return { label: `cycle through ${chain.map((j) => c.bodies[j].id).join(', ')}`, text: JSON.stringify(c), expect: { kind: 'reject', paths } };
    }
    case 'unknown-parent':
    case 'self-parent': {
      if (nb === 0) break;
      const k = bodyIdx();
      const v = kind === 'self-parent' ? doc.bodies[k].id : d.pick(['nowhere', 'x', 'ilmar-b', 'Tessel', '']);
      return set(['bodies', k, 'parent'], v, `bodies[${k}].parent = ${JSON.stringify(v)}`, { kind: 'reject', paths: [`bodies[${k}].parent`] });
    }
    case 'duplicate-id': {
      if (nb < 1) break;
      const k = bodyIdx();
      const j = d.int(-1, nb - 1);
      if (j === k) break;
      const id = j < 0 ? doc.star.id : doc.bodies[j].id;
      const other = j < 0 ? 'star.id' : `bodies[${j}].id`;
      return set(['bodies', k, 'id'], id, `bodies[${k}].id duplicates ${other}`, { kind: 'reject', paths: [`bodies[${k}].id`, other] });
    }
    case 'remove': {
      const props = all.filter((f) => typeof f.keys[f.keys.length - 1] === 'string');
      const f = d.pick(props);
      const c = clone(doc);
      deleteAt(c, f.keys);
      const parent = f.keys.slice(0, -1);
      return {
        label: `${f.path} removed`,
        text: JSON.stringify(c),
        expect: { kind: 'named', paths: [...related(doc, f.path), ...(parent.length > 0 ? [pathText(parent)] : [])] },
      };
    }
    case 'unknown-field': {
      const objects = [
        { keys: [] as Key[], path: '', value: doc as Json },
        ...all.filter((f) => f.value !== null && typeof f.value === 'object' && !Array.isArray(f.value)),
      ];
      const f = d.pick(objects);
      const c = clone(doc);
      (getAt(c, f.keys) as Record<string, Json>).zz_extra = d.pick<Json>([1, 'x', null, {}]);
      return { label: `unknown field under ${f.path || '(document)'}`, text: JSON.stringify(c), expect: { kind: 'reject', paths: [f.path] } };
    }
    case 'version': {
      const v = d.pick<Json>([2, 3, 99, 0, -1, 1.5, '1', null]);
      return set(['version'], v, `version = ${JSON.stringify(v)}`, { kind: 'reject', paths: ['version'] });
    }
    case 'large': {
      // many small bodies on the star: a very large file, every one of them valid
      const c = clone(doc);
      const n = Math.round(d.log(10, 2000));
      for (let i = 0; i < n; i++) {
        c.bodies.push({
          id: `rock-${i}`,
          name: `Rock ${i}`,
          parent: c.star.id,
          mu_m3_s2: d.log(1e3, 1e9),
          radius_m: d.log(1e3, 1e5),
          min_safe_altitude_m: 0,
          orbit: { a_m: d.log(2e11, 5e11), e: d.uniform(0, 0.3), i_deg: d.uniform(0, 30), raan_deg: 0, argp_deg: 0, mean_anomaly_deg: d.uniform(0, 360) },
        });
      }
      return { label: `${n} extra bodies`, text: JSON.stringify(c), expect: { kind: 'any' } };
    }
  }
  const f = d.pick(numeric);
  return set(f.keys, -1, `${f.path} = -1`, { kind: 'named', paths: related(doc, f.path) });
}

/** The document if it loads (warnings allowed), else the demo document. */
export function loadableOr(doc: Doc): Doc {
  try {
    parseSystemFile(JSON.stringify(doc));
    return doc;
  } catch {
    return demoSystemDoc() as Doc;
  }
}

/** One system-file case. */
export function systemCase(d: Draw): FileCase {
  const r = d.unit();
  if (r < 0.25) {
    const doc = randomSystemDoc(d);
    return { label: 'random valid system', text: JSON.stringify(doc, null, 2), expect: { kind: 'any' } };
  }
  // one field broken in a file that loads, so the error found is the one made
  const base = d.bool(0.5) ? (demoSystemDoc() as Doc) : loadableOr(randomSystemDoc(d));
  if (r < 0.85) return systemMutation(d, base);
  return brokenTextCase(d, base as Json, d.bool(0.5) ? demoSystemText() : JSON.stringify(base, null, 2), 'system');
}

export const systemCases = built(systemCase);

// --- runner ------------------------------------------------------------------------------------------

let demoPlan: Plan | null = null;
function theDemoPlan(): Plan {
  demoPlan ??= parsePlanFile(demoPlanText('tessel-to-ochre.plan.json')).plan;
  return demoPlan;
}

/** Flies the demo plan in a loaded system when it fits (a system with Tessel and Ochre). */
export function evaluateDemoPlanIn(system: StarSystem): string {
  const plan = theDemoPlan();
  try {
    requirePlanFitsSystem(plan, system);
  } catch (e) {
    return `plan does not fit: ${typedOrFail(e, [ValidationError], 'requirePlanFitsSystem')}`;
  }
  return evaluateChecked(system, plan);
}

export function runSystemCase(c: FileCase): string {
  let system: StarSystem;
  let warnings: ValidationIssue[];
  try {
    const parsed = parseSystemFile(c.text);
    system = parsed.system;
    warnings = parsed.warnings;
  } catch (e) {
    typedOrFail(e, [ValidationError], 'parseSystemFile');
    checkExpectation(c, (e as ValidationError).issues, []);
    return 'refused';
  }
  checkExpectation(c, null, warnings);
  if (system.bodies.some((b) => !Number.isFinite(b.derived.soiRadius) && b.index !== 0)) {
    throw new CaseFailure('non-finite in system', `${c.label}: a body has a non-finite SOI radius`);
  }
  return `loaded; ${evaluateDemoPlanIn(system)}`;
}
