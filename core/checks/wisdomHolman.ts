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
 * (Murray & Dermott, Solar System Dynamics, eqs. 2.71; Danby, Fundamentals of Celestial
 * Mechanics, 2nd ed., §6.9: ΔM = x − e·cosE0·sin x + e·sinE0·(1 − cos x), solved by Newton from
 * x = ΔM) when the orbit is bound and |ΔM| ≤ π — the universal-variable solver
 * (`keplerCoefficients`, core/orbit/kepler.ts) took 5× the time of the whole step and stays
 * the path for every other case (unbound, a long drift, Newton not settled); the kick's accelerations come from Cartesian positions:
 *   a_i = −Σ_j μ_j (x_i − x_j)/r_ij³ (every pair but the first two bodies', whose term cancels
 *   exactly against k = 1), plus for k ≥ 2: M_{k−1} r'_k/r'_k³ on body k and −μ_k r'_k/r'_k³
 *   on each body inside it,
 * turned into Jacobi accelerations a'_k = a_k − (μ-weighted mean of a over bodies 0 … k−1).
 * The closing half kick of one step and the opening half kick of the next use the same
 * positions, so the accelerations are kept (one force evaluation per step) while the caller
 * leaves x unchanged between steps.
 * The map is exact for two bodies (H_I = 0) and its error is O(ε·h²) for planets of mass
 * ratio ε; no symplectic corrector is applied (Wisdom, Holman & Touma 1996 would remove the
 * O(ε·h²) part of the energy oscillation, not a secular drift).
 * Order matters: the first body should dominate (the star), then bodies outward; a moon placed
 * after its planet orbits the barycentre of everything inside it, which its planet dominates,
 * so H_I is not small for it and the map is then only as good as leapfrog at the same step.
 */
import { keplerCoefficients } from '../orbit/index.ts';

/** Newton iterations for the change of eccentric anomaly before the universal solver takes over. */
const WH_NEWTON_MAX = 12;
/** Newton stop: the last correction at the rounding of x (quadratic convergence leaves the next below ε). */
const WH_NEWTON_TOL = 4e-16;

export interface WisdomHolmanStepper {
  /** Advances the barycentric Cartesian state (x, v: 3N each) by h seconds in place; returns the force evaluations used. */
  step(t: number, h: number, x: Float64Array, v: Float64Array): number;
}

/**
 * A Wisdom–Holman stepper for the bodies of gravitational parameters mus (m³/s²), taken in
 * Jacobi order `order` (indices into mus; default 0, 1, …, N−1). Allocation-free per step.
 */
export function wisdomHolmanStepper(mus: ArrayLike<number>, order?: ArrayLike<number>): WisdomHolmanStepper {
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
  const xLast = new Float64Array(3 * N); // positions the cached accelerations belong to (caller's order)
  let cached = false;
  const st = new Float64Array(6);
  const cf = new Float64Array(5);

  /** Cartesian (caller's order) → Jacobi positions (and Cartesian copy in Jacobi order). */
  const toJacobi = (src: Float64Array, dst: Float64Array, copy: Float64Array | null): void => {
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
      dst[j] = cx + src[3 * k];
      dst[j + 1] = cy + src[3 * k + 1];
      dst[j + 2] = cz + src[3 * k + 2];
    }
    const j0 = 3 * o[0];
    dst[j0] = cx;
    dst[j0 + 1] = cy;
    dst[j0 + 2] = cz;
    if (copy) {
      for (let k = 0; k < N; k++) {
        const j = 3 * o[k];
        copy[3 * k] = dst[j];
        copy[3 * k + 1] = dst[j + 1];
        copy[3 * k + 2] = dst[j + 2];
      }
    }
  };

  /** Interaction accelerations from xc (Cartesian, Jacobi order) and xj (Jacobi positions). */
  const interaction = (): void => {
    ac.fill(0);
    for (let i = 0; i < N; i++) {
      for (let k = i + 1; k < N; k++) {
        if (i === 0 && k === 1) continue;
        const dx = xc[3 * k] - xc[3 * i],
          dy = xc[3 * k + 1] - xc[3 * i + 1],
          dz = xc[3 * k + 2] - xc[3 * i + 2];
        const r2 = dx * dx + dy * dy + dz * dz;
        const inv3 = 1 / (r2 * Math.sqrt(r2));
        ac[3 * i] += mu[k] * inv3 * dx;
        ac[3 * i + 1] += mu[k] * inv3 * dy;
        ac[3 * i + 2] += mu[k] * inv3 * dz;
        ac[3 * k] -= mu[i] * inv3 * dx;
        ac[3 * k + 1] -= mu[i] * inv3 * dy;
        ac[3 * k + 2] -= mu[i] * inv3 * dz;
      }
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

  /** Kicks the Jacobi velocities by dt with the accelerations ac. */
  const kick = (dt: number): void => {
    let sx = 0,
      sy = 0,
      sz = 0;
    for (let k = 0; k < N; k++) {
      if (k > 0) {
        const m = M[k - 1];
        vj[3 * k] += dt * (ac[3 * k] - sx / m);
        vj[3 * k + 1] += dt * (ac[3 * k + 1] - sy / m);
        vj[3 * k + 2] += dt * (ac[3 * k + 2] - sz / m);
      }
      sx += mu[k] * ac[3 * k];
      sy += mu[k] * ac[3 * k + 1];
      sz += mu[k] * ac[3 * k + 2];
    }
    vj[0] += (dt * sx) / M[N - 1];
    vj[1] += (dt * sy) / M[N - 1];
    vj[2] += (dt * sz) / M[N - 1];
  };

  /**
   * Lagrange coefficients [f, g, ḟ, ġ] of a bound drift into cf (eqs. 2.71 of Murray & Dermott);
   * false when the fast path does not apply.
   */
  const ellipticCoefficients = (m: number, dt: number): boolean => {
    const r0 = Math.sqrt(st[0] * st[0] + st[1] * st[1] + st[2] * st[2]);
    const v2 = st[3] * st[3] + st[4] * st[4] + st[5] * st[5];
    const sigma = st[0] * st[3] + st[1] * st[4] + st[2] * st[5];
    const ia = 2 / r0 - v2 / m;
    if (!(ia > 0)) return false;
    const a = 1 / ia;
    const n = Math.sqrt(m * ia * ia * ia);
    const dM = n * dt;
    if (!(Math.abs(dM) <= Math.PI)) return false;
    const ec = 1 - r0 * ia;
    const es = sigma / (n * a * a);
    let x = dM;
    let ok = false;
    for (let it = 0; it < WH_NEWTON_MAX; it++) {
      const sx = Math.sin(x),
        cx = Math.cos(x);
      const F = x - ec * sx + es * (1 - cx) - dM;
      const dF = 1 - ec * cx + es * sx;
      const dx = F / dF;
      x -= dx;
      if (Math.abs(dx) <= WH_NEWTON_TOL * (1 + Math.abs(x))) {
        ok = true;
        break;
      }
    }
    if (!ok) return false;
    const sx = Math.sin(x),
      cx = Math.cos(x);
    const r = a * (1 - ec * cx + es * sx);
    cf[0] = 1 + (a * (cx - 1)) / r0;
    cf[1] = dt + (sx - x) / n;
    cf[2] = (-a * a * n * sx) / (r * r0);
    cf[3] = 1 + (a * (cx - 1)) / r;
    return true;
  };

  /** Moves the barycentre and every Jacobi body on its Kepler orbit for dt. */
  const drift = (dt: number): void => {
    xj[0] += dt * vj[0];
    xj[1] += dt * vj[1];
    xj[2] += dt * vj[2];
    for (let k = 1; k < N; k++) {
      const b = 3 * k;
      st[0] = xj[b];
      st[1] = xj[b + 1];
      st[2] = xj[b + 2];
      st[3] = vj[b];
      st[4] = vj[b + 1];
      st[5] = vj[b + 2];
      if (!ellipticCoefficients(M[k], dt)) keplerCoefficients(M[k], st, dt, cf);
      const f = cf[0],
        g = cf[1],
        fd = cf[2],
        gd = cf[3];
      xj[b] = f * st[0] + g * st[3];
      xj[b + 1] = f * st[1] + g * st[4];
      xj[b + 2] = f * st[2] + g * st[5];
      vj[b] = fd * st[0] + gd * st[3];
      vj[b + 1] = fd * st[1] + gd * st[4];
      vj[b + 2] = fd * st[2] + gd * st[5];
    }
  };

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
      toJacobi(x, xj, xc);
      toJacobi(v, vj, null);
      if (!same) {
        interaction();
        evals++;
      }
      kick(0.5 * h);
      drift(h);
      fromJacobi(xj, x, xc);
      interaction();
      evals++;
      kick(0.5 * h);
      fromJacobi(vj, v, null);
      xLast.set(x);
      cached = true;
      return evals;
    },
  };
}
