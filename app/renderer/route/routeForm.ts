/**
 * The route form ("Plan a route"): what the user typed, as text, and the route intent it means.
 * The bodies to choose from in tree order (each moon under its planet), the defaults (the open
 * plan's start body, altitude and epoch; the destination's safe altitude; a departure range of
 * one synodic period), and the reading of the form into a core/route RouteIntent, with every
 * problem at its field in the form's own words and units. Plain code, tested without a page.
 */
import { issueInWords } from '../../../core/io/index.ts';
import { InputError } from '../../../core/math/index.ts';
import { synodicPeriod } from '../../../core/orbit/index.ts';
import type { Plan, TruthModel } from '../../../core/plan/index.ts';
import { TRUTH_MODELS } from '../../../core/plan/index.ts';
import type { Body, StarSystem } from '../../../core/system/index.ts';
import { UNITS, formatNumber, formatTime, parseNumber, parseTime } from '../plan/fieldText.ts';
import type { RouteIntent } from './routeCore.ts';

/** The form as typed: numbers in the units shown (km, °), dates as compact calendar dates. */
export interface RouteForm {
  from: string;
  /** Circular orbit altitude about From, km. */
  fromAltitude: string;
  /** Departure orbit inclination, °; empty: any (the route builder chooses the plane). */
  fromInclination: string;
  to: string;
  /** Target orbit periapsis altitude, km. */
  periapsis: string;
  /** Target orbit apoapsis altitude, km; empty: circular. */
  apoapsis: string;
  /** Target orbit inclination, °; empty: any. */
  inclination: string;
  departAfter: string;
  departBefore: string;
  truthModel: TruthModel;
}

export type RouteField = keyof RouteForm;

/** The form's labels: messages name fields by these. */
export const ROUTE_FIELD_LABELS: Readonly<Record<RouteField, string>> = {
  from: 'From',
  fromAltitude: 'Orbit altitude',
  fromInclination: 'Orbit inclination',
  to: 'To',
  periapsis: 'Periapsis altitude',
  apoapsis: 'Apoapsis altitude',
  inclination: 'Inclination',
  departAfter: 'Depart after',
  departBefore: 'Depart before',
  truthModel: 'Truth model',
};

/** A body to choose: its id, name and depth in the tree (1: planet, 2: moon …). */
export interface BodyChoice {
  id: string;
  name: string;
  depth: number;
  /** The name indented by depth (no-break spaces), for a plain <option>. */
  label: string;
}

/** Every planet and moon, each followed by its own moons (depth first, in the file's order). */
export function routeBodies(system: StarSystem): BodyChoice[] {
  const out: BodyChoice[] = [];
  const visit = (index: number, depth: number): void => {
    const b = system.bodies[index];
    if (depth > 0) out.push({ id: b.id, name: b.name, depth, label: `${'\u00a0\u00a0\u00a0'.repeat(depth - 1)}${depth > 1 ? '↳ ' : ''}${b.name}` });
    for (const c of [...b.children].sort((x, y) => x - y)) visit(c, depth + 1);
  };
  visit(0, 0);
  return out;
}

function bodyById(system: StarSystem, id: string): Body | null {
  const b = system.bodies.find((x) => x.id === id);
  return b && b.index !== 0 ? b : null;
}

/** The body's ancestors from itself up to the star. */
function lineage(system: StarSystem, b: Body): Body[] {
  const out: Body[] = [b];
  let p = b.parentIndex;
  while (p >= 0) {
    out.push(system.bodies[p]);
    p = system.bodies[p].parentIndex;
  }
  return out;
}

/**
 * How often the geometry of a transfer from `fromId` to `toId` repeats, s: the synodic period of
 * the two bodies (or of their ancestors that orbit the same parent: Tessel to Skerry repeats with
 * Tessel and Moravel); from a body to its own moon, or from a moon to its parent, the moon's period.
 */
export function repeatPeriod(system: StarSystem, fromId: string, toId: string): number | null {
  const a = bodyById(system, fromId);
  const b = bodyById(system, toId);
  if (!a || !b || a === b) return null;
  const la = lineage(system, a);
  const lb = lineage(system, b);
  if (la.includes(b)) return la[la.indexOf(b) - 1].derived.period;
  if (lb.includes(a)) return lb[lb.indexOf(a) - 1].derived.period;
  const common = la.find((x) => lb.includes(x))!;
  const sa = la[la.indexOf(common) - 1];
  const sb = lb[lb.indexOf(common) - 1];
  const ta = sa.derived.period;
  const tb = sb.derived.period;
  if (!(Number.isFinite(ta) && Number.isFinite(tb) && ta > 0 && tb > 0)) return null;
  // equal periods never change phase: one period is as good a range as any
  return ta === tb ? ta : synodicPeriod(ta, tb);
}

/** The circular orbit altitude the form offers about `bodyId`: the plan's own when it starts there in a parking orbit, else the body's safe altitude. */
export function fromAltitudeDefault(system: StarSystem, plan: Plan, bodyId: string): number {
  if (plan.start.kind === 'parking' && plan.start.body === bodyId) return plan.start.periapsisAltitude;
  return bodyById(system, bodyId)?.safeAlt ?? 0;
}

/** The form's first values for the open plan (see the module comment). */
export function defaultRouteForm(system: StarSystem, plan: Plan): RouteForm {
  const choices = routeBodies(system);
  const start = bodyById(system, plan.start.body);
  const firstPlanet = choices.find((c) => c.depth === 1) ?? choices[0];
  const from = start?.id ?? firstPlanet?.id ?? '';
  const wanted = plan.target && plan.target.body !== from ? bodyById(system, plan.target.body) : null;
  const to = wanted?.id ?? choices.find((c) => c.id !== from)?.id ?? '';
  const cal = system.calendar;
  const after = Number.isFinite(plan.start.epoch) ? plan.start.epoch : 0;
  const form: RouteForm = {
    from,
    fromAltitude: formatNumber(fromAltitudeDefault(system, plan, from), UNITS.km),
    fromInclination: '',
    to,
    periapsis: formatNumber(bodyById(system, to)?.safeAlt ?? 0, UNITS.km),
    apoapsis: '',
    inclination: '',
    departAfter: formatTime(cal, after),
    departBefore: '',
    truthModel: plan.truthModel ?? 'conic',
  };
  return withDepartureRange(system, form);
}

/** The form with "Depart before" set one repeat period after "Depart after" (unchanged when either is unreadable). */
export function withDepartureRange(system: StarSystem, form: RouteForm): RouteForm {
  const after = parseTime(ROUTE_FIELD_LABELS.departAfter, form.departAfter, system.calendar);
  const period = repeatPeriod(system, form.from, form.to);
  if (!after.ok || after.value === null || period === null) return form;
  return { ...form, departBefore: formatTime(system.calendar, after.value + period) };
}

/** The form after choosing From: its altitude offered anew and the departure range refitted. */
export function chooseFrom(system: StarSystem, plan: Plan, form: RouteForm, id: string): RouteForm {
  return withDepartureRange(system, { ...form, from: id, fromAltitude: formatNumber(fromAltitudeDefault(system, plan, id), UNITS.km) });
}

/** The form after choosing To: the periapsis offered at its safe altitude and the departure range refitted. */
export function chooseTo(system: StarSystem, form: RouteForm, id: string): RouteForm {
  return withDepartureRange(system, { ...form, to: id, periapsis: formatNumber(bodyById(system, id)?.safeAlt ?? 0, UNITS.km) });
}

export type RouteFieldErrors = Partial<Record<RouteField, string>>;

export type ReadRoute = { ok: true; intent: RouteIntent } | { ok: false; errors: RouteFieldErrors };

const km = (m: number): string => `${formatNumber(m, UNITS.km)} km`;

/**
 * The intent the form means, for the open plan's vehicle and reserve; or every field's problem
 * in the form's words ("Periapsis altitude must be at least 8 km, Skerry's safe altitude").
 */
export function readRouteForm(system: StarSystem, plan: Plan, form: RouteForm): ReadRoute {
  const L = ROUTE_FIELD_LABELS;
  const errors: RouteFieldErrors = {};
  const from = bodyById(system, form.from);
  const to = bodyById(system, form.to);
  if (!from) errors.from = `${L.from}: choose a planet or moon`;
  if (!to) errors.to = `${L.to}: choose a planet or moon`;
  else if (from && to === from) errors.to = `${L.to} must be another body than ${from.name}`;

  const number = (field: RouteField, opts: { nullable?: boolean } = {}, unit: typeof UNITS.km | typeof UNITS.deg = UNITS.km): number | null => {
    const r = parseNumber(L[field], form[field], unit, opts);
    if (!r.ok) {
      errors[field] = r.message;
      return null;
    }
    return r.value;
  };
  const altitude = number('fromAltitude');
  if (altitude !== null && from && altitude < from.safeAlt)
    errors.fromAltitude = `${L.fromAltitude} must be at least ${km(from.safeAlt)}, ${from.name}'s safe altitude`;
  const fromInc = number('fromInclination', { nullable: true }, UNITS.deg);
  if (fromInc !== null && !(fromInc >= 0 && fromInc <= Math.PI)) errors.fromInclination = `${L.fromInclination} must be from 0° to 180°, or empty for any`;
  const peri = number('periapsis');
  if (peri !== null && to && peri < to.safeAlt) errors.periapsis = `${L.periapsis} must be at least ${km(to.safeAlt)}, ${to.name}'s safe altitude`;
  const apo = number('apoapsis', { nullable: true });
  if (apo !== null && peri !== null && apo < peri)
    errors.apoapsis = `${L.apoapsis} must be at least the periapsis altitude (${km(peri)}), or empty for a circular orbit`;
  const inc = number('inclination', { nullable: true }, UNITS.deg);
  if (inc !== null && !(inc >= 0 && inc <= Math.PI)) errors.inclination = `${L.inclination} must be from 0° to 180°, or empty for any`;

  const cal = system.calendar;
  const date = (field: 'departAfter' | 'departBefore'): number | null => {
    const r = parseTime(L[field], form[field], cal);
    if (!r.ok || r.value === null) {
      errors[field] = r.ok ? `${L[field]} is required` : r.message;
      return null;
    }
    return r.value;
  };
  const after = date('departAfter');
  const before = date('departBefore');
  if (after !== null && before !== null && !(before > after))
    errors.departBefore = `${L.departBefore} must be later than ${L.departAfter.toLowerCase()} (${formatTime(cal, after)})`;
  if (!TRUTH_MODELS.includes(form.truthModel)) errors.truthModel = `${L.truthModel}: choose one of the list`;

  if (Object.keys(errors).length > 0 || !from || !to || altitude === null || peri === null || after === null || before === null) return { ok: false, errors };
  return {
    ok: true,
    intent: {
      from: { body: from.id, altitude, inclination: fromInc },
      to: { body: to.id, periapsisAltitude: peri, apoapsisAltitude: apo, inclination: inc },
      departAfter: after,
      departBefore: before,
      vehicle: structuredClone(plan.vehicle),
      reserve: structuredClone(plan.reserve),
      name: `${from.name} to ${to.name}`,
      truthModel: form.truthModel,
    },
  };
}

// The route builder's intent fields, as the form shows them.
const INTENT_FIELDS: Record<string, RouteField> = {
  from: 'from',
  'from.body': 'from',
  'from.altitude': 'fromAltitude',
  'from.inclination': 'fromInclination',
  to: 'to',
  'to.body': 'to',
  'to.periapsisAltitude': 'periapsis',
  'to.apoapsisAltitude': 'apoapsis',
  'to.inclination': 'inclination',
  departAfter: 'departAfter',
  departBefore: 'departBefore',
  truthModel: 'truthModel',
};

// What each kind of solver failure (core/math SolverReason) means for a route, in the user's words.
const SOLVER_WORDS: Record<string, string> = {
  'no-solution': 'No route was found',
  'no-convergence': 'The burns could not be targeted: the search for them did not settle',
  'no-bracket': 'No departure time in the range gives a transfer',
  'step-underflow': 'The flight could not be followed to its end: the steps became too small',
  'step-budget': 'The flight could not be followed to its end in the steps allowed',
  'non-finite': 'The calculation ran out of range',
  cancelled: 'The route was cancelled',
  singular: 'The geometry has no single answer (a transfer of exactly half a revolution, say)',
  'precision-lost': 'The numbers are beyond what the calculation can resolve',
  collision: 'The path falls into a body',
};
// "route: no-solution: detail", as core/math SolverError writes its message (the worker passes the message on).
const SOLVER_MESSAGE = /^([a-z][\w-]*): ([a-z-]+): ([\s\S]*)$/;

/** A message with any field path left in it ("events[4].dv") named in words ("the Δv of event 5"). */
function pathsInWords(text: string, system: StarSystem): string {
  const named = issueInWords({ path: 'route', rule: text }, null, system).rule;
  // any path core/io does not name: items counted from 1, dots as spaces ("hops[1]" → "hop 2")
  return named.replace(
    /\b([A-Za-z_]+)s?\[(\d+)\]((?:\.[A-Za-z_]+)*)/g,
    (_m, list: string, k: string, rest: string) => `${list.replace(/s$/, '')} ${Number(k) + 1}${rest.replace(/\./g, ' ')}`,
  );
}

/**
 * The route builder's refusal or failure in the user's words. An InputError(field, rule) lands
 * at the form's field, in its words and units (core/io issueInWords writes SI values as the
 * fields show them); a field the form does not show (the vehicle, the reserve) gives `field` null
 * and a sentence naming it. A SolverError (or its message passed on by the worker) reads as what
 * its reason means for the route, then the solver's own detail; no field path or reason code is
 * left in either.
 */
export function routeErrorAtField(err: unknown, system: StarSystem, plan: Plan): { field: RouteField | null; message: string } {
  if (!(err instanceof InputError)) {
    const raw = err instanceof Error ? err.message : String(err);
    const m = SOLVER_MESSAGE.exec(raw);
    const reason = m && SOLVER_WORDS[m[2]] !== undefined ? m[2] : null;
    const detail = pathsInWords(reason ? m![3] : raw, system).trim();
    if (!reason) return { field: null, message: detail };
    const head = SOLVER_WORDS[reason];
    // the detail, when there is one, says where and why; a head alone ends the sentence
    return { field: null, message: detail ? `${head}: ${detail}` : `${head}.` };
  }
  const field = INTENT_FIELDS[err.field] ?? null;
  // a date's value would read as plain seconds: the field shows the date itself
  const value = field === 'departAfter' || field === 'departBefore' ? undefined : err.value;
  const words = issueInWords({ path: err.field, rule: err.rule, value }, plan, system);
  if (field) return { field, message: pathsInWords(`${ROUTE_FIELD_LABELS[field]} ${words.rule}`, system) };
  return { field: null, message: pathsInWords(words.text, system) };
}
