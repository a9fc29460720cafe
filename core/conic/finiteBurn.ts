/**
 * Finite burns: the ship's motion under the central body's gravity and a constant thrust, with
 * the mass falling at ṁ = −F/(g0·Isp) — the two-body mode of the ship force model
 * (core/dynamics/shipForces.ts, the one model of every non-conic flight, thrust included) —
 * integrated with Dormand–Prince RK45 (core/integrate/rk45.ts) stage phase by stage phase (the phases and their durations come from the rocket-equation
 * bookkeeping of vehicle.ts, so the propellant burned is exactly what the impulsive budget
 * spends: the propellant delivers the same Δv = Σ c·ln(m0/m1)).
 *
 * Pointing
 * - 'inertial': thrust held along the fixed inertial direction û of the impulsive Δv.
 * - 'velocity': thrust held fixed in the rotating VNB frame (velocity, normal, binormal) at the
 *   VNB components that û has at the burn centre — for a prograde or retrograde burn that is
 *   thrust along ±velocity, the usual "follow the velocity vector" steering.
 *
 * Gravity loss (defined here): the impulsive burn at the centre time t_c adds Δv along û to the
 * coast state (r_c, v_c). The finite burn ends with specific orbital energy ε_f. The
 * energy-equivalent impulsive Δv is the k ≥ 0 with |v_c + k·û|²/2 − μ/|r_c| = ε_f (the root nearer
 * |Δv|); the gravity loss is Δv_propellant − k: the part of the propellant's Δv that did not go
 * into orbital energy because the thrust acted over an arc instead of at one point. It tends to 0
 * as thrust → ∞ (burn time → 0). When ε_f cannot be reached along û (discriminant < 0) k is the
 * closest value, −v_c·û.
 *
 * The loss can come out slightly negative when the steering departs from û (velocity pointing
 * of a burn with a large normal or binormal part: the frame turns with the velocity the burn
 * itself rotates, so the thrust does not stay along û) — the figure then says "the finite burn
 * put more energy in than the impulsive one", not "no loss".
 *
 * The mass is not integrated: within a phase it falls linearly, m(t) = m0 − (F/c)(t − t0), as
 * the force model holds it, and the mass at a phase's end is that line's value.
 *
 * Limits: only the central body's gravity acts (patched conic); an SOI crossing during the burn
 * is not looked for — the next coast starts from the burn's end state (the evaluation then
 * moves the ship to the SOI it is in). The burn is centred in time on the planned instant
 * (common practice); with the mass falling, the impulse is not centred exactly, which shifts
 * the end state by an amount of first order in the burn time.
 */
import { rk45 } from '../integrate/index.ts';
import type { DenseOutput } from '../integrate/index.ts';
import { SolverError } from '../math/index.ts';
import { inertialToVnb } from '../math/index.ts';
import { ShipForces } from '../dynamics/index.ts';
import type { BurnBook } from '../plan/index.ts';

/** Relative tolerance of the burn integration. */
export const FINITE_BURN_RTOL = 1e-10;

export interface FiniteBurnInput {
  /** μ of the central body. */
  mu: number;
  /** Ship state relative to the central body at tStart. */
  state: ArrayLike<number>;
  tStart: number;
  /** The impulsive Δv at the burn centre (inertial, m/s): direction and loss reference. */
  dvImpulsive: ArrayLike<number>;
  /** Coast state at the burn centre (reference of the gravity loss). */
  centreState: ArrayLike<number>;
  pointing: 'velocity' | 'inertial';
  /** Stage phases from vehicle.ts spendBurn. */
  book: BurnBook;
  /** Drawing samples over the burn (0: none). */
  samples: number;
}

export interface FiniteBurnResult {
  tEnd: number;
  /** State at tEnd relative to the central body. */
  state: Float64Array;
  massEnd: number;
  /** Δv the propellant delivered, Σ c·ln(m0/m1) over the phases, m/s. */
  dvPropellant: number;
  /** Energy-equivalent impulsive Δv k (see the module comment), m/s. */
  dvEquivalent: number;
  /** dvPropellant − dvEquivalent, m/s. */
  gravityLoss: number;
  sampleT: Float64Array;
  samples: Float64Array;
  /** RK45 accepted steps and function evaluations over all phases. */
  steps: number;
  fevals: number;
}

const EMPTY = new Float64Array(0);

/** Integrates the burn (see the module comment). */
export function flyFiniteBurn(input: FiniteBurnInput): FiniteBurnResult {
  const { mu, book } = input;
  const dvn = Math.hypot(input.dvImpulsive[0], input.dvImpulsive[1], input.dvImpulsive[2]);
  const ux = dvn > 0 ? input.dvImpulsive[0] / dvn : 0;
  const uy = dvn > 0 ? input.dvImpulsive[1] / dvn : 0;
  const uz = dvn > 0 ? input.dvImpulsive[2] / dvn : 0;
  // VNB components of û at the centre (velocity pointing)
  let vnb: [number, number, number] | null = null;
  if (input.pointing === 'velocity' && dvn > 0) {
    try {
      const l = inertialToVnb(
        [input.centreState[0], input.centreState[1], input.centreState[2]],
        [input.centreState[3], input.centreState[4], input.centreState[5]],
        [ux, uy, uz],
      );
      vnb = [l[0], l[1], l[2]];
    } catch {
      vnb = null; // r ∥ v: no VNB frame, hold the inertial direction
    }
  }
  const forces = ShipForces.centralBody(mu);
  const u = [ux, uy, uz];
  const y = new Float64Array(6);
  for (let i = 0; i < 6; i++) y[i] = input.state[i];
  let mass = book.massBefore;
  const r0 = Math.hypot(y[0], y[1], y[2]);
  const v0 = Math.hypot(y[3], y[4], y[5]) || 1;
  const atol = [1e-9 * r0, 1e-9 * r0, 1e-9 * r0, 1e-10 * v0, 1e-10 * v0, 1e-10 * v0];
  let t = input.tStart;
  let steps = 0;
  let fevals = 0;
  let dvProp = 0;
  const spans: { t0: number; t1: number; dense: DenseOutput | undefined }[] = [];
  for (let ph = 0; ph < book.phases; ph++) {
    const dur = book.phaseDuration[ph];
    // mass at the phase start: a dropped stage's dry mass leaves between phases
    mass = book.phaseMass0[ph];
    if (!(dur > 0)) continue;
    const phase = { duration: dur, thrust: book.phaseThrust[ph], exhaust: book.phaseExhaust[ph], mass0: mass };
    forces.setThrust(phase, t, u, vnb);
    const res = rk45(forces.deriv, t, y, t + dur, { rtol: FINITE_BURN_RTOL, atol, dense: input.samples > 0 });
    if (res.status !== 'done') {
      throw new SolverError('finite-burn', 'no-convergence', `burn integration stopped: ${res.message}`, { tStart: t, duration: dur });
    }
    steps += res.stats.accepted;
    fevals += res.stats.fevals;
    const massEnd = phase.thrust > 0 ? mass - (phase.thrust / phase.exhaust) * dur : mass;
    if (massEnd < mass) dvProp += phase.exhaust * Math.log(mass / massEnd);
    mass = massEnd;
    spans.push({ t0: t, t1: t + dur, dense: res.dense });
    y.set(res.y);
    t += dur;
  }
  forces.setThrust(null, 0, u, null);
  const state = new Float64Array(6);
  for (let i = 0; i < 6; i++) state[i] = y[i];
  for (let i = 0; i < 6; i++) {
    if (!Number.isFinite(state[i])) throw new SolverError('finite-burn', 'non-finite', 'burn end state is not finite', { tStart: input.tStart });
  }
  // energy-equivalent impulsive Δv at the centre
  const c = input.centreState;
  const rc = Math.hypot(c[0], c[1], c[2]);
  const rf = Math.hypot(state[0], state[1], state[2]);
  const vf2 = state[3] * state[3] + state[4] * state[4] + state[5] * state[5];
  const epsF = 0.5 * vf2 - mu / rf;
  const vdotu = c[3] * ux + c[4] * uy + c[5] * uz;
  const vc2 = c[3] * c[3] + c[4] * c[4] + c[5] * c[5];
  const disc = vdotu * vdotu - vc2 + 2 * (epsF + mu / rc);
  let k: number;
  if (disc >= 0) {
    const sq = Math.sqrt(disc);
    const k1 = -vdotu + sq;
    const k2 = -vdotu - sq;
    k = Math.abs(k1 - dvn) <= Math.abs(k2 - dvn) ? k1 : k2;
  } else {
    k = -vdotu;
  }
  if (dvn === 0) k = 0;
  let sampleT = EMPTY;
  let samples = EMPTY;
  const n = input.samples;
  if (n > 0 && spans.length > 0) {
    sampleT = new Float64Array(n);
    samples = new Float64Array(3 * n);
    const ts = input.tStart;
    const te = t;
    const tmp = new Float64Array(6);
    let sp = 0;
    for (let j = 0; j < n; j++) {
      const tj = n === 1 ? ts : ts + ((te - ts) * j) / (n - 1);
      while (sp < spans.length - 1 && tj > spans[sp].t1) sp++;
      const d = spans[sp].dense;
      sampleT[j] = tj;
      if (d) {
        d.at(Math.min(Math.max(tj, d.tStart), d.tEnd), tmp); // the dense output's own ends (its last step may end a rounding short)
        samples[3 * j] = tmp[0];
        samples[3 * j + 1] = tmp[1];
        samples[3 * j + 2] = tmp[2];
      }
    }
  }
  return {
    tEnd: t,
    state,
    massEnd: mass,
    dvPropellant: dvProp,
    dvEquivalent: k,
    gravityLoss: dvProp - k,
    sampleT,
    samples,
    steps,
    fevals,
  };
}
