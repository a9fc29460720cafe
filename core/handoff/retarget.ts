/**
 * Retargeting a plan for a game's own physics: the burns a game applies open loop (fixed Δv at
 * whole steps of its fixed step), adjusted so that the game's simulation — its integrator, step,
 * precision, floating origin, gravity and burn model, flown step by step — reaches the plan's
 * goals within the designer's tolerance.
 *
 * Method (defect correction: a cheap exact model corrected by the game's measured difference):
 * 1. Burns snapped to the game's step grid t_k = t0 + k·h (the nearest step; a spread burn's
 *    start), Δv fixed in inertial axes (what the plan's evaluation resolved).
 * 2. The plan's legs and goals (core/target planLegs, from its patched-conic evaluation):
 *    arrivals aimed on the B-plane (periapsis altitude and inclination) and, held by default,
 *    the periapsis time; the last leg the target orbit at the end of the plan.
 * 3. Leg by leg in order, from the game's own state just before the leg's first burn: fly the
 *    game (gameRun.ts, long coasts by measured-order step scaling) and read its goals g_game(x);
 *    met → next leg. Else the defect d = g_game(x) − g_ref(x) against the reference dynamics of
 *    the same gravity model (RK45, no step error) from the same state; solve g_ref(x′) + d =
 *    wanted for the leg's Δv components (newton.ts: least-change Newton steps from x);
 *    fly the game at x′ again. The defect is the game's step error, nearly the same at x and x′;
 *    its slope in x is learnt from successive game flights (Broyden's secant update), so this
 *    converges in a few game flights.
 * 4. The whole schedule verified by flying it with the game's physics from the start — every
 *    step by default ('every-step'; 'extrapolated' uses the step scaling of gameRun.ts).
 * 5. When it cannot be met (the flight diverges, hits a body, or the goals do not come within
 *    tolerance), say which, and look for what works: float64 instead of float32, then the step
 *    halved (up to RECOMMEND_HALVINGS times).
 */
import { InputError, SolverError, WaymarkError } from '../math/index.ts';
import { bodyState, type StarSystem } from '../system/index.ts';
import { inertialToBurn, type Plan } from '../plan/index.ts';
import { measure, planLegs, type FlightGoal, type Leg, type ModelFlight, type TargetTolerances } from '../target/index.ts';
import {
  ReferenceTrack,
  flyReference,
  normalizePhysics,
  prepareGameStep,
  spreadDuration,
  type GameBurn,
  type GamePhysics,
  type GamePhysicsInput,
} from '../gamestep/index.ts';
import { newtonSolve } from './newton.ts';
import { flyGame, gridTime, referenceSettings, stateNear, stepIndex, type GameRun, type GameState, type RunContext, type RunRegion } from './gameRun.ts';
import type { GameSchedule, ScheduledBurn } from './schedule.ts';

const DEG = Math.PI / 180;

/** Default tolerances of a game's retargeting: what a game can hold (its osculating orbit wobbles with its step). */
export const GAME_TOLERANCES: TargetTolerances = { altitude: 1000, i: 0.01 * DEG, e: 1e-4, time: 60 };
/** Game flights per leg at most. */
export const DEFAULT_GAME_FLIGHTS = 8;
/** Steps kept flown at the game's step between a leg's start and its first burn. */
export const LEG_CLEARANCE_STEPS = 4;
/** Step halvings tried for a recommendation. */
export const RECOMMEND_HALVINGS = 4;
/** A leg is done when every goal is within this fraction of its tolerance (or within the tolerance once the flights are spent). */
export const OUTER_AIM = 0.25;
/** Each game flight must bring the leg's misses (norm, in tolerances) below this fraction of the last one's, or the leg stops (a spread burn's leg shrinks them by a third to a half per flight). */
export const CONVERGENCE_RATIO = 0.9;
/** The reference solve between game flights aims this close (in tolerances): the defect moves a little between flights. */
export const INNER_AIM = 0.05;
/** Newton iterations of a reference solve at most. */
export const INNER_ITERATIONS = 8;
/** Finite-difference step of a Δv component, m/s (changes the demo's B-plane point by about 150 km: linear, far above the reference's noise). */
export const DIFFERENCE_STEP = 1e-3;
/** Relative tolerance of the reference flights the defect is taken against (tighter than any goal needs; RK45, core/gamestep/reference.ts). */
export const RETARGET_RTOL = 1e-11;

export interface RetargetOptions {
  /** The game's physics (guidance is ignored: a schedule is flown open loop). */
  physics: GamePhysicsInput;
  tolerance?: Partial<TargetTolerances>;
  /** Hold each arrival's periapsis time (default true). */
  arrivalTime?: boolean;
  /** How the final verification flies the schedule (default 'every-step'). */
  verify?: 'every-step' | 'extrapolated';
  /** Game flights per leg at most (default DEFAULT_GAME_FLIGHTS). */
  maxGameFlights?: number;
  /** Fly the plan's own burns too, for the before/after comparison (default true). */
  compare?: boolean;
  /** Look for the step or precision that works when the goals are not met (default true). */
  recommend?: boolean;
  /** Game steps above which a coast's interior is extrapolated while retargeting (gameRun.ts). */
  maxStepsPerSpan?: number;
  onProgress?: (p: RetargetProgress) => void;
  signal?: { aborted: boolean };
}

export interface RetargetProgress {
  stage: 'before' | 'leg' | 'verify' | 'recommend';
  /** Words for the status line. */
  message: string;
  /** Fraction of the stage done (0..1) when known. */
  fraction: number | null;
}

export interface RetargetGoal {
  leg: string;
  name: string;
  wanted: number;
  tolerance: number;
  /** Flying the plan's own burns in the game (null when not compared or not read). */
  before: number | null;
  /** Flying the retargeted schedule (the verification). */
  after: number | null;
  met: boolean;
  units?: string;
  unitScale?: number;
}

export interface RetargetLeg {
  name: string;
  /** Game flights and reference flights spent. */
  gameFlights: number;
  referenceFlights: number;
  met: boolean;
}

export interface Recommendation {
  reason: 'float32' | 'step';
  /** What to change, in words. */
  text: string;
  /** The precision or the step that meets the goals (null when none tried did). */
  precision: 'float64' | null;
  dt: number | null;
}

export interface ErrorCurve {
  t: Float64Array;
  /** |r_game − r_plan|, m: the game's distance from the plan's path. */
  error: Float64Array;
  extrapolated: Uint8Array;
}

export interface RetargetResult {
  status: 'met' | 'not-met';
  /** Why not met: null, 'diverged', 'impact' or 'goals'. */
  failure: 'diverged' | 'impact' | 'goals' | null;
  message: string;
  physics: GamePhysics;
  tolerance: TargetTolerances;
  schedule: GameSchedule;
  goals: RetargetGoal[];
  legs: RetargetLeg[];
  verification: {
    mode: 'every-step' | 'extrapolated';
    steps: number;
    regions: RunRegion[];
    impact: { t: number; body: string } | null;
    divergedAt: number | null;
  };
  /** Largest snap of a burn to the step grid, s. */
  largestSnap: number;
  recommendation: Recommendation | null;
  curves: { before: ErrorCurve | null; after: ErrorCurve };
  stats: { gameSteps: number; coarseSteps: number; gameFlights: number; referenceFlights: number };
  notes: string[];
}

interface Work {
  ctx: RunContext;
  burns: GameBurn[];
  stats: RetargetResult['stats'];
  generated: Map<number, Float64Array>;
}

/** The burn with Δv dv (inertial): its magnitude and, flown spread, its duration follow (from its start, which stays on the grid). */
function withDv(b: GameBurn, dv: ArrayLike<number>, spread: boolean): GameBurn {
  const v: [number, number, number] = [dv[0], dv[1], dv[2]];
  const dvMag = Math.hypot(v[0], v[1], v[2]);
  if (!spread || !(b.duration > 0)) return { ...b, dv: v, dvMag, event: null };
  const duration = spreadDuration(b, dvMag);
  return { ...b, dv: v, dvMag, duration, t: b.tStart + 0.5 * duration, mass1: b.mass0 - b.mdot * duration, event: null };
}

/** The plan's burns on the game's step grid (see the module comment). */
function snapBurns(ctx: RunContext, burns: GameBurn[]): { burns: GameBurn[]; largest: number } {
  let largest = 0;
  const spread = ctx.physics.burns === 'spread';
  const out = burns.map((b) => {
    if (spread && b.duration > 0) {
      const ts = gridTime(ctx, b.tStart);
      largest = Math.max(largest, Math.abs(ts - b.tStart));
      return { ...b, tStart: ts, t: ts + 0.5 * b.duration, event: null };
    }
    const t = gridTime(ctx, b.t);
    largest = Math.max(largest, Math.abs(t - b.t));
    return { ...b, t, tStart: t - 0.5 * b.duration, event: null };
  });
  return { burns: out, largest };
}

function burnStart(ctx: RunContext, b: GameBurn): number {
  return ctx.physics.burns === 'spread' && b.duration > 0 ? b.tStart : b.t;
}

/** A game flight read through core/target's flight interface. */
function gameFlightView(ctx: RunContext, run: GameRun): ModelFlight {
  const sys = ctx.system;
  return {
    model: 'conic',
    conic: ctx.prep.result,
    t0: run.start.t,
    t1: run.end.t,
    stateAt(k, t, out6) {
      const s = run.probes.get(t);
      if (!s) return false;
      stateNear(sys, s, k, t, out6);
      return true;
    },
    endState(k, out6) {
      stateNear(sys, run.end, k, run.end.t, out6);
    },
    entries: run.entries,
    impact: run.impact,
    checkpoint: () => null,
  };
}

const a6 = new Float64Array(6);
const c6 = new Float64Array(6);

/** The reference dynamics (no step error) of the schedule from `start` to tEnd, as a flight view. */
function referenceView(w: Work, burns: GameBurn[], start: GameState, tEnd: number): ModelFlight {
  const { system } = w.ctx;
  const f = flyReference(referenceSettings(w.ctx, burns, RETARGET_RTOL), start.t, start.abs, start.central, tEnd, true);
  w.stats.referenceFlights++;
  const track = new ReferenceTrack(system, f);
  return {
    model: 'conic',
    conic: w.ctx.prep.result,
    t0: start.t,
    t1: tEnd,
    stateAt(k, t, out6) {
      track.at(t, a6);
      bodyState(system, k, t, c6);
      for (let i = 0; i < 6; i++) out6[i] = a6[i] - c6[i];
      return true;
    },
    endState(k, out6) {
      bodyState(system, f.central, f.t, c6);
      for (let i = 0; i < 6; i++) a6[i] = f.y[i] + c6[i];
      bodyState(system, k, f.t, c6);
      for (let i = 0; i < 6; i++) out6[i] = a6[i] - c6[i];
    },
    entries: [],
    impact: null,
    checkpoint: () => null,
  };
}

function readGoals(system: StarSystem, flight: ModelFlight, goals: readonly FlightGoal[], out: Float64Array): void {
  for (let i = 0; i < goals.length; i++) out[i] = measure(system, flight, goals[i]);
}

function allMet(goals: readonly FlightGoal[], values: Float64Array, fraction: number): boolean {
  return goals.every((g, i) => Math.abs(values[i] - g.wanted) <= fraction * g.tolerance);
}

/** Retargets the plan's burns for the game's physics (see the module comment). */
export function retargetForGame(system: StarSystem, plan: Plan, options: RetargetOptions): RetargetResult {
  if (!options || typeof options !== 'object') throw new InputError('options', 'must be an object with physics', options);
  const physics = normalizePhysics({ ...options.physics, guidance: 'open-loop' });
  const tol: TargetTolerances = { ...GAME_TOLERANCES, ...(options.tolerance ?? {}) };
  for (const [k, v] of Object.entries(tol)) {
    if (!(typeof v === 'number' && Number.isFinite(v) && v > 0)) throw new InputError(`tolerance.${k}`, 'must be a number > 0', v);
  }
  const maxFlights = options.maxGameFlights ?? DEFAULT_GAME_FLIGHTS;
  if (!Number.isInteger(maxFlights) || maxFlights < 1) throw new InputError('maxGameFlights', 'must be an integer >= 1', maxFlights);
  const verifyMode = options.verify ?? 'every-step';
  if (verifyMode !== 'every-step' && verifyMode !== 'extrapolated') throw new InputError('verify', "must be 'every-step' or 'extrapolated'", verifyMode);
  const progress = options.onProgress ?? (() => {});
  const signal = options.signal;

  const prep = prepareGameStep(system, plan, { gravity: physics.gravity, burns: physics.burns, guidance: 'open-loop', signal });
  const hs = physics.precision === 'float32' ? Math.fround(physics.dt) : physics.dt;
  const ctx: RunContext = { system, prep, physics, hs, gridT0: prep.t0 };
  const snapped = snapBurns(ctx, prep.burns);
  const planBurns = snapped.burns;
  const w: Work = {
    ctx,
    burns: planBurns.map((b) => ({ ...b })),
    stats: { gameSteps: 0, coarseSteps: 0, gameFlights: 0, referenceFlights: 0 },
    generated: new Map(),
  };
  const notes: string[] = [];
  if (snapped.largest > 0) notes.push(`burns moved to the game's step grid by up to ${(snapped.largest * 1000).toFixed(3)} ms`);
  const legs = planLegs(system, plan, prep.result, tol, options.arrivalTime ?? true);
  const start: GameState = { t: prep.t0, abs: Float64Array.from(prep.start.abs), central: prep.start.central };
  const totalSteps = (prep.t1 - prep.t0) / hs;
  const stepProgress = (stage: RetargetProgress['stage'], message: string) => {
    let done = 0;
    return (n: number) => {
      done += n;
      if ((done & 0xfffff) < n) progress({ stage, message, fraction: Math.min(1, done / totalSteps) });
    };
  };
  const fly = (
    burns: GameBurn[],
    from: GameState,
    tEnd: number,
    probes: readonly number[],
    mode: 'every-step' | 'extrapolate',
    stage: RetargetProgress['stage'],
    message: string,
  ): GameRun => {
    const run = flyGame(ctx, burns, from, tEnd, probes, {
      mode,
      generated: w.generated,
      maxStepsPerSpan: options.maxStepsPerSpan,
      onSteps: stepProgress(stage, message),
      signal,
    });
    w.stats.gameFlights++;
    w.stats.gameSteps += run.steps;
    w.stats.coarseSteps += run.coarseSteps;
    return run;
  };
  const probesOf = (l: Leg) => l.goals.flatMap((g) => (g.at !== undefined ? [g.at] : []));
  const allProbes = legs.flatMap(probesOf);

  // before: the plan's own burns, flown open loop by the game
  let before: GameRun | null = null;
  if (options.compare ?? true) {
    progress({ stage: 'before', message: "flying the plan's own burns in the game", fraction: 0 });
    before = fly(w.burns, start, prep.t1, allProbes, 'extrapolate', 'before', "flying the plan's own burns in the game");
  }

  // leg by leg
  const legReports: RetargetLeg[] = [];
  let current = start;
  for (let li = 0; li < legs.length; li++) {
    const leg = legs[li];
    const idx = leg.burns.map((id) => w.burns.findIndex((b) => b.id === id)).filter((i) => i >= 0);
    const report: RetargetLeg = { name: leg.name, gameFlights: 0, referenceFlights: 0, met: false };
    legReports.push(report);
    if (idx.length === 0) continue;
    const first = Math.min(...idx.map((i) => burnStart(ctx, w.burns[i])));
    const legStartT = Math.max(current.t, gridTime(ctx, first) - LEG_CLEARANCE_STEPS * hs);
    if (legStartT > current.t) {
      const r = fly(w.burns, current, legStartT, [], 'extrapolate', 'leg', `to the start of ${leg.name}`);
      if (r.divergedAt !== null) break;
      current = r.end;
    }
    const next = legs[li + 1];
    const nextIdx = next ? next.burns.map((id) => w.burns.findIndex((b) => b.id === id)).filter((i) => i >= 0) : [];
    const nextStart = nextIdx.length > 0 ? gridTime(ctx, Math.min(...nextIdx.map((i) => burnStart(ctx, w.burns[i])))) - LEG_CLEARANCE_STEPS * hs : null;
    const probes = probesOf(leg);
    const tEnd = leg.kind === 'final' || probes.length === 0 ? prep.t1 : Math.max(...probes, nextStart ?? -Infinity);
    const flightProbes = nextStart !== null ? [...probes, nextStart] : probes;
    const goals = leg.goals;
    const m = goals.length;
    const x = new Float64Array(3 * idx.length);
    idx.forEach((bi, j) => x.set(w.burns[bi].dv, 3 * j));
    const gGame = new Float64Array(m);
    const gRef = new Float64Array(m);
    const withX = (xs: ArrayLike<number>): GameBurn[] => {
      const out = w.burns.slice();
      idx.forEach((bi, j) => (out[bi] = withDv(w.burns[bi], [xs[3 * j], xs[3 * j + 1], xs[3 * j + 2]], physics.burns === 'spread')));
      return out;
    };
    const legStart = current;
    let run: GameRun | null = null;
    // the defect's own slope in the controls (Broyden's rank-one secant update from successive game flights)
    const n = x.length;
    const D = new Float64Array(m * n);
    let lastMissNorm = Number.POSITIVE_INFINITY;
    let prevX: Float64Array | null = null;
    let prevD: Float64Array | null = null;
    for (let it = 0; ; it++) {
      progress({ stage: 'leg', message: `${leg.name}: game flight ${it + 1}`, fraction: null });
      const gameBurnsNow = withX(x);
      run = fly(gameBurnsNow, legStart, tEnd, flightProbes, 'extrapolate', 'leg', `${leg.name}: game flight ${it + 1}`);
      report.gameFlights++;
      if (run.divergedAt !== null) break;
      try {
        readGoals(system, gameFlightView(ctx, run), goals, gGame);
      } catch (e) {
        if (!(e instanceof WaymarkError)) throw e;
        notes.push(`${leg.name}: ${e.message}`);
        break;
      }
      report.met = allMet(goals, gGame, 1);
      // aim well inside the tolerance while flights remain: a later leg then starts where the plan
      // meant (an arrival late by the whole time tolerance costs the capture burn m/s)
      if (allMet(goals, gGame, OUTER_AIM) || (report.met && it + 1 >= maxFlights)) break;
      if (it + 1 >= maxFlights) break;
      // a game flight that does not bring the misses well down means the game's physics is not
      // near the reference's here (a step too coarse): more flights would not help
      const missNorm = Math.hypot(...Array.from(gGame, (g, i) => (g - goals[i].wanted) / goals[i].tolerance));
      if (it > 0 && !(missNorm < CONVERGENCE_RATIO * lastMissNorm)) {
        notes.push(`${leg.name}: the game's misses stopped shrinking (${lastMissNorm.toPrecision(3)} → ${missNorm.toPrecision(3)} tolerances)`);
        break;
      }
      lastMissNorm = missNorm;
      const refBefore = w.stats.referenceFlights;
      try {
        readGoals(system, referenceView(w, gameBurnsNow, legStart, run.end.t), goals, gRef);
      } catch (e) {
        if (!(e instanceof WaymarkError) || signal?.aborted) throw e;
        notes.push(`${leg.name}: ${e.message}`);
        break;
      }
      const defect = gGame.map((g, i) => g - gRef[i]);
      if (prevX && prevD) broydenUpdate(D, m, n, prevX, x, prevD, defect);
      prevX = Float64Array.from(x);
      prevD = Float64Array.from(defect);
      const xk = prevX;
      let sol: ReturnType<typeof newtonSolve>;
      try {
        sol = newtonSolve(
          (xs, out) => {
            readGoals(system, referenceView(w, withX(xs), legStart, run?.end.t ?? tEnd), goals, out);
            for (let i = 0; i < m; i++) {
              let slope = 0;
              for (let j = 0; j < n; j++) slope += D[i * n + j] * (xs[j] - xk[j]);
              out[i] += defect[i] + slope;
            }
          },
          goals,
          x,
          { scale: 1, aim: INNER_AIM, maxIterations: INNER_ITERATIONS, step: DIFFERENCE_STEP },
        );
      } catch (e) {
        if (!(e instanceof WaymarkError) || signal?.aborted) throw e;
        notes.push(`${leg.name}: ${e.message}`);
        break;
      }
      report.referenceFlights += w.stats.referenceFlights - refBefore;
      x.set(sol.x);
    }
    w.burns = withX(x);
    if (run && nextStart !== null) {
      const s = run.probes.get(nextStart);
      if (!s) break;
      current = s;
    }
  }

  // verification: the whole schedule from the start
  progress({
    stage: 'verify',
    message: `verifying: flying the schedule ${verifyMode === 'every-step' ? 'at every step' : 'with long coasts extrapolated'}`,
    fraction: 0,
  });
  const burnProbes = w.burns.map((b) => burnStart(ctx, b) - 1.5 * hs);
  const ver = fly(
    w.burns,
    start,
    prep.t1,
    [...allProbes, ...burnProbes],
    verifyMode === 'every-step' ? 'every-step' : 'extrapolate',
    'verify',
    'verifying the schedule',
  );
  const goalsOut: RetargetGoal[] = [];
  for (const leg of legs) {
    for (const g of leg.goals) {
      const read = (r: GameRun | null): number | null => {
        if (!r || r.divergedAt !== null) return null;
        try {
          return measure(system, gameFlightView(ctx, r), g);
        } catch (e) {
          if (!(e instanceof WaymarkError)) throw e;
          return null;
        }
      };
      const after = read(ver);
      goalsOut.push({
        leg: leg.name,
        name: g.name,
        wanted: g.wanted,
        tolerance: g.tolerance,
        before: read(before),
        after,
        met: after !== null && Math.abs(after - g.wanted) <= g.tolerance,
        units: g.units,
        unitScale: g.unitScale,
      });
    }
  }
  const met = ver.divergedAt === null && !ver.impact && goalsOut.every((g) => g.met);
  const failure: RetargetResult['failure'] = met ? null : ver.divergedAt !== null ? 'diverged' : ver.impact ? 'impact' : 'goals';
  const schedule = toSchedule(w, plan, start, ver);
  let recommendation: Recommendation | null = null;
  if (!met && (options.recommend ?? true)) recommendation = recommend(system, plan, options, physics, progress);
  const names = system.bodies.map((b) => b.name);
  const message = met
    ? `The game's ${physics.integrator} at ${fmtStep(physics.dt)} (${physics.precision}) flies the retargeted schedule to every goal (verified ${verifyMode === 'every-step' ? 'at every step' : 'with long coasts extrapolated'}).`
    : failureText(failure, ver, goalsOut, names) + (recommendation ? ` ${recommendation.text}` : '');
  return {
    status: met ? 'met' : 'not-met',
    failure,
    message,
    physics,
    tolerance: tol,
    schedule,
    goals: goalsOut,
    legs: legReports,
    verification: {
      mode: verifyMode,
      steps: ver.steps,
      regions: ver.regions,
      impact: ver.impact ? { t: ver.impact.t, body: names[ver.impact.body] } : null,
      divergedAt: ver.divergedAt,
    },
    largestSnap: snapped.largest,
    recommendation,
    curves: { before: before ? curveOf(prep.reference, before) : null, after: curveOf(prep.reference, ver) },
    stats: w.stats,
    notes,
  };
}

/**
 * Broyden's rank-one secant update of the defect's slope D (m×n): D += (Δd − D·Δx)·Δxᵀ/|Δx|²
 * (Broyden 1965; Nocedal & Wright, Numerical Optimization, 2nd ed., §11.1).
 */
function broydenUpdate(D: Float64Array, m: number, n: number, x0: Float64Array, x1: Float64Array, d0: Float64Array, d1: Float64Array): void {
  let dx2 = 0;
  for (let j = 0; j < n; j++) dx2 += (x1[j] - x0[j]) ** 2;
  if (!(dx2 > 0)) return;
  for (let i = 0; i < m; i++) {
    let pred = 0;
    for (let j = 0; j < n; j++) pred += D[i * n + j] * (x1[j] - x0[j]);
    const k = (d1[i] - d0[i] - pred) / dx2;
    for (let j = 0; j < n; j++) D[i * n + j] += k * (x1[j] - x0[j]);
  }
}

function fmtStep(dt: number): string {
  const hz = 1 / dt;
  return Math.abs(hz - Math.round(hz)) < 1e-9 && hz >= 1 ? `1/${Math.round(hz)} s` : `${Number(dt.toPrecision(4))} s`;
}

function failureText(failure: RetargetResult['failure'], ver: GameRun, goals: RetargetGoal[], names: string[]): string {
  if (failure === 'diverged')
    return `The game's flight diverged (its state stopped being finite) at t = ${ver.divergedAt?.toFixed(0)} s: the step is too coarse for the orbit there.`;
  if (failure === 'impact' && ver.impact) return `In the game the ship hits ${names[ver.impact.body]}: the step is too coarse for the orbit there.`;
  const missed = goals.filter((g) => !g.met).map((g) => g.name);
  return `The game's flight does not reach ${missed.join(', ')} within tolerance.`;
}

function curveOf(ref: ReferenceTrack, run: GameRun): ErrorCurve {
  const n = run.samples.t.length;
  const t = new Float64Array(n);
  const error = new Float64Array(n);
  const extrapolated = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    t[i] = run.samples.t[i];
    ref.at(t[i], a6);
    error[i] = Math.hypot(run.samples.pos[3 * i] - a6[0], run.samples.pos[3 * i + 1] - a6[1], run.samples.pos[3 * i + 2] - a6[2]);
    extrapolated[i] = run.samples.extrapolated[i] ? 1 : 0;
  }
  return { t, error, extrapolated };
}

/** The schedule of the retargeted burns; burn-frame components from the game's own state at each burn. */
function toSchedule(w: Work, plan: Plan, start: GameState, ver: GameRun): GameSchedule {
  const { ctx } = w;
  const { system, prep } = ctx;
  const names = system.bodies.map((b) => b.name);
  // the game's own state at the step before each burn (a probe of the verification flight, read at the first step after it)
  const orig = new Map(prep.burns.map((b) => [b.id, b]));
  const burns: ScheduledBurn[] = w.burns.map((b) => {
    const ts = burnStart(ctx, b);
    const at = ver.probes.get(ts - 1.5 * ctx.hs);
    const c = at ? at.central : start.central;
    if (at) a6.set(at.abs);
    bodyState(system, c, at ? at.t : ts, c6);
    const r = [a6[0] - c6[0], a6[1] - c6[1], a6[2] - c6[2]];
    const v = [a6[3] - c6[3], a6[4] - c6[4], a6[5] - c6[5]];
    const local = inertialToBurn('vnb', r, v, b.dv);
    const o = orig.get(b.id) ?? b;
    const spread = ctx.physics.burns === 'spread' && b.duration > 0;
    let thrust: ScheduledBurn['thrust'] = null;
    if (spread) {
      const accel0 = b.mdot > 0 && b.mass0 > b.mass1 ? b.thrust / b.mass0 : b.duration > 0 ? b.dvMag / b.duration : 0;
      const first = Math.min(accel0 * ctx.hs, b.dvMag);
      const durationNow = b.dvMag > 0 && accel0 > 0 ? estimateDuration(b) : 0;
      const steps = Math.max(1, Math.ceil(durationNow / ctx.hs - 1e-9));
      const full = steps - 1;
      const massAt = b.mass0 - b.mdot * full * ctx.hs;
      const accelLast = b.mdot > 0 ? b.thrust / massAt : accel0;
      const deliveredBefore = durationNow > 0 ? b.dvMag - Math.min(b.dvMag, accelLast * ctx.hs) : 0;
      thrust = {
        steps,
        direction: [b.dv[0] / b.dvMag, b.dv[1] / b.dvMag, b.dv[2] / b.dvMag],
        thrust: b.thrust,
        mass0: b.mass0,
        mdot: b.mdot,
        firstStepDv: first,
        lastStepDv: Math.max(0, b.dvMag - Math.max(deliveredBefore, 0)),
      };
    }
    return {
      id: b.id,
      name: b.name,
      step: stepIndex(ctx, ts),
      t: ts,
      dv: [b.dv[0], b.dv[1], b.dv[2]],
      dvMag: b.dvMag,
      dvBurnFrame: [local[0], local[1], local[2]],
      change: [b.dv[0] - o.dv[0], b.dv[1] - o.dv[1], b.dv[2] - o.dv[2]],
      central: names[c],
      thrust,
    };
  });
  bodyState(system, start.central, start.t, c6);
  const s = Array.from(start.abs, (x, i) => x - c6[i]) as [number, number, number, number, number, number];
  return {
    plan: plan.name,
    system: system.name,
    physics: ctx.physics,
    t0: start.t,
    start: { central: names[start.central], state: s },
    endStep: stepIndex(ctx, ver.end.t),
    burns,
  };
}

/** Duration of a spread burn delivering its |Δv| (Tsiolkovsky at its thrust and flow), s. */
function estimateDuration(b: GameBurn): number {
  if (b.mdot > 0 && b.thrust > 0) return (b.mass0 - b.mass0 * Math.exp((-b.dvMag * b.mdot) / b.thrust)) / b.mdot;
  return b.duration > 0 && b.dvMag > 0 ? b.duration : 0;
}

/** What works when the game's physics cannot meet the goals: float64, then the step halved. */
function recommend(system: StarSystem, plan: Plan, options: RetargetOptions, physics: GamePhysics, progress: (p: RetargetProgress) => void): Recommendation {
  const tryWith = (p: GamePhysicsInput): boolean => {
    try {
      const r = retargetForGame(system, plan, { ...options, physics: p, compare: false, recommend: false, verify: 'extrapolated', onProgress: undefined });
      return r.status === 'met';
    } catch (e) {
      if (e instanceof SolverError) return false;
      throw e;
    }
  };
  if (physics.precision === 'float32') {
    progress({ stage: 'recommend', message: 'trying float64 at the same step', fraction: null });
    if (tryWith({ ...physics, precision: 'float64' })) {
      return {
        reason: 'float32',
        text: `float32 rounding is larger than the tolerance; the same step in float64 meets every goal — fly the ship's state in double precision (or keep float32 and widen the tolerance).`,
        precision: 'float64',
        dt: null,
      };
    }
  }
  let dt = physics.dt;
  for (let k = 1; k <= RECOMMEND_HALVINGS; k++) {
    dt /= 2;
    progress({ stage: 'recommend', message: `trying a step of ${fmtStep(dt)}`, fraction: k / RECOMMEND_HALVINGS });
    if (tryWith({ ...physics, dt })) {
      return {
        reason: 'step',
        text: `The largest step found that meets every goal is ${fmtStep(dt)} (the step halved ${k} time${k > 1 ? 's' : ''}).`,
        precision: null,
        dt,
      };
    }
  }
  return {
    reason: physics.precision === 'float32' ? 'float32' : 'step',
    text: `No step down to ${fmtStep(dt)} meets every goal${physics.precision === 'float32' ? ', nor float64' : ''}: widen the tolerance or use a higher-order integrator.`,
    precision: null,
    dt: null,
  };
}
