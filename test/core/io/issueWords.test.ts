import { describe, expect, it } from 'vitest';
import { issueInWords, issuesInWords } from '../../../core/io/issueWords.ts';
import { parsePlanFile, planToDocument } from '../../../core/io/planFile.ts';
import { checkDocumentAgainstSystem, checkPlanDocument } from '../../../core/io/planSchema.ts';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import { InputError, ValidationError } from '../../../core/math/errors.ts';
import { checkPlan } from '../../../core/plan/checkPlan.ts';
import { formatCompactDate } from '../../../core/system/calendar.ts';
import { clonePlan, demoPlan } from '../../fixtures/demoPlan.ts';
import { demoText } from '../system/fixtures.ts';
import { DEMO_SYSTEM_REF } from './demoPlanFiles.ts';

const system = parseSystemFile(demoText()).system;

/** The demo plan as a plan file's document, edited. */
function demoDocument(edit: (d: ReturnType<typeof planToDocument>) => void): ReturnType<typeof planToDocument> {
  const d = structuredClone(planToDocument(demoPlan, DEMO_SYSTEM_REF));
  edit(d);
  return d;
}

// What a raw path or raw seconds look like in a message: they must not lead one.
const RAW_PATH = /events\[\d+\]|vehicle\.stages\[\d+\]/;

describe('issueInWords on the demo plan', () => {
  it('an arrival before its burn: the burn named and numbered from 1, its time as a calendar date, the path only in the detail', () => {
    const burn = demoPlan.events[0];
    if (burn.type !== 'burn' || burn.t === null || burn.solve.kind !== 'transfer') throw new Error('the demo plan starts with a timed transfer burn');
    const burnTime = burn.t;
    const doc = demoDocument((d) => {
      const b = d.events[0];
      if (b.type === 'burn' && b.solve?.kind === 'transfer') b.solve.arrive_s = burnTime - 86400;
    });
    const issue = checkPlanDocument(doc).find((i) => i.path === 'events[0].solve.arrive_s');
    expect(issue).toBeDefined();
    const w = issueInWords(issue!, doc, system);
    expect(w.text).toBe(`Burn 1 '${burn.name}': arrival must be later than the burn (${formatCompactDate(system.calendar, burnTime)})`);
    expect(w.detail).toBe('plan field: events[0].solve.arrive_s');
    expect(w.text).not.toMatch(RAW_PATH);
    expect(w.text).not.toContain(String(burnTime));
  });

  it('a burn referring to an unknown body: the burn named, the destination field in the card’s words', () => {
    const k = demoPlan.events.findIndex((e, i) => i > 0 && e.type === 'burn' && e.solve.kind === 'transfer');
    expect(k).toBeGreaterThan(0);
    const doc = demoDocument((d) => {
      const b = d.events[k];
      if (b.type === 'burn' && b.solve?.kind === 'transfer') b.solve.to = 'vesper';
    });
    const issue = checkDocumentAgainstSystem(doc, system).find((i) => i.path === `events[${k}].solve.to`);
    expect(issue).toBeDefined();
    const w = issueInWords(issue!, doc, system);
    expect(w.text.startsWith(`Burn ${k + 1} '${demoPlan.events[k].name}': destination `)).toBe(true);
    expect(w.text).toContain('"vesper"');
    expect(w.detail).toBe(`plan field: events[${k}].solve.to`);
  });

  it('a negative stage mass, from the file reader and from the evaluator’s check, in tonnes as the field shows it', () => {
    const doc = demoDocument((d) => {
      d.vehicle.stages[1].dry_kg = -5000;
    });
    let issues: ValidationError['issues'] = [];
    try {
      parsePlanFile(JSON.stringify({ ...doc, system: { embedded: JSON.parse(demoText()) } }));
    } catch (e) {
      if (!(e instanceof ValidationError)) throw e;
      issues = e.issues;
    }
    const fromFile = issues.find((i) => i.path === 'vehicle.stages[1].dry_kg');
    expect(fromFile).toBeDefined();
    const stage = demoPlan.vehicle.stages[1].name;
    expect(issueInWords(fromFile!, doc, system).text.startsWith(`Stage 2 '${stage}': dry mass must be `)).toBe(true);

    const plan = clonePlan(demoPlan);
    plan.vehicle.stages[1].dryMass = -5000;
    let caught: InputError | null = null;
    try {
      checkPlan(system, plan);
    } catch (e) {
      if (!(e instanceof InputError)) throw e;
      caught = e;
    }
    expect(caught).not.toBeNull();
    const w = issueInWords({ path: caught!.field, rule: caught!.rule, value: caught!.value }, plan, system);
    expect(w.text).toMatch(new RegExp(`^Stage 2 '${stage}': dry mass must be .*\\(got −5 t\\)$`));
    expect(w.text).not.toMatch(RAW_PATH);
  });

  it('writes lengths in km with the subject named, and leaves a document-level issue as it is', () => {
    const w = issueInWords({ path: 'target.periapsis_altitude_m', rule: 'must be > -3400000 m (the mean radius of Ochre)' }, demoPlan, system);
    expect(w.text).toBe('Target orbit: periapsis altitude must be > −3\u202f400 km (the mean radius of Ochre)');
    expect(issueInWords({ path: '', rule: 'is not JSON' }, null, system)).toMatchObject({ text: 'is not JSON', detail: '' });
  });

  it('names another event it quotes, and a duration with its units', () => {
    const doc = planToDocument(demoPlan, DEMO_SYSTEM_REF);
    const w = issueInWords({ path: 'events[3].until.t_s', rule: 'must not be earlier than events[0].t_s (13996800 s)' }, doc, system);
    expect(w.text).toBe(
      `${demoPlan.events[3].type === 'coast' ? 'Coast' : 'Burn'} 4 '${demoPlan.events[3].name}': time must not be earlier than the time of burn 1 '${demoPlan.events[0].name}' (${formatCompactDate(system.calendar, 13996800)})`,
    );
    expect(issueInWords({ path: 'events[3].until.dt', rule: 'must be >= 0', value: -5400 }, demoPlan, system).rule).toBe('must be ≥ 0 (got −1 h 30 min 00 s)');
  });

  it('issuesInWords keeps path, rule and severity and adds the words', () => {
    const listed = issuesInWords([{ path: 'reserve.percent', rule: 'must be >= 0', severity: 'error' as const }], demoPlan, system);
    expect(listed).toEqual([{ path: 'reserve.percent', rule: 'must be >= 0', severity: 'error', words: 'Reserve: percent of planned Δv must be ≥ 0' }]);
  });
});
