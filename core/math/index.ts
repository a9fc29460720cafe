/**
 * Front door of core/math. Math: error types, 3-vectors, VNB/RTN frames, root finding, small linear algebra, seeded random numbers.
 * Other folders of core/ and the app import from here only.
 */
export { InputError, SolverError, ValidationError, WaymarkError, requireFinite, requireFiniteVector, requireNonNegative, requirePositive } from './errors.ts';
export { MAX_LISTED_ISSUES, capIssues, countIssues, formatCount } from './errors.ts';
export type { ValidationIssue } from './errors.ts';
export { inertialToRtn, inertialToVnb, perifocalToInertial, rtnMatrix, rtnToInertial, vnbToInertial } from './frames.ts';
export { dampedLeastSquares } from './linalg.ts';
export { stream } from './random.ts';
export type { Seed } from './random.ts';
export { brent } from './roots.ts';
export type { Vec3, Vec3Like } from './vec3.ts';
export { minimize } from './roots.ts';
export type { MinimumResult } from './roots.ts';
