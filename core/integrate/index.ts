/**
 * Front door of core/integrate. Integrators: Dormand–Prince RK45 and DOP853 with dense output and events, fixed-step methods, point-mass gravity, and the propagation front door that records which method flew each span.
 * Other folders of core/ and the app import from here only.
 */
export type { DenseOutput } from './dense.ts';
export type { EventSpec } from './eventLocator.ts';
export { fixedStepper, integrateFixed } from './fixed.ts';
export { mutualAccel } from './gravity.ts';
export { propagate } from './propagate.ts';
export type { FlownSpan, MethodChoice } from './propagate.ts';
export { MIN_RTOL, rk45 } from './rk45.ts';
export { DOP853_MIN_RTOL, dop853 } from './dop853.ts';
