/**
 * Evaluation cases: random plans in memory (planGen.ts), flown in the demo system or in a
 * random variant of it, straight into evaluate() with no file in between — so plans the file
 * reader would refuse (burns out of time order, stage drops with no stage left) reach the
 * evaluator too, and must come back as flags, not exceptions.
 */
import { parseSystemFile } from '../../core/io/systemFile.ts';
import type { Plan } from '../../core/plan/plan.ts';
import type { StarSystem } from '../../core/system/model.ts';
import { built } from './draw.ts';
import { evaluateChecked } from './evaluation.ts';
import { demoPlanText, demoSystem } from './files.ts';
import { parsePlanFile } from '../../core/io/planFile.ts';
import { randomPlan, variedDemoPlan } from './planGen.ts';
import { randomSystemDoc } from './systemCases.ts';

export interface EvaluateCase {
  label: string;
  system: StarSystem;
  plan: Plan;
}

let demo: Plan | null = null;

export const evaluateCases = built((d): EvaluateCase => {
  let system = demoSystem();
  let label = 'demo system';
  if (d.bool(0.25)) {
    try {
      system = parseSystemFile(JSON.stringify(randomSystemDoc(d))).system;
      label = 'random system';
    } catch {
      // a variant the reader refuses: fly in the demo system instead
    }
  }
  if (d.bool(0.25)) {
    demo ??= parsePlanFile(demoPlanText('tessel-to-ochre.plan.json')).plan;
    return { label: `${label}, varied demo plan`, system, plan: variedDemoPlan(d, demo) };
  }
  return { label: `${label}, random plan`, system, plan: randomPlan(d, system) };
});

export function runEvaluateCase(c: EvaluateCase): string {
  return evaluateChecked(c.system, c.plan);
}

export function describeEvaluateCase(c: EvaluateCase): string {
  const p = c.plan;
  const events = p.events
    .map((e) =>
      e.type === 'burn'
        ? `burn(${e.solve.kind}${e.mode === 'finite' ? ',finite' : ''}${e.t === null ? '' : `@${e.t.toPrecision(6)}`})`
        : e.type === 'coast'
          ? `coast(${e.until.kind})`
          : 'stage',
    )
    .join(' ');
  return `${c.label}: start ${p.start.kind} at ${p.start.body}, ${p.vehicle.stages.length} stages, events: ${events || 'none'}, target ${p.target?.body ?? 'none'}`;
}
