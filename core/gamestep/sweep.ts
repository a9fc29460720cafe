/**
 * Time-step sweep of the game-step check: for each integrator, the largest step on a ladder
 * dt·2^k (k = 0 … K, dt·2^K ≤ dtMax) whose flight keeps the arrival miss within the position
 * tolerance and the energy drift within its tolerance; the cheapest integrator (fewest
 * acceleration evaluations over the whole mission at its largest passing step); and a
 * precision check at the game's own integrator and step: float64, float32, and float32 with a
 * floating origin, flown the same way.
 *
 * Search: each integrator's ladder is tried from the largest step down and stops at the first
 * step that passes, so the largest passing step is found when the error grows with the step
 * (the usual case; a step that passes above a failing one is not looked for). Every run is a
 * full gameStepCheck sharing one reference flight. Steps are multiples of dt by powers of two
 * (a doubling ladder).
 */
import { InputError, requireFinite } from '../math/index.ts';
import { bodyState } from '../system/index.ts';
import type { StarSystem } from '../system/index.ts';
import type { Float32Row, GamePhysics, GamePhysicsInput, GameStepResult, PreparedGameStep } from './check.ts';
import { DEFAULT_REBASE, gameStepCheck, normalizePhysics, prepareGameStep } from './check.ts';
import { EVALS_PER_STEP, GAME_INTEGRATORS, type GameIntegrator } from './kernel.ts';
import type { Plan } from '../plan/index.ts';
import type { PlanResult } from '../plan/index.ts';

/** Default largest step: this fraction of the shortest bound orbital period flown. */
export const DEFAULT_DT_MAX_FRACTION = 1 / 20;
/** Ladder rungs when no bound orbit sets dtMax. */
export const DEFAULT_LADDER_RUNGS = 10;
/** Series points per span in sweep runs (only the summary figures are kept). */
export const SWEEP_SAMPLES_PER_SPAN = 16;

export interface SweepOptions {
  /** The game's physics: dt is the smallest step of the ladder; integrator is the one the precision check uses. */
  physics: GamePhysicsInput;
  /** Integrators to sweep (default all four). */
  integrators?: GameIntegrator[];
  /** Largest step of the ladder, s (default DEFAULT_DT_MAX_FRACTION of the shortest bound period). */
  dtMax?: number;
  tolerance?: number;
  energyTolerance?: number;
  maxStepsPerSpan?: number;
  windowSteps?: number;
  /** Run the float32 / floating-origin comparison (default true). */
  precisionCheck?: boolean;
  result?: PlanResult;
  /** Called with (runs done, runs at most). */
  onProgress?: (done: number, total: number) => void;
  signal?: { aborted: boolean };
}

export interface SweepRow {
  integrator: GameIntegrator;
  dt: number;
  passes: boolean;
  status: GameStepResult['status'];
  /** Arrival miss, m (null when the flight diverged before arriving), and its basis. */
  arrivalMiss: number | null;
  arrivalBasis: 'measured' | 'extrapolated' | null;
  maxDriftPerOrbit: number | null;
  /** Acceleration evaluations the game spends on the whole mission at this step. */
  missionEvals: number;
  /** Whether any span was extrapolated in this run. */
  extrapolated: boolean;
}

export interface PrecisionRow {
  precision: GamePhysics['precision'];
  rebase: GamePhysics['rebase'];
  passes: boolean;
  arrivalMiss: number | null;
  maxDriftPerOrbit: number | null;
}

export type PrecisionVerdict = 'float32' | 'float32-rebase' | 'float64' | 'none';

export interface SweepResult {
  physics: GamePhysics;
  tolerance: number;
  energyTolerance: number;
  ladder: number[];
  rows: SweepRow[];
  /** Per integrator: the largest passing step (null when none passed) and its cost. */
  best: { integrator: GameIntegrator; dt: number | null; missionEvals: number | null }[];
  /** The passing (integrator, step) with the fewest evaluations over the mission, or null. */
  cheapest: { integrator: GameIntegrator; dt: number; missionEvals: number } | null;
  precision: {
    integrator: GameIntegrator;
    dt: number;
    rows: PrecisionRow[];
    /** 'float32': float32 suffices; 'float32-rebase': only with a floating origin; 'float64': only float64 passes; 'none': not even float64. */
    verdict: PrecisionVerdict;
    /** binary32 spacings at the mission's distances (from the float32 run). */
    float32: Float32Row[];
  } | null;
  notes: string[];
}

/** Runs the sweep (see the module comment). */
export function gameStepSweep(system: StarSystem, plan: Plan, options: SweepOptions): SweepResult {
  if (!options || typeof options !== 'object') throw new InputError('options', 'must be an object with physics', options);
  const physics = normalizePhysics(options.physics);
  const integrators = options.integrators ?? [...GAME_INTEGRATORS];
  if (!Array.isArray(integrators) || integrators.length === 0) throw new InputError('integrators', 'must list at least one integrator', integrators);
  for (const m of integrators) if (!GAME_INTEGRATORS.includes(m)) throw new InputError('integrators', `must be among ${GAME_INTEGRATORS.join(', ')}`, m);
  const prepared = prepareGameStep(system, plan, {
    gravity: physics.gravity,
    burns: physics.burns,
    guidance: physics.guidance,
    result: options.result,
    signal: options.signal,
  });
  let dtMax = options.dtMax;
  if (dtMax !== undefined) {
    requireFinite('dtMax', dtMax);
    if (!(dtMax >= physics.dt)) throw new InputError('dtMax', `must be >= dt (${physics.dt} s)`, dtMax);
  } else {
    const periods = boundPeriods(prepared);
    dtMax = periods.length > 0 ? Math.max(physics.dt, Math.min(...periods) * DEFAULT_DT_MAX_FRACTION) : physics.dt * 2 ** DEFAULT_LADDER_RUNGS;
  }
  const ladder: number[] = [];
  for (let k = 0; physics.dt * 2 ** k <= dtMax * (1 + 1e-12); k++) ladder.push(physics.dt * 2 ** k);
  const base = {
    tolerance: options.tolerance,
    energyTolerance: options.energyTolerance,
    maxStepsPerSpan: options.maxStepsPerSpan,
    windowSteps: options.windowSteps,
    samplesPerSpan: SWEEP_SAMPLES_PER_SPAN,
    prepared,
    signal: options.signal,
  };
  const precisionRuns = options.precisionCheck === false ? 0 : 3;
  const total = integrators.length * ladder.length + precisionRuns;
  let done = 0;
  const tick = (): void => {
    done++;
    options.onProgress?.(done, total);
  };
  const rows: SweepRow[] = [];
  const best: SweepResult['best'] = [];
  let tolerance = 0;
  let energyTolerance = 0;
  for (const integrator of integrators) {
    let found: SweepRow | null = null;
    for (let k = ladder.length - 1; k >= 0; k--) {
      const r = gameStepCheck(system, plan, { ...base, physics: { ...physics, integrator, dt: ladder[k] } });
      tolerance = r.tolerance;
      energyTolerance = r.energyTolerance;
      tick();
      const row = rowOf(integrator, ladder[k], r);
      rows.push(row);
      if (row.passes) {
        found = row;
        done += k; // the smaller steps are not flown
        break;
      }
    }
    best.push({ integrator, dt: found ? found.dt : null, missionEvals: found ? found.missionEvals : null });
  }
  let cheapest: SweepResult['cheapest'] = null;
  for (const b of best) {
    if (b.dt === null || b.missionEvals === null) continue;
    if (!cheapest || b.missionEvals < cheapest.missionEvals) cheapest = { integrator: b.integrator, dt: b.dt, missionEvals: b.missionEvals };
  }
  const notes: string[] = [];
  if (rows.some((r) => r.extrapolated)) notes.push('some runs extrapolated long coasts (see gameStepCheck); their misses are estimates');
  let precision: SweepResult['precision'] = null;
  if (precisionRuns > 0) {
    const combos: { precision: GamePhysics['precision']; rebase: GamePhysics['rebase'] }[] = [
      { precision: 'float64', rebase: null },
      { precision: 'float32', rebase: null },
      { precision: 'float32', rebase: physics.rebase ?? DEFAULT_REBASE },
    ];
    const prow: PrecisionRow[] = [];
    let f32: Float32Row[] = [];
    for (const c of combos) {
      const r = gameStepCheck(system, plan, { ...base, physics: { ...physics, precision: c.precision, rebase: c.rebase } });
      tick();
      if (c.precision === 'float32' && c.rebase === null) f32 = r.float32;
      prow.push({ precision: c.precision, rebase: c.rebase, passes: r.passes, arrivalMiss: miss(r), maxDriftPerOrbit: r.maxDriftPerOrbit });
    }
    const verdict: PrecisionVerdict = prow[1].passes ? 'float32' : prow[2].passes ? 'float32-rebase' : prow[0].passes ? 'float64' : 'none';
    precision = { integrator: physics.integrator, dt: physics.dt, rows: prow, verdict, float32: f32 };
  }
  options.onProgress?.(total, total);
  return { physics, tolerance, energyTolerance, ladder, rows, best, cheapest, precision, notes };
}

function miss(r: GameStepResult): number | null {
  return r.arrival ? r.arrival.positionError : null;
}

function rowOf(integrator: GameIntegrator, dt: number, r: GameStepResult): SweepRow {
  return {
    integrator,
    dt,
    passes: r.passes,
    status: r.status,
    arrivalMiss: miss(r),
    arrivalBasis: r.arrival ? r.arrival.basis : null,
    maxDriftPerOrbit: r.maxDriftPerOrbit,
    missionEvals: Math.ceil((r.t1 - r.t0) / dt) * EVALS_PER_STEP[integrator],
    extrapolated: r.spans.some((s) => s.mode === 'extrapolated'),
  };
}

// Periods of the reference orbit about each span's central body at the span's middle (bound orbits only).
function boundPeriods(prep: PreparedGameStep): number[] {
  const out: number[] = [];
  const r = new Float64Array(6);
  const b = new Float64Array(6);
  for (const s of prep.spans) {
    const t = 0.5 * (s.t0 + s.t1);
    prep.reference.at(t, r);
    bodyState(prep.system, s.central, t, b);
    const mu = prep.system.bodies[s.central].mu;
    const rr = Math.hypot(r[0] - b[0], r[1] - b[1], r[2] - b[2]);
    const v2 = (r[3] - b[3]) ** 2 + (r[4] - b[4]) ** 2 + (r[5] - b[5]) ** 2;
    const e = 0.5 * v2 - mu / rr;
    if (e < 0) out.push(2 * Math.PI * Math.sqrt((-mu / (2 * e)) ** 3 / mu));
  }
  return out;
}
