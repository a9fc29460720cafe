/**
 * Surface ⇄ low orbit: the Δv map's rule of thumb for climbing from a body's surface to its low
 * orbit and coming back down, with the losses stated (common practice, not a flight simulation).
 *
 * Low orbit (a rule of the product): circular at the body's minimum safe altitude + LOW_ORBIT_MARGIN.
 *
 * Ascent (surface → low orbit):
 *  - ideal: a two-burn climb from rest on the surface (non-rotating axes) on the ellipse whose
 *    periapsis is the surface radius R and apoapsis the low-orbit radius r: the vis-viva speed
 *    at R on that ellipse, then the circularising burn at r (vis-viva; Curtis, Orbital Mechanics
 *    for Engineering Students, section 6.3, the Hohmann construction with one end at the surface);
 *  - minus the equatorial rotation speed 2πR/|P| (a prograde equatorial launch; 0 without a
 *    rotation period);
 *  - plus losses as fractions of the circular speed at the surface √(μ/R): with air, gravity
 *    loss 20 % and drag loss 3 %; airless, gravity loss 4 % and no drag. Common practice (from
 *    memory): about 1.5–2 km/s of losses on the way to low Earth orbit, whose total is usually
 *    quoted as about 9.3–10 km/s; a lunar ascent of about 1.85 km/s. The fractions put an
 *    Earth-like body and a Moon-like body inside those figures (test/core/survey/ascent.test.ts).
 *
 * Landing (low orbit → surface): a powered landing costs the same as the ascent (the rule is
 * taken symmetric). With air the body is landed by aerobraking instead (`aero`): a deorbit burn
 * at the low orbit lowering the periapsis to half the atmosphere's height (vis-viva), plus a
 * terminal landing allowance of 2 % of √(μ/R) (parachutes and a last burn; common practice).
 */
import type { Body } from '../system/index.ts';

/** Low orbit = minimum safe altitude + this margin, m (a rule of the product). */
export const LOW_ORBIT_MARGIN = 10e3;

/** Loss fractions of the circular speed at the surface radius (common practice; see the file comment). */
export const GRAVITY_LOSS_AIR = 0.2;
export const DRAG_LOSS_AIR = 0.03;
export const GRAVITY_LOSS_AIRLESS = 0.04;
/** Terminal allowance of an aerobraked landing, fraction of √(μ/R). */
export const AERO_LANDING_ALLOWANCE = 0.02;

/** Altitude of the body's low orbit above its mean radius, m: minimum safe altitude + LOW_ORBIT_MARGIN. */
export function lowOrbitAltitude(body: Body): number {
  return body.safeAlt + LOW_ORBIT_MARGIN;
}

export interface AscentFigures {
  /** Low-orbit altitude above the mean radius, m. */
  altitude: number;
  /** Two-burn vis-viva climb from rest on the surface to the circular low orbit, m/s. */
  ideal: number;
  /** Equatorial rotation speed subtracted (prograde launch), m/s (0 without a rotation period). */
  rotation: number;
  /** Gravity and drag losses added, m/s. */
  gravityLoss: number;
  dragLoss: number;
  /** ideal − rotation + gravityLoss + dragLoss, m/s. */
  total: number;
  /** Aerobraked landing (deorbit burn + terminal allowance), m/s; null for an airless body. */
  aeroLanding: number | null;
  /** The deorbit burn part of aeroLanding, m/s; null for an airless body. */
  deorbit: number | null;
}

/** Speed at radius r on the orbit of semi-major axis a: vis-viva v² = μ(2/r − 1/a). */
function visViva(mu: number, r: number, a: number): number {
  return Math.sqrt(mu * (2 / r - 1 / a));
}

/**
 * Burn at the apoapsis of a circular orbit of radius rHigh that lowers the periapsis to rLow
 * (or, reversed, raises it back): √(μ/rHigh) − v_apo of the ellipse rLow × rHigh (vis-viva).
 * 0 when rLow ≥ rHigh.
 */
export function apoapsisBurn(mu: number, rHigh: number, rLow: number): number {
  if (!(rLow < rHigh)) return 0;
  return Math.sqrt(mu / rHigh) - visViva(mu, rHigh, (rHigh + rLow) / 2);
}

/** The ascent and landing figures of a body by the rule of the file comment. */
export function ascentFigures(body: Body): AscentFigures {
  const mu = body.mu;
  const R = body.radius;
  const altitude = lowOrbitAltitude(body);
  const r = R + altitude;
  const a = (R + r) / 2;
  const ideal = visViva(mu, R, a) + (Math.sqrt(mu / r) - visViva(mu, r, a));
  const rotation = body.rotationPeriod === null ? 0 : (2 * Math.PI * R) / Math.abs(body.rotationPeriod);
  const vSurface = Math.sqrt(mu / R);
  const air = body.atmosphereHeight > 0;
  const gravityLoss = (air ? GRAVITY_LOSS_AIR : GRAVITY_LOSS_AIRLESS) * vSurface;
  const dragLoss = air ? DRAG_LOSS_AIR * vSurface : 0;
  const deorbit = air ? apoapsisBurn(mu, r, R + body.atmosphereHeight / 2) : null;
  return {
    altitude,
    ideal,
    rotation,
    gravityLoss,
    dragLoss,
    total: ideal - rotation + gravityLoss + dragLoss,
    aeroLanding: deorbit === null ? null : deorbit + AERO_LANDING_ALLOWANCE * vSurface,
    deorbit,
  };
}

/** The rule in words, for the map's footnotes. */
export const ASCENT_RULES: readonly string[] = [
  `Low orbit: circular at the body's minimum safe altitude + ${LOW_ORBIT_MARGIN / 1000} km.`,
  `Ascent: two-burn vis-viva climb from rest on the surface to the low orbit, minus the equatorial rotation speed 2πR/P (prograde launch), plus losses as fractions of the circular speed at the surface: with air gravity ${GRAVITY_LOSS_AIR * 100} % and drag ${DRAG_LOSS_AIR * 100} %, airless gravity ${GRAVITY_LOSS_AIRLESS * 100} % (rule of thumb).`,
  `Landing: powered, the same as the ascent; with air, aerobraked: a deorbit burn lowering the periapsis to half the atmosphere's height plus ${AERO_LANDING_ALLOWANCE * 100} % of the circular speed at the surface for the last descent.`,
];
