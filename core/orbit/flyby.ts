/**
 * Flyby (gravity-assist) geometry in patched conics: the hyperbola about the flyby body turns
 * the excess velocity v∞ by δ = 2·asin(1/e), e = 1 + r_p·v∞²/μ, keeping |v∞| (unpowered); a
 * tangential burn at periapsis joins an incoming and an outgoing hyperbola of different v∞ that
 * share the periapsis (powered flyby: the turn is asin(1/e_in) + asin(1/e_out)).
 * Sources: Curtis, Orbital Mechanics for Engineering Students, §8.9 "Planetary flyby";
 * Bate, Mueller & White, Fundamentals of Astrodynamics, chapter 7; powered flyby as the two
 * hyperbolas joined at periapsis (Prussing & Conway, Orbital Mechanics, chapter on gravity
 * assist, from memory).
 *
 * B-plane convention (as core/nbody/bPlane.ts): Ŝ = v∞ in / |v∞ in|, T = Ŝ × ẑ normalised,
 * R = Ŝ × T; the B-plane angle θ is measured from T toward R, B̂ = cos θ·T + sin θ·R. The
 * hyperbola bends v∞ toward the body, i.e. toward −B̂: v∞ out = v∞ (cos δ·Ŝ − sin δ·B̂).
 * When Ŝ is along ±ẑ, T is taken as x̂ (any axis in the B-plane would do).
 *
 * Hot loops (core/search/sequence.ts) use flybyCostInto, which allocates nothing.
 */
import { InputError, requireFiniteVector, requireNonNegative, requirePositive } from '../math/index.ts';
import { bPlaneFrame } from './bPlaneFrame.ts';

/** Turning angle of a hyperbola: δ = 2·asin(1/e), e = 1 + r_p·v∞²/μ (Curtis §8.9). */
export function flybyTurnAngle(mu: number, rp: number, vInf: number): number {
  requirePositive('mu', mu);
  requirePositive('rp', rp);
  requireNonNegative('vInf', vInf);
  return 2 * Math.asin(1 / (1 + (rp * vInf * vInf) / mu));
}

// T and R axes of the B-plane of the unit vector Ŝ (bPlaneFrame.ts), written by bPlaneFrame.
const AX = new Float64Array(6);

/**
 * Unpowered flyby: v∞ out = v∞ in rotated by δ(r_p) in the plane of the hyperbola; the B-plane
 * angle θ (rad) is measured from T toward R (T = Ŝ×ẑ normalised, R = Ŝ×T, as core/nbody/bPlane.ts).
 * Writes v∞ out (3 components) into `out`. Curtis §8.9.
 */
export function unpoweredFlyby(mu: number, vInfIn: ArrayLike<number>, rp: number, bAngle: number, out: Float64Array | number[]): void {
  requirePositive('mu', mu);
  requirePositive('rp', rp);
  requireFiniteVector('vInfIn', vInfIn);
  if (!Number.isFinite(bAngle)) throw new InputError('bAngle', 'must be a finite number', bAngle);
  const v = Math.sqrt(vInfIn[0] * vInfIn[0] + vInfIn[1] * vInfIn[1] + vInfIn[2] * vInfIn[2]);
  if (!(v > 0)) throw new InputError('vInfIn', 'must be a non-zero vector', v);
  const sx = vInfIn[0] / v;
  const sy = vInfIn[1] / v;
  const sz = vInfIn[2] / v;
  bPlaneFrame(sx, sy, sz, AX);
  const c = Math.cos(bAngle);
  const s = Math.sin(bAngle);
  const bx = c * AX[0] + s * AX[3];
  const by = c * AX[1] + s * AX[4];
  const bz = c * AX[2] + s * AX[5];
  const d = 2 * Math.asin(1 / (1 + (rp * v * v) / mu));
  const cd = Math.cos(d) * v;
  const sd = Math.sin(d) * v;
  out[0] = cd * sx - sd * bx;
  out[1] = cd * sy - sd * by;
  out[2] = cd * sz - sd * bz;
}

export interface PoweredFlyby {
  /** Periapsis radius that turns v∞ in into the direction of v∞ out (both hyperbolas sharing the periapsis), m. */
  rp: number;
  /** Tangential Δv at periapsis |v_p,out − v_p,in|, m/s (0 when |v∞ in| = |v∞ out| and the turn is reachable). */
  dvPeriapsis: number;
  /** B-plane angle of the incoming hyperbola that gives this turn, rad (T → R). */
  bAngle: number;
  /** Turn asked for (angle between v∞ in and v∞ out), rad. */
  turn: number;
  /** Largest turn reachable at rpMin with these speeds, rad. */
  maxTurn: number;
  /** True when rp < rpMin was needed: then rp = rpMin and the rest is paid by `dvExtra`. */
  limited: boolean;
  /** Extra Δv when limited: |v∞ out wanted − v∞ out reached| (paid as a burn at the SOI exit; an upper bound), m/s. */
  dvExtra: number;
  /** dvPeriapsis + dvExtra. */
  dvTotal: number;
  /** |v∞ out − v∞ in| (vector difference), the heliocentric velocity change the pass gives, m/s. */
  freeDv: number;
}

/** Slots of flybyCostInto's output. */
export const FLYBY_RP = 0;
export const FLYBY_DV_PERIAPSIS = 1;
export const FLYBY_TURN = 2;
export const FLYBY_MAX_TURN = 3;
export const FLYBY_LIMITED = 4;
export const FLYBY_DV_EXTRA = 5;
export const FLYBY_DV_TOTAL = 6;
export const FLYBY_FREE_DV = 7;
/** Length of flybyCostInto's output. */
export const FLYBY_SLOTS = 8;

/**
 * Periapsis radius at which the two hyperbolas (speeds² a·μ and b·μ, i.e. a = v∞in²/μ,
 * b = v∞out²/μ) turn by `turn`: the root of asin(1/(1+a r)) + asin(1/(1+b r)) = turn
 * (0 < turn < π). Newton's method from the lower bound r₀ = (1/sin(turn/2) − 1)/max(a, b): the
 * function is convex and decreasing in r, so the iterates rise monotonically to the root.
 */
function twoHyperbolaRp(a: number, b: number, turn: number): number {
  const m = a > b ? a : b;
  let r = (1 / Math.sin(turn / 2) - 1) / m;
  for (let k = 0; k < 60; k++) {
    const ea = 1 + a * r;
    const eb = 1 + b * r;
    const f = Math.asin(1 / ea) + Math.asin(1 / eb) - turn;
    const df = -a / (ea * Math.sqrt(ea * ea - 1)) - b / (eb * Math.sqrt(eb * eb - 1));
    const step = f / df;
    r -= step;
    if (!(Math.abs(step) > 1e-14 * r)) break;
  }
  return r;
}

/**
 * Allocation-free flyby cost for hot loops: v∞ in and v∞ out wanted in vin[0..2], vout[0..2];
 * writes the FLYBY_* slots into out. Powered: a tangential periapsis burn joins the two
 * hyperbolas (rp from the two-hyperbola condition); unpowered: |v∞ out| stays |v∞ in|, rp from
 * δ = 2·asin(1/e), and the whole mismatch is dvExtra. When the turn needs rp < rpMin, the pass
 * is flown at rpMin and the direction error is paid as dvExtra = |v∞ out wanted − reached|.
 * A turn of (nearly) 0 needs rp = +Infinity (no pass); the returned rp is then Infinity.
 * Returns false (slots Infinity) on a zero or non-finite speed. B-plane angle: see poweredFlyby.
 */
export function flybyCostInto(mu: number, vin: ArrayLike<number>, vout: ArrayLike<number>, rpMin: number, powered: boolean, out: Float64Array): boolean {
  // small enough to be inlined into the caller's loop, so mu and rpMin reach FP unboxed
  FP[0] = mu;
  FP[1] = rpMin;
  FP[2] = vin[0];
  FP[3] = vin[1];
  FP[4] = vin[2];
  FP[5] = vout[0];
  FP[6] = vout[1];
  FP[7] = vout[2];
  return flybyCostFromInput(powered, out);
}

// The input of flybyCostInto: μ, rpMin, v∞ in (3), v∞ out (3).
const FP = new Float64Array(8);

function flybyCostFromInput(powered: boolean, out: Float64Array): boolean {
  const mu = FP[0];
  const rpMin = FP[1];
  const ix = FP[2];
  const iy = FP[3];
  const iz = FP[4];
  const ox = FP[5];
  const oy = FP[6];
  const oz = FP[7];
  const vi2 = ix * ix + iy * iy + iz * iz;
  const vo2 = ox * ox + oy * oy + oz * oz;
  const vi = Math.sqrt(vi2);
  const vo = Math.sqrt(vo2);
  if (!(vi > 0 && vo > 0 && vi < Infinity && vo < Infinity)) {
    out.fill(Infinity);
    return false;
  }
  const dx = ox - ix;
  const dy = oy - iy;
  const dz = oz - iz;
  out[FLYBY_FREE_DV] = Math.sqrt(dx * dx + dy * dy + dz * dz);
  let cosT = (ix * ox + iy * oy + iz * oz) / (vi * vo);
  cosT = cosT > 1 ? 1 : cosT < -1 ? -1 : cosT;
  const turn = Math.acos(cosT);
  out[FLYBY_TURN] = turn;
  const a = vi2 / mu;
  // unpowered: the outgoing hyperbola has the incoming speed
  const b = powered ? vo2 / mu : a;
  const vReach = powered ? vo : vi;
  const maxTurn = Math.asin(1 / (1 + a * rpMin)) + Math.asin(1 / (1 + b * rpMin));
  out[FLYBY_MAX_TURN] = maxTurn;
  let rp: number;
  let limited = false;
  let dvExtra: number;
  if (turn > maxTurn) {
    rp = rpMin;
    limited = true;
  } else if (turn > 1e-12) {
    rp = a === b ? (1 / Math.sin(turn / 2) - 1) / a : twoHyperbolaRp(a, b, turn);
    if (rp < rpMin) rp = rpMin;
  } else {
    rp = Infinity;
  }
  if (limited) {
    // reached: speed vReach, direction turned by maxTurn in the plane of v∞ in and v∞ out wanted;
    // |wanted − reached|² by the law of cosines
    const miss = turn - maxTurn;
    dvExtra = Math.sqrt(Math.max(0, vo2 + vReach * vReach - 2 * vo * vReach * Math.cos(miss)));
  } else {
    dvExtra = powered ? 0 : Math.abs(vo - vi);
  }
  let dvP = 0;
  if (powered) {
    dvP = rp < Infinity ? Math.abs(Math.sqrt(vo2 + (2 * mu) / rp) - Math.sqrt(vi2 + (2 * mu) / rp)) : Math.abs(vo - vi);
  }
  out[FLYBY_RP] = rp;
  out[FLYBY_DV_PERIAPSIS] = dvP;
  out[FLYBY_LIMITED] = limited ? 1 : 0;
  out[FLYBY_DV_EXTRA] = dvExtra;
  out[FLYBY_DV_TOTAL] = dvP + dvExtra;
  return true;
}

/**
 * B-plane angle (T → R) of the incoming hyperbola that bends v∞ in toward v∞ out: B̂ is minus the
 * part of v̂ out across Ŝ. 0 when the two are (anti)parallel (no plane defined).
 */
export function flybyBPlaneAngle(vInfIn: ArrayLike<number>, vInfOut: ArrayLike<number>): number {
  const vi = Math.sqrt(vInfIn[0] * vInfIn[0] + vInfIn[1] * vInfIn[1] + vInfIn[2] * vInfIn[2]);
  const vo = Math.sqrt(vInfOut[0] * vInfOut[0] + vInfOut[1] * vInfOut[1] + vInfOut[2] * vInfOut[2]);
  if (!(vi > 0 && vo > 0)) return 0;
  const sx = vInfIn[0] / vi;
  const sy = vInfIn[1] / vi;
  const sz = vInfIn[2] / vi;
  const ux = vInfOut[0] / vo;
  const uy = vInfOut[1] / vo;
  const uz = vInfOut[2] / vo;
  const c = sx * ux + sy * uy + sz * uz;
  const px = -(ux - c * sx);
  const py = -(uy - c * sy);
  const pz = -(uz - c * sz);
  if (!(Math.sqrt(px * px + py * py + pz * pz) > 1e-12)) return 0;
  bPlaneFrame(sx, sy, sz, AX);
  const bt = px * AX[0] + py * AX[1] + pz * AX[2];
  const br = px * AX[3] + py * AX[4] + pz * AX[5];
  const th = Math.atan2(br, bt);
  return th < 0 ? th + 2 * Math.PI : th;
}

const SLOTS = new Float64Array(FLYBY_SLOTS);

function flybyResult(mu: number, vInfIn: ArrayLike<number>, vInfOut: ArrayLike<number>, rpMin: number, powered: boolean): PoweredFlyby {
  requirePositive('mu', mu);
  requirePositive('rpMin', rpMin);
  requireFiniteVector('vInfIn', vInfIn);
  requireFiniteVector('vInfOut', vInfOut);
  if (!flybyCostInto(mu, vInfIn, vInfOut, rpMin, powered, SLOTS)) {
    throw new InputError('vInfIn', 'v∞ in and v∞ out must be non-zero', 0);
  }
  return {
    rp: SLOTS[FLYBY_RP],
    dvPeriapsis: SLOTS[FLYBY_DV_PERIAPSIS],
    bAngle: flybyBPlaneAngle(vInfIn, vInfOut),
    turn: SLOTS[FLYBY_TURN],
    maxTurn: SLOTS[FLYBY_MAX_TURN],
    limited: SLOTS[FLYBY_LIMITED] === 1,
    dvExtra: SLOTS[FLYBY_DV_EXTRA],
    dvTotal: SLOTS[FLYBY_DV_TOTAL],
    freeDv: SLOTS[FLYBY_FREE_DV],
  };
}

/**
 * Powered flyby meeting a wanted v∞ out (Δv at periapsis, tangential), periapsis no lower than
 * rpMin: rp solves asin(1/e_in) + asin(1/e_out) = turn, e = 1 + r_p·v∞²/μ for each hyperbola;
 * Δv = |√(v∞out² + 2μ/r_p) − √(v∞in² + 2μ/r_p)|. A turn of 0 gives rp = Infinity.
 */
export function poweredFlyby(mu: number, vInfIn: ArrayLike<number>, vInfOut: ArrayLike<number>, rpMin: number): PoweredFlyby {
  return flybyResult(mu, vInfIn, vInfOut, rpMin, true);
}

/**
 * Unpowered flyby aimed at a wanted v∞ out: |v∞ out| = |v∞ in|, rp from δ = 2·asin(1/e) (no lower
 * than rpMin); dvPeriapsis is 0 and the whole mismatch (speed and unreachable turn) is dvExtra.
 */
export function unpoweredFlybyMatch(mu: number, vInfIn: ArrayLike<number>, vInfOut: ArrayLike<number>, rpMin: number): PoweredFlyby {
  return flybyResult(mu, vInfIn, vInfOut, rpMin, false);
}
