import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parsePlanFile, serializePlanFile } from '../../../core/io/planFile.ts';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import { evaluate } from '../../../core/conic/evaluate.ts';
import type { Plan } from '../../../core/plan/plan.ts';
import { DEMO_PLAN_FILES, DEMO_SYSTEM_REF, PLANS_DIR, demoPlanText } from './demoPlanFiles.ts';

const ilmar = parseSystemFile(readFileSync(new URL('../../../assets/systems/ilmar.system.json', import.meta.url), 'utf8')).system;

/** Deep equality, numbers within 1 ulp (an angle the degree form cannot hold exactly). */
function expectClose(a: unknown, b: unknown, path = 'plan'): void {
  if (typeof a === 'number' && typeof b === 'number') {
    const tol = Math.max(Number.MIN_VALUE, Math.abs(b) * Number.EPSILON);
    expect(Math.abs(a - b), path).toBeLessThanOrEqual(tol);
  } else if (a && b && typeof a === 'object') {
    expect(Object.keys(a as object).sort(), path).toEqual(Object.keys(b as object).sort());
    for (const k of Object.keys(b as object)) expectClose((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${path}.${k}`);
  } else expect(a, path).toBe(b);
}

describe('demo plan files (assets/plans)', () => {
  for (const { file, plan } of DEMO_PLAN_FILES) {
    const text = readFileSync(new URL(file, PLANS_DIR), 'utf8');
    it(`${file} is the fixture written by the serialiser (regenerate: npx tsx test/core/io/demoPlanFiles.ts)`, () => {
      expect(text).toBe(demoPlanText(plan));
    });
    it(`${file} loads back to the fixture (angles within 1 ulp) and saves to the same bytes`, () => {
      const back = parsePlanFile(text);
      expect(back.warnings).toEqual([]);
      expect(back.system).toEqual(DEMO_SYSTEM_REF);
      expectClose(back.plan, plan);
      expect(serializePlanFile(back.plan, back.system)).toBe(text);
    });
  }

  it('the demo plan from its file closes with a small positive margin; the heavy one does not', () => {
    const [demo, heavy] = DEMO_PLAN_FILES.map(({ file }) => parsePlanFile(readFileSync(new URL(file, PLANS_DIR), 'utf8')).plan as Plan);
    const a = evaluate(ilmar, demo).budget;
    const b = evaluate(ilmar, heavy).budget;
    expect(a.margin).toBeGreaterThan(0);
    expect(a.margin).toBeLessThan(0.1 * a.total);
    expect(b.margin).toBeLessThan(0);
  });
});
