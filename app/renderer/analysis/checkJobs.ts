/**
 * The checks as analysis-worker jobs: the game-step check of the plan (core/gamestep/check.ts),
 * its time-step sweep (core/gamestep/sweep.ts), the plan's burns retargeted for the game's
 * physics with the runtime data of the schedule (core/handoff), the system stability check
 * (core/checks/stability.ts) and a quick estimate of how long a stability run will take.
 * Plain code, run by runJob.ts in the worker and tested without one.
 *
 * The estimate flies two short stability runs (moons flown, moons merged) of about
 * ESTIMATE_STEPS steps each and reports their step sizes and measured step rates; the panel
 * multiplies them out for the span the user asks for (stability/summary.ts runEstimate). A
 * warm-up run goes first; short runs still warm the JIT less than a long one, so the estimate
 * errs long (in the demo about 8–10 s estimated against 6 s flown for 10,000 years). After a
 * real run the store takes its measured rate instead.
 */
import { gameStepCheck, type GamePhysicsInput, type GameStepResult } from '../../../core/gamestep/index.ts';
import { gameStepSweep, type SweepResult } from '../../../core/gamestep/index.ts';
import { gameRuntimeData, retargetForGame, type RetargetResult } from '../../../core/handoff/index.ts';
import type { RuntimeEphemeris } from '../../../core/runtime/index.ts';
import type { TargetTolerances } from '../../../core/target/index.ts';
import type { Plan } from '../../../core/plan/index.ts';
import type { PlanResult } from '../../../core/plan/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import { retargetFraction } from '../handoff/progress.ts';
import { checkStability, DEFAULT_MAX_STEPS, DEFAULT_WH_MAX_STEPS, type StabilityMethod, type StabilityResult } from '../../../core/checks/index.ts';

/** Options of a game-step check that the app passes through (SI). */
export interface GameStepJobOptions {
  physics: GamePhysicsInput;
  /** Position tolerance, m (omitted: the plan target's tolerance, else the core's default). */
  tolerance?: number;
  /** Tolerance on the relative energy drift per orbit. */
  energyTolerance?: number;
  /** Step of a long-step coast, s (omitted: long coasts are extrapolated). */
  warpDt?: number;
  /** Series points per span. */
  samplesPerSpan?: number;
}

/** Options of "Retarget for my game" (SI). */
export interface RetargetJobOptions {
  physics: GamePhysicsInput;
  /** Tolerances set (the rest: core/handoff GAME_TOLERANCES). */
  tolerance?: Partial<TargetTolerances>;
  /** The final flight of the schedule: every game step, or long coasts extrapolated. */
  verify: 'every-step' | 'extrapolated';
}

/** A retargeting and the runtime data of its schedule (bodies and the ship's path), for "Save runtime data…". */
export interface RetargetOutput {
  retarget: RetargetResult;
  runtime: RuntimeEphemeris;
}

export interface StabilityJobOptions {
  years: number;
  mergeMoons: boolean | 'auto';
  /** Integrator (default: the core's, Wisdom–Holman). */
  method?: StabilityMethod;
}

/** What a stability run of this system costs: per merge mode, the step and the measured step rate. */
export interface StabilityEstimate {
  /** Seconds per calendar year. */
  yearLength: number;
  /** Whether the system has moons (else `merged` equals `moons`). */
  hasMoons: boolean;
  /** Moons flown: step, s, and steps per second measured. */
  moons: { h: number; stepsPerSecond: number };
  /** Moons merged into their planets. */
  merged: { h: number; stepsPerSecond: number };
  /** The core's step budget (a run needing more is refused; 'auto' merges moons above it). */
  maxSteps: number;
}

/** Steps of each timing run of the estimate, and of the warm-up run before it. */
export const ESTIMATE_STEPS = 20_000;
export const ESTIMATE_WARMUP = 5_000;
/** Series points per span of an app game-step run (the core's default is 200). */
export const APP_SAMPLES_PER_SPAN = 240;

export type CheckJob =
  | ({ kind: 'gamestep'; system: StarSystem; plan: Plan; result: PlanResult | null } & GameStepJobOptions)
  | { kind: 'sweep'; system: StarSystem; plan: Plan; result: PlanResult | null; physics: GamePhysicsInput; tolerance?: number; energyTolerance?: number }
  | ({ kind: 'retarget'; system: StarSystem; plan: Plan } & RetargetJobOptions)
  | ({ kind: 'stability'; system: StarSystem } & StabilityJobOptions)
  | { kind: 'stability-estimate'; system: StarSystem; method?: StabilityMethod };

export type CheckOutput =
  | { kind: 'gamestep'; check: GameStepResult }
  | { kind: 'sweep'; sweep: SweepResult }
  | ({ kind: 'retarget' } & RetargetOutput)
  | { kind: 'stability'; stability: StabilityResult }
  | { kind: 'stability-estimate'; estimate: StabilityEstimate };

const now = (): number => (typeof performance !== 'undefined' ? performance.now() : Date.now());

/** One timing run: the step at this merge mode, and the step rate over about ESTIMATE_STEPS steps. */
function timeStability(system: StarSystem, mergeMoons: boolean, method?: StabilityMethod): { h: number; stepsPerSecond: number } {
  // a short run gives about the step (h = span / ⌈span / h₀⌉ ≤ h₀); a run of about ESTIMATE_STEPS steps then gives h₀ closely, and the rate
  const probe = checkStability(system, { span: 0.01 * system.calendar.yearLength, mergeMoons, method, samples: 2 });
  const h = probe.h;
  checkStability(system, { span: ESTIMATE_WARMUP * h, mergeMoons, method, samples: 2 }); // warms the JIT
  const t0 = now();
  const r = checkStability(system, { span: ESTIMATE_STEPS * h, mergeMoons, method, samples: 2 });
  const ms = Math.max(1, now() - t0);
  return { h: r.h, stepsPerSecond: (1000 * r.steps) / ms };
}

export function runCheckJob(job: CheckJob, onProgress: (fraction: number, note: string) => void): CheckOutput {
  switch (job.kind) {
    case 'gamestep':
      return {
        kind: 'gamestep',
        check: gameStepCheck(job.system, job.plan, {
          physics: job.physics,
          tolerance: job.tolerance,
          energyTolerance: job.energyTolerance,
          warpDt: job.warpDt,
          samplesPerSpan: job.samplesPerSpan ?? APP_SAMPLES_PER_SPAN,
          result: job.result ?? undefined,
          onProgress: (f) => onProgress(f, "flying the plan with the game's physics"),
        }),
      };
    case 'sweep':
      return {
        kind: 'sweep',
        sweep: gameStepSweep(job.system, job.plan, {
          physics: job.physics,
          tolerance: job.tolerance,
          energyTolerance: job.energyTolerance,
          result: job.result ?? undefined,
          onProgress: (done, total) => onProgress(total > 0 ? done / total : 0, `flight ${Math.min(done + 1, total)} of at most ${total}`),
        }),
      };
    case 'retarget': {
      let last = 0;
      const retarget = retargetForGame(job.system, job.plan, {
        physics: job.physics,
        tolerance: job.tolerance,
        verify: job.verify,
        onProgress: (p) => {
          last = retargetFraction(p, last);
          onProgress(last, p.message);
        },
      });
      onProgress(1, 'fitting the runtime data');
      return { kind: 'retarget', retarget, runtime: gameRuntimeData(job.system, job.plan, retarget.schedule) };
    }
    case 'stability':
      return {
        kind: 'stability',
        stability: checkStability(job.system, {
          years: job.years,
          mergeMoons: job.mergeMoons,
          method: job.method,
          onProgress: (f) => onProgress(f, `${Math.round(f * job.years).toLocaleString('en')} of ${job.years.toLocaleString('en')} years`),
        }),
      };
    case 'stability-estimate': {
      const hasMoons = job.system.bodies.some((b) => b.derived.depth > 1);
      const moons = timeStability(job.system, false, job.method);
      const merged = hasMoons ? timeStability(job.system, true, job.method) : moons;
      const maxSteps = (job.method ?? 'wisdom-holman') === 'wisdom-holman' ? DEFAULT_WH_MAX_STEPS : DEFAULT_MAX_STEPS;
      return { kind: 'stability-estimate', estimate: { yearLength: job.system.calendar.yearLength, hasMoons, moons, merged, maxSteps } };
    }
  }
}
