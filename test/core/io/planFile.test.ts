import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ValidationError, type ValidationIssue } from '../../../core/math/errors.ts';
import {
  PLAN_MIGRATIONS,
  checkPlanAgainstSystem,
  degreesForFile,
  parsePlanFile,
  serializePlanFile,
  type PlanMigration,
  type PlanSystemRef,
} from '../../../core/io/planFile.ts';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import type { Plan } from '../../../core/plan/plan.ts';
import { planTruthModel } from '../../../core/plan/index.ts';
import { samplePlan, stateStartPlan } from './planSamples.ts';
import { MAX_PLAN_YEARS_FROM_EPOCH } from '../../../core/system/index.ts';

type Doc = Record<string, any>;
const SYSTEM_TEXT = readFileSync(new URL('../../../assets/systems/ilmar.system.json', import.meta.url), 'utf8');
const ilmar = parseSystemFile(SYSTEM_TEXT).system;
const PATH_REF: PlanSystemRef = { kind: 'path', path: '../systems/ilmar.system.json' };

function issuesOf(text: string, migrations?: Record<number, PlanMigration>): ValidationIssue[] {
  try {
    parsePlanFile(text, migrations ? { migrations } : {});
  } catch (e) {
    expect(e).toBeInstanceOf(ValidationError);
    expect((e as ValidationError).what).toBe('plan file');
    return (e as ValidationError).issues;
  }
  throw new Error('file loaded but should not have');
}

const sampleText = () => serializePlanFile(samplePlan(), PATH_REF);
function edited(edit: (d: Doc) => void): string {
  const d = JSON.parse(sampleText()) as Doc;
  edit(d);
  return JSON.stringify(d, null, 2);
}
const errorsOnly = (issues: ValidationIssue[]) => issues.filter((i) => i.severity === 'error').map((i) => `${i.path}: ${i.rule}`);

describe('plan file round trip', () => {
  it('save → open gives an equal Plan and open → save the same bytes', () => {
    for (const plan of [samplePlan(), stateStartPlan()]) {
      const text = serializePlanFile(plan, PATH_REF);
      const back = parsePlanFile(text);
      expect(back.plan).toEqual(plan);
      expect(back.system).toEqual(PATH_REF);
      expect(back.fileVersion).toBe(1);
      expect(serializePlanFile(back.plan, back.system)).toBe(text);
    }
  });

  it('writes stable key order, 2-space indent, a trailing newline and degrees as written', () => {
    const text = sampleText();
    expect(text.endsWith('}\n')).toBe(true);
    expect(text.startsWith('{\n  "format": "waymark-plan",\n  "version": 1,\n  "name": "Sample run",')).toBe(true);
    expect(text).toContain('"i_deg": 28.5,');
    expect(text).toContain('"nu_deg": -45');
    expect(text).toContain('"i_deg": 0.5');
    expect(text).toContain('"dv_mps": [1.25, -0.5, 0.1]');
    expect(text).toContain('"epoch_s": 3.25e7');
    const keys = Object.keys(JSON.parse(text));
    expect(keys).toEqual(['format', 'version', 'name', 'description', 'system', 'vehicle', 'start', 'events', 'target', 'reserve', 'end_s']);
  });

  it('a hand-written file with the optional fields left out loads with the documented defaults', () => {
    const d = JSON.parse(sampleText()) as Doc;
    delete d.description;
    delete d.end_s;
    for (const k of ['e', 'i_deg', 'raan_deg', 'argp_deg', 'nu_deg']) delete d.start[k];
    delete d.events[2].solve;
    delete d.events[2].mode;
    delete d.events[2].pointing;
    delete d.target.e;
    delete d.target.apoapsis_altitude_m;
    delete d.target.i_deg;
    const { plan } = parsePlanFile(JSON.stringify(d));
    expect(plan.description).toBe('');
    expect(plan.end).toBeNull();
    expect(plan.start).toMatchObject({ e: 0, i: 0, raan: 0, argp: 0, nu: 0 });
    expect(plan.events[2]).toMatchObject({ solve: { kind: 'fixed' }, mode: 'impulsive', pointing: 'velocity' });
    expect(plan.target).toMatchObject({ e: null, apoapsisAltitude: null, i: null });
    // Saving writes the defaults out; the saved file then round-trips byte for byte.
    const saved = serializePlanFile(plan, PATH_REF);
    expect(saved).toContain('"description": ""');
    expect(serializePlanFile(parsePlanFile(saved).plan, PATH_REF)).toBe(saved);
  });

  it('accepts an editor "$schema" pointer and does not write it back', () => {
    const text = edited((d) => (d.$schema = '../schema/plan.schema.json'));
    const back = parsePlanFile(text);
    expect(back.plan).toEqual(samplePlan());
    expect(serializePlanFile(back.plan, back.system)).toBe(sampleText());
  });

  it('keeps -0 and the extreme doubles exactly', () => {
    const p = stateStartPlan();
    p.start = {
      ...p.start,
      kind: 'state',
      r: [-0, Number.MIN_VALUE, Number.MAX_VALUE / 1e300],
      v: [5e-324, -1.7976931348623155e-308 * 1e300, 1 / 3],
    } as Plan['start'];
    const text = serializePlanFile(p, PATH_REF);
    const back = parsePlanFile(text).plan;
    expect(back).toEqual(p);
    expect(Object.is((back.start as { r: number[] }).r[0], -0)).toBe(true);
  });

  it('property: random plans round-trip exactly (equal Plan, then identical bytes)', () => {
    const num = fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e12, max: 1e12 });
    const degAngle = fc.double({ noNaN: true, noDefaultInfinity: true, min: -360, max: 360 });
    const incl = fc.double({ noNaN: true, noDefaultInfinity: true, min: 0, max: 180 });
    fc.assert(
      fc.property(num, num, num, degAngle, degAngle, incl, incl, (a, b, c, raan, nu, i, j) => {
        const p = samplePlan();
        const rad = Math.PI / 180;
        p.start = { kind: 'parking', body: 'tessel', epoch: 0, periapsisAltitude: Math.abs(a), e: 0, i: i * rad, raan: raan * rad, argp: 0, nu: nu * rad };
        p.events = [
          {
            type: 'burn',
            id: 'b',
            name: 'b',
            t: Math.abs(b),
            frame: 'inertial',
            dv: [a, b, c],
            solve: { kind: 'plane', i: j * rad },
            mode: 'impulsive',
            pointing: 'velocity',
          },
        ];
        p.end = null;
        const text = serializePlanFile(p, PATH_REF);
        const back = parsePlanFile(text).plan;
        expect(back).toEqual(p);
        expect(serializePlanFile(back, PATH_REF)).toBe(text);
      }),
      { numRuns: 300 },
    );
  });

  it('property: any radian value reads back within 1 ulp, and the bytes are stable from the first save', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true, min: -2 * Math.PI, max: 2 * Math.PI }), (x) => {
        const d = degreesForFile(x);
        const back = d * (Math.PI / 180);
        const ulp = Math.max(Number.MIN_VALUE, Math.abs(x) * Number.EPSILON);
        expect(Math.abs(back - x)).toBeLessThanOrEqual(ulp);
        expect(degreesForFile(back)).toBe(d);
      }),
      { numRuns: 2000 },
    );
  });

  it('degreesForFile writes round values as the shortest decimal', () => {
    for (const d of [0.1, 1, 28.5, 45, 90, 123.456, 180, -12.75, 359.999]) expect(degreesForFile(d * (Math.PI / 180))).toBe(d);
  });

  it('embedded system: round trip of bytes, and the embedded text is the system-file serialiser output', () => {
    const ref: PlanSystemRef = { kind: 'embedded', system: ilmar };
    const text = serializePlanFile(samplePlan(), ref);
    const back = parsePlanFile(text);
    expect(back.system.kind).toBe('embedded');
    expect(serializePlanFile(back.plan, back.system)).toBe(text);
    expect(back.plan).toEqual(samplePlan());
    const d = JSON.parse(text) as Doc;
    expect(d.system.embedded.format).toBe('waymark-system');
    expect(d.system.embedded.bodies.length).toBe(ilmar.bodies.length - 1);
    expect(text).toContain('\n  "system": {\n    "embedded": {\n      "format": "waymark-system",');
  });

  it('truth_model: each of the three values round-trips, written last, and an unset one is not written', () => {
    for (const m of ['conic', 'finite', 'nbody'] as const) {
      const plan: Plan = { ...samplePlan(), truthModel: m };
      const text = serializePlanFile(plan, PATH_REF);
      expect(text).toContain(`\n  "truth_model": "${m}"\n}\n`);
      const back = parsePlanFile(text).plan;
      expect(back.truthModel).toBe(m);
      expect(back).toEqual(plan);
      expect(serializePlanFile(back, PATH_REF)).toBe(text);
    }
    expect(sampleText()).not.toContain('truth_model');
  });

  it('truth_model: a file without it loads with no truth model set (the plan default, conic)', () => {
    expect('truth_model' in JSON.parse(sampleText())).toBe(false);
    const { plan } = parsePlanFile(sampleText());
    expect('truthModel' in plan).toBe(false);
    expect(planTruthModel(plan)).toBe('conic');
  });

  it('refuses to write non-finite numbers, naming the file field', () => {
    const p = samplePlan();
    p.vehicle.stages[1].isp = Number.NaN;
    expect(() => serializePlanFile(p, PATH_REF)).toThrow(/vehicle\.stages\[1\]\.isp_s cannot be written: NaN/);
  });
});

// Sample event indices: 0 depart (transfer), 1 cruise-1 (until time), 2 mcc (fixed), 3 drop-kick (stage),
// 4 to-soi, 5 to-peri, 6 capture, 7 to-node, 8 plane, 9 to-apo, 10 circ, 11 low, 12 settle.
const BAD_FILES: { name: string; text: () => string; expected: string[] }[] = [
  {
    name: 'an unknown truth model',
    text: () => edited((d) => (d.truth_model = 'exact')),
    expected: ['truth_model: must be one of: "conic", "finite", "nbody"'],
  },
  {
    name: 'a truth model that is not a string',
    text: () => edited((d) => (d.truth_model = 2)),
    expected: ['truth_model: must be one of: "conic", "finite", "nbody"'],
  },
  { name: 'not JSON', text: () => '{ "format": "waymark-plan",', expected: [': is not valid JSON'] },
  { name: 'JSON but not an object', text: () => '"plan"', expected: [': must be a JSON object'] },
  { name: 'missing format', text: () => edited((d) => delete d.format), expected: ['format: is required (must be "waymark-plan")'] },
  {
    name: 'unknown format',
    text: () => edited((d) => (d.format = 'flight-plan')),
    expected: ['format: must be "waymark-plan" (got "flight-plan"); this is not a plan file'],
  },
  {
    name: 'a system file opened as a plan',
    text: () => SYSTEM_TEXT,
    expected: ['format: must be "waymark-plan" (got "waymark-system"); this is a system file, not a plan file'],
  },
  {
    name: 'version from the future',
    text: () => edited((d) => (d.version = 2)),
    expected: ['version: is 2, newer than this program reads (up to 1); use a newer Waymark'],
  },
  { name: 'version missing', text: () => edited((d) => delete d.version), expected: ['version: is required'] },
  { name: 'version not an integer', text: () => edited((d) => (d.version = 1.5)), expected: ['version: must be an integer (got 1.5)'] },
  {
    name: 'version older than any migration',
    text: () => edited((d) => (d.version = 0)),
    expected: ['version: is 0, which this program cannot read or migrate (it reads 1)'],
  },
  { name: 'Δv component not a number', text: () => edited((d) => (d.events[2].dv_mps[0] = 'fast')), expected: ['events[2].dv_mps[0]: must be a number'] },
  { name: 'Δv with two components', text: () => edited((d) => (d.events[2].dv_mps = [1, 2])), expected: ['events[2].dv_mps: must have exactly 3 items'] },
  {
    name: 'negative propellant',
    text: () => edited((d) => (d.vehicle.stages[0].propellant_kg = -1)),
    expected: ['vehicle.stages[0].propellant_kg: must be >= 0'],
  },
  { name: 'zero Isp', text: () => edited((d) => (d.vehicle.stages[1].isp_s = 0)), expected: ['vehicle.stages[1].isp_s: must be > 0'] },
  {
    name: 'no stages',
    text: () => edited((d) => (d.vehicle.stages = [])),
    // The staging event is checked too though the schema refused the stages: every problem at once.
    expected: ['vehicle.stages: must not be empty', 'events[3]: drops a stage but none is left'],
  },
  { name: 'missing thrust', text: () => edited((d) => delete d.vehicle.stages[0].thrust_N), expected: ['vehicle.stages[0].thrust_N: is required'] },
  { name: 'unknown field', text: () => edited((d) => (d.events[6].foo = 1)), expected: ['events[6]: unknown field "foo"'] },
  { name: 'unknown top-level field', text: () => edited((d) => (d.speed = 3)), expected: [': unknown field "speed"'] },
  { name: 'field in radians by mistake', text: () => edited((d) => (d.start.i = 0.5)), expected: ['start: unknown field "i"'] },
  {
    name: 'bad frame',
    text: () => edited((d) => (d.events[2].frame = 'lvlh')),
    expected: ['events[2].frame: must be one of: "vnb", "rtn", "inertial"'],
  },
  {
    name: 'bad event type',
    text: () => edited((d) => (d.events[1].type = 'wait')),
    expected: ['events[1].type: must be one of: "burn", "coast", "stage"'],
  },
  {
    name: 'bad coast condition',
    text: () => edited((d) => (d.events[4].until.kind = 'forever')),
    expected: ['events[4].until.kind: must be one of: "time", "duration", "periapsis", "apoapsis", "soi-change", "altitude", "node"'],
  },
  { name: 'transfer without arrival', text: () => edited((d) => delete d.events[0].solve.arrive_s), expected: ['events[0].solve.arrive_s: is required'] },
  { name: 'capture into a hyperbola', text: () => edited((d) => (d.events[6].solve.e = 1.2)), expected: ['events[6].solve.e: must be < 1'] },
  { name: 'inclination over 180', text: () => edited((d) => (d.target.i_deg = 190)), expected: ['target.i_deg: must be <= 180'] },
  { name: 'burn time as a string', text: () => edited((d) => (d.events[0].t_s = '3.26e7')), expected: ['events[0].t_s: must be a number or null'] },
  { name: 'zero-length coast', text: () => edited((d) => (d.events[12].until.dt_s = 0)), expected: ['events[12].until.dt_s: must be > 0'] },
  { name: 'reserve over 100 %', text: () => edited((d) => (d.reserve.percent = 150)), expected: ['reserve.percent: must be <= 100'] },
  {
    name: 'bad event id',
    text: () => edited((d) => (d.events[3].id = 'Drop Kick')),
    expected: ['events[3].id: must be a lowercase slug (a-z, 0-9 and single hyphens, starting with a letter)'],
  },
  {
    name: 'number too big for a double',
    text: () => sampleText().replace('"payload_kg": 1500', '"payload_kg": 1e999'),
    expected: ['vehicle.payload_kg: is too large'],
  },
  {
    name: 'both system forms',
    text: () => edited((d) => (d.system = { path: 'a.json', embedded: {} })),
    expected: ['system: needs exactly one of "path" and "embedded"'],
  },
  { name: 'no system', text: () => edited((d) => delete d.system), expected: ['system: is required'] },
  {
    name: 'several problems at once',
    text: () =>
      edited((d) => {
        d.vehicle.payload_kg = -5;
        d.events[2].frame = 'x';
        delete d.reserve.percent;
      }),
    expected: ['vehicle.payload_kg: must be >= 0', 'events[2].frame: must be one of: "vnb", "rtn", "inertial"', 'reserve.percent: is required'],
  },
  // Semantic checks (after the schema).
  {
    name: 'duplicate event id',
    text: () => edited((d) => (d.events[5].id = 'cruise-1')),
    expected: ['events[5].id: must be unique ("cruise-1" is also the id of events[1])'],
  },
  {
    name: 'burn before the start',
    text: () => edited((d) => (d.events[0].t_s = 1e7)),
    expected: ['events[0].t_s: must not be earlier than start.epoch_s (32500000 s)'],
  },
  {
    name: 'times out of order',
    text: () => edited((d) => (d.events[1].until.t_s = 3.255e7)),
    expected: ['events[1].until.t_s: must not be earlier than events[0].t_s (32600000 s)'],
  },
  {
    name: 'arrival before departure',
    text: () => edited((d) => (d.events[0].solve.arrive_s = 3.2e7)),
    expected: ['events[0].solve.arrive_s: must be later than events[0].t_s (32600000 s)'],
  },
  {
    name: 'end before the last event',
    text: () => edited((d) => (d.end_s = 3.3e7)),
    expected: ['end_s: must not be earlier than events[1].until.t_s (40000000 s)'],
  },
  {
    name: 'both e and apoapsis in the target',
    text: () => edited((d) => (d.target.apoapsis_altitude_m = 5e5)),
    expected: ['target: must give "e" or "apoapsis_altitude_m", not both'],
  },
  {
    name: 'apoapsis below periapsis',
    text: () =>
      edited((d) => {
        d.target.e = null;
        d.target.apoapsis_altitude_m = 1e5;
      }),
    expected: ['target.apoapsis_altitude_m: must be >= target.periapsis_altitude_m (400000 m)'],
  },
  {
    name: 'more staging than stages',
    text: () => edited((d) => d.events.push({ type: 'stage', id: 's2', name: 'x' }, { type: 'stage', id: 's3', name: 'y' })),
    expected: ['events[16]: drops a stage but none is left (the vehicle has 2 stages)'],
  },
  {
    name: 'vehicle without mass',
    text: () =>
      edited((d) => {
        d.vehicle.payload_kg = 0;
        d.vehicle.stages = [{ name: 'x', dry_kg: 0, propellant_kg: 0, isp_s: 300, thrust_N: 1 }];
      }),
    expected: ['vehicle: must have a total mass > 0 (payload, dry and propellant masses are all 0)'],
  },
  {
    name: 'zero position',
    text: () => serializePlanFile({ ...stateStartPlan(), start: { kind: 'state', body: 'ilmar', epoch: 0, r: [0, 0, 0], v: [1, 2, 3] } }, PATH_REF),
    expected: ['start.r_m: must not be the zero vector'],
  },
  // Embedded system problems come back under system.embedded.
  {
    name: 'embedded system with a bad field',
    text: () => {
      const d = JSON.parse(serializePlanFile(samplePlan(), { kind: 'embedded', system: ilmar })) as Doc;
      d.system.embedded.bodies[1].radius_m = -1;
      return JSON.stringify(d);
    },
    expected: ['system.embedded.bodies[1].radius_m: must be > 0'],
  },
  {
    name: 'embedded system lacks a body the plan names',
    text: () => {
      const d = JSON.parse(serializePlanFile(samplePlan(), { kind: 'embedded', system: ilmar })) as Doc;
      d.target.body = 'nowhere';
      return JSON.stringify(d);
    },
    expected: [
      'target.body: names no body of system "Ilmar" (got "nowhere"; the bodies are: ilmar, kiln, tessel, quill, ochre, moravel, skerry, lough, fennick)',
    ],
  },
];

describe('plan file: bad files', () => {
  for (const c of BAD_FILES) {
    it(`rejects ${c.name}`, () => {
      const got = errorsOnly(issuesOf(c.text()));
      for (const want of c.expected)
        expect(
          got.some((g) => g.startsWith(want)),
          `${want}\nin\n${got.join('\n')}`,
        ).toBe(true);
      expect(got.length).toBe(c.expected.length);
    });
  }

  it('the error message lists every issue with its path', () => {
    try {
      parsePlanFile(
        edited((d) => {
          d.vehicle.payload_kg = -5;
          d.events[2].dv_mps[0] = 'x';
        }),
      );
      expect.unreachable();
    } catch (e) {
      expect((e as Error).message).toBe('plan file: 2 problems\n  vehicle.payload_kg must be >= 0\n  events[2].dv_mps[0] must be a number');
    }
  });

  it('warnings do not stop the load', () => {
    const { warnings } = parsePlanFile(edited((d) => (d.events[2].dv_mps = [0, 0, 0])));
    expect(warnings.map((w) => `${w.path}: ${w.rule}`)).toEqual(['events[2].dv_mps: is zero: the burn changes nothing']);
  });
});

describe('plan file migrations', () => {
  it('the shipped table is empty (version 1 is the first format)', () => {
    expect(Object.keys(PLAN_MIGRATIONS)).toEqual([]);
  });

  it('runs a migration table one step at a time and reports the file version', () => {
    // A synthetic version 0 that wrote the reserve as a bare percentage.
    const v0 = edited((d) => {
      d.version = 0;
      d.reserve_percent = d.reserve.percent;
      delete d.reserve;
    });
    const table: Record<number, PlanMigration> = {
      0: (doc) => {
        const { reserve_percent, ...rest } = doc as Doc;
        return { ...rest, reserve: { percent: reserve_percent, absolute_mps: 0 } };
      },
    };
    const got = parsePlanFile(v0, { migrations: table });
    expect(got.fileVersion).toBe(0);
    expect(got.plan.reserve).toEqual({ percent: 5, absolute: 0 });
    // Without the table the same file is refused.
    expect(errorsOnly(issuesOf(v0))).toEqual(['version: is 0, which this program cannot read or migrate (it reads 1)']);
  });
});

describe('checkPlanAgainstSystem', () => {
  it('accepts the sample plan in the demo system', () => {
    expect(checkPlanAgainstSystem(samplePlan(), ilmar).filter((i) => i.severity === 'error')).toEqual([]);
  });

  it('names every unknown body, with file paths', () => {
    const p = samplePlan();
    p.start = { ...p.start, body: 'tesel' };
    (p.events[0] as { solve: { to: string } }).solve.to = 'ilmar';
    p.target = { ...p.target!, body: 'ocher' };
    const got = checkPlanAgainstSystem(p, ilmar).map((i) => `${i.severity} ${i.path}: ${i.rule}`);
    expect(got).toEqual([
      expect.stringMatching(/^error start\.body: names no body of system "Ilmar" \(got "tesel"/),
      'error events[0].solve.to: must name a body, not the star',
      expect.stringMatching(/^error target\.body: names no body of system "Ilmar" \(got "ocher"/),
    ]);
  });

  it('checks the body of an apsis coast and the aim altitude of a transfer', () => {
    const p = samplePlan();
    (p.events[5] as { until: { body?: string } }).until.body = 'ochra';
    (p.events[0] as { solve: { periapsisAltitude?: number } }).solve.periapsisAltitude = -1e9;
    const got = checkPlanAgainstSystem(p, ilmar).map((i) => `${i.severity} ${i.path}: ${i.rule}`);
    expect(got).toEqual([
      expect.stringMatching(/^error events\[0\]\.solve\.periapsis_altitude_m: must be > -\d+ m \(the mean radius of Ochre\)$/),
      expect.stringMatching(/^error events\[5\]\.until\.body: names no body of system "Ilmar" \(got "ochra"/),
    ]);
  });

  it('an orbit below the surface is an error, below the safe altitude a warning', () => {
    const p = samplePlan();
    p.start = { ...p.start, kind: 'parking', periapsisAltitude: 50000 } as Plan['start'];
    p.target = { ...p.target!, periapsisAltitude: -1e7 };
    const got = checkPlanAgainstSystem(p, ilmar).map((i) => `${i.severity} ${i.path}: ${i.rule}`);
    expect(got).toContain('warning start.periapsis_altitude_m: is below the minimum safe altitude of Tessel (90000 m)');
    expect(got).toContainEqual(expect.stringMatching(/^error target\.periapsis_altitude_m: must be > -\d+ m \(the mean radius of Ochre\)$/));
  });
  it('refuses times more than 1,000 calendar years from the epoch, naming the year (year −5000 was accepted)', () => {
    const cal = ilmar.calendar;
    const p = samplePlan();
    // year −5000 of the calendar: (−5000 − yearAtEpoch) whole years before the epoch
    p.start = { ...p.start, epoch: (-5000 - cal.yearAtEpoch) * cal.yearLength };
    const burn = p.events[0] as { t: number | null };
    burn.t = (MAX_PLAN_YEARS_FROM_EPOCH + 1) * cal.yearLength;
    const got = checkPlanAgainstSystem(p, ilmar).filter((i) => i.severity === 'error');
    expect(got.map((i) => i.path)).toEqual(['start.epoch_s', 'events[0].t_s']);
    expect(got[0].rule).toMatch(/^falls in year -5000\b.*more than 1,000 years from the epoch of Ilmar/);
    expect(got[1].rule).toMatch(new RegExp(`^falls in year ${cal.yearAtEpoch + MAX_PLAN_YEARS_FROM_EPOCH + 1}\\b`));
    // the edge: exactly the limit is accepted
    burn.t = MAX_PLAN_YEARS_FROM_EPOCH * cal.yearLength;
    p.start = { ...p.start, epoch: -MAX_PLAN_YEARS_FROM_EPOCH * cal.yearLength };
    expect(checkPlanAgainstSystem(p, ilmar).filter((i) => i.severity === 'error')).toEqual([]);
  });
});

describe('plan file: every problem at once', () => {
  // A negative dry mass and a zero tolerance (schema) and an unknown transfer target (system):
  // the system check runs on the parts the schema accepted, so all three are reported.
  const threeProblems = (d: Doc): void => {
    d.vehicle.stages[0].dry_kg = -5;
    d.events[0].solve.to = 'nowhere';
    d.target.tolerance.e = 0;
  };
  const want = ['vehicle.stages[0].dry_kg: must be >= 0', 'events[0].solve.to: names no body of system "Ilmar"', 'target.tolerance.e: must be > 0'];
  const expectAll = (got: string[]): void => {
    for (const w of want)
      expect(
        got.some((g) => g.startsWith(w)),
        `${w}\nin\n${got.join('\n')}`,
      ).toBe(true);
    expect(got.length).toBe(want.length);
  };

  it('a file with an embedded system reports the schema and system problems together', () => {
    const d = JSON.parse(serializePlanFile(samplePlan(), { kind: 'embedded', system: ilmar })) as Doc;
    threeProblems(d);
    expectAll(errorsOnly(issuesOf(JSON.stringify(d))));
  });

  it('a file naming its system by path reports them together when the caller passes the system', () => {
    const d = JSON.parse(sampleText()) as Doc;
    threeProblems(d);
    let issues: ValidationIssue[] = [];
    try {
      parsePlanFile(JSON.stringify(d), { system: ilmar });
    } catch (e) {
      issues = (e as ValidationError).issues;
    }
    expectAll(errorsOnly(issues));
    // Without the system only the two schema problems can be found.
    expect(errorsOnly(issuesOf(JSON.stringify(d))).length).toBe(2);
  });

  it('semantic problems are reported beside schema problems', () => {
    const got = errorsOnly(
      issuesOf(
        edited((d) => {
          d.reserve.percent = 500;
          d.events[5].id = 'cruise-1';
        }),
      ),
    );
    expect(got).toEqual(['reserve.percent: must be <= 100', 'events[5].id: must be unique ("cruise-1" is also the id of events[1])']);
  });
});
