/**
 * Plan-file cases: the demo plans, the sample plans and random valid plans (naming the demo
 * system by path, or embedding the demo system or a random variant of it), each as written, with
 * one field broken, truncated, garbled or deeply nested. The runner reads a case the way the
 * file layer does (parsePlanFile, then requirePlanFitsSystem against the demo system for a plan
 * that names its system by path), checks the answer against the case's expectation and
 * evaluates every plan that loads.
 */
import { ValidationError, type ValidationIssue } from '../../core/math/errors.ts';
import { parsePlanFile, requirePlanFitsSystem, serializePlanFile } from '../../core/io/planFile.ts';
import type { Plan } from '../../core/plan/plan.ts';
import type { StarSystem } from '../../core/system/model.ts';
import { samplePlan, stateStartPlan } from '../core/io/planSamples.ts';
import { built, type Draw } from './draw.ts';
import { evaluateChecked } from './evaluation.ts';
import { checkExpectation, type Expectation, type FileCase } from './expect.ts';
import { DEMO_PLAN_FILES, demoPlanText, demoSystem, demoSystemDoc } from './files.ts';
import { clone, deleteAt, fields, getAt, pathText, setAt, withRawValue, type Json, type Key } from './json.ts';
import { randomPlan, variedDemoPlan } from './planGen.ts';
import { brokenTextCase, HUGE_NUMBERS, nanTextCase, ODD_NUMBERS, randomSystemDoc, systemCase } from './systemCases.ts';
import { typedOrFail } from './verdict.ts';

type Doc = Record<string, any>;

const PATH_REF = { kind: 'path', path: '../systems/ilmar.system.json' } as const;

function docOf(plan: Plan): Doc {
  return JSON.parse(serializePlanFile(plan, PATH_REF)) as Doc;
}

let demoPlans: Plan[] | null = null;
function theDemoPlans(): Plan[] {
  demoPlans ??= DEMO_PLAN_FILES.map((f) => parsePlanFile(demoPlanText(f)).plan);
  return demoPlans;
}

/** A valid plan document and where it came from. */
function basePlanDoc(d: Draw): { doc: Doc; label: string } {
  const r = d.unit();
  let doc: Doc;
  let label: string;
  if (r < 0.15) {
    const f = d.pick(DEMO_PLAN_FILES);
    doc = JSON.parse(demoPlanText(f)) as Doc;
    label = f;
  } else if (r < 0.25) {
    doc = docOf(d.bool() ? samplePlan() : stateStartPlan());
    label = 'sample plan';
  } else if (r < 0.4) {
    doc = docOf(variedDemoPlan(d, d.pick(theDemoPlans())));
    label = 'varied demo plan';
  } else {
    doc = docOf(randomPlan(d, demoSystem()));
    label = 'random plan';
  }
  if (d.bool(0.25)) {
    doc.system = { embedded: d.bool(0.6) ? demoSystemDoc() : randomSystemDoc(d) };
    label += ', embedded system';
  }
  return { doc, label };
}

/** Paths whose errors count as naming a change at `path`. */
function related(path: string): string[] {
  const out = [path];
  if (path.startsWith('start.')) out.push('start');
  if (path.startsWith('target.')) out.push('target');
  if (path.startsWith('vehicle.')) out.push('vehicle');
  const ev = /^events\[\d+\]/.exec(path);
  if (ev) out.push(ev[0]);
  return out;
}

function otherType(d: Draw, v: Json): { value: Json; mustFail: boolean } {
  // null is a valid value of some fields (t_s, target, end_s, the target's e / apoapsis / i)
  if (typeof v === 'number') {
    const value = d.pick<Json>(['12', true, null, {}, []]);
    return { value, mustFail: value !== null };
  }
  if (typeof v === 'string') return { value: d.pick<Json>([12, true, {}, []]), mustFail: true };
  if (typeof v === 'boolean') return { value: d.pick<Json>([1, 'true']), mustFail: true };
  if (v === null) return { value: d.pick<Json>(['x', true, []]), mustFail: true };
  if (Array.isArray(v)) return { value: d.pick<Json>(['x', 1, {}]), mustFail: true };
  return { value: d.pick<Json>(['x', 1, []]), mustFail: true };
}

function planMutation(d: Draw, doc: Doc, label: string): FileCase {
  const embedded = 'embedded' in doc.system;
  // mutations inside an embedded system are the system cases' own, under system.embedded
  if (embedded && d.bool(0.3)) {
    const inner = systemCase(d);
    const text = withRawValue(doc as Json, ['system', 'embedded'], inner.text);
    const prefix = (p: string) => (p === '' ? 'system.embedded' : `system.embedded.${p}`);
    const ie = inner.expect;
    let ex: Expectation;
    if (ie.kind === 'reject') ex = { kind: 'reject', paths: ie.paths.length === 0 ? [] : ie.paths.map(prefix) };
    // a system that loads may still lack a body the plan names: that refusal names the plan's field
    else if (ie.kind === 'named') ex = { kind: 'named', paths: [...ie.paths.map(prefix), 'start.body', 'target.body', 'events'] };
    else ex = { kind: 'any' };
    return { label: `${label}; embedded system: ${inner.label}`, text, expect: ex };
  }
  const all = fields(doc).filter((f) => !f.path.startsWith('system.embedded'));
  const numeric = all.filter((f) => typeof f.value === 'number');
  const events: Doc[] = doc.events;
  const set = (keys: Key[], v: Json, what: string, expect: Expectation): FileCase => {
    const c = clone(doc);
    setAt(c as Json, keys, v);
    return { label: `${label}; ${what}`, text: JSON.stringify(c, null, d.pick([0, 2])), expect };
  };
  const kinds = [
    'wrong-type',
    'nan-text',
    'huge',
    'odd-number',
    'negative-mass',
    'out-of-order',
    'duplicate-id',
    'unknown-body',
    'remove',
    'unknown-field',
    'extra-stage-drop',
    'version',
    'format',
  ] as const;
  const kind = d.pick(kinds);
  switch (kind) {
    case 'wrong-type': {
      const f = d.pick(all);
      const { value, mustFail } = otherType(d, f.value);
      return set(f.keys, value, `${f.path}: ${JSON.stringify(f.value)?.slice(0, 40)} → ${JSON.stringify(value)}`, {
        kind: mustFail ? 'reject' : 'named',
        paths: related(f.path),
      });
    }
    case 'nan-text': {
      const c = nanTextCase(d, doc, numeric, label);
      return c;
    }
    case 'huge':
    case 'odd-number': {
      const f = d.pick(numeric);
      const v = d.pick(kind === 'huge' ? HUGE_NUMBERS : ODD_NUMBERS);
      return set(f.keys, v, `${f.path}: ${f.value} → ${v}`, { kind: 'named', paths: related(f.path) });
    }
    case 'negative-mass': {
      const k = d.int(-1, doc.vehicle.stages.length - 1);
      const keys: Key[] = k < 0 ? ['vehicle', 'payload_kg'] : ['vehicle', 'stages', k, d.pick(['dry_kg', 'propellant_kg'])];
      return set(keys, -d.log(1e-6, 1e6), `${pathText(keys)} negative`, { kind: 'reject', paths: [pathText(keys)] });
    }
    case 'out-of-order': {
      // a burn (or timed coast) earlier than the start or an earlier timed event
      const timed = events.map((e, k) => ({ e, k })).filter(({ e }) => e.type === 'burn' || (e.type === 'coast' && e.until.kind === 'time'));
      if (timed.length === 0) break;
      const { e, k } = d.pick(timed);
      const keys: Key[] = e.type === 'burn' ? ['events', k, 't_s'] : ['events', k, 'until', 't_s'];
      const t = doc.start.epoch_s - d.log(1, 1e7);
      return set(keys, t, `${pathText(keys)} = ${t} before the start`, { kind: 'reject', paths: [pathText(keys)] });
    }
    case 'duplicate-id': {
      if (events.length < 2) break;
      const k = d.int(1, events.length - 1);
      const j = d.int(0, k - 1);
      return set(['events', k, 'id'], events[j].id, `events[${k}].id duplicates events[${j}].id`, {
        kind: 'reject',
        paths: [`events[${k}].id`, `events[${j}].id`],
      });
    }
    case 'unknown-body': {
      const refs: Key[][] = [['start', 'body']];
      if (doc.target) refs.push(['target', 'body']);
      events.forEach((e, k) => {
        if (e.type === 'burn' && e.solve?.kind === 'transfer') refs.push(['events', k, 'solve', 'to']);
        if (e.type === 'coast' && e.until.body !== undefined) refs.push(['events', k, 'until', 'body']);
      });
      const keys = d.pick(refs);
      const v = d.pick(['nowhere', 'tessel-2', 'Tessel', '', 'x']);
      return set(keys, v, `${pathText(keys)} = ${JSON.stringify(v)}`, { kind: 'reject', paths: [pathText(keys)] });
    }
    case 'remove': {
      const props = all.filter((f) => typeof f.keys[f.keys.length - 1] === 'string');
      const f = d.pick(props);
      const c = clone(doc);
      deleteAt(c as Json, f.keys);
      return {
        label: `${label}; ${f.path} removed`,
        text: JSON.stringify(c),
        expect: { kind: 'named', paths: [...related(f.path), pathText(f.keys.slice(0, -1))] },
      };
    }
    case 'unknown-field': {
      const objects = [{ keys: [] as Key[], path: '' }, ...all.filter((f) => f.value !== null && typeof f.value === 'object' && !Array.isArray(f.value))];
      const f = d.pick(objects);
      const c = clone(doc);
      (getAt(c as Json, f.keys) as Record<string, Json>).zz_extra = 1;
      return { label: `${label}; unknown field under ${f.path || '(document)'}`, text: JSON.stringify(c), expect: { kind: 'reject', paths: [f.path] } };
    }
    case 'extra-stage-drop': {
      const c = clone(doc);
      const n = doc.vehicle.stages.length + 1 - events.filter((e) => e.type === 'stage').length;
      for (let i = 0; i < n; i++) c.events.splice(d.int(0, c.events.length), 0, { type: 'stage', id: `extra-drop-${i}`, name: 'Extra drop' });
      return { label: `${label}; ${n} extra stage drops`, text: JSON.stringify(c), expect: { kind: 'reject', paths: ['events'] } };
    }
    case 'version':
    case 'format': {
      const v = kind === 'version' ? d.pick<Json>([2, 3, 99, 0, -1, 1.5, '1', null]) : d.pick<Json>(['waymark-system', 'waymark', '', 1, null]);
      return set([kind], v, `${kind} = ${JSON.stringify(v)}`, { kind: 'reject', paths: [kind] });
    }
  }
  const f = d.pick(numeric);
  return set(f.keys, -1, `${f.path} = -1`, { kind: 'named', paths: related(f.path) });
}

/** True when the document loads as the file layer would load it (warnings allowed). */
function loads(doc: Doc): boolean {
  try {
    const parsed = parsePlanFile(JSON.stringify(doc));
    if (parsed.system.kind === 'path') requirePlanFitsSystem(parsed.plan, demoSystem());
    return true;
  } catch {
    return false;
  }
}

/** One plan-file case. */
export function planCase(d: Draw): FileCase {
  const base = basePlanDoc(d);
  const r = d.unit();
  if (r < 0.3) return { label: base.label, text: JSON.stringify(base.doc, null, 2), expect: { kind: 'any' } };
  // one field broken in a file that loads, so the error found is the one made
  const { doc, label } = loads(base.doc) ? base : { doc: JSON.parse(demoPlanText(DEMO_PLAN_FILES[0])) as Doc, label: DEMO_PLAN_FILES[0] };
  if (r < 0.85) return planMutation(d, doc, label);
  return brokenTextCase(d, doc as Json, JSON.stringify(doc, null, 2), label);
}

export const planCases = built(planCase);

/** Reads the case as the file layer would, checks the expectation, evaluates a plan that loads. */
export function runPlanCase(c: FileCase): string {
  let plan: Plan;
  let system: StarSystem;
  let warnings: ValidationIssue[];
  try {
    const parsed = parsePlanFile(c.text);
    plan = parsed.plan;
    warnings = [...parsed.warnings];
    if (parsed.system.kind === 'embedded') system = parsed.system.system;
    else {
      system = demoSystem();
      warnings.push(...requirePlanFitsSystem(plan, system));
    }
  } catch (e) {
    typedOrFail(e, [ValidationError], 'parsePlanFile');
    checkExpectation(c, (e as ValidationError).issues, []);
    return 'refused';
  }
  checkExpectation(c, null, warnings);
  return `loaded; ${evaluateChecked(system, plan)}`;
}
