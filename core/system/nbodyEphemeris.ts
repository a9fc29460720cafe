/**
 * Mutual n-body ephemeris: the star and every body pulling on each other as point masses,
 * flown with a fixed-step symplectic method from core/integrate and stored at a coarse sample
 * interval, then interpolated with cubic Hermite polynomials from the stored positions and
 * velocities (Burden & Faires, Numerical Analysis, 9th ed., §3.4).
 *
 * Start, from the conic elements at the epoch (ephemeris.ts):
 *  - a body's conic is taken as the orbit of the barycentre of the body and everything that
 *    orbits it (its subsystem) about its parent body — the way planetary ephemerides treat the
 *    Earth–Moon barycentre. So a planet sits at its conic state minus the offset of its
 *    subsystem's barycentre, off = Σ_children M_k·conic_k / M_sub, and each moon at the
 *    planet plus the moon's conic (minus its own subsystem offset). Without this, the
 *    barycentre of a planet with a heavy moon would start (μ_moon/μ_planet)·v_moon off the
 *    conic's velocity and drift steadily away from the conic;
 *  - then every state is shifted to the system barycentre: r_i − Σμ_j r_j / Σμ_j and
 *    v_i − Σμ_j v_j / Σμ_j, so the total momentum is zero and the barycentre stays at the
 *    origin. The frame is barycentric and inertial, with the axes of the system frame.
 * Hence a planet with moons wobbles about its conic by its subsystem offset (Tessel: about
 * (μ_Quill/μ_Tessel)·a_Quill ≈ 2,000 km), on top of the real mutual perturbations.
 *
 * Span: [0, tEnd] forward from the epoch only. Step: by default 1/2000 of the shortest
 * orbital period in the system, shrunk slightly so a whole number of steps fills each sample
 * interval and a whole number of sample intervals fills the span.
 *
 * Interpolated positions are 4th-order accurate in the sample interval; interpolated
 * velocities (the derivative of the cubic) are 3rd-order. The stored samples themselves are
 * the integrator's states.
 *
 * The data (`NBodyEphemerisData`) is plain typed arrays, so it can be posted to a worker;
 * wrap it again with `new NBodyEphemeris(data)`.
 */

import { InputError, SolverError } from '../math/index.ts';
import { integrateFixed } from '../integrate/index.ts';
import { mutualAccel } from '../integrate/index.ts';
import { bodyStateRelativeToParent } from './ephemeris.ts';
import type { StarSystem } from './model.ts';

/** Default step as a fraction of the shortest orbital period. */
export const DEFAULT_STEPS_PER_SHORTEST_PERIOD = 2000;
/** Default number of integrator steps per stored sample. */
export const DEFAULT_STEPS_PER_SAMPLE = 10;
/** Default cap on stored numbers (8 bytes each): 25e6 numbers = 200 MB. */
export const DEFAULT_MAX_STORED_VALUES = 25e6;
/** `relativeTo` value for barycentric states. */
export const BARYCENTRE = -1;

export type NBodyMethod = 'yoshida4' | 'verlet';

export interface NBodyOptions {
  /** End of the span, s from the epoch (> 0). */
  tEnd: number;
  /** Integrator (default 'yoshida4'). */
  method?: NBodyMethod;
  /** Largest step, s (default shortest period / DEFAULT_STEPS_PER_SHORTEST_PERIOD). */
  h?: number;
  /** Integrator steps per stored sample (default DEFAULT_STEPS_PER_SAMPLE). */
  stepsPerSample?: number;
  /** Refuse runs that would store more numbers than this (default DEFAULT_MAX_STORED_VALUES). */
  maxStoredValues?: number;
  /** Called with the fraction done (0..1) after each stored sample. */
  onProgress?: (fraction: number) => void;
  /** Cooperative cancellation; a cancelled build throws SolverError 'cancelled'. */
  signal?: { aborted: boolean };
}

export interface NBodyEphemerisData {
  /** Number of bodies (star included), in the order of StarSystem.bodies. */
  count: number;
  /** μ of each body, m³/s². */
  mus: Float64Array;
  tEnd: number;
  /** Step used, s. */
  h: number;
  /** Time between samples, s. */
  sampleInterval: number;
  /** Number of samples (sample k is at t = k · sampleInterval). */
  samples: number;
  /** Barycentric states: sample k, body i at offset (k · count + i) · 6: x, y, z, vx, vy, vz. */
  states: Float64Array;
  method: NBodyMethod;
  /** Acceleration evaluations used by the build. */
  fevals: number;
}

/** Flies the system's mutual gravity from the epoch to options.tEnd and stores samples. */
export function buildNBodyEphemeris(system: StarSystem, options: NBodyOptions): NBodyEphemeris {
  if (!options || !Number.isFinite(options.tEnd) || !(options.tEnd > 0)) {
    throw new InputError('tEnd', 'must be a finite number > 0 (s after the epoch)', options?.tEnd);
  }
  const method = options.method ?? 'yoshida4';
  if (method !== 'yoshida4' && method !== 'verlet') throw new InputError('method', 'must be one of: yoshida4, verlet', method);
  const N = system.bodies.length;
  let shortest = Infinity;
  for (const b of system.bodies) shortest = Math.min(shortest, b.derived.period);
  const hMax = options.h ?? (Number.isFinite(shortest) ? shortest / DEFAULT_STEPS_PER_SHORTEST_PERIOD : options.tEnd / 1000);
  if (!Number.isFinite(hMax) || !(hMax > 0)) throw new InputError('h', 'must be a finite number > 0', options.h);
  const perSample = options.stepsPerSample ?? DEFAULT_STEPS_PER_SAMPLE;
  if (!Number.isInteger(perSample) || perSample < 1) throw new InputError('stepsPerSample', 'must be an integer >= 1', perSample);
  const intervals = Math.max(1, Math.ceil(options.tEnd / (hMax * perSample) - 1e-9));
  const samples = intervals + 1;
  const maxValues = options.maxStoredValues ?? DEFAULT_MAX_STORED_VALUES;
  if (samples * N * 6 > maxValues) {
    throw new InputError(
      'tEnd',
      `needs ${samples} samples of ${N} bodies (${samples * N * 6} numbers, more than ${maxValues}); shorten the span or raise stepsPerSample`,
      options.tEnd,
    );
  }
  const sampleInterval = options.tEnd / intervals;
  const h = sampleInterval / perSample;

  const { x0, v0, mus } = initialStates(system);

  const states = new Float64Array(samples * N * 6);
  const store = (k: number, x: ArrayLike<number>, v: ArrayLike<number>): void => {
    const o = k * N * 6;
    for (let i = 0; i < N; i++) {
      for (let c = 0; c < 3; c++) {
        states[o + 6 * i + c] = x[3 * i + c];
        states[o + 6 * i + 3 + c] = v[3 * i + c];
      }
    }
  };
  store(0, x0, v0);
  let step = 0;
  const res = integrateFixed(method, mutualAccel(mus), 0, x0, v0, {
    h,
    steps: intervals * perSample,
    signal: options.signal,
    onStep: (_t, x, v) => {
      step++;
      if (step % perSample === 0) {
        const k = step / perSample;
        store(k, x, v);
        options.onProgress?.(k / intervals);
      }
    },
  });
  if (res.status === 'cancelled') throw new SolverError('nbody-ephemeris', 'cancelled', `cancelled at t = ${res.t} s`, { t: res.t });
  return new NBodyEphemeris({
    count: N,
    mus,
    tEnd: options.tEnd,
    h,
    sampleInterval,
    samples,
    states,
    method,
    fevals: res.fevals,
  });
}

/**
 * Barycentric epoch positions and velocities (3N each) and μ per body, with each conic read as
 * the orbit of its body's subsystem barycentre (see the module comment).
 */
export function initialStates(system: StarSystem): { x0: Float64Array; v0: Float64Array; mus: Float64Array } {
  const bodies = system.bodies;
  const N = bodies.length;
  const mus = new Float64Array(N);
  for (let i = 0; i < N; i++) mus[i] = bodies[i].mu;
  const conic = new Float64Array(6 * N); // state of each body's subsystem barycentre rel. parent
  const s6 = new Float64Array(6);
  for (let i = 1; i < N; i++) {
    bodyStateRelativeToParent(system, i, 0, s6);
    conic.set(s6, 6 * i);
  }
  // Subsystem masses and barycentre offsets, children before parents (post-order).
  const order: number[] = [];
  const visit = (i: number): void => {
    for (const k of bodies[i].children) visit(k);
    order.push(i);
  };
  visit(0);
  const muSub = new Float64Array(N);
  const off = new Float64Array(6 * N);
  for (const i of order) {
    let m = mus[i];
    for (const k of bodies[i].children) {
      m += muSub[k];
      for (let c = 0; c < 6; c++) off[6 * i + c] += muSub[k] * conic[6 * k + c];
    }
    muSub[i] = m;
    for (let c = 0; c < 6; c++) off[6 * i + c] /= m;
  }
  // Positions top-down: body = parent + conic − own subsystem offset; star at the origin.
  const abs = new Float64Array(6 * N);
  for (let j = order.length - 1; j >= 0; j--) {
    const i = order[j];
    if (i === 0) continue;
    const p = bodies[i].parentIndex;
    for (let c = 0; c < 6; c++) abs[6 * i + c] = abs[6 * p + c] + conic[6 * i + c] - off[6 * i + c];
  }
  // Shift to the system barycentre.
  const cm = [0, 0, 0, 0, 0, 0];
  let muSum = 0;
  for (let i = 0; i < N; i++) {
    for (let c = 0; c < 6; c++) cm[c] += mus[i] * abs[6 * i + c];
    muSum += mus[i];
  }
  const x0 = new Float64Array(3 * N);
  const v0 = new Float64Array(3 * N);
  for (let i = 0; i < N; i++) {
    for (let c = 0; c < 3; c++) {
      x0[3 * i + c] = abs[6 * i + c] - cm[c] / muSum;
      v0[3 * i + c] = abs[6 * i + 3 + c] - cm[3 + c] / muSum;
    }
  }
  return { x0, v0, mus };
}

const a6 = new Float64Array(6);

export class NBodyEphemeris {
  constructor(readonly data: NBodyEphemerisData) {}

  get tEnd(): number {
    return this.data.tEnd;
  }

  /**
   * State of body `index` at time t ∈ [0, tEnd], relative to body `relativeTo` (default the
   * star, index 0) or to the barycentre (BARYCENTRE). Allocation-free.
   */
  state(t: number, index: number, out6: Float64Array, relativeTo = 0): Float64Array {
    const d = this.data;
    if (!(index >= 0 && index < d.count && Number.isInteger(index))) {
      throw new InputError('index', `must be a body index in [0, ${d.count - 1}]`, index);
    }
    if (relativeTo !== BARYCENTRE && !(relativeTo >= 0 && relativeTo < d.count && Number.isInteger(relativeTo))) {
      throw new InputError('relativeTo', `must be a body index in [0, ${d.count - 1}] or BARYCENTRE (−1)`, relativeTo);
    }
    if (!(t >= 0 && t <= d.tEnd)) throw new InputError('t', `must lie within the ephemeris span [0, ${d.tEnd}] s`, t);
    let k = Math.floor(t / d.sampleInterval);
    if (k > d.samples - 2) k = d.samples - 2;
    const s = t / d.sampleInterval - k;
    interpolate(d, k, s, index, out6);
    if (relativeTo !== BARYCENTRE) {
      interpolate(d, k, s, relativeTo, a6);
      for (let c = 0; c < 6; c++) out6[c] -= a6[c];
    }
    return out6;
  }

  /** Total energy divided by G, Σ ½ μ_i v_i² − Σ_{i<j} μ_i μ_j / r_ij (m⁵/s⁴), at stored sample k. */
  energyAtSample(k: number): number {
    const d = this.data;
    if (!(Number.isInteger(k) && k >= 0 && k < d.samples)) throw new InputError('k', `must be a sample index in [0, ${d.samples - 1}]`, k);
    const o = k * d.count * 6;
    const st = d.states;
    let kin = 0;
    let pot = 0;
    for (let i = 0; i < d.count; i++) {
      const p = o + 6 * i;
      kin += 0.5 * d.mus[i] * (st[p + 3] ** 2 + st[p + 4] ** 2 + st[p + 5] ** 2);
      for (let j = i + 1; j < d.count; j++) {
        const q = o + 6 * j;
        pot -= (d.mus[i] * d.mus[j]) / Math.hypot(st[q] - st[p], st[q + 1] - st[p + 1], st[q + 2] - st[p + 2]);
      }
    }
    return kin + pot;
  }
}

// Cubic Hermite between samples k and k + 1 at fraction s ∈ [0, 1].
function interpolate(d: NBodyEphemerisData, k: number, s: number, i: number, out: Float64Array): void {
  const dt = d.sampleInterval;
  const p0 = (k * d.count + i) * 6;
  const p1 = p0 + d.count * 6;
  const st = d.states;
  const s2 = s * s;
  const s3 = s2 * s;
  const h00 = 2 * s3 - 3 * s2 + 1;
  const h10 = (s3 - 2 * s2 + s) * dt;
  const h01 = -2 * s3 + 3 * s2;
  const h11 = (s3 - s2) * dt;
  const d00 = (6 * s2 - 6 * s) / dt;
  const d10 = 3 * s2 - 4 * s + 1;
  const d01 = (-6 * s2 + 6 * s) / dt;
  const d11 = 3 * s2 - 2 * s;
  for (let c = 0; c < 3; c++) {
    const x0 = st[p0 + c];
    const v0 = st[p0 + 3 + c];
    const x1 = st[p1 + c];
    const v1 = st[p1 + 3 + c];
    out[c] = h00 * x0 + h10 * v0 + h01 * x1 + h11 * v1;
    out[3 + c] = d00 * x0 + d10 * v0 + d01 * x1 + d11 * v1;
  }
}
