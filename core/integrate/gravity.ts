/**
 * Force model: Newtonian point-mass gravity (Newton's law of gravitation, a = −μ·r/|r|³;
 * Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., §1.3) on spacecraft from a
 * set of bodies whose positions are given as functions of time, plus an optional thrust
 * acceleration; and the mutual gravity of N bodies for the n-body ephemeris.
 *
 * Frame: the positions of sources and spacecraft are in one frame whose origin is taken as
 * inertial (e.g. star-centred, with the star as a source at the origin). No indirect term is
 * added: if the origin is a body that is itself accelerated by the other sources, the caller must
 * account for that (or place the origin at the system barycentre).
 *
 * Several spacecraft may share one call: x of length 3K holds K craft, each pulled by every
 * source (not by one another). Source positions are evaluated once per call. Nothing allocates
 * per call. A craft exactly at a source's centre gets a non-finite acceleration, which the
 * integrators reject.
 */
import { InputError, requireNonNegative } from '../math/index.ts';
import type { AccelFunction, OdeFunction } from './ode.ts';

export interface GravitySource {
  /** Gravitational parameter G·M (m³/s², ≥ 0). */
  mu: number;
  /** Writes the source's position at time t into out (3 components). */
  position: (t: number, out: Float64Array) => void;
  name?: string;
}

/** Thrust (or any other extra) acceleration; it is added to gravity. */
export interface ThrustModel {
  accel: (t: number, x: Float64Array, v: Float64Array, out: Float64Array) => void;
}

function checkSources(sources: GravitySource[]): void {
  if (!Array.isArray(sources)) throw new InputError('sources', 'must be an array of gravity sources', sources);
  sources.forEach((s, i) => {
    if (!s || typeof s.position !== 'function') throw new InputError(`sources[${i}].position`, 'must be a function', s?.position);
    requireNonNegative(`sources[${i}].mu`, s.mu);
  });
}

function checkThrust(thrust: ThrustModel | undefined): void {
  if (thrust !== undefined && (!thrust || typeof thrust.accel !== 'function')) {
    throw new InputError('thrust.accel', 'must be a function', thrust?.accel);
  }
}

/** Acceleration on spacecraft at x (3K components) from the sources, plus thrust if given. */
export function spacecraftAccel(sources: GravitySource[], thrust?: ThrustModel): AccelFunction {
  checkSources(sources);
  checkThrust(thrust);
  const m = sources.length;
  const mus = Float64Array.from(sources.map((s) => s.mu));
  const pos = new Float64Array(3 * m);
  const p = new Float64Array(3);
  const positions = sources.map((s) => s.position);
  return (t, x, v, out) => {
    for (let j = 0; j < m; j++) {
      positions[j](t, p);
      pos[3 * j] = p[0];
      pos[3 * j + 1] = p[1];
      pos[3 * j + 2] = p[2];
    }
    out.fill(0);
    if (thrust) thrust.accel(t, x, v, out); // a model that writes or one that adds both work on zeroed out
    const len = x.length;
    for (let c = 0; c < len; c += 3) {
      let ax = 0,
        ay = 0,
        az = 0;
      const x0 = x[c],
        x1 = x[c + 1],
        x2 = x[c + 2];
      for (let j = 0; j < m; j++) {
        const dx = x0 - pos[3 * j];
        const dy = x1 - pos[3 * j + 1];
        const dz = x2 - pos[3 * j + 2];
        const r2 = dx * dx + dy * dy + dz * dz;
        const k = -mus[j] / (r2 * Math.sqrt(r2));
        ax += k * dx;
        ay += k * dy;
        az += k * dz;
      }
      out[c] += ax;
      out[c + 1] += ay;
      out[c + 2] += az;
    }
  };
}

/**
 * The same force model in first-order form for RK45: y = [x, v] with x, v of 3K components each
 * (a single craft: y = [x, y, z, vx, vy, vz]).
 */
export function spacecraftOde(sources: GravitySource[], thrust?: ThrustModel): OdeFunction {
  const accel = spacecraftAccel(sources, thrust);
  let xs = new Float64Array(3);
  let vs = new Float64Array(3);
  let as = new Float64Array(3);
  return (t, y, dydt) => {
    const n = y.length >> 1;
    if (xs.length !== n) {
      if (n < 3 || n % 3 !== 0 || y.length !== 2 * n) throw new InputError('y', 'must have 6K components: [x (3K), v (3K)]', y.length);
      xs = new Float64Array(n);
      vs = new Float64Array(n);
      as = new Float64Array(n);
    }
    for (let i = 0; i < n; i++) {
      xs[i] = y[i];
      vs[i] = y[n + i];
    }
    accel(t, xs, vs, as);
    for (let i = 0; i < n; i++) {
      dydt[i] = vs[i];
      dydt[n + i] = as[i];
    }
  };
}

/**
 * Mutual point-mass gravity of N bodies: x has 3N components, body i pulled by every j ≠ i with
 * μ_j. Bodies with μ = 0 are test particles (pulled, not pulling). Pairs are visited once.
 */
export function mutualAccel(mus: ArrayLike<number>): AccelFunction {
  if (!mus || typeof mus.length !== 'number' || mus.length < 1) throw new InputError('mus', 'must have at least 1 entry', mus);
  const N = mus.length;
  const mu = new Float64Array(N);
  for (let i = 0; i < N; i++) mu[i] = requireNonNegative(`mus[${i}]`, mus[i]);
  return (_t, x, _v, out) => {
    if (x.length !== 3 * N) throw new InputError('x', `must have ${3 * N} components (3 per body)`, x.length);
    out.fill(0);
    for (let i = 0; i < N; i++) {
      const xi = x[3 * i],
        yi = x[3 * i + 1],
        zi = x[3 * i + 2];
      let ax = out[3 * i],
        ay = out[3 * i + 1],
        az = out[3 * i + 2];
      for (let j = i + 1; j < N; j++) {
        const dx = x[3 * j] - xi;
        const dy = x[3 * j + 1] - yi;
        const dz = x[3 * j + 2] - zi;
        const r2 = dx * dx + dy * dy + dz * dz;
        const inv3 = 1 / (r2 * Math.sqrt(r2));
        const ki = mu[j] * inv3; // pull on i toward j
        const kj = mu[i] * inv3; // pull on j toward i
        ax += ki * dx;
        ay += ki * dy;
        az += ki * dz;
        out[3 * j] -= kj * dx;
        out[3 * j + 1] -= kj * dy;
        out[3 * j + 2] -= kj * dz;
      }
      out[3 * i] = ax;
      out[3 * i + 1] = ay;
      out[3 * i + 2] = az;
    }
  };
}
