/**
 * Bad input at scale, plan files: the CI budget of the plan fuzz target (test/fuzz/planCases.ts:
 * the demo and sample plans and random valid plans, by path or with an embedded system, as
 * written, with one field broken, truncated, garbled or deeply nested; every plan that loads is
 * evaluated), and the cases that failed once, kept as regressions.
 */
import { describe, expect, it } from 'vitest';
import { InputError, ValidationError } from '../../core/math/errors.ts';
import { parsePlanFile, requirePlanFitsSystem, serializePlanFile } from '../../core/io/planFile.ts';
import { evaluate } from '../../core/conic/evaluate.ts';
import type { Plan } from '../../core/plan/plan.ts';
import { samplePlan, stateStartPlan as stateStartPlanForTest } from '../core/io/planSamples.ts';
import { demoPlanText, demoSystem, demoSystemDoc } from '../fuzz/files.ts';
import { deepText, withRawValue, type Json } from '../fuzz/json.ts';
import { TARGETS } from '../fuzz/targets.ts';
import { count, runBudget } from './budget.ts';

type Doc = Record<string, any>;

const demoDoc = (): Doc => JSON.parse(demoPlanText('tessel-to-ochre.plan.json')) as Doc;

function refusal(text: string): ValidationError {
  try {
    parsePlanFile(text);
  } catch (e) {
    if (e instanceof ValidationError) return e;
    throw e;
  }
  throw new Error('the file loaded');
}

function inputError(plan: Plan): InputError {
  try {
    evaluate(demoSystem(), plan);
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error('the plan evaluated');
}

describe('plan files, fuzzed', () => {
  it('every case loads and evaluates to a finite result, or is refused naming the field; never another exception or a NaN', () => {
    const outcomes = runBudget(TARGETS.plan, 800);
    expect(count(outcomes, 'loaded; evaluated')).toBeGreaterThan(50);
    expect(count(outcomes, 'refused')).toBeGreaterThan(200);
  });
});

describe('plan files: cases kept as regressions', () => {
  it('regression (an embedded system holding 10⁵ nested objects: RangeError from JSON.stringify of the embedded system): refused naming the field', () => {
    const doc = demoDoc();
    doc.system = { embedded: demoSystemDoc() };
    for (const [keys, at] of [
      [['system', 'embedded', 'description'], 'system.embedded.description'],
      [['system', 'embedded', 'bodies'], 'system.embedded.bodies'],
      [['system', 'embedded'], 'system.embedded'],
    ] as const) {
      const e = refusal(withRawValue(doc as Json, keys as unknown as (string | number)[], deepText(100_000, 'object')));
      expect(e.issues[0].path.startsWith(at)).toBe(true);
      expect(e.issues[0].rule).toContain('nested too deeply');
    }
  });

  it('regression (payload 0 and a last stage of dry mass 0: the file loaded, then evaluate threw InputError): the file is refused naming vehicle.payload_kg', () => {
    const doc = demoDoc();
    doc.vehicle.payload_kg = 0;
    doc.vehicle.stages[doc.vehicle.stages.length - 1].dry_kg = 0;
    const e = refusal(JSON.stringify(doc));
    expect(e.issues.find((i) => i.severity === 'error')?.path).toBe('vehicle.payload_kg');
  });

  it('regression (plan fuzz: a last stage of dry mass 1e-300 kg under 20 kg of propellant, payload 0 — the burnout mass rounded to 0 and the Δv capacity and margin came out Infinity): refused naming vehicle.payload_kg, and the evaluator names vehicle.payloadMass', () => {
    const doc = JSON.parse(serializePlanFile(stateStartPlanForTest(), { kind: 'path', path: 'x.system.json' })) as Doc;
    doc.vehicle.stages[0].dry_kg = 1e-300;
    expect(refusal(JSON.stringify(doc)).issues.find((i) => i.severity === 'error')?.path).toBe('vehicle.payload_kg');
    const p = stateStartPlanForTest();
    p.vehicle.stages[0].dryMass = 1e-300;
    expect(inputError(p).field).toBe('vehicle.payloadMass');
  });

  it('regression (start.r_m[1] = 1.8e308: Kepler SolverError escaped evaluate): refused naming start.r_m, and the evaluator names start.r', () => {
    const p = samplePlan();
    p.start = { kind: 'state', body: 'ilmar', epoch: 0, r: [1.2e11, 1.7976931348623157e308, 0], v: [0, 3e4, 0] };
    const e = refusal(serializePlanFile(p, { kind: 'path', path: 'x.system.json' }));
    expect(e.issues.some((i) => i.path === 'start.r_m')).toBe(true);
    expect(inputError(p).field).toBe('start.r');
  });

  it('regression (a burn of 1.8e308 m/s: budget margin −Infinity): refused naming the burn, and the evaluator names its dv', () => {
    const p = samplePlan();
    const k = p.events.findIndex((e) => e.type === 'burn' && e.solve.kind === 'fixed');
    const burn = p.events[k] as Extract<Plan['events'][number], { type: 'burn' }>;
    burn.dv = [0, 0, 1.7976931348623157e308];
    const e = refusal(serializePlanFile(p, { kind: 'path', path: 'x.system.json' }));
    expect(e.issues.some((i) => i.path === `events[${k}].dv_mps`)).toBe(true);
    expect(inputError(p).field).toBe(`events[${k}].dv`);
  });

  it('regression (a stage thrust of 5e-324 N: burn durations of Infinity in the budget): refused naming thrust_N, and the evaluator names thrust', () => {
    const doc = demoDoc();
    doc.vehicle.stages[1].thrust_N = 5e-324;
    expect(refusal(JSON.stringify(doc)).issues.some((i) => i.path === 'vehicle.stages[1].thrust_N')).toBe(true);
    const p = parsePlanFile(demoPlanText('tessel-to-ochre.plan.json')).plan;
    p.vehicle.stages[1].thrust = 5e-324;
    expect(inputError(p).field).toBe('vehicle.stages[1].thrust');
  });

  it('a plan file of a newer version is refused naming version; NaN written as a string, unknown bodies and out-of-order burns name their fields', () => {
    const cases: [(d: Doc) => void, string, RegExp][] = [
      [(d) => (d.version = 2), 'version', /newer/],
      [(d) => (d.start.epoch_s = 'NaN'), 'start.epoch_s', /number/],
      [(d) => (d.target.body = 'nowhere'), 'target.body', /names no body/],
      [(d) => (d.events[0].t_s = d.start.epoch_s - 86400), 'events[0].t_s', /earlier/],
      [(d) => (d.events[2].id = d.events[0].id), 'events[2].id', /unique/],
      [(d) => (d.vehicle.stages[0].propellant_kg = -1), 'vehicle.stages[0].propellant_kg', />= 0/],
    ];
    for (const [change, path, rule] of cases) {
      const d = demoDoc();
      change(d);
      // as the file layer reads it: the file, then the plan against its (demo) system
      const read = (): void => {
        requirePlanFitsSystem(parsePlanFile(JSON.stringify(d)).plan, demoSystem());
      };
      expect(read).toThrow(ValidationError);
      try {
        read();
      } catch (e) {
        expect(
          (e as ValidationError).issues.some((i) => i.path === path && rule.test(i.rule)),
          `${path}: ${(e as Error).message}`,
        ).toBe(true);
      }
    }
  });
});
