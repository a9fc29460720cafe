/**
 * n-body verification, correction and dispersion speed (core/nbody/verify.ts, correct.ts,
 * disperse.ts).
 *
 * Figures (goal: n-body verification of a one-year cruise with all demo bodies under 150 ms;
 * dispersion ≥ 1,000 samples per second per core):
 * - a one-year cruise: the demo departure from Tessel's 300 km parking orbit, out of the SOI,
 *   then 365 days of heliocentric cruise, flown with all 9 bodies pulling (with and without
 *   drawing samples);
 * - the whole demo plan (241-day cruise, capture, a day in orbit at Ochre);
 * - the demo's differential correction (mid-course burn, n-body flights from the burn on);
 * - dispersion samples per second on this thread (frozen and retarget).
 * References in the same run: the patched-conic evaluation of the same plan; the same 365-day
 * heliocentric cruise (from the conic SOI-exit state) in two-body gravity by RK45 through the
 * front door and by odex (Hairer's ODEX extrapolation code, npm) at the same tolerance.
 */
import { createRequire } from 'node:module';
import { readFileSync } from 'node:fs';
import { parseSystemFile } from '../../core/io/systemFile.ts';
import { propagate } from '../../core/integrate/propagate.ts';
import { correctPlan } from '../../core/nbody/correct.ts';
import { prepareDispersion, runSamples } from '../../core/nbody/disperse.ts';
import { evaluate } from '../../core/conic/evaluate.ts';
import { verifyNBody } from '../../core/nbody/verify.ts';
import type { Plan } from '../../core/plan/plan.ts';
import { clonePlan, demoPlan } from '../fixtures/demoPlan.ts';
import { printTable, timeMedian } from './table.ts';

const SYSTEM_PATH = new URL('../../assets/systems/ilmar.system.json', import.meta.url);
const DAY = 86400;

interface OdexSolver {
  maxSteps: number;
  relativeTolerance: number;
  absoluteTolerance: number;
  solve(f: (x: number, y: number[]) => number[], x: number, y0: number[], xEnd: number): { y: number[]; outcome: number; nEval?: number; nStep?: number };
}
const odex = createRequire(import.meta.url)('odex') as { Solver: new (n: number) => OdexSolver };

function yearCruise(): Plan {
  const p = clonePlan(demoPlan);
  p.events = [
    p.events[0], // departure
    p.events[1], // drop the kick stage
    p.events[2], // leave Tessel's SOI
    { type: 'coast', id: 'year', name: 'One year of cruise', until: { kind: 'duration', dt: 365 * DAY } },
  ];
  p.target = null;
  return p;
}

export async function run(): Promise<void> {
  const { system } = parseSystemFile(readFileSync(SYSTEM_PATH, 'utf8'));
  const rows: (string | number)[][] = [];
  const cruise = yearCruise();
  const cases: [string, Plan][] = [
    ['one-year cruise', cruise],
    ['demo plan', demoPlan],
  ];
  for (const [name, plan] of cases) {
    const conic = evaluate(system, plan, { samplesPerSegment: 0 });
    const days = (conic.t1 - conic.t0) / DAY;
    const v = verifyNBody(system, plan, conic, { samples: false });
    const bare = timeMedian(() => void verifyNBody(system, plan, conic, { samples: false }), 15, 3);
    const drawn = timeMedian(() => void verifyNBody(system, plan, conic), 15, 3);
    const ref = timeMedian(() => void evaluate(system, plan, { samplesPerSegment: 0 }), 200, 20);
    rows.push([`${name} (${days.toFixed(0)} d): n-body, all bodies`, bare.median, v.stats.steps, v.stats.fevals, '—']);
    rows.push([`${name}: n-body with drawing samples`, drawn.median, v.stats.steps, v.stats.fevals, drawn.median / bare.median]);
    rows.push([`${name}: patched conic evaluate (reference)`, ref.median, '', '', bare.median / ref.median]);
  }
  // two-body references over the heliocentric year, from the conic SOI-exit state
  const conic = evaluate(system, cruise, { samplesPerSegment: 0 });
  const helio = conic.segments.find((s) => s.central === 0)!;
  const mu = system.bodies[0].mu;
  const span = helio.t1 - helio.t0;
  const accel = (_t: number, x: Float64Array, _v: Float64Array, out: Float64Array): void => {
    const r2 = x[0] * x[0] + x[1] * x[1] + x[2] * x[2];
    const k = -mu / (r2 * Math.sqrt(r2));
    out[0] = k * x[0];
    out[1] = k * x[1];
    out[2] = k * x[2];
  };
  let rkSteps = 0;
  let rkFevals = 0;
  const rk = timeMedian(
    () => {
      const r = propagate({ accel, t0: helio.t0, x0: helio.state0.subarray(0, 3), v0: helio.state0.subarray(3, 6), tEnd: helio.t1, rtol: 1e-10, atol: 1e-10 });
      rkSteps = r.spans[0].stats.accepted;
      rkFevals = r.spans[0].stats.fevals;
    },
    50,
    5,
  );
  const L = Math.hypot(helio.state0[0], helio.state0[1], helio.state0[2]);
  const V = Math.sqrt(mu / L);
  const T = L / V;
  let odexEvals = 0;
  const f = (_t: number, y: number[]): number[] => {
    odexEvals++;
    const r = Math.hypot(y[0], y[1], y[2]);
    const k = -1 / (r * r * r);
    return [y[3], y[4], y[5], k * y[0], k * y[1], k * y[2]];
  };
  const y0 = [...Array.from(helio.state0.subarray(0, 3), (c) => c / L), ...Array.from(helio.state0.subarray(3, 6), (c) => c / V)];
  const od = timeMedian(
    () => {
      const s = new odex.Solver(6);
      s.relativeTolerance = 1e-10;
      s.absoluteTolerance = 1e-10;
      s.maxSteps = 1e6;
      odexEvals = 0;
      s.solve(f, 0, y0, span / T);
    },
    50,
    5,
  );
  rows.push([`two-body year, RK45 front door (reference)`, rk.median, rkSteps, rkFevals, '']);
  rows.push([`two-body year, odex rtol 1e-10 (reference)`, od.median, '', odexEvals, '']);
  printTable(['case', 'median ms', 'steps', 'fevals', 'ratio'], rows);
  console.log('  goal: one-year cruise with all bodies < 150 ms');

  // correction
  const t0 = performance.now();
  const c = correctPlan(system, demoPlan);
  const tc = performance.now() - t0;
  printTable(['correction', 'ms', 'iterations', 'n-body flights', 'correction Δv m/s'], [['demo mid-course', tc, c.iterations, c.flights, c.correctionDv]]);

  // dispersion on this thread
  const drows: (string | number)[][] = [];
  const N = 2000;
  for (const resolve of ['frozen', 'retarget'] as const) {
    const p = prepareDispersion(system, demoPlan, { samples: N, seed: 1, magnitudeSigma: 0.1, pointingSigma: 0.1, resolve });
    runSamples(p, 0, 200); // warm-up
    const s0 = performance.now();
    runSamples(p, 0, N);
    const ms = performance.now() - s0;
    drows.push([`demo, ${resolve}, σ 0.1 % / 0.1°`, N, ms, (1000 * N) / ms]);
  }
  const ev = timeMedian(() => void evaluate(system, demoPlan, { samplesPerSegment: 0 }), 400, 50);
  drows.push(['evaluate demo, 0 samples (reference)', 1, ev.median, 1000 / ev.median]);
  printTable(['dispersion (one core)', 'samples', 'ms', 'samples/s'], drows);
  console.log('  goal: ≥ 1,000 samples/s per core');
}
