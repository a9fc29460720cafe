/**
 * Documented limits (core/system/limits.ts): an oversized document or run is refused where it
 * arrives — the file when it is read, the options when the run starts — with a message naming
 * the field, the limit and the value, before any of the work is done (checked by counting the
 * work: progress callbacks and steps, never a clock). Inputs at the limits of real use (the
 * test suite's 1,008-body system, the demo runs) stay well inside them.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { checkStability } from '../../core/checks/stability.ts';
import { gameStepCheck, prepareGameStep } from '../../core/gamestep/check.ts';
import { parsePlanFile } from '../../core/io/planFile.ts';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import { InputError, ValidationError } from '../../core/math/errors.ts';
import { disperse } from '../../core/nbody/disperse.ts';
import { checkPlan } from '../../core/plan/checkPlan.ts';
import {
  MAX_BODIES,
  MAX_DISPERSION_SAMPLES,
  MAX_EVENTS,
  MAX_GAME_SAMPLES_PER_SPAN,
  MAX_GAME_STEPS,
  MAX_STABILITY_BODIES,
  MAX_STABILITY_SAMPLES,
  MAX_STABILITY_STEPS,
  MAX_STABILITY_WORK,
  MAX_STAGES,
} from '../../core/system/index.ts';
import { demoPlan } from '../fixtures/demoPlan.ts';
import { demoSystem } from '../core/plan/helpers.ts';
import { demoPlanText, demoSystemDoc } from '../fuzz/files.ts';

type Doc = Record<string, any>;

const fmt = (n: number): string => n.toLocaleString('en-US');

function refusal(f: () => unknown): ValidationError {
  try {
    f();
  } catch (e) {
    if (e instanceof ValidationError) return e;
    throw e;
  }
  throw new Error('the file loaded');
}

function inputError(f: () => unknown): InputError {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error('accepted');
}

/** The demo system plus `n` small bodies on separate circular orbits about the star. */
function asteroids(n: number): Doc {
  const doc = demoSystemDoc() as Doc;
  for (let i = 0; i < n; i++) {
    doc.bodies.push({
      id: `rock-${i}`,
      name: `Rock ${i}`,
      parent: 'ilmar',
      mu_m3_s2: 1e6,
      radius_m: 1e4,
      min_safe_altitude_m: 0,
      orbit: { a_m: 4e11 + 1e9 * i, e: 0, i_deg: 0, raan_deg: 0, argp_deg: 0, mean_anomaly_deg: (7 * i) % 360 },
    });
  }
  return doc;
}

describe('file limits, enforced when the file is read', () => {
  it('regression (a schema-valid system of 10,000 bodies crashed stability with the heap exhausted): refused at load naming bodies, the limit and the count', () => {
    const doc = asteroids(10_000 - 8);
    const e = refusal(() => parseSystemFile(JSON.stringify(doc)));
    expect(e.issues).toEqual([{ path: 'bodies', rule: `is ${fmt(10_000)} bodies, more than the ${fmt(MAX_BODIES)} Waymark handles`, severity: 'error' }]);
    // one past the limit is refused
    const over = refusal(() => parseSystemFile(JSON.stringify(asteroids(MAX_BODIES - 8 + 1))));
    expect(over.issues[0].path).toBe('bodies');
    // a plan embedding it is refused the same way, the path under system.embedded
    const plan = JSON.parse(demoPlanText('tessel-to-ochre.plan.json')) as Doc;
    plan.system = { embedded: doc };
    const p = refusal(() => parsePlanFile(JSON.stringify(plan)));
    expect(p.issues[0].path).toBe('system.embedded.bodies');
  });

  it("a system of exactly the limit loads (the tests' largest real-use case has 1,008 bodies)", () => {
    const { system } = parseSystemFile(JSON.stringify(asteroids(MAX_BODIES - 8)));
    expect(system.bodies).toHaveLength(1 + MAX_BODIES);
  });

  it('a plan of more events or stages than the limits is refused naming the field', () => {
    const doc = JSON.parse(demoPlanText('tessel-to-ochre.plan.json')) as Doc;
    const ev = doc.events[1];
    doc.events = Array.from({ length: MAX_EVENTS + 1 }, (_, k) => ({ ...ev, id: `e${k}` }));
    const st = doc.vehicle.stages[0];
    doc.vehicle.stages = Array.from({ length: MAX_STAGES + 1 }, () => st);
    const e = refusal(() => parsePlanFile(JSON.stringify(doc)));
    expect(e.issues.map((i) => [i.path, i.rule])).toEqual([
      ['events', `is ${fmt(MAX_EVENTS + 1)} events, more than the ${fmt(MAX_EVENTS)} Waymark handles`],
      ['vehicle.stages', `is ${fmt(MAX_STAGES + 1)} stages, more than the ${fmt(MAX_STAGES)} Waymark handles`],
    ]);
  });

  it("the evaluator's own guard refuses an in-memory plan past the limits too", () => {
    const sys = demoSystem();
    const many = { ...demoPlan, events: Array.from({ length: MAX_EVENTS + 1 }, (_, k) => ({ type: 'stage' as const, id: `s${k}`, name: '' })) };
    expect(inputError(() => checkPlan(sys, many)).field).toBe('events');
    const stages = { ...demoPlan, vehicle: { ...demoPlan.vehicle, stages: Array.from({ length: MAX_STAGES + 1 }, () => demoPlan.vehicle.stages[0]) } };
    expect(inputError(() => checkPlan(sys, stages)).field).toBe('vehicle.stages');
  });
});

describe('long runs: refused before they start, or bounded', () => {
  const system = parseSystemFile(readFileSync(new URL('../../assets/systems/ilmar.system.json', import.meta.url), 'utf8')).system;

  it('regression (`stability --samples 1e9` grew to 5.8 GB): samples and the step budget are bounded', () => {
    let progress = 0;
    const onProgress = (): void => void progress++;
    const s = inputError(() => checkStability(system, { samples: 1e9, onProgress }));
    expect(s.field).toBe('samples');
    expect(s.message).toBe(`samples is ${fmt(1e9)} samples, more than the ${fmt(MAX_STABILITY_SAMPLES)} Waymark handles`);
    const m = inputError(() => checkStability(system, { maxSteps: 1e12, onProgress }));
    expect(m.field).toBe('maxSteps');
    expect(m.message).toContain(fmt(MAX_STABILITY_STEPS));
    expect(progress).toBe(0);
  });

  it('regression (1,000 bodies gave no output in 120 s): more bodies than the check flies are refused before a step', () => {
    const big = parseSystemFile(JSON.stringify(asteroids(MAX_STABILITY_BODIES))).system;
    let progress = 0;
    const e = inputError(() => checkStability(big, { years: 1, onProgress: () => void progress++ }));
    expect(e.field).toBe('system.bodies');
    // the moons merged (auto) leave the planets: the 5 of the demo and the asteroids
    expect(e.message).toBe(
      `system.bodies is ${fmt(5 + MAX_STABILITY_BODIES)} planets to fly (moons merged), more than the ${fmt(MAX_STABILITY_BODIES)} Waymark handles`,
    );
    expect(progress).toBe(0);
  });

  it('a run whose body-pair force evaluations exceed the budget is refused before a step, naming the span', () => {
    // Yoshida 4 on the demo with moons merged: 5 planets and the star, 15 pairs, 3 evaluations a step
    // (about 650 steps a year): 10⁶ years need ~3·10¹⁰ pair evaluations
    let progress = 0;
    const e = inputError(() =>
      checkStability(system, { method: 'yoshida4', years: 1e6, maxSteps: MAX_STABILITY_STEPS, mergeMoons: true, onProgress: () => void progress++ }),
    );
    expect(e.field).toBe('span');
    expect(e.message).toContain(`body-pair force evaluations`);
    expect(e.message).toContain(`steps of 15 pairs, moons merged), more than the ${MAX_STABILITY_WORK.toExponential(0)} Waymark runs in one stability check`);
    expect(progress).toBe(0);
  });

  it('game-step check: samples, the per-span step budget and the whole run are bounded, refused before the first step', () => {
    const sys = demoSystem();
    const prepared = prepareGameStep(sys, demoPlan);
    let progress = 0;
    const base = { physics: { integrator: 'verlet' as const, dt: 0.02 }, prepared, onProgress: () => void progress++ };
    expect(inputError(() => gameStepCheck(sys, demoPlan, { ...base, samplesPerSpan: 1e9 })).field).toBe('samplesPerSpan');
    expect(inputError(() => gameStepCheck(sys, demoPlan, { ...base, maxStepsPerSpan: 1e12 })).field).toBe('maxStepsPerSpan');
    // a coast step of a microsecond over the months-long cruise
    const w = inputError(() => gameStepCheck(sys, demoPlan, { ...base, warpDt: 1e-6 }));
    expect(w.field).toBe('warpDt');
    expect(w.message).toContain(`game steps, more than the ${MAX_GAME_STEPS.toExponential(0)} Waymark flies in one check`);
    // a step of a microsecond with the per-span budget at its largest: every span flown whole
    const d = inputError(() => gameStepCheck(sys, demoPlan, { ...base, physics: { integrator: 'verlet', dt: 1e-6 }, maxStepsPerSpan: MAX_GAME_STEPS }));
    expect(d.field).toBe('physics.dt');
    expect(inputError(() => gameStepCheck(sys, demoPlan, { ...base, samplesPerSpan: MAX_GAME_SAMPLES_PER_SPAN + 1 })).message).toContain(
      fmt(MAX_GAME_SAMPLES_PER_SPAN),
    );
    expect(progress).toBe(0);
  });

  it('dispersion: samples past the limit are refused naming the option (nothing allocated for them)', () => {
    const e = inputError(() => disperse(demoSystem(), demoPlan, { samples: 1e9 }));
    expect(e.field).toBe('options.samples');
    expect(e.message).toBe(`options.samples is ${fmt(1e9)} samples, more than the ${fmt(MAX_DISPERSION_SAMPLES)} Waymark handles`);
  });
});
