/**
 * The restricted n-body force model of the n-body verification (nbody.ts).
 *
 * Model (restricted n-body problem): the star and every body pull on the ship as point masses;
 * the bodies move on their conic ephemerides (core/system/ephemeris.ts); the ship pulls on
 * nothing. The equations are written relative to an origin body o — the body whose sphere of
 * influence the ship is in — in the standard third-body form (Montenbruck & Gill, Satellite
 * Orbits, §3.3; Battin, An Introduction to the Mathematics and Methods of Astrodynamics, §8.4):
 *
 *   ẍ = −μ_o x/|x|³ + Σ_{k≠o} μ_k [ (p_k − x)/|p_k − x|³ − p_k/|p_k|³ ],
 *
 * with x the ship and p_k body k relative to o. The second term in the bracket is the
 * acceleration of the origin itself (the frame is non-rotating and falls with o). When o is
 * the star this is the star-centred frame with the indirect acceleration −Σ μ_k r_k/|r_k|³
 * (the star's own acceleration towards the bodies). Writing the motion relative to the SOI
 * body keeps the integration accurate in a low orbit (relative tolerances apply to planet-
 * centred numbers). During a finite-burn phase the thrust acceleration (constant thrust, mass
 * falling linearly) is added along a fixed inertial direction or at fixed VNB components.
 *
 * Limits: no oblateness, drag or radiation pressure; bodies do not feel each other beyond their
 * conics; the ship's mass only matters for finite burns.
 */
import type { MethodChoice } from '../integrate/index.ts';
import { InputError, requireFinite } from '../math/index.ts';
import { bodyPosition } from '../system/index.ts';
import { findBodyIndex, type StarSystem } from '../system/index.ts';

/** Relative tolerance of the n-body integration. */
export const DEFAULT_NBODY_RTOL = 1e-10;

export type Vec3Tuple = [number, number, number];

/** The ship's state in the n-body flight: relative to body `origin` (index), inertial axes. */
export interface NBodyState {
  t: number;
  origin: number;
  x: Float64Array;
  v: Float64Array;
}

/** One stage phase of a finite burn: constant thrust, mass falling at thrust/exhaust. */
export interface ThrustPhase {
  duration: number;
  thrust: number;
  exhaust: number;
  mass0: number;
}

export interface NBodyModelOptions {
  /** Ids of the bodies whose gravity acts (default: the star and every body). */
  pull?: readonly string[];
  /** Relative tolerance (default DEFAULT_NBODY_RTOL). */
  rtol?: number;
  /** Absolute tolerance; default DEFAULT_ATOL_FACTOR × rtol (see atolFor). */
  atol?: number;
  /** Integrator choice handed to the front door (default 'auto'). */
  method?: MethodChoice;
  /** RK45 step budget per integration piece (front-door default when omitted). */
  maxSteps?: number;
}

/**
 * The absolute tolerance is rtol × DEFAULT_ATOL_FACTOR (in metres and metres per second
 * alike): negligible beside rtol·|x| for positions, so position components crossing zero do not
 * force tiny steps, and at the level of rtol·|v| for velocities of a few km/s.
 */
export const DEFAULT_ATOL_FACTOR = 1;

/** The force model and integrator settings of one system (reuse it across flights). */
export class NBodyModel {
  readonly system: StarSystem;
  readonly count: number;
  /** μ of each body as it pulls on the ship (0: not pulling). */
  readonly mu: Float64Array;
  readonly rtol: number;
  readonly atol: number;
  readonly method: MethodChoice;
  readonly maxSteps: number | undefined;
  /** Bodies other than the star in parent-before-child order. */
  private readonly order: Int32Array;
  private readonly parent: Int32Array;
  /** Star-relative positions of every body at tCache, 3 per body. */
  private readonly R: Float64Array;
  private tCache = NaN;
  private readonly tmp3 = new Float64Array(3);
  /** Current origin body. */
  origin = 0;
  /** Thrust of the current finite-burn phase (0: none). */
  private thrust = 0;
  private thrustT0 = 0;
  private thrustMass0 = 1;
  private thrustMdot = 0;
  private readonly thrustU = new Float64Array(3);
  private thrustVnb: Float64Array | null = null;
  /** The acceleration function handed to the front door. */
  readonly accel: (t: number, x: Float64Array, v: Float64Array, out: Float64Array) => void;

  constructor(system: StarSystem, options: NBodyModelOptions = {}) {
    this.system = system;
    const n = system.bodies.length;
    this.count = n;
    this.mu = new Float64Array(n);
    if (options.pull !== undefined) {
      if (!Array.isArray(options.pull)) throw new InputError('options.pull', 'must be an array of body ids', options.pull);
      for (const id of options.pull) {
        const k = findBodyIndex(system, id);
        if (k < 0) throw new InputError('options.pull', `names no body of the system ("${id}")`, id);
        this.mu[k] = system.bodies[k].mu;
      }
    } else {
      for (let k = 0; k < n; k++) this.mu[k] = system.bodies[k].mu;
    }
    this.rtol = options.rtol ?? DEFAULT_NBODY_RTOL;
    requireFinite('options.rtol', this.rtol);
    if (!(this.rtol > 0)) throw new InputError('options.rtol', 'must be > 0', this.rtol);
    this.atol = options.atol ?? this.rtol * DEFAULT_ATOL_FACTOR;
    requireFinite('options.atol', this.atol);
    if (!(this.atol > 0)) throw new InputError('options.atol', 'must be > 0', this.atol);
    this.method = options.method ?? 'auto';
    this.maxSteps = options.maxSteps;
    this.parent = Int32Array.from(system.bodies.map((b) => b.parentIndex));
    const others = system.bodies.filter((b) => b.index !== 0).map((b) => b.index);
    others.sort((a, b) => system.bodies[a].derived.depth - system.bodies[b].derived.depth);
    this.order = Int32Array.from(others);
    this.R = new Float64Array(3 * n);
    const mu = this.mu;
    const R = this.R;
    const U = this.thrustU;
    this.accel = (t, x, v, out) => {
      this.positions(t);
      const o = this.origin;
      const ox = R[3 * o], oy = R[3 * o + 1], oz = R[3 * o + 2];
      const x0 = x[0], x1 = x[1], x2 = x[2];
      let ax = 0, ay = 0, az = 0;
      const muo = mu[o];
      if (muo > 0) {
        const r2 = x0 * x0 + x1 * x1 + x2 * x2;
        const k = -muo / (r2 * Math.sqrt(r2));
        ax = k * x0;
        ay = k * x1;
        az = k * x2;
      }
      for (let j = 0; j < n; j++) {
        const m = mu[j];
        if (j === o || m === 0) continue;
        const px = R[3 * j] - ox, py = R[3 * j + 1] - oy, pz = R[3 * j + 2] - oz;
        const dx = px - x0, dy = py - x1, dz = pz - x2;
        const d2 = dx * dx + dy * dy + dz * dz;
        const p2 = px * px + py * py + pz * pz;
        const kd = m / (d2 * Math.sqrt(d2));
        const kp = m / (p2 * Math.sqrt(p2));
        ax += kd * dx - kp * px;
        ay += kd * dy - kp * py;
        az += kd * dz - kp * pz;
      }
      if (this.thrust > 0) {
        const a = this.thrust / (this.thrustMass0 - this.thrustMdot * (t - this.thrustT0));
        let ux = U[0], uy = U[1], uz = U[2];
        const l = this.thrustVnb;
        if (l) {
          // VNB frame of the current state (Vallado §3.3): V along v, N along r × v, B = V × N
          const vx = v[0], vy = v[1], vz = v[2];
          const vn = Math.sqrt(vx * vx + vy * vy + vz * vz);
          const Vx = vx / vn, Vy = vy / vn, Vz = vz / vn;
          let Nx = x1 * vz - x2 * vy, Ny = x2 * vx - x0 * vz, Nz = x0 * vy - x1 * vx;
          const hn = Math.sqrt(Nx * Nx + Ny * Ny + Nz * Nz);
          Nx /= hn;
          Ny /= hn;
          Nz /= hn;
          const Bx = Vy * Nz - Vz * Ny, By = Vz * Nx - Vx * Nz, Bz = Vx * Ny - Vy * Nx;
          ux = l[0] * Vx + l[1] * Nx + l[2] * Bx;
          uy = l[0] * Vy + l[1] * Ny + l[2] * By;
          uz = l[0] * Vz + l[1] * Nz + l[2] * Bz;
        }
        ax += a * ux;
        ay += a * uy;
        az += a * uz;
      }
      out[0] = ax;
      out[1] = ay;
      out[2] = az;
    };
  }

  /** Fills the star-relative body positions for time t (cached for repeated t). */
  positions(t: number): void {
    if (t === this.tCache) return;
    const R = this.R;
    const tmp = this.tmp3;
    const order = this.order;
    R[0] = R[1] = R[2] = 0;
    for (let q = 0; q < order.length; q++) {
      const j = order[q];
      const p = this.parent[j];
      bodyPosition(this.system, j, t, tmp, p);
      R[3 * j] = R[3 * p] + tmp[0];
      R[3 * j + 1] = R[3 * p + 1] + tmp[1];
      R[3 * j + 2] = R[3 * p + 2] + tmp[2];
    }
    this.tCache = t;
  }

  /** Position of body k relative to body o at time t, into out. */
  relative(k: number, o: number, t: number, out: Float64Array): Float64Array {
    this.positions(t);
    const R = this.R;
    out[0] = R[3 * k] - R[3 * o];
    out[1] = R[3 * k + 1] - R[3 * o + 1];
    out[2] = R[3 * k + 2] - R[3 * o + 2];
    return out;
  }

  /** Turns a thrust phase on (from t0) or off (phase null). */
  setThrust(phase: ThrustPhase | null, t0: number, u: ArrayLike<number>, vnb: ArrayLike<number> | null): void {
    if (!phase || !(phase.thrust > 0)) {
      this.thrust = 0;
      return;
    }
    this.thrust = phase.thrust;
    this.thrustT0 = t0;
    this.thrustMass0 = phase.mass0;
    this.thrustMdot = phase.thrust / phase.exhaust;
    this.thrustU[0] = u[0];
    this.thrustU[1] = u[1];
    this.thrustU[2] = u[2];
    this.thrustVnb = vnb ? Float64Array.from(vnb) : null;
  }
}
