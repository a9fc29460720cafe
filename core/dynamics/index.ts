/**
 * Front door of core/dynamics. The ship force model: the one model of the ship's motion used by every flight that is not patched-conic (n-body verification, correction, dispersion, the game-step reference, finite burns).
 * Other folders of core/ and the app import from here only.
 */
export { DEFAULT_ATOL_FACTOR, DEFAULT_NBODY_RTOL, NBodyModel } from './shipForces.ts';
export type { NBodyModelOptions, NBodyState, ThrustPhase, Vec3Tuple } from './shipForces.ts';
