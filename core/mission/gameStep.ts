/**
 * Game-step check: flies a plan with a game's own physics — fixed step, simple integrator,
 * float32 or float64, optional floating origin, patched-conic or all-body gravity, burns as the
 * game applies them — and compares it with the reference flight of the same model (RK45 at a
 * tight tolerance, gameStepReference.ts).
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
 * - flown at a time-warp step `warpDt` ('warp', measured), or
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
 *   e(τ) ≈ A·τ^q (gameStepFit.ts), the direction taken from the window's last error in the RTN
 *   frame. In float32 the window is always flown, and replaces step scaling when it measures
 *   more than twice the scaled error. (3) The error at a sample is carried + generated; the game
 *   resumes at the region's end from the carried state plus the generated error, so later spans
 *   propagate it. Series points carry a basis code: measured, extrapolated, or measured after an
 *   extrapolated region.
 * Checked against flying the demo cruise whole (test/core/mission/gameStepDemo.test.ts: step
 * scaling within 5 % of the flown arrival miss; at 1/60 s semi-implicit Euler 2,243 m
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
 * the motion). The precision verdict itself comes from flying the plan (gameStepSweep.ts).
 */
import { InputError, SolverError, requireFinite } from '../math/errors.ts';
import { bodyState } from '../system/ephemeris.ts';
import type { StarSystem } from '../system/model.ts';
import { MIN_RTOL } from '../integrate/rk45.ts';
import { evaluate } from './evaluate.ts';
import { ulp32 } from './float32.ts';
import { GameFlight, type GameRebase } from './gameStepFlight.ts';
import type { GameGuidance } from './gameStepGuidance.ts';
import { driftPerOrbit, fitPowerLaw, powerLawAt, trendSlope, type PowerLawFit } from './gameStepFit.ts';
import { EVALS_PER_STEP, GAME_INTEGRATORS, METHOD_ORDER, type GameIntegrator, type GamePrecision } from './gameStepKernel.ts';
import {
  REFERENCE_RTOL,
  ReferenceTrack,
  flyReference,
  frameAt,
  type GameBurn,
  type GameBurnModel,
  type GameGravity,
  type ReferenceSettings,
  type ReferenceStats,
} from './gameStepReference.ts';
import type { Plan } from './plan.ts';
import type { PlanResult } from './result.ts';

export type { GameIntegrator, GamePrecision } from './gameStepKernel.ts';
export type { GameBurn, GameBurnModel, GameGravity } from './gameStepReference.ts';
export type { GameRebase } from './gameStepFlight.ts';
export type { GameGuidance } from './gameStepGuidance.ts';
export { GAME_INTEGRATORS, METHOD_ORDER, EVALS_PER_STEP } from './gameStepKernel.ts';

/** The game's physics. */
export interface GamePhysics {
  integrator: GameIntegrator;
  /** Fixed step, s. */
  dt: number;
  precision: GamePrecision;
  /** Floating-origin rebasing, or null for none. */
  rebase: GameRebase | null;
  /** 'central': the patched-conic central body only (most games); 'all': the star and every body. */
  gravity: GameGravity;
  /** 'impulsive': Δv at the nearest step; 'spread': over steps at the vehicle's thrust. */
  burns: GameBurnModel;
  /** 'resolve': solved burns re-solved from the game's own state (default); 'open-loop': the plan's inertial Δv. */
  guidance: GameGuidance;
}

/** GamePhysics with defaults for all but the integrator and step. */
export type GamePhysicsInput = Pick<GamePhysics, 'integrator' | 'dt'> & Partial<Omit<GamePhysics, 'integrator' | 'dt'>>;

export const DEFAULT_PRECISION: GamePrecision = 'float64';
export const DEFAULT_GRAVITY: GameGravity = 'central';
export const DEFAULT_BURN_MODEL: GameBurnModel = 'impulsive';
export const DEFAULT_GUIDANCE: GameGuidance = 'resolve';
/** Default floating-origin rebasing: re-centre position and velocity beyond 10 km. */
export const DEFAULT_REBASE: GameRebase = { distance: 10_000, velocity: true };
/** Default position tolerance when the plan has no target tolerance, m. */
export const DEFAULT_TOLERANCE = 10_000;
/** Default tolerance on the relative energy drift per orbit. */
export const DEFAULT_ENERGY_TOLERANCE = 1e-6;
/** Spans needing more game steps than this are warped or extrapolated (about 1 s of flying in float64). */
export const DEFAULT_MAX_STEPS_PER_SPAN = 50_000_000;
/** Steps of the window flown at the game's step (extrapolation fallback, and the float32 check of step scaling). */
export const DEFAULT_WINDOW_STEPS = 10_000_000;
/** Series points per span. */
export const DEFAULT_SAMPLES_PER_SPAN = 200;
/** Comparisons with the reference per series interval (at least). */
export const CHECKS_PER_SAMPLE = 4;
/** At most this many game steps between comparisons with the reference. */
export const MAX_CHECK_EVERY = 64;
/** Points of the extrapolation window's error series. */
export const WINDOW_POINTS = 400;
/** The window is at most this fraction of the region. */
export const MAX_WINDOW_FRACTION = 0.5;
/** Steps kept flown at the game's step on each side of a burn before a region starts. */
export const BURN_CLEARANCE_STEPS = 4;
/** The reference's error is estimated against a run at this fraction of its rtol. */
export const REFERENCE_CHECK_FACTOR = 0.1;
/** Orbits flown by an energy-drift probe (see GameSpanReport.driftMethod 'probe'). */
export const PROBE_ORBITS = 2;
/** Comparisons per probe flight. */
export const PROBE_POINTS = 2000;

/** Series basis codes. */
export const BASIS_EXTRAPOLATED = 0;
export const BASIS_MEASURED = 1;
/** Measured after an extrapolated region: the game resumed from a state holding that region's extrapolated error. */
export const BASIS_MEASURED_PLUS = 2;

export type GameSpanMode = 'flown' | 'warp' | 'extrapolated';
export type GameBasis = 'measured' | 'extrapolated';

export interface GameExtrapolationWindow {
  /** Length flown at the game's step from the reference state at the region's start, s, and its steps. */
  length: number;
  steps: number;
  /** Growth fitted over the window: e ≈ coefficient·τ^order (m or m/s, s). */
  position: PowerLawFit;
  velocity: PowerLawFit;
  /** The window's measured position error (for charts). */
  t: Float64Array;
  positionError: Float64Array;
}

export interface GameExtrapolation {
  /**
   * 'step-scaling': the region flown whole from the reference state at two coarse steps H and
   * 2H of the game's method and precision; the error at the game's step is the error at H scaled
   * by (dt/H)^p with the measured order p = log2(e(2H)/e(H)) (vectors scaled, so direction is
   * kept). 'window': the game's step flown over a window and its growth fitted (e ∝ τ^q), used
   * when the coarse flights do not show the method's order (e.g. float32 rounding dominates).
   */
  method: 'step-scaling' | 'window';
  /** Region length, s. */
  region: number;
  /** step-scaling: the coarse steps H, 2H (s) and the position errors they left at the region's end (m). */
  coarseDt: [number, number] | null;
  coarseError: [number, number] | null;
  /** Measured order: step-scaling p; window q. */
  order: number;
  /** The window (method 'window', and for float32 the check of step-scaling against the game's step). */
  window: GameExtrapolationWindow | null;
  /** Relative energy error generated per second in the region (extrapolated). */
  energyRate: number;
  /** Error the game brought into the region, carried through it with the reference dynamics, at its end, m. */
  carriedError: number;
  /** Error generated in the region by the game's step, extrapolated to its end, m and m/s. */
  generatedError: number;
  generatedVelocityError: number;
  /** Steps flown for the extrapolation (coarse flights and window). */
  steps: number;
}

export interface GameSpanReport {
  index: number;
  kind: 'coast' | 'burn';
  /** Central body of the plan's segment. */
  central: number;
  t0: number;
  t1: number;
  mode: GameSpanMode;
  /** Game step of the span, s (warp: the step outside the region). */
  dt: number;
  /** Game steps flown in the span (window steps not included). */
  steps: number;
  /** The warped or extrapolated part and its step (the window's step for 'extrapolated'). */
  region: { t0: number; t1: number; dt: number } | null;
  positionErrorMax: number;
  velocityErrorMax: number;
  /** Largest |relative energy error|. */
  energyErrorMax: number;
  positionErrorEnd: number;
  velocityErrorEnd: number;
  energyErrorEnd: number;
  /** Period of the reference orbit about the span's central body mid-span, s; null when not bound. */
  period: number | null;
  /** Change of the relative energy error per orbit; null when the orbit is not bound. */
  driftPerOrbit: number | null;
  /**
   * 'per-orbit': mean change over one period of the span's own comparisons (span ≥ a period);
   * 'probe': the same on a probe flight of PROBE_ORBITS periods with the game's physics and no
   * burns from the reference state at the span's first coasting comparison (span shorter than a period, probe within
   * the step budget) — a trend over part of an orbit would count the periodic part of the error
   * as drift; 'trend': least-squares slope × period (long orbits; for an extrapolated region,
   * the window's slope).
   */
  driftMethod: 'per-orbit' | 'probe' | 'trend' | null;
  /** Basis of the span's end values. */
  basis: GameBasis;
  extrapolation: GameExtrapolation | null;
}

/** binary32 spacing at the mission's distances, per span. */
export interface Float32Row {
  span: number;
  /** Largest distance from the game's frame centre (central body; the star for 'all'), m. */
  distance: number;
  /** ulp32(distance): position resolution without rebasing, m. */
  spacing: number;
  /** Largest speed relative to the frame centre, m/s, and ulp32 of it. */
  speed: number;
  speedSpacing: number;
  /** speed·dt, m: the position increment of one step, and its ratio to `spacing`. */
  stepMove: number;
  stepMoveToSpacing: number;
  /** Largest gravity·dt, m/s: the velocity increment of one step, and its ratio to `speedSpacing`. */
  stepKick: number;
  stepKickToSpacing: number;
  /** With rebasing: the position spacing at the rebasing distance, m; else null. */
  rebasedSpacing: number | null;
}

/** Sampled error series (drawable; one point per sample). */
export interface GameStepSeries {
  /** Time, s from the system epoch. */
  t: Float64Array;
  /** |Δr|, m. */
  positionError: Float64Array;
  /** |Δv|, m/s. */
  velocityError: Float64Array;
  /** (ε_game − ε_ref)/|ε_ref|. */
  energyError: Float64Array;
  /** BASIS_MEASURED, BASIS_EXTRAPOLATED or BASIS_MEASURED_PLUS. */
  basis: Uint8Array;
  /** Index of the span of each point. */
  span: Int32Array;
}

/** Game and reference positions at the series' sample times (star frame, 3 per sample, m). */
export interface GameStepTrack {
  t: Float64Array;
  game: Float64Array;
  reference: Float64Array;
}

export interface GameStepPoint {
  t: number;
  positionError: number;
  velocityError: number;
  energyError: number;
  basis: GameBasis;
  /**
   * The extrapolated part of the error, m: 0 when measured; in a region, the generated error at that
   * time; after a region, the generated error the resumed state was given (summed over regions).
   */
  extrapolatedPart: number;
}

export interface GameStepResult {
  physics: GamePhysics;
  /** Position tolerance, m, and relative energy drift per orbit tolerance. */
  tolerance: number;
  energyTolerance: number;
  t0: number;
  t1: number;
  /** 'done', or 'diverged' (the game's state became non-finite at `divergedAt`). */
  status: 'done' | 'diverged';
  divergedAt: number | null;
  spans: GameSpanReport[];
  series: GameStepSeries;
  track: GameStepTrack;
  /** At the plan's closest approach to its target (or the end when it has none). */
  arrival: (GameStepPoint & { body: number }) | null;
  end: GameStepPoint | null;
  /** First time the position error exceeded the tolerance; `resolution`: the time between the comparisons that bracket it, s. */
  firstExceed: (GameStepPoint & { resolution: number }) | null;
  /** Largest |drift per orbit| over the spans whose drift was measured over a whole orbit ('per-orbit', 'probe'), or null. */
  maxDriftPerOrbit: number | null;
  /** Arrival miss and energy drift within tolerance, and the flight did not diverge. */
  passes: boolean;
  float32: Float32Row[];
  impacts: { t: number; body: number }[];
  reference: {
    rtol: number;
    stats: ReferenceStats;
    /** Position difference to a run at REFERENCE_CHECK_FACTOR × rtol, the larger at arrival and end, m: the estimated error of the reference itself. */
    errorEstimate: number;
  };
  stats: {
    gameSteps: number;
    /** Steps of extrapolation windows and of energy-drift probes (not part of the game's flight). */
    windowSteps: number;
    probeSteps: number;
    accelEvals: number;
    rebases: number;
    soiChanges: number;
    flownTime: number;
    warpTime: number;
    extrapolatedTime: number;
    /** Steps and acceleration evaluations the game itself spends on the whole mission at its step. */
    missionSteps: number;
    missionEvals: number;
  };
  notes: string[];
}

interface SpanDef {
  index: number;
  kind: 'coast' | 'burn';
  central: number;
  t0: number;
  t1: number;
}

/** The plan, its reference flight and what every game-step run of it shares. */
export interface PreparedGameStep {
  system: StarSystem;
  plan: Plan;
  result: PlanResult;
  gravity: GameGravity;
  burnModel: GameBurnModel;
  guidance: GameGuidance;
  burns: GameBurn[];
  spans: SpanDef[];
  t0: number;
  t1: number;
  start: { abs: Float64Array; central: number };
  arrival: { t: number; body: number } | null;
  settings: ReferenceSettings;
  reference: ReferenceTrack;
  referenceStats: ReferenceStats;
  referenceError: number;
  rtol: number;
}

export interface PrepareOptions {
  gravity?: GameGravity;
  burns?: GameBurnModel;
  guidance?: GameGuidance;
  /** The plan's patched-conic result (evaluated when omitted). */
  result?: PlanResult;
  /** Relative tolerance of the reference (default REFERENCE_RTOL). */
  rtol?: number;
  signal?: { aborted: boolean };
}

/** Smallest ln(m0/m1) for which a burn's thrust is taken from its mass flow. */
const LN_RATIO_MIN = 1e-12;

/** Burns of the plan as the game flies them, from the result's budget rows and the plan's burn events. */
export function gameBurns(plan: Plan, result: PlanResult): GameBurn[] {
  const out: GameBurn[] = [];
  const segs = result.segments;
  for (const r of result.budget.rows) {
    if (!(r.dv > 0)) continue;
    const frac = r.dvMissing ? Math.max(0, (r.dv - r.dvMissing) / r.dv) : 1;
    const dv: [number, number, number] = [r.dvInertial[0] * frac, r.dvInertial[1] * frac, r.dvInertial[2] * frac];
    const dvMag = Math.hypot(dv[0], dv[1], dv[2]);
    if (!(dvMag > 0)) continue;
    const duration = r.duration > 0 ? r.duration : 0;
    const mdot = duration > 0 ? r.propellantUsed / duration : 0;
    const ev = plan.events.find((e) => e.id === r.planEventId);
    // the segment the burn starts (or, for a burn at the plan's end, the one it ends)
    const seg = segs.find((g) => g.t0 === r.t) ?? segs.find((g) => g.t0 <= r.t && r.t <= g.t1) ?? segs[segs.length - 1];
    const lnRatio = r.massAfter > 0 && r.massBefore > r.massAfter ? Math.log(r.massBefore / r.massAfter) : 0;
    const thrust = lnRatio > LN_RATIO_MIN ? (dvMag * mdot) / lnRatio : 0;
    out.push({
      id: r.planEventId,
      name: r.name,
      t: r.t,
      tStart: r.t - 0.5 * duration,
      duration,
      dv,
      dvMag,
      mass0: r.massBefore,
      mass1: r.massAfter,
      mdot,
      thrust,
      event: ev && ev.type === 'burn' ? ev : null,
      central: seg ? seg.central : 0,
      fraction: frac,
    });
  }
  return out.sort((a, b) => a.t - b.t);
}

/** Builds the mission's spans, burns and reference flight. */
export function prepareGameStep(system: StarSystem, plan: Plan, options: PrepareOptions = {}): PreparedGameStep {
  const gravity = options.gravity ?? DEFAULT_GRAVITY;
  if (gravity !== 'central' && gravity !== 'all') throw new InputError('physics.gravity', "must be 'central' or 'all'", gravity);
  const burnModel = options.burns ?? DEFAULT_BURN_MODEL;
  if (burnModel !== 'impulsive' && burnModel !== 'spread') throw new InputError('physics.burns', "must be 'impulsive' or 'spread'", burnModel);
  const guidance = options.guidance ?? DEFAULT_GUIDANCE;
  if (guidance !== 'resolve' && guidance !== 'open-loop') throw new InputError('physics.guidance', "must be 'resolve' or 'open-loop'", guidance);
  const rtol = options.rtol ?? REFERENCE_RTOL;
  const result = options.result ?? evaluate(system, plan, { samplesPerSegment: 0 });
  const segs = result.segments.filter((s) => s.t1 > s.t0);
  if (segs.length === 0) throw new InputError('plan', 'flies no trajectory (its result has no segment of positive length)');
  const spans: SpanDef[] = segs.map((s, index) => ({ index, kind: s.kind, central: s.central, t0: s.t0, t1: s.t1 }));
  const t0 = segs[0].t0;
  const t1 = segs[segs.length - 1].t1;
  const central = segs[0].central;
  const abs = new Float64Array(6);
  bodyState(system, central, t0, abs);
  for (let i = 0; i < 6; i++) abs[i] += segs[0].state0[i];
  const burns = gameBurns(plan, result);
  const frames = { t: segs.map((s) => s.t0), central: segs.map((s) => s.central) };
  const settings: ReferenceSettings = { system, gravity, burnModel, burns, guidance, frames, rtol, signal: options.signal };
  const flight = flyReference(settings, t0, abs, central, t1, true);
  const reference = new ReferenceTrack(system, flight);
  let arrival: { t: number; body: number } | null = null;
  const ca = result.target?.closestApproach;
  if (result.target && ca && ca.t >= t0 && ca.t <= t1) arrival = { t: ca.t, body: result.target.body };
  // the reference's own error: the difference to a run at a tighter tolerance
  const tight = new ReferenceTrack(system, flyReference({ ...settings, rtol: Math.max(MIN_RTOL, rtol * REFERENCE_CHECK_FACTOR) }, t0, abs, central, t1, true));
  const a6 = new Float64Array(6);
  const b6 = new Float64Array(6);
  let referenceError = 0;
  for (const t of [arrival?.t ?? t1, t1]) {
    reference.at(t, a6);
    tight.at(t, b6);
    referenceError = Math.max(referenceError, Math.hypot(a6[0] - b6[0], a6[1] - b6[1], a6[2] - b6[2]));
  }
  return {
    system,
    plan,
    result,
    gravity,
    burnModel,
    guidance,
    burns,
    spans,
    t0,
    t1,
    start: { abs, central },
    arrival,
    settings,
    reference,
    referenceStats: flight.stats,
    referenceError,
    rtol,
  };
}

export interface GameStepOptions {
  physics: GamePhysicsInput;
  /** Position tolerance, m (default: the plan target's periapsis-altitude tolerance, else DEFAULT_TOLERANCE). */
  tolerance?: number;
  /** Tolerance on |relative energy drift per orbit| (default DEFAULT_ENERGY_TOLERANCE). */
  energyTolerance?: number;
  /** Game steps above which a span's region is warped or extrapolated (default DEFAULT_MAX_STEPS_PER_SPAN). */
  maxStepsPerSpan?: number;
  /** Time-warp step for the regions of long spans, s; omitted: extrapolate. */
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

/** Fills in and checks the game's physics. */
export function normalizePhysics(p: GamePhysicsInput): GamePhysics {
  if (!p || typeof p !== 'object') throw new InputError('physics', 'must be an object with integrator and dt', p);
  if (!GAME_INTEGRATORS.includes(p.integrator)) throw new InputError('physics.integrator', `must be one of ${GAME_INTEGRATORS.join(', ')}`, p.integrator);
  requireFinite('physics.dt', p.dt);
  if (!(p.dt > 0)) throw new InputError('physics.dt', 'must be > 0 (s)', p.dt);
  const precision = p.precision ?? DEFAULT_PRECISION;
  if (precision !== 'float64' && precision !== 'float32') throw new InputError('physics.precision', "must be 'float64' or 'float32'", precision);
  if (precision === 'float32' && !(Math.fround(p.dt) > 0)) throw new InputError('physics.dt', 'must be representable in float32 (> 1.4e-45 s)', p.dt);
  const rebase = p.rebase === undefined ? null : p.rebase;
  if (rebase !== null) {
    if (typeof rebase !== 'object') throw new InputError('physics.rebase', 'must be null or { distance, velocity }', rebase);
    requireFinite('physics.rebase.distance', rebase.distance);
    if (!(rebase.distance > 0)) throw new InputError('physics.rebase.distance', 'must be > 0 (m)', rebase.distance);
    if (typeof rebase.velocity !== 'boolean') throw new InputError('physics.rebase.velocity', 'must be true or false', rebase.velocity);
  }
  const gravity = p.gravity ?? DEFAULT_GRAVITY;
  if (gravity !== 'central' && gravity !== 'all') throw new InputError('physics.gravity', "must be 'central' or 'all'", gravity);
  const burns = p.burns ?? DEFAULT_BURN_MODEL;
  if (burns !== 'impulsive' && burns !== 'spread') throw new InputError('physics.burns', "must be 'impulsive' or 'spread'", burns);
  const guidance = p.guidance ?? DEFAULT_GUIDANCE;
  if (guidance !== 'resolve' && guidance !== 'open-loop') throw new InputError('physics.guidance', "must be 'resolve' or 'open-loop'", guidance);
  return { integrator: p.integrator, dt: p.dt, precision, rebase: rebase ? { ...rebase } : null, gravity, burns, guidance };
}

function positiveInteger(field: string, v: number | undefined, dflt: number, min = 1): number {
  const x = v ?? dflt;
  if (!Number.isInteger(x) || x < min) throw new InputError(field, `must be an integer >= ${min}`, x);
  return x;
}

/** Scale of the relative energy error: |ε_ref|, but at least 1e-6·μ/r (near-parabolic orbits). */
function energyScale(er: number, r: Float64Array, B: Float64Array, mu: number): number {
  return Math.max(Math.abs(er), (1e-6 * mu) / Math.hypot(r[0] - B[0], r[1] - B[1], r[2] - B[2]));
}

// Specific orbital energy of state s (abs) about the body of abs state B and μ.
function energyOf(s: Float64Array, B: Float64Array, mu: number): number {
  const rx = s[0] - B[0], ry = s[1] - B[1], rz = s[2] - B[2];
  const vx = s[3] - B[3], vy = s[4] - B[4], vz = s[5] - B[5];
  return 0.5 * (vx * vx + vy * vy + vz * vz) - mu / Math.hypot(rx, ry, rz);
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
    prepareGameStep(system, plan, { gravity: physics.gravity, burns: physics.burns, guidance: physics.guidance, result: options.result, signal: options.signal });
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
  const maxSteps = positiveInteger('maxStepsPerSpan', options.maxStepsPerSpan, DEFAULT_MAX_STEPS_PER_SPAN);
  const windowSteps = Math.min(positiveInteger('windowSteps', options.windowSteps, DEFAULT_WINDOW_STEPS, 16), maxSteps);
  const samples = positiveInteger('samplesPerSpan', options.samplesPerSpan, DEFAULT_SAMPLES_PER_SPAN, 2);
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
          this.extrapolate(s, ta);
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
      s.periodSum += 2 * Math.PI * Math.sqrt(Math.pow(-mu / (2 * er), 3) / mu);
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

  /** The extrapolated region of span s, from the game's state at ta (see the module comment). */
  extrapolate(s: SpanAcc, ta: number): void {
    const prep = this.prep;
    const system = this.system;
    const region = s.region as { t0: number; t1: number; dt: number };
    const tb = region.t1;
    const T = tb - ta;
    const hs = this.hs;
    const order = METHOD_ORDER[this.physics.integrator];
    const n = Math.max(2, Math.ceil((this.o.samples * T) / (s.def.t1 - s.def.t0)));
    const times: number[] = [];
    for (let j = 1; j <= n; j++) times.push(j === n ? tb : ta + (j * T) / n);
    const r0 = new Float64Array(6);
    const c0 = this.ref.at(ta, r0);
    const startState = { r0, c0 };
    // (1) step scaling: coarse flights at H and 2H with 1.5·T/H ≤ the step budget
    let j = 1;
    while ((1.5 * T) / (hs * 2 ** j) > this.o.maxSteps) j++;
    const H = hs * 2 ** j;
    const e1 = this.regionFlight(startState, ta, tb, H, times);
    const e2 = e1.status === 'done' ? this.regionFlight(startState, ta, tb, 2 * H, times) : e1;
    let steps = e1.steps + (e2 === e1 ? 0 : e2.steps);
    const m1 = norm3(e1.end, 0);
    const m2 = norm3(e2.end, 0);
    const p = m1 > 0 && m2 > 0 ? Math.log2(m2 / m1) : NaN;
    const pv = Math.log2(norm3(e2.end, 3) / norm3(e1.end, 3));
    let method: GameExtrapolation['method'] =
      e1.status === 'done' && e2.status === 'done' && p >= 0.6 * order && p <= 1.6 * order + 0.4 ? 'step-scaling' : 'window';
    const scale = method === 'step-scaling' ? Math.pow(hs / H, p) : 0;
    const scaleV = method === 'step-scaling' && Number.isFinite(pv) ? Math.pow(hs / H, pv) : scale;
    // (2) the window at the game's step: the method for 'window', and for float32 a check that
    // rounding at the game's step does not outgrow the scaled truncation error
    let win: GameExtrapolationWindow | null = null;
    let wDir: number[] | null = null;
    let energyRate = 0;
    if (method === 'window' || this.physics.precision === 'float32') {
      const w = this.windowFlight(startState, ta, Math.min(this.o.windowSteps * hs, MAX_WINDOW_FRACTION * T));
      steps += w.win.steps;
      if (w.status === 'diverged') {
        this.windowSteps += steps;
        this.status = 'diverged';
        this.divergedAt = w.t;
        this.notes.push(`span ${s.def.index}: the game's state became non-finite at t = ${w.t.toFixed(3)} s in the extrapolation window: the flight diverged`);
        return;
      }
      if (method === 'step-scaling') {
        // the scaled error at the window's end, against what the window measured
        const predicted = interpolateNorm(times, e1.dP, ta + w.win.length, ta) * scale;
        const measured = w.win.positionError[w.win.positionError.length - 1] ?? 0;
        if (measured > 2 * predicted) method = 'window';
      }
      win = w.win;
      wDir = w.dir;
      if (method === 'window') energyRate = w.energyRate;
    }
    this.windowSteps += steps;
    // (3) the carried error: the game's state at ta flown with the reference dynamics
    const g = new Float64Array(6);
    this.flight.state(g);
    const carried = flyReference(prep.settings, ta, g, this.flight.central, tb, true);
    const ctrack = new ReferenceTrack(system, carried);
    // (4) the generated error at each sample time, as a vector (step scaling) or laid along the
    // window's last error direction (window)
    const r = new Float64Array(6);
    const B = new Float64Array(6);
    const gen = (k: number, out: number[]): number => {
      const t = times[k];
      if (method === 'step-scaling') {
        for (let c = 0; c < 3; c++) {
          out[c] = e1.dP[k][c] * scale;
          out[3 + c] = e1.dP[k][3 + c] * scaleV;
        }
        return e1.dE[k] * scale;
      }
      const tau = t - ta;
      const w = win as GameExtrapolationWindow;
      const gp = powerLawAt(w.position, tau);
      const gv = powerLawAt(w.velocity, tau);
      const d = wDir as number[];
      const pw = Math.hypot(d[0], d[1], d[2]);
      const vw = Math.hypot(d[3], d[4], d[5]);
      const rc = this.ref.at(t, r);
      bodyState(system, this.physics.gravity === 'central' ? rc : frameAt(prep.settings.frames, t), t, B);
      const dd = [0, 0, 0, 0, 0, 0];
      for (let c = 0; c < 3; c++) {
        dd[c] = pw > 0 ? (d[c] * gp) / pw : 0;
        dd[3 + c] = vw > 0 ? (d[3 + c] * gv) / vw : 0;
      }
      const tmp = new Float64Array(6);
      fromRtn(r, B, dd, tmp);
      for (let c = 0; c < 6; c++) out[c] = tmp[c];
      return energyRate * tau;
    };
    const c6 = new Float64Array(6);
    const gv6 = [0, 0, 0, 0, 0, 0];
    const point = new Float64Array(6);
    let prevT = ta;
    let genEnd = 0;
    let genVEnd = 0;
    for (let k = 0; k < times.length; k++) {
      const t = times[k];
      ctrack.at(t, c6);
      const dE = gen(k, gv6);
      for (let c = 0; c < 6; c++) point[c] = c6[c] + gv6[c];
      const before = this.firstExceed;
      this.record(t, point, BASIS_EXTRAPOLATED, true, 0, 0, dE, Math.hypot(gv6[0], gv6[1], gv6[2]));
      if (!before && this.firstExceed) (this.firstExceed as GameStepPoint & { resolution: number }).resolution = t - prevT;
      const arr = prep.arrival;
      if (arr && !this.arrival && arr.t > prevT && arr.t <= t) {
        this.arrival = { ...(this.end as GameStepPoint), t: arr.t, body: arr.body };
      }
      prevT = t;
      genEnd = Math.hypot(gv6[0], gv6[1], gv6[2]);
      genVEnd = Math.hypot(gv6[3], gv6[4], gv6[5]);
    }
    if (method === 'step-scaling') energyRate = (e1.dE[times.length - 1] * scale) / T;
    ctrack.at(tb, c6);
    this.ref.at(tb, r);
    const carriedError = Math.hypot(c6[0] - r[0], c6[1] - r[1], c6[2] - r[2]);
    this.offP += genEnd;
    this.extrapolatedBefore = true;
    s.extrapolation = {
      method,
      region: T,
      coarseDt: [H, 2 * H],
      coarseError: [m1, m2],
      order: method === 'step-scaling' ? p : (win as GameExtrapolationWindow).position.order,
      window: win,
      energyRate,
      carriedError,
      generatedError: genEnd,
      generatedVelocityError: genVEnd,
      steps,
    };
    // (5) resume the game at tb from the carried state plus the generated error
    for (let c = 0; c < 6; c++) point[c] = c6[c] + gv6[c];
    this.flight.reset(tb, point, carried.central);
    this.notes.push(
      `span ${s.def.index}: ${(T / 86400).toFixed(2)} days extrapolated (${method === 'step-scaling' ? `coarse steps ${fmtS(H)} and ${fmtS(2 * H)}, measured order ${p.toFixed(2)}` : `window of ${fmtS((win as GameExtrapolationWindow).length)}, error ∝ τ^${(win as GameExtrapolationWindow).position.order.toFixed(2)}`}): ` +
        `${fmtM(genEnd)} generated, ${fmtM(carriedError)} carried at the region's end; the game resumes from the carried state plus the generated error`,
    );
  }

  /** The region flown at step H with the game's physics from the reference state at ta; error vectors at the sample times. */
  regionFlight(start: { r0: Float64Array; c0: number }, ta: number, tb: number, H: number, times: number[]) {
    const f = new GameFlight({ ...this.flight.setup, burns: [] });
    f.reset(ta, start.r0, start.c0);
    const dP: number[][] = times.map(() => [0, 0, 0, 0, 0, 0]);
    const dE: number[] = times.map(() => 0);
    const g = new Float64Array(6);
    const r = new Float64Array(6);
    const B = new Float64Array(6);
    let k = 0;
    const st = f.fly(tb, H, {
      land: true,
      checkEvery: Number.MAX_SAFE_INTEGER,
      checkpoints: times,
      onCheck: (t) => {
        while (k < times.length - 1 && times[k] < t - 0.5 * H) k++;
        f.state(g);
        const rc = this.ref.at(t, r);
        for (let c = 0; c < 6; c++) dP[k][c] = g[c] - r[c];
        const b = this.physics.gravity === 'central' ? rc : frameAt(this.prep.settings.frames, t);
        bodyState(this.system, b, t, B);
        const mu = this.system.bodies[b].mu;
        const er = energyOf(r, B, mu);
        dE[k] = (energyOf(g, B, mu) - er) / energyScale(er, r, B, mu);
      },
      onSteps: (n) => this.progress(n),
      signal: this.o.signal,
    });
    if (st === 'cancelled') throw new SolverError('game-step', 'cancelled', `cancelled at t = ${f.t} s`, { t: f.t });
    return { status: st, steps: f.steps, dP, dE, end: dP[times.length - 1] };
  }

  /** The game's step flown for `length` from the reference state at ta; the window's fits and last error direction (RTN). */
  windowFlight(start: { r0: Float64Array; c0: number }, ta: number, length: number) {
    const hs = this.hs;
    const wf = new GameFlight({ ...this.flight.setup, burns: [] });
    wf.reset(ta, start.r0, start.c0);
    const wT: number[] = [];
    const wP: number[] = [];
    const wV: number[] = [];
    const wE: number[] = [];
    const g = new Float64Array(6);
    const r = new Float64Array(6);
    const B = new Float64Array(6);
    const dir = [0, 0, 0, 0, 0, 0];
    const st = wf.fly(ta + length, hs, {
      land: true,
      checkEvery: Math.max(1, Math.floor(length / hs / WINDOW_POINTS)),
      onCheck: (t) => {
        wf.state(g);
        const rc = this.ref.at(t, r);
        const b = this.physics.gravity === 'central' ? rc : frameAt(this.prep.settings.frames, t);
        bodyState(this.system, b, t, B);
        const mu = this.system.bodies[b].mu;
        const er = energyOf(r, B, mu);
        wT.push(t - ta);
        wP.push(Math.hypot(g[0] - r[0], g[1] - r[1], g[2] - r[2]));
        wV.push(Math.hypot(g[3] - r[3], g[4] - r[4], g[5] - r[5]));
        wE.push((energyOf(g, B, mu) - er) / energyScale(er, r, B, mu));
        toRtn(r, B, g, dir);
      },
      onSteps: (n) => this.progress(n),
      signal: this.o.signal,
    });
    if (st === 'cancelled') throw new SolverError('game-step', 'cancelled', `cancelled at t = ${wf.t} s`, { t: wf.t });
    const win: GameExtrapolationWindow = {
      length,
      steps: wf.steps,
      position: fitPowerLaw(wT, wP),
      velocity: fitPowerLaw(wT, wV),
      t: Float64Array.from(wT),
      positionError: Float64Array.from(wP),
    };
    return { status: st, t: wf.t, win, dir, energyRate: trendSlope(wT, wE) };
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
    const st = pf.fly(t0 + len, hs, {
      land: true,
      checkEvery: Math.max(1, Math.floor(len / hs / PROBE_POINTS)),
      onCheck: (t) => {
        pf.state(g);
        const rc = pref.at(t, r);
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
      if (s.driftPerOrbit !== null && (s.driftMethod === 'per-orbit' || s.driftMethod === 'probe')) maxDrift = Math.max(maxDrift ?? 0, Math.abs(s.driftPerOrbit));
    }
    const float32: Float32Row[] = this.spans.map((s) => {
      const spacing = ulp32(Math.min(s.dist, 3.4e38));
      const speedSpacing = ulp32(Math.min(s.speed, 3.4e38));
      const stepMove = s.speed * this.hs;
      const stepKick = s.accel * this.hs;
      return {
        span: s.def.index,
        distance: s.dist,
        spacing,
        speed: s.speed,
        speedSpacing,
        stepMove,
        stepMoveToSpacing: stepMove / spacing,
        stepKick,
        stepKickToSpacing: stepKick / speedSpacing,
        rebasedSpacing: physics.rebase ? ulp32(physics.rebase.distance) : null,
      };
    });
    const arrival = this.arrival ?? (!this.prep.arrival && this.end && this.status === 'done' ? { ...this.end, body: -1 } : null);
    const missPoint = arrival;
    const passes =
      this.status === 'done' &&
      missPoint !== null &&
      missPoint.positionError <= this.o.tolerance &&
      (maxDrift === null || maxDrift <= this.o.energyTolerance);
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

// Unit radial, transverse, normal vectors of state r (abs) about body B (abs), into u (9).
function rtnBasis(r: ArrayLike<number>, B: ArrayLike<number>, u: number[]): void {
  const x = r[0] - B[0], y = r[1] - B[1], z = r[2] - B[2];
  const vx = r[3] - B[3], vy = r[4] - B[4], vz = r[5] - B[5];
  const rn = Math.hypot(x, y, z) || 1;
  let hx = y * vz - z * vy, hy = z * vx - x * vz, hz = x * vy - y * vx;
  const hn = Math.hypot(hx, hy, hz) || 1;
  hx /= hn;
  hy /= hn;
  hz /= hn;
  u[0] = x / rn;
  u[1] = y / rn;
  u[2] = z / rn;
  u[3] = hy * u[2] - hz * u[1];
  u[4] = hz * u[0] - hx * u[2];
  u[5] = hx * u[1] - hy * u[0];
  u[6] = hx;
  u[7] = hy;
  u[8] = hz;
}

const basis9 = [0, 0, 0, 0, 0, 0, 0, 0, 0];

/** RTN components of the difference g − r (position, velocity) in r's frame about B, into out (6). */
function toRtn(r: ArrayLike<number>, B: ArrayLike<number>, g: ArrayLike<number>, out: number[]): void {
  rtnBasis(r, B, basis9);
  const u = basis9;
  for (let k = 0; k < 2; k++) {
    const dx = g[3 * k] - r[3 * k], dy = g[3 * k + 1] - r[3 * k + 1], dz = g[3 * k + 2] - r[3 * k + 2];
    for (let j = 0; j < 3; j++) out[3 * k + j] = u[3 * j] * dx + u[3 * j + 1] * dy + u[3 * j + 2] * dz;
  }
}

/** Adds RTN components d (6) in r's frame about B to state out (6). */
function fromRtn(r: ArrayLike<number>, B: ArrayLike<number>, d: ArrayLike<number>, out: Float64Array): void {
  rtnBasis(r, B, basis9);
  const u = basis9;
  for (let k = 0; k < 2; k++) {
    for (let c = 0; c < 3; c++) out[3 * k + c] += u[c] * d[3 * k] + u[3 + c] * d[3 * k + 1] + u[6 + c] * d[3 * k + 2];
  }
}

/** Non-finite numbers (a diverged flight) become the largest double, so no NaN or Infinity leaves the core. */
function finiteOr(x: number): number {
  if (Number.isNaN(x)) return Number.MAX_VALUE;
  return Number.isFinite(x) ? x : Number.MAX_VALUE;
}

function norm3(v: ArrayLike<number>, o: number): number {
  return Math.hypot(v[o], v[o + 1], v[o + 2]);
}

// |position part| of the vectors at `times`, linearly interpolated at t (0 at t0).
function interpolateNorm(times: number[], v: number[][], t: number, t0: number): number {
  let tPrev = t0;
  let ePrev = 0;
  for (let i = 0; i < times.length; i++) {
    const e = norm3(v[i], 0);
    if (times[i] >= t) return ePrev + ((e - ePrev) * (t - tPrev)) / Math.max(times[i] - tPrev, 1e-300);
    tPrev = times[i];
    ePrev = e;
  }
  return ePrev;
}

function fmtS(s: number): string {
  return s >= 1 ? `${Number(s.toPrecision(4))} s` : `${Number((s * 1000).toPrecision(4))} ms`;
}

function fmtM(m: number): string {
  return m >= 1000 ? `${(m / 1000).toFixed(3)} km` : `${m.toFixed(3)} m`;
}
