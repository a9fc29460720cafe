/**
 * Wisdom–Holman symplectic map for the n-body problem in Jacobi coordinates (Wisdom & Holman,
 * "Symplectic maps for the n-body problem", AJ 102 (1991) 1528; the Kepler/interaction split as
 * written by Rein & Tamayo, "WHFast", MNRAS 452 (2015) 376, §2).
 *
 * H = H_K + H_I with, for the Jacobi bodies k = 1 … N−1 in the given order (μ = G·m, M_k the
 * sum of μ over the bodies 0 … k, r'_k the position of body k relative to the barycentre of
 * bodies 0 … k−1, v'_k likewise):
 *   H_K = Σ_k [ ½ m'_k v'_k² − m_k M_{k−1}/r'_k ]   (each a Kepler orbit with μ = M_k),
 *   H_I = Σ_{k≥1} m_k M_{k−1}/r'_k − Σ_{i<j} m_i m_j / r_ij.
 * One step is kick(h/2, H_I) · drift(h, H_K) · kick(h/2, H_I). The drift moves every Jacobi
 * body on its Kepler orbit with the Lagrange coefficients in the change of eccentric anomaly
 * (ellipticDrift.ts: Halley's method without trigonometric calls) when the orbit is bound
 * and |ΔM| ≤ π — the universal-variable solver (`keplerCoefficients`, core/orbit/kepler.ts)
 * took 5× the time of the whole step and stays the path for every other case (unbound, a long
 * drift, the iteration not settled); the kick's accelerations come from Cartesian positions:
 *   a_i = −Σ_j μ_j (x_i − x_j)/r_ij³ (every pair but the first two bodies', whose term cancels
 *   exactly against k = 1), plus for k ≥ 2: M_{k−1} r'_k/r'_k³ on body k and −μ_k r'_k/r'_k³
 *   on each body inside it,
 * turned into Jacobi accelerations a'_k = a_k − (μ-weighted mean of a over bodies 0 … k−1).
 * The closing half kick of one step and the opening half kick of the next use the same
 * positions, so the accelerations are kept (one force evaluation per step) while the caller
 * leaves x unchanged between steps.
 * The map is exact for two bodies (H_I = 0) and its error is O(ε·h²) for planets of mass
 * ratio ε. Long runs use `wisdomHolmanRun` (wisdomHolmanRun.ts): the drift–kick–drift form of
 * the same map with the Jacobi state kept between steps and symplectic correctors.
 * Order matters: the first body should dominate (the star), then bodies outward; a moon placed
 * after its planet orbits the barycentre of everything inside it, which its planet dominates,
 * so H_I is not small for it and the map is then only as good as leapfrog at the same step.
 */
import { keplerCoefficients } from '../orbit/index.ts';
import { DRIFT_SLOTS, driftMemo, ellipticDrift } from './ellipticDrift.ts';

export interface WisdomHolmanStepper {
  /** Advances the barycentric Cartesian state (x, v: 3N each) by h seconds in place; returns the force evaluations used. */
  step(t: number, h: number, x: Float64Array, v: Float64Array): number;
}

/**
 * The map's working state and its parts (kick, drift, coordinate changes) for the bodies of mus
 * in Jacobi order `order`; shared by the stepper and `wisdomHolmanRun` (wisdomHolmanRun.ts).
 */
export function whCore(mus: ArrayLike<number>, order?: ArrayLike<number>) {
  const N = mus.length;
  const o = Int32Array.from(order ?? Array.from({ length: N }, (_, k) => k));
  const mu = Float64Array.from(o, (j) => mus[j]); // in Jacobi order
  const M = new Float64Array(N); // cumulative μ over 0 … k
  let s = 0;
  for (let k = 0; k < N; k++) {
    s += mu[k];
    M[k] = s;
  }
  const xj = new Float64Array(3 * N);
  const vj = new Float64Array(3 * N);
  const xc = new Float64Array(3 * N); // Cartesian positions in Jacobi order
  const ac = new Float64Array(3 * N); // Cartesian interaction accelerations in Jacobi order
  const memo = driftMemo(N); // ellipticDrift's per-body guesses and reference angles
  const st = new Float64Array(6);
  const cf = new Float64Array(5);
  const bodyDrift = ellipticDrift; // a local binding: the hot loop calls it without a module-namespace lookup

  /** Cartesian (caller's order) → Jacobi (and Cartesian copy in Jacobi order). */
  const toJacobi = (src: ArrayLike<number>, dst: Float64Array, copy: Float64Array | null): void => {
    let rx = 0,
      ry = 0,
      rz = 0;
    for (let k = 0; k < N; k++) {
      const j = 3 * o[k];
      const px = src[j],
        py = src[j + 1],
        pz = src[j + 2];
      if (copy) {
        copy[3 * k] = px;
        copy[3 * k + 1] = py;
        copy[3 * k + 2] = pz;
      }
      if (k > 0) {
        const m = M[k - 1];
        dst[3 * k] = px - rx / m;
        dst[3 * k + 1] = py - ry / m;
        dst[3 * k + 2] = pz - rz / m;
      }
      rx += mu[k] * px;
      ry += mu[k] * py;
      rz += mu[k] * pz;
    }
    dst[0] = rx / M[N - 1];
    dst[1] = ry / M[N - 1];
    dst[2] = rz / M[N - 1];
  };

  /** Jacobi → Cartesian (written in the caller's order, and in Jacobi order into copy). */
  const fromJacobi = (src: Float64Array, dst: Float64Array, copy: Float64Array | null): void => {
    let cx = src[0],
      cy = src[1],
      cz = src[2];
    for (let k = N - 1; k >= 1; k--) {
      const f = mu[k] / M[k];
      cx -= f * src[3 * k];
      cy -= f * src[3 * k + 1];
      cz -= f * src[3 * k + 2];
      const j = 3 * o[k];
      const px = cx + src[3 * k],
        py = cy + src[3 * k + 1],
        pz = cz + src[3 * k + 2];
      dst[j] = px;
      dst[j + 1] = py;
      dst[j + 2] = pz;
      if (copy) {
        copy[3 * k] = px;
        copy[3 * k + 1] = py;
        copy[3 * k + 2] = pz;
      }
    }
    const j0 = 3 * o[0];
    dst[j0] = cx;
    dst[j0 + 1] = cy;
    dst[j0 + 2] = cz;
    if (copy) {
      copy[0] = cx;
      copy[1] = cy;
      copy[2] = cz;
    }
  };

  /** Interaction accelerations from xc (Cartesian, Jacobi order) and xj (Jacobi positions). */
  const interaction = (): void => {
    ac.fill(0);
    for (let i = 0; i < N; i++) {
      const xi = xc[3 * i],
        yi = xc[3 * i + 1],
        zi = xc[3 * i + 2];
      const mi = mu[i];
      let ax = 0,
        ay = 0,
        az = 0;
      for (let k = i === 0 ? 2 : i + 1; k < N; k++) {
        const dx = xc[3 * k] - xi,
          dy = xc[3 * k + 1] - yi,
          dz = xc[3 * k + 2] - zi;
        const r2 = dx * dx + dy * dy + dz * dz;
        const inv3 = 1 / (r2 * Math.sqrt(r2));
        const fk = mu[k] * inv3,
          fi = mi * inv3;
        ax += fk * dx;
        ay += fk * dy;
        az += fk * dz;
        ac[3 * k] -= fi * dx;
        ac[3 * k + 1] -= fi * dy;
        ac[3 * k + 2] -= fi * dz;
      }
      ac[3 * i] += ax;
      ac[3 * i + 1] += ay;
      ac[3 * i + 2] += az;
    }
    // the Jacobi terms m_k M_{k−1}/r'_k, k ≥ 2; tx.. sums the pull on bodies inside k
    let tx = 0,
      ty = 0,
      tz = 0;
    for (let k = N - 1; k >= 0; k--) {
      ac[3 * k] += tx;
      ac[3 * k + 1] += ty;
      ac[3 * k + 2] += tz;
      if (k < 2) continue;
      const dx = xj[3 * k],
        dy = xj[3 * k + 1],
        dz = xj[3 * k + 2];
      const r2 = dx * dx + dy * dy + dz * dz;
      const inv3 = 1 / (r2 * Math.sqrt(r2));
      ac[3 * k] += M[k - 1] * inv3 * dx;
      ac[3 * k + 1] += M[k - 1] * inv3 * dy;
      ac[3 * k + 2] += M[k - 1] * inv3 * dz;
      tx -= mu[k] * inv3 * dx;
      ty -= mu[k] * inv3 * dy;
      tz -= mu[k] * inv3 * dz;
    }
  };

  /** Kicks the Jacobi velocities w by dt with the accelerations ac. */
  const kick = (w: Float64Array, dt: number): void => {
    let sx = 0,
      sy = 0,
      sz = 0;
    for (let k = 0; k < N; k++) {
      if (k > 0) {
        const m = M[k - 1];
        w[3 * k] += dt * (ac[3 * k] - sx / m);
        w[3 * k + 1] += dt * (ac[3 * k + 1] - sy / m);
        w[3 * k + 2] += dt * (ac[3 * k + 2] - sz / m);
      }
      sx += mu[k] * ac[3 * k];
      sy += mu[k] * ac[3 * k + 1];
      sz += mu[k] * ac[3 * k + 2];
    }
    w[0] += (dt * sx) / M[N - 1];
    w[1] += (dt * sy) / M[N - 1];
    w[2] += (dt * sz) / M[N - 1];
  };

  /** Moves the barycentre and every Jacobi body on its Kepler orbit for dt. */
  const drift = (dt: number): void => {
    xj[0] += dt * vj[0];
    xj[1] += dt * vj[1];
    xj[2] += dt * vj[2];
    for (let k = 1; k < N; k++) {
      const b = 3 * k;
      if (bodyDrift(M[k], dt, xj, vj, b, memo, DRIFT_SLOTS * k)) continue;
      for (let c = 0; c < 3; c++) {
        st[c] = xj[b + c];
        st[3 + c] = vj[b + c];
      }
      keplerCoefficients(M[k], st, dt, cf);
      const f = cf[0],
        g = cf[1],
        fd = cf[2],
        gd = cf[3];
      for (let c = 0; c < 3; c++) {
        xj[b + c] = f * st[c] + g * st[3 + c];
        vj[b + c] = fd * st[c] + gd * st[3 + c];
      }
    }
  };

  return { N, xj, vj, xc, ac, memo, toJacobi, fromJacobi, interaction, kick, drift };
}

/**
 * A Wisdom–Holman stepper for the bodies of gravitational parameters mus (m³/s²), taken in
 * Jacobi order `order` (indices into mus; default 0, 1, …, N−1). Allocation-free per step.
 */
export function wisdomHolmanStepper(mus: ArrayLike<number>, order?: ArrayLike<number>): WisdomHolmanStepper {
  const c = whCore(mus, order);
  const N = c.N;
  const xLast = new Float64Array(3 * N); // positions the cached accelerations belong to (caller's order)
  let cached = false;
  return {
    step(_t: number, h: number, x: Float64Array, v: Float64Array): number {
      let evals = 0;
      let same = cached;
      if (same) {
        for (let i = 0; i < 3 * N; i++) {
          if (x[i] !== xLast[i]) {
            same = false;
            break;
          }
        }
      }
      c.toJacobi(x, c.xj, c.xc);
      c.toJacobi(v, c.vj, null);
      if (!same) {
        c.interaction();
        evals++;
      }
      c.kick(c.vj, 0.5 * h);
      c.drift(h);
      c.fromJacobi(c.xj, x, c.xc);
      c.interaction();
      evals++;
      c.kick(c.vj, 0.5 * h);
      c.fromJacobi(c.vj, v, null);
      xLast.set(x);
      cached = true;
      return evals;
    },
  };
}
