/**
 * Validation at scale: a file whose array items all break a rule is refused with work linear in
 * the number of items (doubling the bad items about doubles the work, measured by a work
 * counter, never a clock), and the refusal lists the first MAX_LISTED_ISSUES problems and counts
 * the rest — in the core's parsers and in the renderer's build-time validators alike.
 *
 * The work counter: every call of an Array method that walks or copies an array (concat, some,
 * filter, map, indexOf …) adds the length it walks. Quadratic steps in validation are of that
 * kind (ajv joining each failing item's errors to all earlier ones with `concat`; a per-error
 * `some` over every oneOf failure).
 */
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { afterEach, describe, expect, it } from 'vitest';
import { standaloneModuleSource } from '../../app/renderer/build/ajvStandalone.ts';
import { inlineLocalRefs } from '../../core/io/fileValidator.ts';
import { parsePlanFile, planSchemaIssues } from '../../core/io/planFile.ts';
import { parseSystemFile, schemaIssues } from '../../core/io/systemFile.ts';
import { MAX_LISTED_ISSUES, ValidationError, type ValidationIssue } from '../../core/math/errors.ts';
import { demoPlanText, demoSystemDoc } from '../fuzz/files.ts';

type Doc = Record<string, any>;

const WALKING = ['concat', 'some', 'every', 'filter', 'map', 'forEach', 'find', 'findIndex', 'indexOf', 'includes', 'slice', 'join', 'reduce'] as const;

let restore: (() => void) | null = null;
afterEach(() => {
  restore?.();
  restore = null;
});

/** Array elements walked or copied by Array methods while f runs. */
function work(f: () => void): number {
  let n = 0;
  const proto = Array.prototype as unknown as Record<string, (...a: unknown[]) => unknown>;
  const saved = WALKING.map((m) => [m, proto[m]] as const);
  for (const [m, orig] of saved) {
    proto[m] = function (this: unknown[], ...args: unknown[]) {
      n += this.length;
      if (m === 'concat') for (const a of args) if (Array.isArray(a)) n += a.length;
      return orig.apply(this, args);
    };
  }
  restore = () => {
    for (const [m, orig] of saved) proto[m] = orig;
  };
  try {
    f();
  } finally {
    restore();
    restore = null;
  }
  return n;
}

function refusal(f: () => unknown): ValidationError {
  try {
    f();
  } catch (e) {
    if (e instanceof ValidationError) return e;
    throw e;
  }
  throw new Error('the file loaded');
}

/** The demo plan with `n` events, each the number 1 (one problem each: "must be an object"). */
function planWithBadEvents(n: number): string {
  const doc = JSON.parse(demoPlanText('tessel-to-ochre.plan.json')) as Doc;
  doc.events = Array.from({ length: n }, () => 1);
  return JSON.stringify(doc);
}

/** The demo system with `n` bodies lacking μ and mass and with e = 2 (two problems each). */
function systemWithBadBodies(n: number): string {
  const doc = demoSystemDoc() as Doc;
  const b = doc.bodies[0];
  doc.bodies = Array.from({ length: n }, (_, k) => {
    const { mu_m3_s2: _mu, ...rest } = b;
    return { ...rest, id: `rock-${k}`, orbit: { ...b.orbit, e: 2 } };
  });
  return JSON.stringify(doc);
}

/** The issues a capped list stands for, checked for its shape: MAX_LISTED_ISSUES, then one count. */
function expectCapped(issues: ValidationIssue[], total: number): void {
  expect(issues).toHaveLength(MAX_LISTED_ISSUES + 1);
  const last = issues[MAX_LISTED_ISSUES];
  expect(last.more).toBe(total - MAX_LISTED_ISSUES);
  expect(last.rule).toBe(`… and ${(total - MAX_LISTED_ISSUES).toLocaleString('en-US')} more problems`);
  expect(issues.slice(0, MAX_LISTED_ISSUES).every((i) => i.more === undefined)).toBe(true);
}

// Linear work doubles when the bad items double; quadratic work quadruples. 2.5 separates the
// two with room for the fixed cost of the rest of the file (which only lowers the ratio).
const LINEAR_RATIO = 2.5;

describe('validation work is linear in the number of bad array items', () => {
  it('regression (5,000 → 10,000 bad items took 2.3 s → 9.6 s; a 43 KB plan 51 s): plan events', () => {
    const n = 400;
    let small: ValidationError | null = null;
    let large: ValidationError | null = null;
    const w1 = work(() => (small = refusal(() => parsePlanFile(planWithBadEvents(n)))));
    const w2 = work(() => (large = refusal(() => parsePlanFile(planWithBadEvents(2 * n)))));
    expect(w2 / w1).toBeLessThan(LINEAR_RATIO);
    // every event is one problem, listed in order up to the cap, then counted
    expectCapped(small!.issues, n);
    expectCapped(large!.issues, 2 * n);
    expect(small!.issues.slice(0, MAX_LISTED_ISSUES).map((i) => i.path)).toEqual(Array.from({ length: MAX_LISTED_ISSUES }, (_, k) => `events[${k}]`));
    expect(large!.message.split('\n')[0]).toBe(`plan file: ${(2 * n).toLocaleString('en-US')} problems`);
    expect(large!.message.split('\n')).toHaveLength(MAX_LISTED_ISSUES + 2);
  });

  it('regression (the oneOf lookup was a scan of every oneOf failure per error): system bodies without μ or mass', () => {
    const n = 500;
    let small: ValidationError | null = null;
    let large: ValidationError | null = null;
    const w1 = work(() => (small = refusal(() => parseSystemFile(systemWithBadBodies(n)))));
    const w2 = work(() => (large = refusal(() => parseSystemFile(systemWithBadBodies(2 * n)))));
    expect(w2 / w1).toBeLessThan(LINEAR_RATIO);
    // two problems a body: the either/or rule and e
    expectCapped(small!.issues, 2 * n);
    expectCapped(large!.issues, 4 * n);
    expect(small!.issues[0]).toMatchObject({ path: 'bodies[0]', rule: 'needs exactly one of "mu_m3_s2" and "mass_kg"' });
    expect(small!.issues[1]).toMatchObject({ path: 'bodies[0].orbit.e', rule: 'must be < 1' });
  });

  it('inlining local references keeps every rule: the inlined schema has no $ref left and the same x-rule wording', () => {
    const schema = JSON.parse(readFileSync(new URL('../../assets/schema/plan.schema.json', import.meta.url), 'utf8'));
    const inlined = inlineLocalRefs(schema) as Doc;
    const refs = (x: unknown): number =>
      Array.isArray(x)
        ? x.reduce((s: number, y) => s + refs(y), 0)
        : x && typeof x === 'object'
          ? Object.entries(x).reduce((s, [k, v]) => s + (k === '$ref' ? 1 : k === '$defs' ? 0 : refs(v)), 0)
          : 0;
    expect(refs(schema)).toBeGreaterThan(0);
    expect(refs(inlined)).toBe(0);
    expect(inlined.properties.events.items.allOf.length).toBe(schema.$defs.event.allOf.length);
    expect(schema.properties.events.items).toEqual({ $ref: '#/$defs/event', description: schema.properties.events.items.description });
  });
});

describe("the renderer's build-time validators: linear and capped too", () => {
  async function shim(): Promise<{ compile(s: unknown): ((d: unknown) => boolean) & { errors: unknown } }> {
    const dir = new URL('../output/validation-scale/', import.meta.url).pathname;
    mkdirSync(dir, { recursive: true });
    const file = `${dir}validators-${process.pid}.mjs`;
    writeFileSync(file, standaloneModuleSource(new URL('../../assets/schema/', import.meta.url).pathname));
    const mod = (await import(file)) as { Ajv2020: new (o: unknown) => { compile(s: unknown): ((d: unknown) => boolean) & { errors: unknown } } };
    return new mod.Ajv2020({});
  }

  it('plan events and system bodies: work about doubles when the bad items double; the issues are capped', async () => {
    const ajv = await shim();
    const planSchema = JSON.parse(readFileSync(new URL('../../assets/schema/plan.schema.json', import.meta.url), 'utf8'));
    const systemSchema = JSON.parse(readFileSync(new URL('../../assets/schema/system.schema.json', import.meta.url), 'utf8'));
    const validatePlan = ajv.compile(planSchema);
    const validateSystem = ajv.compile(systemSchema);
    const cases = [
      { n: 400, doc: (k: number) => JSON.parse(planWithBadEvents(k)), validate: validatePlan, issues: planSchemaIssues, perItem: 1 },
      { n: 500, doc: (k: number) => JSON.parse(systemWithBadBodies(k)), validate: validateSystem, issues: schemaIssues, perItem: 2 },
    ];
    for (const c of cases) {
      const d1 = c.doc(c.n);
      const d2 = c.doc(2 * c.n);
      let e1: ValidationError | null = null;
      let e2: ValidationError | null = null;
      const w1 = work(() => {
        expect(c.validate(d1)).toBe(false);
        e1 = new ValidationError('file', c.issues(c.validate.errors as never));
      });
      const w2 = work(() => {
        expect(c.validate(d2)).toBe(false);
        e2 = new ValidationError('file', c.issues(c.validate.errors as never));
      });
      expect(w2 / w1).toBeLessThan(LINEAR_RATIO);
      expectCapped(e1!.issues, c.perItem * c.n);
      expectCapped(e2!.issues, 2 * c.perItem * c.n);
    }
  });
});

describe('capped lists', () => {
  it("a ValidationError re-made from capped issues (paths prefixed, as the renderer does for a plan's system) keeps the count", () => {
    const e = refusal(() => parsePlanFile(planWithBadEvents(300)));
    const again = new ValidationError(
      'plan file',
      e.issues.map((i) => ({ ...i, path: `system (x.json) ${i.path}`.trim() })),
    );
    expect(again.issues).toHaveLength(MAX_LISTED_ISSUES + 1);
    expect(again.message.split('\n')[0]).toBe('plan file: 300 problems');
  });

  it('errors come before the count; the count is an error when any problem it stands for is', () => {
    const issues: ValidationIssue[] = [
      ...Array.from({ length: 150 }, (_, k) => ({ path: `a[${k}]`, rule: 'is bad', severity: 'error' as const })),
      ...Array.from({ length: 50 }, (_, k) => ({ path: `b[${k}]`, rule: 'is doubtful', severity: 'warning' as const })),
    ];
    const e = new ValidationError('x', issues);
    expect(e.issues[MAX_LISTED_ISSUES]).toMatchObject({ severity: 'error', more: 100 });
    const w = new ValidationError('x', issues.slice(0, 100).concat(issues.slice(150)));
    expect(w.issues[MAX_LISTED_ISSUES]).toMatchObject({ severity: 'warning', more: 50 });
    expect(new ValidationError('x', issues.slice(0, 100)).issues).toHaveLength(100);
  });
});
