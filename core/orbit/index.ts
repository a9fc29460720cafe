/**
 * Front door of core/orbit. Two-body orbits: anomalies, elements <-> state, Stumpff functions, universal-variable Kepler, Lambert, Hohmann, bi-elliptic, synodic period, sphere of influence, hyperbolic departure and arrival, flyby geometry (unpowered and powered) and the B-plane axes.
 * Other folders of core/ and the app import from here only.
 */
export { eccentricToMean, hyperbolicToMean, solveEllipticKepler, trueToEccentric, trueToHyperbolic } from './anomaly.ts';
export { bielliptic } from './bielliptic.ts';
export { elementsToState, stateToElements } from './elements.ts';
export {
  FLYBY_DV_EXTRA,
  FLYBY_DV_PERIAPSIS,
  FLYBY_DV_TOTAL,
  FLYBY_FREE_DV,
  FLYBY_LIMITED,
  FLYBY_MAX_TURN,
  FLYBY_RP,
  FLYBY_SLOTS,
  FLYBY_TURN,
  flybyBPlaneAngle,
  flybyCostInto,
  flybyTurnAngle,
  poweredFlyby,
  unpoweredFlyby,
  unpoweredFlybyMatch,
} from './flyby.ts';
export { bPlaneFrame } from './bPlaneFrame.ts';
export type { PoweredFlyby } from './flyby.ts';
export { hohmann } from './hohmann.ts';
export { hyperbolaPeriapsisSpeed, orbitPeriapsisSpeed } from './hyperbolic.ts';
export { keplerCoefficients, propagateKepler } from './kepler.ts';
export { lambertBest, lambertCodeRevs, lambertSingleRev, solveLambert } from './lambert.ts';
export type { LambertSolution } from './lambert.ts';
export { hillRadius, sphereOfInfluence } from './soi.ts';
export { stumpffCS } from './stumpff.ts';
export { synodicPeriod } from './synodic.ts';
