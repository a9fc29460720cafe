/**
 * The demo plan files in assets/plans/ and how they are made: the in-memory demo plans of
 * test/fixtures/demoPlan.ts and test/fixtures/skerryPlan.ts written through the plan-file
 * serialiser, naming the demo system by relative path. Regenerate with
 *   npx tsx test/core/io/demoPlanFiles.ts
 * (test/core/io/demoPlans.test.ts fails when the files and the fixture drift apart).
 */
import { fileURLToPath } from 'node:url';
import { serializePlanFile, type PlanSystemRef } from '../../../core/io/planFile.ts';
import type { Plan } from '../../../core/plan/plan.ts';
import { demoPlan, heavyDemoPlan } from '../../fixtures/demoPlan.ts';
import { skerryPlan } from '../../fixtures/skerryPlan.ts';
import { flybyPlan } from '../../fixtures/flybyPlan.ts';
import { demoSystem } from '../plan/helpers.ts';

export const DEMO_SYSTEM_REF: PlanSystemRef = { kind: 'path', path: '../systems/ilmar.system.json' };

export const DEMO_PLAN_FILES: { file: string; plan: Plan }[] = [
  { file: 'tessel-to-ochre.plan.json', plan: demoPlan },
  { file: 'tessel-to-ochre-heavy.plan.json', plan: heavyDemoPlan },
  { file: 'tessel-to-skerry.plan.json', plan: skerryPlan() },
  { file: 'tessel-moravel-fennick.plan.json', plan: flybyPlan(demoSystem()) },
];

export const PLANS_DIR = new URL('../../../assets/plans/', import.meta.url);

export function demoPlanText(plan: Plan): string {
  return serializePlanFile(plan, DEMO_SYSTEM_REF);
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const { atomicWriteFile } = await import('../../../app/node/files.ts');
  for (const { file, plan } of DEMO_PLAN_FILES) {
    const path = fileURLToPath(new URL(file, PLANS_DIR));
    await atomicWriteFile(path, demoPlanText(plan), { backup: false });
    console.log(`wrote ${path}`);
  }
}
