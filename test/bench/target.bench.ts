/**
 * Targeting a whole plan (core/target targetPlan) in each model, on the demo plans.
 *
 * Figures: wall time, legs, iterations and flights. Reference, measured in the same run: one
 * flight of the same plan in the same model (the patched-conic evaluation; for n-body the whole
 * flight of the targeted schedule), so "flights × one flight" is what targeting would cost if every
 * trial flew the whole plan; the ratio below 1 is what starting n-body trials just before the
 * leg's first burn and stopping arrival legs at their probe save.
 * Goals (issue 12): demo conic < 20 ms, finite < 200 ms, n-body < 1 s; multi-leg n-body < 3 s.
 */
import { readFileSync } from 'node:fs';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import type { Plan } from '../../core/plan/plan.ts';
import { flyModel, targetPlan } from '../../core/target/index.ts';
import type { TruthModel } from '../../core/plan/plan.ts';
import { evaluate } from '../../core/conic/evaluate.ts';
import { demoPlan } from '../fixtures/demoPlan.ts';
import { skerryPlan } from '../fixtures/skerryPlan.ts';
import { printTable, timeMedian } from './table.ts';

function allFinite(plan: Plan): Plan {
  return { ...plan, events: plan.events.map((e) => (e.type === 'burn' ? { ...e, mode: 'finite' as const } : e)) };
}

export async function run(): Promise<void> {
  const system = parseSystemFile(readFileSync(new URL('../../assets/systems/ilmar.system.json', import.meta.url), 'utf8')).system;
  const cases: { name: string; plan: Plan; model: TruthModel; goal: number }[] = [
    { name: 'demo', plan: demoPlan, model: 'conic', goal: 20 },
    { name: 'demo, every burn finite', plan: allFinite(demoPlan), model: 'finite', goal: 200 },
    { name: 'demo', plan: demoPlan, model: 'nbody', goal: 1000 },
  ];
  {
    const skerry = skerryPlan();
    cases.push({ name: 'Tessel → Moravel → Skerry', plan: skerry, model: 'conic', goal: 20 });
    cases.push({ name: 'Tessel → Moravel → Skerry', plan: skerry, model: 'nbody', goal: 3000 });
  }
  const rows: (string | number)[][] = [];
  for (const c of cases) {
    let r = targetPlan(system, c.plan, { model: c.model });
    const t = timeMedian(
      () => {
        r = targetPlan(system, c.plan, { model: c.model });
      },
      c.model === 'nbody' ? 3 : 7,
      1,
    );
    const flown = c.model === 'nbody' ? r.plan : c.plan;
    const one = timeMedian(() => {
      if (c.model === 'nbody') flyModel(system, flown, 'nbody');
      else evaluate(system, c.model === 'finite' ? allFinite(flown) : flown, { samplesPerSegment: 0 });
    }, 5);
    const whole = r.flights * one.median;
    rows.push([
      `${c.name} (${c.model})`,
      r.status,
      t.median,
      c.goal,
      r.legs.length,
      r.iterations,
      r.flights,
      one.median,
      whole,
      t.median / Math.max(whole, 1e-9),
    ]);
  }
  printTable(['plan (model)', 'status', 'median ms', 'goal ms', 'legs', 'iterations', 'flights', 'one flight ms', 'flights × one', 'ratio'], rows);
}
