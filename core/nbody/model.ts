/**
 * The n-body flight's model: the ship force model (core/dynamics/shipForces.ts — restricted
 * n-body on the conic ephemerides, integrated relative to an origin body) with the integrator
 * settings every n-body flight, probe and correction of one run shares.
 */
import type { MethodChoice } from '../integrate/index.ts';
import { InputError, requireFinite } from '../math/index.ts';
import type { StarSystem } from '../system/index.ts';
import { ShipForces, type ShipForcesOptions } from '../dynamics/index.ts';
import { fieldStepLimit } from './stepLimit.ts';

export type { ThrustPhase, Vec3Tuple } from '../dynamics/index.ts';

/** Relative tolerance of the n-body integration (the front door flies it with DOP853, DOP853_RTOL). */
export const DEFAULT_NBODY_RTOL = 1e-10;

/**
 * The absolute tolerance is rtol × DEFAULT_ATOL_FACTOR (in metres and metres per second
 * alike): negligible beside rtol·|x| for positions, so position components crossing zero do not
 * force tiny steps, and at the level of rtol·|v| for velocities of a few km/s.
 */
export const DEFAULT_ATOL_FACTOR = 1;

/** The ship's state in the n-body flight: relative to body `origin` (index), inertial axes. */
export interface NBodyState {
  t: number;
  origin: number;
  x: Float64Array;
  v: Float64Array;
}

export interface NBodyModelOptions extends ShipForcesOptions {
  /** Relative tolerance (default DEFAULT_NBODY_RTOL). */
  rtol?: number;
  /** Absolute tolerance; default DEFAULT_ATOL_FACTOR × rtol. */
  atol?: number;
  /** Integrator choice handed to the front door (default 'auto'). */
  method?: MethodChoice;
  /** Step budget of the adaptive method per integration piece (front-door default when omitted). */
  maxSteps?: number;
  /** Largest step of the adaptive integrators, s (default fieldStepLimit: half the shortest period of a pulling body). */
  maxStep?: number;
}

/** The force model and integrator settings of one system (reuse it across flights). */
export class NBodyModel extends ShipForces {
  declare readonly system: StarSystem;
  readonly rtol: number;
  readonly atol: number;
  readonly method: MethodChoice;
  readonly maxSteps: number | undefined;
  /** Largest adaptive step, s (undefined: no bound). */
  readonly maxStep: number | undefined;

  constructor(system: StarSystem, options: NBodyModelOptions = {}) {
    super(system, options);
    this.rtol = options.rtol ?? DEFAULT_NBODY_RTOL;
    requireFinite('options.rtol', this.rtol);
    if (!(this.rtol > 0)) throw new InputError('options.rtol', 'must be > 0', this.rtol);
    this.atol = options.atol ?? this.rtol * DEFAULT_ATOL_FACTOR;
    requireFinite('options.atol', this.atol);
    if (!(this.atol > 0)) throw new InputError('options.atol', 'must be > 0', this.atol);
    this.method = options.method ?? 'auto';
    this.maxSteps = options.maxSteps;
    if (options.maxStep !== undefined) {
      requireFinite('options.maxStep', options.maxStep);
      if (!(options.maxStep > 0)) throw new InputError('options.maxStep', 'must be > 0', options.maxStep);
    }
    const limit = options.maxStep ?? fieldStepLimit(this);
    this.maxStep = Number.isFinite(limit) ? limit : undefined;
  }
}
