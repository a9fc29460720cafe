/**
 * The fuzz targets: each is an arbitrary of cases, a runner that judges one case (verdict.ts),
 * and a one-line description of a case for failure reports. The long-run runner (run.ts) and
 * the CI-budget tests (test/robust/*.test.ts) share them.
 */
import type fc from 'fast-check';
import { evaluateCases, runEvaluateCase, describeEvaluateCase } from './evaluateCases.ts';
import { keplerCases, runKeplerCase, describeKeplerCase } from './keplerCases.ts';
import { lambertCases, runLambertCase, describeLambertCase } from './lambertCases.ts';
import { planCases, runPlanCase } from './planCases.ts';
import { rk45Cases, runRk45Case, describeRk45Case } from './rk45Cases.ts';
import { runSystemCase, systemCases } from './systemCases.ts';
import type { FileCase } from './expect.ts';

export interface Target<C> {
  name: string;
  cases: fc.Arbitrary<C>;
  run: (c: C) => string;
  describe: (c: C) => string;
}

const describeFile = (c: FileCase): string => `${c.label} (${c.text.length} characters)`;

export const TARGETS = {
  system: { name: 'system', cases: systemCases, run: runSystemCase, describe: describeFile } as Target<FileCase>,
  plan: { name: 'plan', cases: planCases, run: runPlanCase, describe: describeFile } as Target<FileCase>,
  evaluate: { name: 'evaluate', cases: evaluateCases, run: runEvaluateCase, describe: describeEvaluateCase },
  lambert: { name: 'lambert', cases: lambertCases, run: runLambertCase, describe: describeLambertCase },
  kepler: { name: 'kepler', cases: keplerCases, run: runKeplerCase, describe: describeKeplerCase },
  rk45: { name: 'rk45', cases: rk45Cases, run: runRk45Case, describe: describeRk45Case },
};

export type TargetName = keyof typeof TARGETS;
export const TARGET_NAMES = Object.keys(TARGETS) as TargetName[];
