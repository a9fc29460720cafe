/**
 * Game-step check: flies a plan with a game's own physics — fixed step, simple integrator,
 * float32 or float64, optional floating origin, patched-conic or all-body gravity, burns as the
 * game applies them — and compares it with the reference flight of the same model (DOP853 at a
 * tight tolerance, reference.ts).
 *
 * What is measured, against time: position and velocity error (|game − reference| in the star
 * frame), the relative error of the specific orbital energy about the reference's central body
 * (ε = v²/2 − μ/r; 'all' gravity: about the plan's central body of the time), the energy drift
 * per orbit of each span, the miss at arrival (the plan's closest approach to its target; the
 * end of the plan when it has none) and the first time the position error exceeds the
 * tolerance. The spans are the plan's trajectory segments.
 *
 * Spans flown and spans extrapolated. A game steps at e.g. 1/60 s; a months-long cruise is
 * then ~10⁹ steps. Spans of at most `maxStepsPerSpan` steps are flown at the game's step
 * ('flown'). In a longer span, the part away from burns (the region) is either
 * - flown as a long-step coast at the step `warpDt` (mode 'warp', measured), or
 * - 'extrapolated': (1) the error the game brought into the region is carried through it
 *   exactly, by flying the game's state at the region's start with the reference dynamics;
 *   (2) the error the game's step generates in the region is measured on flights of the whole
 *   region, from the reference state at its start, with the game's method and precision at two
 *   coarse steps H and 2H (within the step budget), and scaled to the game's step with the
 *   measured order p = log2(e(2H)/e(H)): e(dt) = e(H)·(dt/H)^p, as vectors at every sample time
 *   (step-size extrapolation, the reasoning of Richardson extrapolation; Hairer, Nørsett &
 *   Wanner, Solving ODEs I, 2nd ed., §II.9). This is accepted when p is near the method's order;
 *   otherwise (typically float32 rounding, which grows as the step shrinks, or errors below the
 *   reference's own accuracy) a window at the game's step is flown and its growth fitted as
 *   e(τ) ≈ A·τ^q (fit.ts), the direction taken from the window's last error in the RTN
 *   frame. In float32 the window is always flown, and replaces step scaling when it measures
 *   more than twice the scaled error. (3) The error at a sample is carried + generated; the game
 *   resumes at the region's end from the carried state plus the generated error, so later spans
 *   propagate it. Series points carry a basis code: measured, extrapolated, or measured after an
 *   extrapolated region.
 * Checked against flying the demo cruise whole (test/core/gamestep/extrapolate.test.ts: step
 * scaling within 2 % of the flown arrival miss; at 1/60 s semi-implicit Euler 2,243 m
 * extrapolated against 2,250 m flown whole). The window fit is cruder: a power law over a
 * window much shorter than an orbit can miss growth that sets in later. With `warpDt`, or
 * `maxStepsPerSpan` above the region's steps, nothing is extrapolated.
 *
 * Comparisons skip the instants between the game's impulse (at its nearest step) and the
 * planned one, when the two flights are on opposite sides of the burn; energy drift and orbit
 * periods use coasting comparisons only (not inside a spread burn's thrust window).
 *
 * Float32: the result lists, per span, the mission's largest distance from the game's frame
 * centre and speed, their binary32 spacings, and how a step's position and velocity increments
 * compare with them (an increment below the spacing is rounded away: the game cannot represent
 * the motion). The precision verdict itself comes from flying the plan (sweep.ts).
 */
import { InputError, SolverError, requireFinite } from '../math/index.ts';
import { MAX_GAME_SAMPLES_PER_SPAN, MAX_GAME_STEPS, requireWithinLimit } from '../system/index.ts';
import { bodyState } from '../system/index.ts';
import type { StarSystem } from '../system/index.ts';
import { GameFlight } from './flight.ts';
import { driftPerOrbit } from './fit.ts';
import { EVALS_PER_STEP } from './kernel.ts';
import { ReferenceTrack, flyReference, frameAt } from './reference.ts';
import { normalizePhysics, prepareGameStep, type PreparedGameStep, type SpanDef } from './prepare.ts';
import {
  BASIS_EXTRAPOLATED,
  BASIS_MEASURED,
  BASIS_MEASURED_PLUS,
  BURN_CLEARANCE_STEPS,
  CHECKS_PER_SAMPLE,
  DEFAULT_ENERGY_TOLERANCE,
  DEFAULT_MAX_STEPS_PER_SPAN,
  DEFAULT_SAMPLES_PER_SPAN,
  DEFAULT_TOLERANCE,
  DEFAULT_WINDOW_STEPS,
  MAX_CHECK_EVERY,
  PROBE_ORBITS,
  PROBE_POINTS,
  type Float32Row,
  type GameBasis,
  type GameExtrapolation,
  type GamePhysics,
  type GamePhysicsInput,
  type GameSpanMode,
  type GameSpanReport,
  type GameStepPoint,
  type GameStepResult,
} from './types.ts';
import { energyOf, energyScale } from './measure.ts';
import { extrapolate } from './extrapolate.ts';
import { float32Table } from './precision.ts';
import { fmtM } from './format.ts';
import type { Plan } from '../plan/index.ts';
import type { PlanResult } from '../plan/index.ts';

export type { GameIntegrator, GamePrecision } from './kernel.ts';
export type { GameBurn, GameBurnModel, GameGravity } from './reference.ts';
export type { GameRebase } from './flight.ts';
export type { GameGuidance } from './guidance.ts';
export { GAME_INTEGRATORS, METHOD_ORDER, EVALS_PER_STEP } from './kernel.ts';
export type {
  Float32Row,
  GameBasis,
  GameExtrapolation,
  GameExtrapolationWindow,
  GamePhysics,
  GamePhysicsInput,
  GameSpanMode,
  GameSpanReport,
  GameStepPoint,
  GameStepResult,
  GameStepSeries,
  GameStepTrack,
} from './types.ts';
export {
  BASIS_EXTRAPOLATED,
  BASIS_MEASURED,
  BASIS_MEASURED_PLUS,
  BURN_CLEARANCE_STEPS,
  CHECKS_PER_SAMPLE,
  DEFAULT_BURN_MODEL,
  DEFAULT_ENERGY_TOLERANCE,
  DEFAULT_GRAVITY,
  DEFAULT_GUIDANCE,
  DEFAULT_MAX_STEPS_PER_SPAN,
  DEFAULT_PRECISION,
  DEFAULT_REBASE,
  DEFAULT_SAMPLES_PER_SPAN,
  DEFAULT_TOLERANCE,
  DEFAULT_WINDOW_STEPS,
  MAX_CHECK_EVERY,
  MAX_WINDOW_FRACTION,
  PROBE_ORBITS,
  PROBE_POINTS,
  REFERENCE_CHECK_FACTOR,
  WINDOW_POINTS,
} from './types.ts';
export type { PreparedGameStep, PrepareOptions } from './prepare.ts';
export { gameBurns, normalizePhysics, prepareGameStep } from './prepare.ts';

export interface GameStepOptions {
  physics: GamePhysicsInput;
  /** Position tolerance, m (default: the plan target's periapsis-altitude tolerance, else DEFAULT_TOLERANCE). */
  tolerance?: number;
  /** Tolerance on |relative energy drift per orbit| (default DEFAULT_ENERGY_TOLERANCE). */
  energyTolerance?: number;
  /** Game steps above which a span's region is flown as a long-step coast or extrapolated (default DEFAULT_MAX_STEPS_PER_SPAN). */
  maxStepsPerSpan?: number;
  /** Step of the long-step coast over the regions of long spans, s; omitted: extrapolate. */
  warpDt?: number;
  /** Steps of the extrapolation window (default DEFAULT_WINDOW_STEPS, at most maxStepsPerSpan). */
  windowSteps?: number;
  /** Series points per span (default DEFAULT_SAMPLES_PER_SPAN, ≥ 2). */
  samplesPerSpan?: number;
  /** The plan's patched-conic result (evaluated when omitted). */
  result?: PlanResult;
  /** A prepared mission and reference (from prepareGameStep) to reuse across runs. */
  prepared?: PreparedGameStep;
  /** Called with the fraction done (0..1) now and then. */
  onProgress?: (fraction: number) => void;
  signal?: { aborted: boolean };
}

function positiveInteger(field: string, v: number | undefined, dflt: number, min = 1): number {
  const x = v ?? dflt;
  if (!Number.isInteger(x) || x < min) throw new InputError(field, `must be an integer >= ${min}`, x);
  return x;
}

interface SpanAcc {
  def: SpanDef;
  mode: GameSpanMode;
  steps: number;
  region: { t0: number; t1: number; dt: number } | null;
  dt: number;
  posMax: number;
  velMax: number;
  enMax: number;
  posEnd: number;
  velEnd: number;
  enEnd: number;
  basisEnd: GameBasis;
  et: number[];
  ee: number[];
  periodSum: number;
  periodCount: number;
  dist: number;
  speed: number;
  accel: number;
  nextSample: number;
  sampleStep: number;
  extrapolation: GameExtrapolation | null;
}

/** Flies the plan with the game's physics and compares it with the reference (see the module comment). */
export function gameStepCheck(system: StarSystem, plan: Plan, options: GameStepOptions): GameStepResult {
  if (!options || typeof options !== 'object') throw new InputError('options', 'must be an object with physics', options);
  const physics = normalizePhysics(options.physics);
  const prep =
    options.prepared ??
    prepareGameStep(system, plan, {
      gravity: physics.gravity,
      burns: physics.burns,
      guidance: physics.guidance,
      result: options.result,
      signal: options.signal,
    });
  if (prep.gravity !== physics.gravity || prep.burnModel !== physics.burns || prep.guidance !== physics.guidance) {
    throw new InputError(
      'prepared',
      `was made for gravity '${prep.gravity}', burns '${prep.burnModel}', guidance '${prep.guidance}', not '${physics.gravity}', '${physics.burns}', '${physics.guidance}'`,
    );
  }
  const tolerance = options.tolerance ?? (plan.target ? plan.target.tolerance.periapsisAltitude : DEFAULT_TOLERANCE);
  requireFinite('tolerance', tolerance);
  if (!(tolerance > 0)) throw new InputError('tolerance', 'must be > 0 (m)', tolerance);
  const energyTolerance = options.energyTolerance ?? DEFAULT_ENERGY_TOLERANCE;
  requireFinite('energyTolerance', energyTolerance);
  if (!(energyTolerance > 0)) throw new InputError('energyTolerance', 'must be > 0', energyTolerance);
  const maxSteps = requireWithinLimit(
    'maxStepsPerSpan',
    positiveInteger('maxStepsPerSpan', options.maxStepsPerSpan, DEFAULT_MAX_STEPS_PER_SPAN),
    MAX_GAME_STEPS,
    'game steps',
  );
  const windowSteps = Math.min(positiveInteger('windowSteps', options.windowSteps, DEFAULT_WINDOW_STEPS, 16), maxSteps);
  const samples = requireWithinLimit(
    'samplesPerSpan',
    positiveInteger('samplesPerSpan', options.samplesPerSpan, DEFAULT_SAMPLES_PER_SPAN, 2),
    MAX_GAME_SAMPLES_PER_SPAN,
    'samples',
  );
  const warpDt = options.warpDt;
  if (warpDt !== undefined) {
    requireFinite('warpDt', warpDt);
    if (!(warpDt > 0)) throw new InputError('warpDt', 'must be > 0 (s)', warpDt);
  }
  return new GameStepRun(prep, physics, {
    tolerance,
    energyTolerance,
    maxSteps,
    windowSteps,
    samples,
    warpDt: warpDt ?? null,
    onProgress: options.onProgress,
    signal: options.signal,
  }).run();
}

interface RunOptions {
  tolerance: number;
  energyTolerance: number;
  maxSteps: number;
  windowSteps: number;
  samples: number;
  warpDt: number | null;
  onProgress?: (fraction: number) => void;
  signal?: { aborted: boolean };
}
class GameStepRun {
  readonly system: StarSystem;
  readonly flight: GameFlight;
  readonly hs: number;
  readonly ref: ReferenceTrack;
  readonly spans: SpanAcc[];
  // series
  readonly sT: number[] = [];
  readonly sP: number[] = [];
  readonly sV: number[] = [];
  readonly sE: number[] = [];
  readonly sB: number[] = [];
  readonly sS: number[] = [];
  readonly trG: number[] = [];
  readonly trR: number[] = [];
  // offsets from extrapolated regions
  /** Extrapolated position error the resumed state holds (m), for GameStepPoint.extrapolatedPart. */
  offP = 0;
  extrapolatedBefore = false;
  cur = 0;
  firstExceed: (GameStepPoint & { resolution: number }) | null = null;
  lastCheckT = NaN;
  lastCheckP = 0;
  arrival: (GameStepPoint & { body: number }) | null = null;
  end: GameStepPoint | null = null;
  impacts: { t: number; body: number }[] = [];
  impacted = new Set<number>();
  notes: string[] = [];
  windowSteps = 0;
  probeSteps = 0;
  flownTime = 0;
  warpTime = 0;
  extrapolatedTime = 0;
  totalSteps = 1;
  doneSteps = 0;
  lastProgress = -1;
  status: 'done' | 'diverged' = 'done';
  divergedAt: number | null = null;
  readonly g6 = new Float64Array(6);
  readonly r6 = new Float64Array(6);
  readonly b6 = new Float64Array(6);
  readonly f6 = new Float64Array(6);

  constructor(
    readonly prep: PreparedGameStep,
    readonly physics: GamePhysics,
    readonly o: RunOptions,
  ) {
    this.system = prep.system;
    this.ref = prep.reference;
    this.flight = new GameFlight({
      system: prep.system,
      gravity: physics.gravity,
      integrator: physics.integrator,
      precision: physics.precision,
      rebase: physics.rebase,
      burnModel: physics.burns,
      burns: prep.burns,
      guidance: physics.guidance,
    });
    this.hs = this.flight.gameStep(physics.dt);
    this.spans = prep.spans.map((def) => this.planSpan(def));
    let total = 0;
    for (const s of this.spans) {
      const len = s.def.t1 - s.def.t0;
      if (s.region) {
        const rl = s.region.t1 - s.region.t0;
        const extra = Math.min(this.o.maxSteps, (1.5 * rl) / this.hs) + (this.physics.precision === 'float32' ? this.o.windowSteps : 0);
        total += (len - rl) / this.hs + (s.mode === 'warp' ? rl / s.region.dt : extra);
      } else total += len / this.hs;
    }
    this.totalSteps = Math.max(1, total);
    // the budget of a check (core/system/limits.ts): refused before the first step
    if (!(total <= MAX_GAME_STEPS)) {
      const warped = this.spans.some((sp) => sp.mode === 'warp');
      throw new InputError(
        warped ? 'warpDt' : 'physics.dt',
        `needs about ${total.toExponential(2)} game steps, more than the ${MAX_GAME_STEPS.toExponential(0)} Waymark flies in one check; ${warped ? 'take a longer coast step, or omit it to extrapolate long coasts' : 'take a longer step or lower maxStepsPerSpan'}`,
        warped ? this.o.warpDt : physics.dt,
      );
    }
  }

  // Decides how a span is flown.
  planSpan(def: SpanDef): SpanAcc {
    const hs = this.hs;
    const len = def.t1 - def.t0;
    const acc: SpanAcc = {
      def,
      mode: 'flown',
      steps: 0,
      region: null,
      dt: hs,
      posMax: 0,
      velMax: 0,
      enMax: 0,
      posEnd: 0,
      velEnd: 0,
      enEnd: 0,
      basisEnd: 'measured',
      et: [],
      ee: [],
      periodSum: 0,
      periodCount: 0,
      dist: 0,
      speed: 0,
      accel: 0,
      nextSample: def.t0 + len / this.o.samples,
      sampleStep: len / this.o.samples,
      extrapolation: null,
    };
    if (len / hs <= this.o.maxSteps) return acc;
    const clear = BURN_CLEARANCE_STEPS * hs;
    let ta = def.t0 + clear;
    let tb = def.t1 - clear;
    for (const b of this.prep.burns) {
      const w0 = this.physics.burns === 'spread' && b.duration > 0 ? b.tStart : b.t;
      const w1 = this.physics.burns === 'spread' && b.duration > 0 ? b.tStart + b.duration : b.t;
      if (w1 < def.t0 - clear || w0 > def.t1 + clear) continue;
      if (w0 <= 0.5 * (def.t0 + def.t1)) ta = Math.max(ta, w1 + clear);
      else tb = Math.min(tb, w0 - clear);
    }
    if (!((tb - ta) / hs > 16)) return acc;
    const warp = this.o.warpDt;
    acc.mode = warp !== null ? 'warp' : 'extrapolated';
    acc.region = { t0: ta, t1: tb, dt: warp ?? hs };
    return acc;
  }

  progress(steps: number): void {
    this.doneSteps += steps;
    const cb = this.o.onProgress;
    if (!cb) return;
    const f = Math.min(1, this.doneSteps / this.totalSteps);
    if (f - this.lastProgress >= 0.005) {
      this.lastProgress = f;
      cb(f);
    }
  }

  checkEvery(len: number, h: number): number {
    return Math.max(1, Math.min(MAX_CHECK_EVERY, Math.floor(len / (this.o.samples * CHECKS_PER_SAMPLE) / h)));
  }

  run(): GameStepResult {
    const prep = this.prep;
    const flight = this.flight;
    flight.reset(prep.t0, prep.start.abs, prep.start.central);
    this.observe(prep.t0, BASIS_MEASURED, true);
    const last = this.spans.length - 1;
    const hooksFor = (len: number, h: number, land = false) => ({
      land,
      checkEvery: this.checkEvery(len, h),
      checkpoints: prep.arrival ? [prep.arrival.t] : [],
      onCheck: (t: number) => this.observe(t, this.extrapolatedBefore ? BASIS_MEASURED_PLUS : BASIS_MEASURED, false),
      onSteps: (n: number) => this.progress(n),
      signal: this.o.signal,
    });
    for (let i = 0; i < this.spans.length && this.status === 'done'; i++) {
      const s = this.spans[i];
      const len = s.def.t1 - s.def.t0;
      const stepsBefore = flight.steps;
      const tStart = flight.t;
      if (!s.region) {
        this.fly(s.def.t1, this.hs, hooksFor(len, this.hs, i === last));
        this.flownTime += flight.t - tStart;
      } else if (s.mode === 'warp') {
        this.fly(s.region.t0, this.hs, hooksFor(len, this.hs));
        const ta = flight.t;
        const n = Math.max(1, Math.ceil((s.region.t1 - ta) / s.region.dt - 1e-9));
        const H = (s.region.t1 - ta) / n;
        s.region = { t0: ta, t1: s.region.t1, dt: H };
        if (this.status === 'done') this.fly(s.region.t1, H, hooksFor(len, H, true));
        this.warpTime += flight.t - ta;
        const tb = flight.t;
        if (this.status === 'done') this.fly(s.def.t1, this.hs, hooksFor(len, this.hs, i === last));
        this.flownTime += ta - tStart + (flight.t - tb);
      } else {
        this.fly(s.region.t0, this.hs, hooksFor(len, this.hs));
        const ta = flight.t;
        if (this.status === 'done') {
          extrapolate(this, s, ta);
          if (this.status === 'done') {
            this.extrapolatedTime += s.region.t1 - ta;
            const tb = flight.t;
            this.fly(s.def.t1, this.hs, hooksFor(len, this.hs, i === last));
            this.flownTime += ta - tStart + (flight.t - tb);
          }
        }
      }
      s.steps = flight.steps - stepsBefore;
    }
    return this.finish();
  }

  fly(tEnd: number, h: number, hooks: Parameters<GameFlight['fly']>[2]): void {
    const st = this.flight.fly(tEnd, h, hooks);
    if (st === 'cancelled') throw new SolverError('game-step', 'cancelled', `cancelled at t = ${this.flight.t} s`, { t: this.flight.t });
    if (st === 'diverged') {
      this.status = 'diverged';
      this.divergedAt = this.flight.t;
      this.notes.push(`the game's state became non-finite at t = ${this.flight.t.toFixed(3)} s: the flight diverged and stopped there`);
    }
  }

  /** Whether t lies within a spread burn's thrust window (widened by a step each side). */
  inThrust(t: number): boolean {
    if (this.physics.burns !== 'spread') return false;
    for (const b of this.prep.burns) {
      if (b.duration > 0 && t >= b.tStart - 2 * this.hs && t <= b.tStart + 1.2 * b.duration + 2 * this.hs) return true;
    }
    return false;
  }

  spanIndexAt(t: number): number {
    while (this.cur + 1 < this.spans.length && t > this.spans[this.cur].def.t1) this.cur++;
    return this.cur;
  }

  /** Compares the game's current state with the reference. */
  observe(t: number, basis: number, forceSample: boolean): void {
    // between the game's impulse and the planned one the two flights differ by the burn itself
    if (this.flight.inImpulseWindow(t)) return;
    this.flight.state(this.g6);
    this.record(t, this.g6, basis, forceSample, 0, 0, 0);
  }

  /**
   * Records one comparison of a game state g (absolute) with the reference at t; extra error
   * parts (extrapolated) are added to the measured ones.
   */
  record(t: number, g: Float64Array, basis: number, forceSample: boolean, addP: number, addV: number, addE: number, part = addP): void {
    const system = this.system;
    const r = this.r6;
    const refCentral = this.ref.at(t, r);
    const b = this.physics.gravity === 'central' ? refCentral : frameAt(this.prep.settings.frames, t);
    const B = this.b6;
    bodyState(system, b, t, B);
    const mu = system.bodies[b].mu;
    const dp = Math.hypot(g[0] - r[0], g[1] - r[1], g[2] - r[2]) + addP;
    const dv = Math.hypot(g[3] - r[3], g[4] - r[4], g[5] - r[5]) + addV;
    const er = energyOf(r, B, mu);
    const de = (energyOf(g, B, mu) - er) / energyScale(er, r, B, mu) + addE;
    const k = this.spanIndexAt(t);
    const s = this.spans[k];
    if (dp > s.posMax) s.posMax = dp;
    if (dv > s.velMax) s.velMax = dv;
    if (Math.abs(de) > s.enMax) s.enMax = Math.abs(de);
    s.posEnd = dp;
    s.velEnd = dv;
    s.enEnd = de;
    const basisName: GameBasis = basis === BASIS_MEASURED ? 'measured' : 'extrapolated';
    s.basisEnd = basisName;
    // energy drift and period: coasting comparisons only (a thrust window shifts the energy by the burn itself)
    const coasting = !this.inThrust(t);
    if (basis !== BASIS_EXTRAPOLATED && coasting) {
      s.et.push(t);
      s.ee.push(de);
    }
    if (er < 0 && coasting) {
      s.periodSum += 2 * Math.PI * Math.sqrt((-mu / (2 * er)) ** 3 / mu);
      s.periodCount++;
    }
    // the mission's distances in the game's frame (the central body, or the star for 'all')
    const F = this.f6;
    if (this.physics.gravity === 'central') F.set(B);
    else F.fill(0);
    const d = Math.hypot(r[0] - F[0], r[1] - F[1], r[2] - F[2]);
    const v = Math.hypot(r[3] - F[3], r[4] - F[4], r[5] - F[5]);
    if (d > s.dist) s.dist = d;
    if (v > s.speed) s.speed = v;
    const rb = Math.hypot(g[0] - B[0], g[1] - B[1], g[2] - B[2]);
    const rr = Math.hypot(r[0] - B[0], r[1] - B[1], r[2] - B[2]);
    const ga = mu / (rr * rr);
    if (ga > s.accel) s.accel = ga;
    if (basis !== BASIS_EXTRAPOLATED && rb < system.bodies[b].radius && !this.impacted.has(b)) {
      this.impacted.add(b);
      this.impacts.push({ t, body: b });
    }
    const point = (): GameStepPoint => ({
      t,
      positionError: dp,
      velocityError: dv,
      energyError: de,
      basis: basisName,
      extrapolatedPart: basis === BASIS_MEASURED ? 0 : basis === BASIS_MEASURED_PLUS ? this.offP : part,
    });
    if (!this.firstExceed && dp > this.o.tolerance) {
      this.firstExceed = { ...point(), resolution: Number.isFinite(this.lastCheckT) ? t - this.lastCheckT : 0 };
    }
    this.lastCheckT = t;
    this.lastCheckP = dp;
    const arr = this.prep.arrival;
    if (arr && !this.arrival && t >= arr.t) this.arrival = { ...point(), body: arr.body };
    this.end = point();
    if (forceSample || t >= s.nextSample) {
      while (s.nextSample <= t) s.nextSample += s.sampleStep;
      this.sT.push(t);
      this.sP.push(dp);
      this.sV.push(dv);
      this.sE.push(de);
      this.sB.push(basis);
      this.sS.push(k);
      this.trG.push(g[0], g[1], g[2]);
      this.trR.push(r[0], r[1], r[2]);
    }
  }

  /**
   * Energy drift per orbit of the game's physics on span s's orbit: PROBE_ORBITS periods flown
   * without burns from the reference state at the span's start, against a reference flight of
   * the same; null when the probe would exceed the step budget.
   */
  probe(s: SpanAcc, period: number): number | null {
    const hs = this.hs;
    const len = PROBE_ORBITS * period;
    if (len / hs > this.o.maxSteps) return null;
    const prep = this.prep;
    const t0 = s.et.length > 0 ? s.et[0] : s.def.t0; // the span's first coasting comparison
    const r0 = new Float64Array(6);
    const c0 = this.ref.at(t0, r0);
    const pf = new GameFlight({ ...this.flight.setup, burns: [] });
    pf.reset(t0, r0, c0);
    const pref = new ReferenceTrack(this.system, flyReference({ ...prep.settings, burns: [] }, t0, r0, c0, t0 + len, true));
    const g = new Float64Array(6);
    const r = new Float64Array(6);
    const B = new Float64Array(6);
    const pt: number[] = [];
    const pe: number[] = [];
    let left = false;
    const st = pf.fly(t0 + len, hs, {
      land: true,
      checkEvery: Math.max(1, Math.floor(len / hs / PROBE_POINTS)),
      onCheck: (t) => {
        if (left) return;
        pf.state(g);
        const rc = pref.at(t, r);
        // the drift of the span's own orbit: a probe that reaches another sphere of influence (an
        // encounter its whole orbit passes through) stops counting there
        if (this.physics.gravity === 'central' && rc !== c0) {
          left = true;
          return;
        }
        const b = this.physics.gravity === 'central' ? rc : frameAt(prep.settings.frames, t);
        bodyState(this.system, b, t, B);
        const mu = this.system.bodies[b].mu;
        const er = energyOf(r, B, mu);
        pt.push(t);
        pe.push((energyOf(g, B, mu) - er) / energyScale(er, r, B, mu));
      },
      onSteps: (n) => this.progress(n),
      signal: this.o.signal,
    });
    if (st === 'cancelled') throw new SolverError('game-step', 'cancelled', `cancelled at t = ${pf.t} s`, { t: pf.t });
    this.probeSteps += pf.steps;
    if (st === 'diverged' || pt.length < 2) return null;
    return driftPerOrbit(pt, pe, period).perOrbit;
  }

  finish(): GameStepResult {
    const physics = this.physics;
    const spans: GameSpanReport[] = this.spans.map((s) => {
      const period = s.periodCount > 0 ? s.periodSum / s.periodCount : null;
      let drift: number | null = null;
      let method: GameSpanReport['driftMethod'] = null;
      if (period !== null && s.extrapolation) {
        drift = s.extrapolation.energyRate * period;
        method = 'trend';
      } else if (period !== null && s.et.length >= 2) {
        const d = driftPerOrbit(s.et, s.ee, period);
        drift = d.perOrbit;
        method = d.method;
        if (d.method === 'trend' && this.status === 'done') {
          const p = this.probe(s, period);
          if (p !== null) {
            drift = p;
            method = 'probe';
          }
        }
      }
      return {
        index: s.def.index,
        kind: s.def.kind,
        central: s.def.central,
        t0: s.def.t0,
        t1: s.def.t1,
        mode: s.mode,
        dt: s.dt,
        steps: s.steps,
        region: s.region,
        positionErrorMax: s.posMax,
        velocityErrorMax: s.velMax,
        energyErrorMax: s.enMax,
        positionErrorEnd: s.posEnd,
        velocityErrorEnd: s.velEnd,
        energyErrorEnd: s.enEnd,
        period,
        driftPerOrbit: drift,
        driftMethod: method,
        basis: s.basisEnd,
        extrapolation: s.extrapolation,
      };
    });
    // the criterion uses drifts measured over a whole orbit; a trend over part of one is indicative only
    let maxDrift: number | null = null;
    for (const s of spans) {
      if (s.driftPerOrbit !== null && (s.driftMethod === 'per-orbit' || s.driftMethod === 'probe'))
        maxDrift = Math.max(maxDrift ?? 0, Math.abs(s.driftPerOrbit));
    }
    const float32: Float32Row[] = float32Table(this.spans, this.hs, physics.rebase);
    const arrival = this.arrival ?? (!this.prep.arrival && this.end && this.status === 'done' ? { ...this.end, body: -1 } : null);
    const missPoint = arrival;
    const passes =
      this.status === 'done' && missPoint !== null && missPoint.positionError <= this.o.tolerance && (maxDrift === null || maxDrift <= this.o.energyTolerance);
    const failed = [...new Set([...this.flight.solveFailures, ...this.prep.referenceStats.solveFailures])];
    if (failed.length > 0) this.notes.push(`burn solve failed for ${failed.join(', ')}: flown with the plan's Δv`);
    if (missPoint && missPoint.positionError < this.prep.referenceError) {
      this.notes.push(`the arrival miss is below the reference's own error estimate (${fmtM(this.prep.referenceError)}): it is not resolved`);
    }
    if (this.impacts.length > 0) {
      for (const im of this.impacts) this.notes.push(`the game's craft is inside ${this.system.bodies[im.body].name} at t = ${im.t.toFixed(1)} s`);
    }
    const missionSteps = Math.ceil((this.prep.t1 - this.prep.t0) / this.hs);
    return {
      physics,
      tolerance: this.o.tolerance,
      energyTolerance: this.o.energyTolerance,
      t0: this.prep.t0,
      t1: this.prep.t1,
      status: this.status,
      divergedAt: this.divergedAt,
      spans,
      series: {
        t: Float64Array.from(this.sT),
        positionError: Float64Array.from(this.sP, finiteOr),
        velocityError: Float64Array.from(this.sV, finiteOr),
        energyError: Float64Array.from(this.sE, finiteOr),
        basis: Uint8Array.from(this.sB),
        span: Int32Array.from(this.sS),
      },
      track: { t: Float64Array.from(this.sT), game: Float64Array.from(this.trG, finiteOr), reference: Float64Array.from(this.trR) },
      arrival: arrival ?? null,
      end: this.end,
      firstExceed: this.firstExceed,
      maxDriftPerOrbit: maxDrift,
      passes,
      float32,
      impacts: this.impacts,
      reference: { rtol: this.prep.rtol, stats: this.prep.referenceStats, errorEstimate: this.prep.referenceError },
      stats: {
        gameSteps: this.flight.steps,
        windowSteps: this.windowSteps,
        probeSteps: this.probeSteps,
        accelEvals: this.flight.craft.evals,
        rebases: this.flight.rebases,
        soiChanges: this.flight.soiChanges,
        flownTime: this.flownTime,
        warpTime: this.warpTime,
        extrapolatedTime: this.extrapolatedTime,
        missionSteps,
        missionEvals: missionSteps * EVALS_PER_STEP[physics.integrator],
      },
      notes: this.notes,
    };
  }
}

/** Non-finite numbers (a diverged flight) become the largest double, so no NaN or Infinity leaves the core. */
function finiteOr(x: number): number {
  if (Number.isNaN(x)) return Number.MAX_VALUE;
  return Number.isFinite(x) ? x : Number.MAX_VALUE;
}
