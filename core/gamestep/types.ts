/**
 * Public types and defaults of the game-step check (check.ts): the game's physics, the
 * result with its span reports, series and track, and the check's constants.
 */
import type { GameRebase } from './flight.ts';
import type { GameGuidance } from './guidance.ts';
import type { PowerLawFit } from './fit.ts';
import type { GameIntegrator, GamePrecision } from './kernel.ts';
import type { GameBurnModel, GameGravity, ReferenceStats } from './reference.ts';

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
/** Spans needing more game steps than this are flown as a long-step coast or extrapolated (about 1 s of flying in float64). */
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
  /** Game step of the span, s ('warp', a long-step coast: the step outside the region). */
  dt: number;
  /** Game steps flown in the span (window steps not included). */
  steps: number;
  /** The long-step or extrapolated part and its step (the window's step for 'extrapolated'). */
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
