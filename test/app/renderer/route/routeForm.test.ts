import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parsePlanFile, parseSystemFile } from '../../../../core/io/index.ts';
import { InputError, SolverError } from '../../../../core/math/index.ts';
import {
  chooseFrom,
  chooseTo,
  defaultRouteForm,
  readRouteForm,
  repeatPeriod,
  routeBodies,
  routeErrorAtField,
  type RouteForm,
} from '../../../../app/renderer/route/routeForm.ts';
import { parseTime } from '../../../../app/renderer/plan/fieldText.ts';

const root = new URL('../../../../', import.meta.url);
const systemText = readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8');
const system = parseSystemFile(systemText).system;
const plan = parsePlanFile(readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8')).plan;
const file = JSON.parse(systemText) as {
  star: { mu_m3_s2: number };
  bodies: { id: string; parent: string; mu_m3_s2: number; orbit: { a_m: number }; min_safe_altitude_m: number }[];
};

/** Orbital period from the system file's own numbers, Kepler's third law with μ_parent + μ_body (the model's two-body form). */
function filePeriod(id: string): number {
  const b = file.bodies.find((x) => x.id === id)!;
  const parentMu = b.parent === 'ilmar' ? file.star.mu_m3_s2 : file.bodies.find((x) => x.id === b.parent)!.mu_m3_s2;
  return 2 * Math.PI * Math.sqrt(b.orbit.a_m ** 3 / (parentMu + b.mu_m3_s2));
}
const seconds = (text: string): number => {
  const r = parseTime('date', text, system.calendar);
  if (!r.ok || r.value === null) throw new Error(`not a date: ${text}`);
  return r.value;
};

describe('the route form', () => {
  it('offers every planet and moon once, each moon right under its planet and indented', () => {
    const list = routeBodies(system);
    expect(list.map((b) => b.id).sort()).toEqual(file.bodies.map((b) => b.id).sort());
    for (const [k, b] of list.entries()) {
      const f = file.bodies.find((x) => x.id === b.id)!;
      if (f.parent === 'ilmar') {
        expect(b.depth).toBe(1);
        expect(b.label).toBe(b.name);
      } else {
        expect(b.depth).toBe(2);
        // its parent comes before it, with only the parent's other moons between
        const p = list.findIndex((x) => x.id === f.parent);
        expect(p).toBeLessThan(k);
        for (const between of list.slice(p + 1, k)) expect(file.bodies.find((x) => x.id === between.id)!.parent).toBe(f.parent);
        expect(b.label.endsWith(b.name)).toBe(true);
        expect(b.label.length).toBeGreaterThan(b.name.length);
      }
    }
  });

  it('starts from the plan: its start body and altitude, its target body at the safe altitude, its epoch and one synodic period later', () => {
    const f = defaultRouteForm(system, plan);
    expect(plan.start.kind).toBe('parking');
    expect(f.from).toBe(plan.start.body);
    expect(Number(f.fromAltitude) * 1000).toBeCloseTo((plan.start as { periapsisAltitude: number }).periapsisAltitude, 6);
    expect(f.to).toBe(plan.target!.body);
    expect(Number(f.periapsis) * 1000).toBe(file.bodies.find((b) => b.id === f.to)!.min_safe_altitude_m);
    expect(f.apoapsis).toBe('');
    expect(f.inclination).toBe('');
    expect(f.fromInclination).toBe('');
    expect(f.truthModel).toBe(plan.truthModel ?? 'conic');
    // the range: the plan's epoch to one synodic period of Tessel and Ochre, 1/|1/T1 − 1/T2|
    // (analytic); the fields show whole seconds, so the read-back is within half a second
    const synodic = 1 / Math.abs(1 / filePeriod('tessel') - 1 / filePeriod('ochre'));
    expect(Math.abs(seconds(f.departAfter) - plan.start.epoch)).toBeLessThanOrEqual(0.5);
    expect(Math.abs(seconds(f.departBefore) - seconds(f.departAfter) - synodic)).toBeLessThanOrEqual(1);
  });

  it('repeats a transfer with the synodic period of the bodies (or their planets), and a moon from its planet with the moon', () => {
    // Tessel to Skerry: Skerry rides with Moravel, so Tessel and Moravel set the phase
    const viaPlanets = 1 / Math.abs(1 / filePeriod('tessel') - 1 / filePeriod('moravel'));
    // relative 1e-12: the same formula from the same numbers, only rounding differs
    expect(repeatPeriod(system, 'tessel', 'skerry')! / viaPlanets).toBeCloseTo(1, 12);
    expect(repeatPeriod(system, 'tessel', 'quill')! / filePeriod('quill')).toBeCloseTo(1, 12);
    expect(repeatPeriod(system, 'quill', 'tessel')! / filePeriod('quill')).toBeCloseTo(1, 12);
    const moons = 1 / Math.abs(1 / filePeriod('skerry') - 1 / filePeriod('lough'));
    expect(repeatPeriod(system, 'skerry', 'lough')! / moons).toBeCloseTo(1, 12);
    expect(repeatPeriod(system, 'tessel', 'tessel')).toBeNull();
    expect(repeatPeriod(system, 'tessel', 'nowhere')).toBeNull();
  });

  it('choosing To offers its safe altitude and refits the range; choosing From offers its safe altitude unless the plan starts there', () => {
    const f = chooseTo(system, defaultRouteForm(system, plan), 'skerry');
    expect(Number(f.periapsis) * 1000).toBe(file.bodies.find((b) => b.id === 'skerry')!.min_safe_altitude_m);
    const viaPlanets = 1 / Math.abs(1 / filePeriod('tessel') - 1 / filePeriod('moravel'));
    expect(Math.abs(seconds(f.departBefore) - seconds(f.departAfter) - viaPlanets)).toBeLessThanOrEqual(1);
    const g = chooseFrom(system, plan, f, 'ochre');
    expect(Number(g.fromAltitude) * 1000).toBe(file.bodies.find((b) => b.id === 'ochre')!.min_safe_altitude_m);
    expect(chooseFrom(system, plan, g, 'tessel').fromAltitude).toBe(f.fromAltitude);
  });

  it('reads the form into an intent in SI units with the plan’s vehicle and reserve', () => {
    const form: RouteForm = {
      ...defaultRouteForm(system, plan),
      from: 'tessel',
      fromAltitude: '300',
      to: 'skerry',
      periapsis: '500',
      apoapsis: '1 200',
      inclination: '30',
      departAfter: '412-149',
      departBefore: '413-100T12:00',
      truthModel: 'finite',
    };
    const r = readRouteForm(system, plan, form);
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const i = r.intent;
    expect(i.from).toEqual({ body: 'tessel', altitude: 300_000, inclination: null });
    expect(i.to.body).toBe('skerry');
    expect(i.to.periapsisAltitude).toBe(500_000);
    expect(i.to.apoapsisAltitude).toBe(1_200_000);
    expect(i.to.inclination).toBeCloseTo(Math.PI / 6, 14);
    expect(i.departAfter).toBe(seconds('412-149'));
    expect(i.departBefore).toBe(seconds('413-100T12:00'));
    expect(i.vehicle).toEqual(plan.vehicle);
    expect(i.vehicle).not.toBe(plan.vehicle);
    expect(i.reserve).toEqual(plan.reserve);
    expect(i.truthModel).toBe('finite');
    expect(i.name).toBe('Tessel to Skerry');
    // empty apoapsis and inclination: circular, any inclination
    const c = readRouteForm(system, plan, { ...form, apoapsis: ' ', inclination: '' });
    expect(c.ok && c.intent.to.apoapsisAltitude === null && c.intent.to.inclination === null).toBe(true);
    // the departure orbit's inclination, degrees to radians (51.6° = 51.6·π/180; 1e-14: one rounding)
    const d = readRouteForm(system, plan, { ...form, fromInclination: '51.6' });
    if (!d.ok) throw new Error(JSON.stringify(d.errors));
    expect(d.intent.from.body).toBe('tessel');
    expect(d.intent.from.altitude).toBe(300_000);
    expect(d.intent.from.inclination! / ((51.6 * Math.PI) / 180)).toBeCloseTo(1, 14);
  });

  it('refuses bad input at each field in the form’s words, never a NaN', () => {
    const base = { ...defaultRouteForm(system, plan), to: 'skerry' };
    const bad = (patch: Partial<RouteForm>) => {
      const r = readRouteForm(system, plan, { ...base, ...patch });
      if (r.ok) throw new Error('accepted');
      for (const m of Object.values(r.errors)) expect(m).not.toMatch(/NaN|undefined|Infinity/);
      return r.errors;
    };
    expect(bad({ fromAltitude: '' }).fromAltitude).toBe('Orbit altitude is required');
    expect(bad({ fromAltitude: 'abc' }).fromAltitude).toMatch(/^Orbit altitude/);
    expect(bad({ fromAltitude: '50' }).fromAltitude).toBe("Orbit altitude must be at least 90 km, Tessel's safe altitude");
    expect(bad({ to: 'tessel' }).to).toBe('To must be another body than Tessel');
    expect(bad({ to: 'ilmar' }).to).toBe('To: choose a planet or moon');
    expect(bad({ periapsis: '2' }).periapsis).toBe("Periapsis altitude must be at least 8 km, Skerry's safe altitude");
    expect(bad({ periapsis: '500', apoapsis: '400' }).apoapsis).toBe(
      'Apoapsis altitude must be at least the periapsis altitude (500 km), or empty for a circular orbit',
    );
    expect(bad({ inclination: '181' }).inclination).toBe('Inclination must be from 0° to 180°, or empty for any');
    expect(bad({ fromInclination: '-1' }).fromInclination).toBe('Orbit inclination must be from 0° to 180°, or empty for any');
    expect(bad({ fromInclination: 'polar' }).fromInclination).toMatch(/^Orbit inclination\b/);
    expect(bad({ departAfter: 'soon' }).departAfter).toMatch(/^Depart after /);
    expect(bad({ departAfter: '413-001', departBefore: '412-200' }).departBefore).toBe('Depart before must be later than depart after (413-001T00:00:00)');
    // every problem at once
    expect(Object.keys(bad({ fromAltitude: '', periapsis: '', departBefore: '' })).sort()).toEqual(['departBefore', 'fromAltitude', 'periapsis']);
  });

  it("puts the route builder's refusal at the form's field in its units, and names a field the form does not show", () => {
    const at = routeErrorAtField(new InputError('to.periapsisAltitude', "must be below 3 000 km (half Skerry's sphere of influence)", 4_000_000), system, plan);
    expect(at.field).toBe('periapsis');
    expect(at.message).toBe("Periapsis altitude must be below 3 000 km (half Skerry's sphere of influence) (got 4\u202f000 km)"); // issueInWords groups digits with a narrow no-break space
    const date = routeErrorAtField(new InputError('departBefore', 'must be after the earliest departure (an empty date range)', 1e7), system, plan);
    expect(date).toEqual({ field: 'departBefore', message: 'Depart before must be after the earliest departure (an empty date range)' });
    const other = routeErrorAtField(new InputError('vehicle.stages[0].isp', 'must be > 0', 0), system, plan);
    expect(other.field).toBeNull();
    expect(other.message).toMatch(/Isp/);
    expect(routeErrorAtField(new Error('no window in the range'), system, plan)).toEqual({ field: null, message: 'no window in the range' });
    const inc = routeErrorAtField(new InputError('from.inclination', 'must be an inclination from 0 to 180°', 4), system, plan);
    expect(inc.field).toBe('fromInclination');
    expect(inc.message).toMatch(/^Orbit inclination must be an inclination from 0 to 180°/);
  });

  it("reads a solver's failure as what it means for the route, with no reason code or field path left", () => {
    // a solver's failure as the worker passes it on (its message only): the reason as a sentence, then its detail
    const passedOn = (e: SolverError) => routeErrorAtField(new Error(e.message), system, plan);
    expect(passedOn(new SolverError('route', 'no-solution', 'no transfer from Tessel to Ochre found in the date range'))).toEqual({
      field: null,
      message: 'No route was found: no transfer from Tessel to Ochre found in the date range',
    });
    expect(routeErrorAtField(new SolverError('route', 'no-solution', 'no window between the dates'), system, plan)).toEqual({
      field: null,
      message: 'No route was found: no window between the dates',
    });
    const reasons = ['no-convergence', 'step-underflow', 'step-budget', 'no-bracket', 'non-finite', 'singular', 'precision-lost', 'collision'] as const;
    const heads = new Set<string>();
    for (const reason of reasons) {
      const m = passedOn(new SolverError('lambert', reason, 'at the second hop')).message;
      expect(m).not.toMatch(new RegExp(`lambert|${reason}`));
      expect(m).toMatch(/^[A-Z].*: at the second hop$/);
      heads.add(m);
    }
    // each reason its own sentence
    expect(heads.size).toBe(reasons.length);
    // a field path in the detail is named in words
    const path = passedOn(new SolverError('route', 'no-solution', 'events[4].dv must be finite; hops[1] failed')).message;
    expect(path).not.toMatch(/\[\d+\]|events|no-solution|route:/);
    expect(path).toMatch(/event 5/);
    expect(path).toMatch(/hop 2/);
    // an InputError of a field the form does not show: named, never its path
    const reserve = routeErrorAtField(new InputError('reserve', 'must hold a percent and an absolute amount, both at least 0', -1), system, plan);
    expect(reserve.field).toBeNull();
    expect(reserve.message).not.toMatch(/\[\d+\]/);
  });
});
