/**
 * The solved burn kinds of a plan (plan.ts BurnSolve): the Δv is computed from the ship's state
 * at the burn. Every solver writes an inertial Δv (m/s) into `out` or throws SolverError
 * ('solve-burn', reason, plain-language detail) — the evaluation turns that into a
 * 'solve-failed' flag and flies a zero Δv.
 *
 * - transfer, departure (the target is a sibling of the central body): Lambert (Izzo 2015,
 *   core/orbit/lambert.ts) from the central body's position at the burn to the target's position
 *   at `arrive`, about their common parent, gives v∞ = v1 − v_body. The burn is made at the
 *   ship's current point so that the hyperbola leaving from there has exactly that excess
 *   velocity — see `hyperbolicDeparture` for the method and its limits.
 * - transfer, direct (the target is a child of the central body, e.g. a mid-course correction
 *   in heliocentric flight): Δv = v1 − v, Lambert from the ship's own position. With
 *   `periapsisAltitude` the arc aims off the target's centre by the impact parameter
 *   B = r_p·√(1 + 2μ/(r_p·v∞²)) (Bate, Mueller & White, Fundamentals of Astrodynamics, §7.4 —
 *   from memory), on the side that makes the arrival orbit prograde about +z, and B is corrected
 *   by Newton steps until the patched-conic periapsis at the target matches (|Δr_p| < 1 m,
 *   at most TRANSFER_AIM_ITERATIONS steps; the last aim is kept if it has not converged).
 * - transfer, direct with `flyby` (the target is a flyby body): the outgoing leg is the Lambert
 *   arc from the target (at the predicted periapsis time) to `next` at `flyby.arrive`; its v∞ and
 *   the incoming v∞ give the powered flyby (core/orbit/flyby.ts poweredFlyby: periapsis radius,
 *   no lower than radius + safe altitude, and B-plane angle θ; with `powered: false` the
 *   unpowered match, unpoweredFlybyMatch: |v∞| kept, turned toward v∞ out). The aim point is the target's
 *   centre plus B·(cos θ T + sin θ R), B = r_p·√(1 + 2μ/(r_p·v∞²)) (BMW §7.4, from memory);
 *   the patched-conic B vector got at the SOI entry (Ŝ × h / v∞, Vallado 4th ed. §12.4, from
 *   memory) is driven to the wanted one by fixed-point steps on the aim (the aim offset maps
 *   nearly one to one onto B), until |ΔB| < TRANSFER_AIM_TOL or TRANSFER_AIM_ITERATIONS.
 * - capture: along ±V at the current point, the speed that gives eccentricity e; at periapsis
 *   the periapsis stays put (vis-viva: v = √(μ(1 + e)/r_p)). Away from periapsis, of the two
 *   speeds that give e the one nearer the current speed is taken.
 * - plane: the velocity is rotated about the radius vector (Rodrigues' rotation) by the smallest
 *   angle that gives inclination i to the reference plane; |Δv| = 2·v⊥·sin(φ/2) (at a node of a
 *   circular orbit: 2v·sin(Δi/2), Curtis, Orbital Mechanics for Engineering Students, eq. 6.23
 *   — from memory). Inclinations below the current latitude cannot be reached by a rotation
 *   about r: solve fails.
 * - apsis: along ±V, the speed that puts the opposite apsis at R + altitude if the current point
 *   is an apsis (vis-viva with a = (r + r_target)/2). Exact at an apsis; elsewhere the opposite
 *   apsis lands near, not at, the altitude (fly it after "coast until periapsis/apoapsis").
 */
import { SolverError } from '../math/index.ts';
import { brent } from '../math/index.ts';
import { poweredFlyby, propagateKepler, unpoweredFlybyMatch } from '../orbit/index.ts';
import { solveLambert, type LambertSolution } from '../orbit/index.ts';
import { bodyPosition, bodyState } from '../system/index.ts';
import { findBodyIndex, type StarSystem } from '../system/index.ts';
import type { Vec3 } from '../math/index.ts';
import type { BurnSolve } from '../plan/index.ts';
import { conicInfo, createConicInfo } from './soiCrossing.ts';
import { bPlaneFrame } from '../orbit/index.ts';

const frameScratch = new Float64Array(6);

/** Newton steps on the aim offset of a direct transfer with a periapsis altitude. */
export const TRANSFER_AIM_ITERATIONS = 12;
/** Periapsis-radius agreement that ends the aim iteration, m. */
export const TRANSFER_AIM_TOL = 1;

export interface SolveContext {
  system: StarSystem;
  /** Central body index of the ship. */
  central: number;
  /** Burn time, s from epoch. */
  t: number;
  /** Ship state relative to the central body. */
  state: ArrayLike<number>;
}

/** What a solver found besides the Δv (for reports and tests). */
export interface SolveInfo {
  /** transfer: the v∞ vector aimed for at departure (departure style) or at arrival (direct), m/s. */
  vInf: [number, number, number] | null;
  /** transfer, direct with periapsisAltitude: the predicted periapsis radius at the target, m. */
  predictedPeriapsis: number | null;
  /** transfer, direct with periapsisAltitude: aim iterations used. */
  iterations: number;
  /** transfer, direct with flyby: the pass the aim solved for (patched conics), else null/absent. */
  flyby?: FlybyAim | null;
}

/** The flyby an aimed transfer solved for (patched conics at the flyby body). */
export interface FlybyAim {
  /** Periapsis radius wanted (powered-flyby solution) and predicted (the aim's incoming hyperbola), m. */
  rpWanted: number;
  rpPredicted: number;
  /** Predicted periapsis time, s from epoch. */
  tPeriapsis: number;
  /** B-plane angle θ (T → R), rad, and |B| wanted, m. */
  bAngle: number;
  b: number;
  /** v∞ in (predicted) and the v∞ out the next leg needs, m/s. */
  vInfIn: [number, number, number];
  vInfOut: [number, number, number];
  /** Δv at periapsis of the powered flyby (0 unpowered), m/s; the periapsis was held at the minimum (limited). */
  dvPeriapsis: number;
  /** What the pass leaves to pay after it (unpowered: the v∞ mismatch; limited: the turn short), m/s. */
  dvExtra: number;
  limited: boolean;
  /** |ΔB| left at the end, m. */
  bError: number;
}

function fail(detail: string, inputs: Record<string, unknown> = {}): never {
  throw new SolverError('solve-burn', 'no-solution', detail, inputs);
}

const body6 = new Float64Array(6);
const tgt3 = new Float64Array(3);
const tgt6 = new Float64Array(6);
const ci = createConicInfo();

/** The Δv of a solved burn at the context's state, written into out (inertial, m/s). */
export function solveBurn(ctx: SolveContext, solve: BurnSolve, out: Vec3, info?: SolveInfo): Vec3 {
  const mu = ctx.system.bodies[ctx.central].mu;
  switch (solve.kind) {
    case 'fixed':
      out[0] = out[1] = out[2] = 0;
      return out;
    case 'transfer':
      return solveTransfer(ctx, solve, out, info);
    case 'capture':
      return solveCapture(mu, ctx.state, solve.e, out);
    case 'plane':
      return solvePlane(ctx.state, solve.i, out);
    case 'apsis': {
      const R = ctx.system.bodies[ctx.central].radius + solve.altitude;
      return solveApsis(mu, ctx.state, R, out);
    }
  }
}

function pickLambert(sols: LambertSolution[], revs: number, vx: number, vy: number, vz: number): LambertSolution | null {
  let best: LambertSolution | null = null;
  let bestCost = Infinity;
  for (const s of sols) {
    if (s.revs !== revs) continue;
    const c = Math.hypot(s.v1[0] - vx, s.v1[1] - vy, s.v1[2] - vz);
    if (c < bestCost) {
      bestCost = c;
      best = s;
    }
  }
  return best;
}

/** 'transfer' (see the module comment). */
export function solveTransfer(ctx: SolveContext, solve: Extract<BurnSolve, { kind: 'transfer' }>, out: Vec3, info?: SolveInfo): Vec3 {
  const { system, central, t, state } = ctx;
  const target = findBodyIndex(system, solve.to);
  if (target < 0) fail(`unknown target body "${solve.to}"`);
  if (target === central) fail(`the ship is already in ${system.bodies[target].name}'s sphere of influence`);
  const tof = solve.arrive - t;
  if (!(tof > 0)) fail(`arrival time ${solve.arrive} s is not after the burn (${t} s)`, { arrive: solve.arrive, t });
  const revs = solve.revs ?? 0;
  const retrograde = solve.retrograde ?? false;
  const tb = system.bodies[target];
  if (info) {
    info.vInf = null;
    info.predictedPeriapsis = null;
    info.iterations = 0;
    info.flyby = null;
  }
  if (tb.parentIndex === central) {
    // direct: Lambert from the ship's own position in this SOI
    const mu = system.bodies[central].mu;
    bodyState(system, target, solve.arrive, tgt6, central);
    const r1 = [state[0], state[1], state[2]];
    const lambert = (aim: ArrayLike<number>): LambertSolution => {
      let sols: LambertSolution[];
      try {
        sols = solveLambert(mu, r1, aim, tof, { revs, retrograde });
      } catch (e) {
        fail(`Lambert arc to ${tb.name} not found: ${(e as Error).message}`);
      }
      const s = pickLambert(sols, revs, state[3], state[4], state[5]);
      if (!s) fail(`no Lambert arc with ${revs} revolution(s) to ${tb.name} in ${tof} s`);
      return s;
    };
    let sol = lambert([tgt6[0], tgt6[1], tgt6[2]]);
    if (solve.flyby !== undefined) {
      sol = aimForFlyby(ctx, target, tof, solve.flyby, sol, lambert, info);
    } else if (solve.periapsisAltitude !== undefined) {
      sol = aimForPeriapsis(ctx, target, tof, tb.radius + solve.periapsisAltitude, sol, lambert, info);
    } else if (info) {
      info.vInf = [sol.v2[0] - tgt6[3], sol.v2[1] - tgt6[4], sol.v2[2] - tgt6[5]];
    }
    out[0] = sol.v1[0] - state[3];
    out[1] = sol.v1[1] - state[4];
    out[2] = sol.v1[2] - state[5];
    return out;
  }
  const parent = system.bodies[central].parentIndex;
  if (parent < 0 || tb.parentIndex !== parent) {
    fail(`a transfer to ${tb.name} must start in the sphere of influence of its parent or of a sibling`);
  }
  // departure: Lambert between the bodies about their common parent
  const muP = system.bodies[parent].mu;
  bodyState(system, central, t, body6, parent);
  bodyPosition(system, target, solve.arrive, tgt3, parent);
  let sols: LambertSolution[];
  try {
    sols = solveLambert(muP, [body6[0], body6[1], body6[2]], tgt3, tof, { revs, retrograde });
  } catch (e) {
    fail(`Lambert arc from ${system.bodies[central].name} to ${tb.name} not found: ${(e as Error).message}`);
  }
  const sol = pickLambert(sols, revs, body6[3], body6[4], body6[5]);
  if (!sol) fail(`no Lambert arc with ${revs} revolution(s) to ${tb.name} in ${tof} s`);
  const vinf = [sol.v1[0] - body6[3], sol.v1[1] - body6[4], sol.v1[2] - body6[5]];
  if (info) info.vInf = [vinf[0], vinf[1], vinf[2]];
  const vPlus = [0, 0, 0];
  hyperbolicDeparture(system.bodies[central].mu, state, vinf, vPlus);
  out[0] = vPlus[0] - state[3];
  out[1] = vPlus[1] - state[4];
  out[2] = vPlus[2] - state[5];
  return out;
}

const aimShip = new Float64Array(6);
const aimTgt = new Float64Array(6);
const aimRel = new Float64Array(6);

/** Newton iteration on the impact parameter B of a direct transfer (see the module comment). */
function aimForPeriapsis(
  ctx: SolveContext,
  target: number,
  tof: number,
  rpWanted: number,
  centreSol: LambertSolution,
  lambert: (aim: ArrayLike<number>) => LambertSolution,
  info?: SolveInfo,
): LambertSolution {
  const { system, central, t } = ctx;
  const tb = system.bodies[target];
  const muT = tb.mu;
  const Rsoi = tb.derived.soiRadius;
  const muC = system.bodies[central].mu;
  const arrive = t + tof;
  if (!(rpWanted > 0)) fail(`periapsis altitude puts the periapsis below ${tb.name}'s centre`);
  // v∞ of the arc aimed at the centre; B and the side (b̂ = v̂∞ × ẑ → prograde arrival)
  const vix = centreSol.v2[0] - tgt6[3],
    viy = centreSol.v2[1] - tgt6[4],
    viz = centreSol.v2[2] - tgt6[5];
  const vinf = Math.hypot(vix, viy, viz);
  if (!(vinf > 0)) fail(`zero arrival excess velocity at ${tb.name}`);
  let bx = viy,
    by = -vix,
    bz = 0; // v̂∞ × ẑ (unnormalised)
  let bn = Math.hypot(bx, by, bz);
  if (bn < 1e-9 * vinf) {
    bx = 0;
    by = viz;
    bz = -viy; // v̂∞ × x̂
    bn = Math.hypot(bx, by, bz);
  }
  bx /= bn;
  by /= bn;
  bz /= bn;
  const impact = (rp: number): number => rp * Math.sqrt(1 + (2 * muT) / (rp * vinf * vinf));
  const dBdrp = (rp: number): number => {
    const q = muT / (rp * vinf * vinf);
    return (1 + q) / Math.sqrt(1 + 2 * q);
  };
  let B = impact(rpWanted);
  if (!(B < Rsoi)) fail(`periapsis altitude too high: the aim point lies outside ${tb.name}'s sphere of influence`);
  let sol = centreSol;
  let rpGot = NaN;
  let iter = 0;
  for (; iter < TRANSFER_AIM_ITERATIONS; iter++) {
    sol = lambert([tgt6[0] + B * bx, tgt6[1] + B * by, tgt6[2] + B * bz]);
    rpGot = predictedPeriapsis(ctx, target, sol, muC, Rsoi, arrive, muT, vinf);
    if (!Number.isFinite(rpGot)) break;
    const err = rpWanted - rpGot;
    if (Math.abs(err) < TRANSFER_AIM_TOL) {
      iter++;
      break;
    }
    // rp(B) follows B(rp) closely: Newton with the derivative of the two-body relation
    const Bn = B + err * dBdrp(Math.max(rpGot, 0.1 * rpWanted));
    B = Math.min(Math.max(Bn, 0.05 * B), 0.999 * Rsoi);
  }
  if (info) {
    info.vInf = [sol.v2[0] - tgt6[3], sol.v2[1] - tgt6[4], sol.v2[2] - tgt6[5]];
    info.predictedPeriapsis = Number.isFinite(rpGot) ? rpGot : null;
    info.iterations = iter;
  }
  return sol;
}

/**
 * SOI entry of the arc (ship state at ctx.t with velocity sol.v1) at the target: the entry is
 * found by Brent on the distance before the arrival time (the arc ends at the aim point, inside
 * the SOI); the state relative to the target at the entry is left in `aimRel`. Returns the entry
 * time, or NaN when no entry is found.
 */
function predictedEntry(ctx: SolveContext, target: number, sol: LambertSolution, muC: number, Rsoi: number, arrive: number, vinf: number): number {
  const { system, t, state } = ctx;
  aimShip[0] = state[0];
  aimShip[1] = state[1];
  aimShip[2] = state[2];
  aimShip[3] = sol.v1[0];
  aimShip[4] = sol.v1[1];
  aimShip[5] = sol.v1[2];
  const g = (tt: number): number => {
    propagateKepler(muC, aimShip, tt - t, aimRel);
    bodyState(system, target, tt, aimTgt, ctx.central);
    return Math.hypot(aimRel[0] - aimTgt[0], aimRel[1] - aimTgt[1], aimRel[2] - aimTgt[2]) - Rsoi;
  };
  if (!(g(arrive) < 0)) return NaN;
  let lo = arrive - (2 * Rsoi) / vinf;
  let found = false;
  for (let k = 0; k < 40; k++) {
    if (lo <= t) {
      lo = t;
      found = g(lo) > 0;
      break;
    }
    if (g(lo) > 0) {
      found = true;
      break;
    }
    lo = arrive - 2 * (arrive - lo);
  }
  if (!found) return NaN;
  const te = brent(g, lo, arrive, { tol: 1e-6 });
  propagateKepler(muC, aimShip, te - t, aimRel);
  bodyState(system, target, te, aimTgt, ctx.central);
  for (let i = 0; i < 6; i++) aimRel[i] -= aimTgt[i];
  return te;
}

/** Periapsis radius about the target of the arc, patched at the SOI entry (NaN when none). */
function predictedPeriapsis(
  ctx: SolveContext,
  target: number,
  sol: LambertSolution,
  muC: number,
  Rsoi: number,
  arrive: number,
  muT: number,
  vinf: number,
): number {
  if (!Number.isFinite(predictedEntry(ctx, target, sol, muC, Rsoi, arrive, vinf))) return NaN;
  const c = conicInfo(muT, aimRel, ci);
  if (!(c.rv < 0)) return NaN;
  return c.rp;
}

const fbBody6 = new Float64Array(6);
const fbNext3 = new Float64Array(3);

/** Fixed-point iteration of a flyby aim (see the module comment). */
function aimForFlyby(
  ctx: SolveContext,
  target: number,
  tof: number,
  flyby: { next: string; arrive: number; powered?: boolean },
  centreSol: LambertSolution,
  lambert: (aim: ArrayLike<number>) => LambertSolution,
  info?: SolveInfo,
): LambertSolution {
  const { system, central, t } = ctx;
  const tb = system.bodies[target];
  const muT = tb.mu;
  const Rsoi = tb.derived.soiRadius;
  const muC = system.bodies[central].mu;
  const arrive = t + tof;
  const next = findBodyIndex(system, flyby.next);
  if (next < 0) fail(`unknown body after the flyby "${flyby.next}"`);
  if (system.bodies[next].parentIndex !== central || next === target) {
    fail(`the body after the flyby (${system.bodies[next].name}) must orbit ${system.bodies[central].name} like ${tb.name}`);
  }
  const rpMin = tb.radius + tb.safeAlt;
  const ax = [0, 0, 0];
  let sol = centreSol;
  let iter = 0;
  let result: FlybyAim | null = null;
  const vin = [0, 0, 0];
  const vout = [0, 0, 0];
  for (;;) {
    const vinfGuess = Math.hypot(sol.v2[0] - tgt6[3], sol.v2[1] - tgt6[4], sol.v2[2] - tgt6[5]);
    const te = predictedEntry(ctx, target, sol, muC, Rsoi, arrive, vinfGuess);
    if (!Number.isFinite(te)) fail(`the arc aimed at ${tb.name} does not enter its sphere of influence`);
    const c = conicInfo(muT, aimRel, ci);
    if (!(c.e > 1) || !(c.rv < 0)) fail(`the approach to ${tb.name} is not an incoming hyperbola`);
    const vinf = Math.sqrt(-muT * c.alpha);
    const e = c.e;
    const sq = Math.sqrt(e * e - 1) / e;
    // incoming asymptote Ŝ = P/e + √(e² − 1)/e·Q
    const Sx = c.P[0] / e + sq * c.Q[0],
      Sy = c.P[1] / e + sq * c.Q[1],
      Sz = c.P[2] / e + sq * c.Q[2];
    vin[0] = vinf * Sx;
    vin[1] = vinf * Sy;
    vin[2] = vinf * Sz;
    const tp = te - c.M / c.n;
    // the next leg: Lambert from the flyby body at the periapsis time to `next`
    bodyState(system, target, tp, fbBody6, central);
    bodyPosition(system, next, flyby.arrive, fbNext3, central);
    if (!(flyby.arrive > tp)) fail(`the arrival at ${system.bodies[next].name} is not after the flyby`);
    let sols: LambertSolution[];
    try {
      sols = solveLambert(muC, [fbBody6[0], fbBody6[1], fbBody6[2]], fbNext3, flyby.arrive - tp, { revs: 0 });
    } catch (err) {
      fail(`Lambert arc from ${tb.name} to ${system.bodies[next].name} not found: ${(err as Error).message}`);
    }
    const out = pickLambert(sols, 0, fbBody6[3], fbBody6[4], fbBody6[5]);
    if (!out) fail(`no Lambert arc from ${tb.name} to ${system.bodies[next].name}`);
    vout[0] = out.v1[0] - fbBody6[3];
    vout[1] = out.v1[1] - fbBody6[4];
    vout[2] = out.v1[2] - fbBody6[5];
    const pf = flyby.powered === false ? unpoweredFlybyMatch(muT, vin, vout, rpMin) : poweredFlyby(muT, vin, vout, rpMin);
    if (!Number.isFinite(pf.rp)) fail(`no turn is needed at ${tb.name}: aim a direct transfer instead`);
    // wanted B on T = Ŝ × ẑ normalised, R = Ŝ × T
    const fr = bPlaneFrame(Sx, Sy, Sz, frameScratch);
    const Tx = fr[0],
      Ty = fr[1],
      Tz = fr[2],
      Rx = fr[3],
      Ry = fr[4],
      Rz = fr[5];
    const Bw = pf.rp * Math.sqrt(1 + (2 * muT) / (pf.rp * vinf * vinf));
    const cb = Math.cos(pf.bAngle),
      sb = Math.sin(pf.bAngle);
    const bwx = Bw * (cb * Tx + sb * Rx),
      bwy = Bw * (cb * Ty + sb * Ry),
      bwz = Bw * (cb * Tz + sb * Rz);
    // got: B = Ŝ × h / v∞
    const bgx = (Sy * c.hz - Sz * c.hy) / vinf,
      bgy = (Sz * c.hx - Sx * c.hz) / vinf,
      bgz = (Sx * c.hy - Sy * c.hx) / vinf;
    const dx = bwx - bgx,
      dy = bwy - bgy,
      dz = bwz - bgz;
    const bErr = Math.hypot(dx, dy, dz);
    result = {
      rpWanted: pf.rp,
      rpPredicted: c.rp,
      tPeriapsis: tp,
      bAngle: pf.bAngle,
      b: Bw,
      vInfIn: [vin[0], vin[1], vin[2]],
      vInfOut: [vout[0], vout[1], vout[2]],
      dvPeriapsis: pf.dvPeriapsis,
      dvExtra: pf.dvExtra,
      limited: pf.limited,
      bError: bErr,
    };
    iter++;
    if (bErr < TRANSFER_AIM_TOL || iter >= TRANSFER_AIM_ITERATIONS) break;
    ax[0] += dx;
    ax[1] += dy;
    ax[2] += dz;
    if (!(Math.hypot(ax[0], ax[1], ax[2]) < Rsoi)) fail(`the flyby aim point lies outside ${tb.name}'s sphere of influence`);
    sol = lambert([tgt6[0] + ax[0], tgt6[1] + ax[1], tgt6[2] + ax[2]]);
  }
  if (info) {
    info.vInf = [sol.v2[0] - tgt6[3], sol.v2[1] - tgt6[4], sol.v2[2] - tgt6[5]];
    info.predictedPeriapsis = result.rpPredicted;
    info.iterations = iter;
    info.flyby = result;
  }
  return sol;
}

/**
 * Hyperbolic departure from the current point: the velocity v+ at position r (relative to the
 * body of gravitational parameter μ) whose hyperbola has excess velocity exactly vInf, written
 * into out. Derivation (this module): the orbit plane must contain r and v̂∞. With θ the angle
 * from r̂ to v̂∞ in the sense of motion, ν∞ = acos(−1/e) the true anomaly of the asymptote and
 * ν0 = ν∞ − θ the anomaly of the current point, the conic equation r = p/(1 + e cos ν0) with
 * p = μ(e² − 1)/v∞² becomes, for s = √(e² − 1) and k = r v∞²/μ,
 *   s² − k·sin θ·s − k·(1 − cos θ) = 0,   s = (k sin θ + √(k² sin²θ + 4k(1 − cos θ)))/2.
 * Then h = √(μp), v_r = (μ/h)·e·sin ν0, v_t = h/r. Both senses of motion in that plane are
 * solutions; the one nearer the current velocity (smaller burn) is taken. At the ideal point
 * (ν0 = 0, θ = ν∞) the burn is tangential with |v+| = √(v∞² + 2μ/r) (Curtis, eq. 8.42 — from
 * memory). Limits: v̂∞ parallel to r (no plane) throws; the asymptote reached is that of the
 * two-body hyperbola — the ship leaves the SOI at a finite radius, so the heliocentric
 * velocity after the SOI exit differs from the Lambert v1 (a mid-course burn corrects this).
 */
export function hyperbolicDeparture(mu: number, state: ArrayLike<number>, vInf: ArrayLike<number>, out: Vec3): Vec3 {
  const rx = state[0],
    ry = state[1],
    rz = state[2];
  const r = Math.hypot(rx, ry, rz);
  const vi = Math.hypot(vInf[0], vInf[1], vInf[2]);
  if (!(vi > 0)) fail('zero excess velocity: nothing to depart on');
  const ux = vInf[0] / vi,
    uy = vInf[1] / vi,
    uz = vInf[2] / vi;
  const rhx = rx / r,
    rhy = ry / r,
    rhz = rz / r;
  // w = r̂ × û
  let wx = rhy * uz - rhz * uy;
  let wy = rhz * ux - rhx * uz;
  let wz = rhx * uy - rhy * ux;
  const sinT = Math.hypot(wx, wy, wz);
  const cosT = rhx * ux + rhy * uy + rhz * uz;
  if (!(sinT > 1e-12)) fail('the departure asymptote is parallel to the position vector: no departure plane');
  wx /= sinT;
  wy /= sinT;
  wz /= sinT;
  const theta1 = Math.atan2(sinT, cosT); // in (0, π) about +w
  const k = (r * vi * vi) / mu;
  let best = Infinity;
  for (let sense = 0; sense < 2; sense++) {
    const th = sense === 0 ? theta1 : 2 * Math.PI - theta1;
    const hx = sense === 0 ? wx : -wx,
      hy = sense === 0 ? wy : -wy,
      hz = sense === 0 ? wz : -wz;
    const st = Math.sin(th);
    const oneMinusCos = 2 * Math.sin(0.5 * th) ** 2;
    const s = 0.5 * (k * st + Math.sqrt(k * k * st * st + 4 * k * oneMinusCos));
    const e = Math.sqrt(1 + s * s);
    const p = (mu * s * s) / (vi * vi);
    const h = Math.sqrt(mu * p);
    const nuInf = Math.acos(-1 / e);
    const nu0 = nuInf - th;
    const vr = (mu / h) * e * Math.sin(nu0);
    const vt = h / r;
    // t̂ = ĥ × r̂
    const tx = hy * rhz - hz * rhy;
    const ty = hz * rhx - hx * rhz;
    const tz = hx * rhy - hy * rhx;
    const vx = vr * rhx + vt * tx,
      vy = vr * rhy + vt * ty,
      vz = vr * rhz + vt * tz;
    const cost = Math.hypot(vx - state[3], vy - state[4], vz - state[5]);
    if (cost < best && Number.isFinite(cost)) {
      best = cost;
      out[0] = vx;
      out[1] = vy;
      out[2] = vz;
    }
  }
  if (!Number.isFinite(best)) fail('departure hyperbola not finite', { r, vInf: vi });
  return out;
}

/** Negative discriminants of a capture down to this size are rounding (a flight-path angle of 1e-6 rad). */
export const DISC_ROUNDING = 1e-12;

/** 'capture': along ±V, the speed giving eccentricity e (see the module comment). */
export function solveCapture(mu: number, state: ArrayLike<number>, e: number, out: Vec3): Vec3 {
  const c = conicInfo(mu, state, ci);
  const r = c.r,
    v = c.v;
  const cos2 = (c.h / (r * v)) ** 2; // cos² of the flight-path angle
  let disc = 1 - (1 - e * e) / cos2;
  // at an apsis found numerically cos² rounds just below 1 and a circular capture's disc to −1e-16:
  // a flight-path angle below 1e-6 rad counts as zero (the orbit then comes out with e below 1e-6)
  if (disc < 0 && disc > -DISC_ROUNDING) disc = 0;
  if (!(disc >= 0)) fail(`eccentricity ${e} cannot be reached by a burn along the velocity here (flight-path angle too steep)`);
  const sq = Math.sqrt(disc);
  const u1 = (mu / r) * (1 + sq);
  const u2 = (mu / r) * (1 - sq);
  const s1 = Math.sqrt(u1);
  const s2 = Math.sqrt(Math.max(0, u2));
  const s = Math.abs(s1 - v) <= Math.abs(s2 - v) ? s1 : s2;
  const k = (s - v) / v;
  out[0] = state[3] * k;
  out[1] = state[4] * k;
  out[2] = state[5] * k;
  return out;
}

/** 'plane': rotate v about r̂ by the smallest angle giving inclination i (see the module comment). */
export function solvePlane(state: ArrayLike<number>, inc: number, out: Vec3): Vec3 {
  const rx = state[0],
    ry = state[1],
    rz = state[2];
  const vx = state[3],
    vy = state[4],
    vz = state[5];
  const r = Math.hypot(rx, ry, rz);
  const ux = rx / r,
    uy = ry / r,
    uz = rz / r;
  const hx = ry * vz - rz * vy,
    hy = rz * vx - rx * vz,
    hz = rx * vy - ry * vx;
  const h = Math.hypot(hx, hy, hz);
  if (!(h > 0)) fail('rectilinear orbit: no orbit plane to rotate');
  // z components of h and r̂ × h
  const A = hz;
  const B = ux * hy - uy * hx;
  const C = h * Math.cos(inc);
  const Rm = Math.hypot(A, B);
  if (!(Math.abs(C) <= Rm * (1 + 1e-12))) {
    fail(`inclination ${(inc * 180) / Math.PI}° cannot be reached by rotating about the radius here (latitude too high; burn at a node)`);
  }
  const phi0 = Math.atan2(B, A);
  const dphi = Math.acos(Math.max(-1, Math.min(1, C / Rm)));
  const wrap = (x: number): number => x - 2 * Math.PI * Math.round(x / (2 * Math.PI));
  const pa = wrap(phi0 + dphi);
  const pb = wrap(phi0 - dphi);
  const phi = Math.abs(pa) <= Math.abs(pb) ? pa : pb;
  const cp = Math.cos(phi),
    sp = Math.sin(phi);
  // Rodrigues: v' = v cos φ + (û × v) sin φ + û (û·v)(1 − cos φ)
  const cx = uy * vz - uz * vy,
    cy = uz * vx - ux * vz,
    cz = ux * vy - uy * vx;
  const ud = ux * vx + uy * vy + uz * vz;
  const omc = 2 * Math.sin(0.5 * phi) ** 2;
  out[0] = vx * (cp - 1) + cx * sp + ux * ud * omc;
  out[1] = vy * (cp - 1) + cy * sp + uy * ud * omc;
  out[2] = vz * (cp - 1) + cz * sp + uz * ud * omc;
  return out;
}

/** 'apsis': along ±V, the speed putting the opposite apsis at radius R (see the module comment). */
export function solveApsis(mu: number, state: ArrayLike<number>, R: number, out: Vec3): Vec3 {
  const r = Math.hypot(state[0], state[1], state[2]);
  const v = Math.hypot(state[3], state[4], state[5]);
  if (!(R > 0)) fail('apsis altitude puts the apsis below the centre of the body');
  const a = 0.5 * (r + R);
  const u = mu * (2 / r - 1 / a);
  if (!(u > 0) || !(v > 0)) fail('no orbit through this point reaches that apsis');
  const k = (Math.sqrt(u) - v) / v;
  out[0] = state[3] * k;
  out[1] = state[4] * k;
  out[2] = state[5] * k;
  return out;
}
