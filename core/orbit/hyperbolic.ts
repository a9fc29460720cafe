/**
 * Patched-conic departure from and arrival at a body: the hyperbola whose excess velocity is
 * v∞, joined at its periapsis to a parking orbit or a target orbit by one tangential burn
 * (Curtis, Orbital Mechanics for Engineering Students, sections 8.7–8.9; Bate, Mueller & White,
 * Fundamentals of Astrodynamics, chapter 7).
 *
 * Periapsis speed on the hyperbola v_p = √(v∞² + 2μ/r_p) (vis-viva with a = −μ/v∞²);
 * eccentricity e = 1 + r_p v∞²/μ; the asymptote makes the angle β = acos(1/e) with the apse
 * line; a flyby turns v∞ by δ = 2 asin(1/e).
 *
 * Burns are tangential at periapsis and given as positive magnitudes (departure speeds up,
 * capture slows down). Declination and right ascension of the outgoing asymptote are taken in
 * the frame of the given vector: the xy-plane is the body's equator, x the reference direction.
 * With v∞ = 0 the asymptote has no direction: declination and right ascension are returned as 0.
 */
import { InputError, requireFiniteVector, requireNonNegative, requirePositive } from '../math/index.ts';

export interface DepartureInput {
  /** Gravitational parameter of the departure body (m³/s²). */
  mu: number;
  /** Parking-orbit radius at periapsis, where the burn is made (m). */
  rPark: number;
  /** Parking-orbit eccentricity, default 0 (circular); elliptic orbits burn at periapsis. */
  ePark?: number;
  /** Departure excess velocity, body-relative, in the body's equatorial axes (m/s). */
  vInf: ArrayLike<number>;
}

export interface Departure {
  /** |v∞| (m/s). */
  vInfMag: number;
  /** Characteristic energy C3 = v∞² (m²/s²). */
  c3: number;
  /** Departure burn v_p − v_park (m/s, positive). */
  dv: number;
  /** Periapsis speed on the departure hyperbola (m/s). */
  vPeriapsis: number;
  /** Parking-orbit speed at periapsis (m/s). */
  vPark: number;
  /** Eccentricity of the departure hyperbola. */
  eHyperbola: number;
  /** Angle between the hyperbola's apse line and its outgoing asymptote, acos(1/e) (rad). */
  beta: number;
  /** Declination of the outgoing asymptote from the equator, in [−π/2, π/2] (rad). */
  declination: number;
  /** Right ascension of the outgoing asymptote, in [0, 2π) (rad). */
  rightAscension: number;
}

/**
 * Speed at periapsis r_p of the hyperbola with excess speed² v∞² (= C3): √(v∞² + 2μ/r_p)
 * (vis-viva with a = −μ/v∞²). No input checks and no allocation: the porkchop's inner loop
 * calls it per cell.
 */
export function hyperbolaPeriapsisSpeed(mu: number, vInf2: number, rp: number): number {
  return Math.sqrt(vInf2 + (2 * mu) / rp);
}

/** Speed at periapsis r_p of a closed orbit of eccentricity e: √(μ(1 + e)/r_p) (vis-viva). No input checks. */
export function orbitPeriapsisSpeed(mu: number, rp: number, e: number): number {
  return Math.sqrt((mu * (1 + e)) / rp);
}

/** Eccentricity of the hyperbola with excess speed² v∞² and periapsis r_p: 1 + r_p v∞²/μ. */
function hyperbolaEccentricity(mu: number, vInf2: number, rp: number): number {
  return 1 + (rp * vInf2) / mu;
}

function parkSpeed(mu: number, rp: number, e: number, field: string): number {
  requireNonNegative(field, e);
  if (!(e < 1)) throw new InputError(field, 'must be < 1 (closed orbit)', e);
  return orbitPeriapsisSpeed(mu, rp, e);
}

/** Departure burn from a parking orbit onto the hyperbola with excess velocity vInf. */
export function departure(input: DepartureInput): Departure {
  if (input === null || typeof input !== 'object') throw new InputError('input', 'must be an object', input);
  const { mu, rPark, vInf } = input;
  const ePark = input.ePark ?? 0;
  requirePositive('mu', mu);
  requirePositive('rPark', rPark);
  requireFiniteVector('vInf', vInf);
  const vPark = parkSpeed(mu, rPark, ePark, 'ePark');
  const vx = vInf[0];
  const vy = vInf[1];
  const vz = vInf[2];
  const c3 = vx * vx + vy * vy + vz * vz;
  const vInfMag = Math.sqrt(c3);
  const vPeriapsis = hyperbolaPeriapsisSpeed(mu, c3, rPark);
  const eHyperbola = hyperbolaEccentricity(mu, c3, rPark);
  let declination = 0;
  let rightAscension = 0;
  if (vInfMag > 0) {
    declination = Math.atan2(vz, Math.hypot(vx, vy));
    rightAscension = Math.atan2(vy, vx);
    if (rightAscension < 0) rightAscension += 2 * Math.PI;
    if (rightAscension >= 2 * Math.PI) rightAscension = 0;
  }
  return {
    vInfMag,
    c3,
    dv: vPeriapsis - vPark,
    vPeriapsis,
    vPark,
    eHyperbola,
    beta: Math.acos(1 / eHyperbola),
    declination,
    rightAscension,
  };
}

export interface ArrivalInput {
  /** Gravitational parameter of the arrival body (m³/s²). */
  mu: number;
  /** Arrival excess velocity: a body-relative vector (m/s) or its magnitude. */
  vInf: ArrayLike<number> | number;
  /** Periapsis radius of the approach hyperbola (m). */
  rPeriapsis: number;
  /** Target-orbit eccentricity with its periapsis at rPeriapsis (0 circular, < 1 elliptic), or 'flyby' (no burn). */
  eTarget: number | 'flyby';
}

export interface Arrival {
  /** Capture burn v_p,hyperbola − v_p,target (m/s, positive); 0 for a flyby. */
  dv: number;
  /** Periapsis speed on the approach hyperbola (m/s). */
  vPeriapsisHyperbola: number;
  /** Periapsis speed on the target orbit (m/s); the hyperbola's own for a flyby. */
  vPeriapsisTarget: number;
  /** Eccentricity of the approach hyperbola. */
  eHyperbola: number;
  /** Flyby only: the turn of v∞, 2 asin(1/e) (rad). */
  turnAngle?: number;
}

function vInfMagnitude(v: ArrayLike<number> | number): number {
  if (typeof v === 'number') {
    requireNonNegative('vInf', v);
    return v;
  }
  requireFiniteVector('vInf', v);
  return Math.hypot(v[0], v[1], v[2]);
}

/** Arrival at periapsis rPeriapsis: capture burn into the target orbit, or a flyby. */
export function arrival(input: ArrivalInput): Arrival {
  if (input === null || typeof input !== 'object') throw new InputError('input', 'must be an object', input);
  const { mu, rPeriapsis, eTarget } = input;
  requirePositive('mu', mu);
  requirePositive('rPeriapsis', rPeriapsis);
  const vInf = vInfMagnitude(input.vInf);
  const vPeriapsisHyperbola = hyperbolaPeriapsisSpeed(mu, vInf * vInf, rPeriapsis);
  const eHyperbola = hyperbolaEccentricity(mu, vInf * vInf, rPeriapsis);
  if (eTarget === 'flyby') {
    return { dv: 0, vPeriapsisHyperbola, vPeriapsisTarget: vPeriapsisHyperbola, eHyperbola, turnAngle: 2 * Math.asin(1 / eHyperbola) };
  }
  if (typeof eTarget !== 'number') throw new InputError('eTarget', "must be a number in [0, 1) or 'flyby'", eTarget);
  const vPeriapsisTarget = parkSpeed(mu, rPeriapsis, eTarget, 'eTarget');
  return { dv: vPeriapsisHyperbola - vPeriapsisTarget, vPeriapsisHyperbola, vPeriapsisTarget, eHyperbola };
}

/** Turn angle δ = 2 asin(1/e), e = 1 + r_p v∞²/μ, of a flyby with periapsis rPeriapsis (rad). */
export function flyby(mu: number, vInfMag: number, rPeriapsis: number): number {
  requirePositive('mu', mu);
  requireNonNegative('vInfMag', vInfMag);
  requirePositive('rPeriapsis', rPeriapsis);
  const e = hyperbolaEccentricity(mu, vInfMag * vInfMag, rPeriapsis);
  return 2 * Math.asin(1 / e);
}
