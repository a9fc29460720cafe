/**
 * A long Wisdom–Holman run with symplectic correctors (Wisdom, Holman & Touma, "Symplectic
 * correctors", in Integration Algorithms and Classical Mechanics, Fields Inst. Commun. 10 (1996)
 * 217; the map and its parts: wisdomHolman.ts).
 *
 * Kernel: the drift–kick–drift form of the map, drift(h/2, H_K) · kick(h, H_I) · drift(h/2, H_K)
 * (Wisdom & Holman 1991, AJ 102, 1528, §3). Consecutive half drifts merge, so the run keeps its
 * Jacobi state half a drift ahead and each step is one force evaluation, one kick and one drift
 * of h; the state is brought back to the step time only when read.
 * Corrector: the kernel's energy error is O(ε·h²) (ε the planets' mass ratios), but its leading
 * part is a Poisson bracket with H_K and is removed by a canonical change of variables C close to
 * the identity: the kernel is C⁻¹ ∘ (a map whose error is O(ε²·h²) plus higher powers of h) ∘ C.
 * The run applies C to the initial state and C⁻¹ to every state it reports (Wisdom, Holman & Touma 1996, §4: C built
 * from stages Z(a, b) = drift(a)·kick(−b)·drift(−2a)·kick(b)·drift(a); the fifth-order set here,
 * a_k = k·√(7/40) h, with the b_k also used by REBOUND's WHFast (Rein & Tamayo 2015, MNRAS 452, 376)).
 * The correction costs 4 stages (12 drifts, 8 force evaluations) per read, nothing per step.
 * Measured on the demo system over 1,000 years (test/core/checks/wisdomHolman.test.ts): the
 * corrected run at period/10 has 1/50 of the uncorrected kick–drift–kick map's energy error at
 * period/20 (1.5e-11 against 8e-10) and the same eccentricity drifts (within 0.1 % of Yoshida 4).
 * Moons flown as bodies of their own break the premise (their planet's pull is in H_I, not
 * small): stability.ts keeps the uncorrected map for them.
 * The positions written after every step (for close-approach and collision checks) are the
 * kernel's uncorrected positions at the middle of the step (the time of its kick): `xLag`
 * (= h/2) behind the run's time; they differ from the corrected ones by O(ε·h²) of the orbit.
 */
import { whCore } from './wisdomHolman.ts';

/** Stage spacing of the correctors: a_k = k·α steps, α = √(7/40) (Wisdom, Holman & Touma 1996). */
const CORRECTOR_A = Math.sqrt(7 / 40);
/**
 * Stage weights of the fifth-order corrector (in steps) for the stages at ±2α and ±α:
 * b₁ = −1/(288α), b₂ = 5/(288α) (the tabulated −0.00830019867593328917… and 0.04150099337966644583…;
 * their leading-order sum −8α·b₁ − 4α·b₂ = −1/24 is the kernel's O(ε·h²) coefficient).
 */
const CORRECTOR_B1 = -1 / (288 * CORRECTOR_A);
const CORRECTOR_B2 = 5 / (288 * CORRECTOR_A);

export interface WisdomHolmanRun {
  /** Barycentric positions (3N, caller's order) at the middle of the last step (the kernel's, uncorrected); written by every advance. */
  readonly x: Float64Array;
  /** How far x trails the run's time, s (h/2). */
  readonly xLag: number;
  /** Force evaluations so far (one per step, plus the correctors'). */
  readonly fevals: number;
  /** Advances the run by its step h. */
  advance(): void;
  /** Writes the corrected barycentric state at the run's time into x and v (3N each, caller's order); the run is not disturbed. */
  read(x: Float64Array, v: Float64Array): void;
}

export interface WisdomHolmanRunOptions {
  /** Jacobi order (indices into mus; default 0, 1, …, N−1). */
  order?: ArrayLike<number>;
  /** Apply the symplectic corrector (default true; false gives the bare kernel). */
  corrector?: boolean;
}

/**
 * A corrected Wisdom–Holman run of the bodies of gravitational parameters mus (m³/s²) from the
 * barycentric state x0, v0 (3N each) with step h. Allocation-free per step and per read.
 */
export function wisdomHolmanRun(
  mus: ArrayLike<number>,
  x0: ArrayLike<number>,
  v0: ArrayLike<number>,
  h: number,
  options: WisdomHolmanRunOptions = {},
): WisdomHolmanRun {
  const c = whCore(mus, options.order);
  const corrected = options.corrector ?? true;
  const N = c.N;
  const x = new Float64Array(3 * N);
  // what a read saves and restores
  const sx = new Float64Array(3 * N);
  const sv = new Float64Array(3 * N);
  const sa = new Float64Array(3 * N);
  const sc = new Float64Array(3 * N);
  const sm = new Float64Array(c.memo.length);
  const scratch = new Float64Array(3 * N);
  let fevals = 0;
  const forces = (): void => {
    c.fromJacobi(c.xj, scratch, c.xc);
    c.interaction();
    fevals++;
  };
  /** One corrector stage Z(a, b). */
  const stage = (a: number, b: number): void => {
    c.drift(a);
    forces();
    c.kick(c.vj, -b);
    c.drift(-2 * a);
    forces();
    c.kick(c.vj, b);
    c.drift(a);
  };
  /** The corrector (sign +1: into the kernel's variables, C; −1: back, C⁻¹ up to the corrector's order). */
  const correct = (sign: number): void => {
    const a = CORRECTOR_A * h;
    stage(-2 * a, -sign * CORRECTOR_B1 * h);
    stage(-a, -sign * CORRECTOR_B2 * h);
    stage(a, sign * CORRECTOR_B2 * h);
    stage(2 * a, sign * CORRECTOR_B1 * h);
  };

  c.toJacobi(x0, c.xj, c.xc);
  c.toJacobi(v0, c.vj, null);
  if (corrected) correct(1);
  c.fromJacobi(c.xj, x, c.xc);
  c.drift(0.5 * h);
  return {
    x,
    xLag: 0.5 * h,
    get fevals(): number {
      return fevals;
    },
    advance(): void {
      c.fromJacobi(c.xj, x, c.xc);
      c.interaction();
      fevals++;
      c.kick(c.vj, h);
      c.drift(h);
    },
    read(xo: Float64Array, vo: Float64Array): void {
      sx.set(c.xj);
      sv.set(c.vj);
      sa.set(c.ac);
      sc.set(c.xc);
      sm.set(c.memo);
      c.drift(-0.5 * h);
      if (corrected) correct(-1);
      c.fromJacobi(c.xj, xo, null);
      c.fromJacobi(c.vj, vo, null);
      c.xj.set(sx);
      c.vj.set(sv);
      c.ac.set(sa);
      c.xc.set(sc);
      c.memo.set(sm);
    },
  };
}
