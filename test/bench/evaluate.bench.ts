/**
 * Plan evaluation speed (core/conic/evaluate.ts, patched conics).
 *
 * Figures: the demo plan (test/fixtures/demoPlan.ts) re-evaluated as on every keystroke (96
 * drawing samples per segment; goal: median under 5 ms) and a 10-burn plan (the demo plus five
 * small trims, each after a coast to apoapsis). References measured in the same run:
 * - the same evaluations with samplesPerSegment = 0 (what a dispersion run uses; the difference
 *   is the drawing cost; goal ≥ 1,000 evaluations per second per core);
 * - a bare Kepler loop over the same flown time span: one universal-variable propagation
 *   (core/orbit/kepler.ts) per segment of the result from its state0 to its end, and the same
 *   with one propagation per drawing sample (the naive way to draw the result).
 */
import { readFileSync } from 'node:fs';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import { evaluate } from '../../core/conic/evaluate.ts';
import type { Plan, PlanEvent } from '../../core/plan/plan.ts';
import { propagateKepler } from '../../core/orbit/kepler.ts';
import { clonePlan, demoPlan } from '../fixtures/demoPlan.ts';
import { printTable, timeMedian } from './table.ts';

const SYSTEM_PATH = new URL('../../assets/systems/ilmar.system.json', import.meta.url);

function tenBurnPlan(): Plan {
  const p = clonePlan(demoPlan);
  const last = p.events.pop() as PlanEvent; // final coast goes to the end again
  for (let k = 0; k < 5; k++) {
    p.events.push({ type: 'coast', id: `to-apo-${k}`, name: `Coast to apoapsis ${k + 1}`, until: { kind: 'apoapsis' } });
    p.events.push({
      type: 'burn',
      id: `trim-${k}`,
      name: `Trim ${k + 1}`,
      t: null,
      frame: 'vnb',
      dv: [0.5, 0, 0],
      solve: { kind: 'fixed' },
      mode: 'impulsive',
      pointing: 'velocity',
    });
  }
  p.events.push(last);
  return p;
}

export async function run(): Promise<void> {
  const { system } = parseSystemFile(readFileSync(SYSTEM_PATH, 'utf8'));
  const plans: [string, Plan][] = [
    ['demo plan (5 burns)', demoPlan],
    ['10-burn plan', tenBurnPlan()],
  ];
  const REPEATS = 400;
  const rows: (string | number)[][] = [];
  const out = new Float64Array(6);
  for (const [name, plan] of plans) {
    const res = evaluate(system, plan);
    const burns = res.budget.rows.length;
    const full = timeMedian(() => void evaluate(system, plan), REPEATS, 50);
    const bare = timeMedian(() => void evaluate(system, plan, { samplesPerSegment: 0 }), REPEATS, 50);
    const segs = res.segments;
    const kepOne = timeMedian(
      () => {
        for (const s of segs) propagateKepler(s.mu, s.state0, s.t1 - s.t0, out);
      },
      REPEATS,
      50,
    );
    const kepSamples = timeMedian(
      () => {
        for (const s of segs) {
          for (let j = 0; j < 96; j++) propagateKepler(s.mu, s.state0, ((s.t1 - s.t0) * j) / 95, out);
        }
      },
      REPEATS,
      50,
    );
    rows.push([`${name}: evaluate, 96 samples/segment`, burns, segs.length, full.median, full.p95, 1000 / full.median, '—']);
    rows.push([`${name}: evaluate, 0 samples (reference)`, burns, segs.length, bare.median, bare.p95, 1000 / bare.median, full.median / bare.median]);
    rows.push([
      `${name}: bare Kepler, 1 per segment (reference)`,
      '',
      segs.length,
      kepOne.median,
      kepOne.p95,
      1000 / kepOne.median,
      full.median / kepOne.median,
    ]);
    rows.push([
      `${name}: bare Kepler, 96 per segment (reference)`,
      '',
      segs.length,
      kepSamples.median,
      kepSamples.p95,
      1000 / kepSamples.median,
      full.median / kepSamples.median,
    ]);
  }
  printTable(['case', 'burns', 'segments', 'median ms', 'p95 ms', 'per second', 'ratio (96-sample evaluate / this)'], rows);
  console.log('  goals: demo median < 5 ms with samples; ≥ 1,000 evaluations/s with 0 samples (one core)');
}
