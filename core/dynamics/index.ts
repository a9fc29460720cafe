/**
 * Front door of core/dynamics. The ship force model: the one model of the ship's motion (restricted n-body on the conic ephemerides, or two-body about the origin body; thrust with a falling mass) used by every flight that is not an analytic conic: n-body verification, correction and dispersion, the game-step reference, finite burns.
 * Other folders of core/ and the app import from here only.
 */
export { ShipForces } from './shipForces.ts';
export type { ShipForcesOptions, ShipGravity, ThrustPhase, Vec3Tuple } from './shipForces.ts';
