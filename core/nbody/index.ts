/**
 * Front door of core/nbody. n-body flight of a plan: verification, arrival and B-plane, differential correction, dispersion runs, n-body states for exports.
 * Other folders of core/ and the app import from here only.
 */
export { correctPlan } from './correct.ts';
export type { CorrectResult } from './correct.ts';
export { disperse, mergeBlocks, prepareDispersion, runSamples, summarizeDispersion } from './disperse.ts';
export { SAMPLE_FLOWN, SAMPLE_IMPACT, SAMPLE_NO_ARRIVAL, SAMPLE_NOT_EVALUATED } from './disperse.ts';
export type { DispersionOptions, DispersionResult, SampleBlock } from './disperse.ts';
export { nbodyStatesToEphemeris } from './states.ts';
export { STEPS_PER_FASTEST_PERIOD, fieldStepLimit } from './stepLimit.ts';
export { verifyNBody } from './verify.ts';
export type { NBodyResult } from './verify.ts';
export { freezePlan } from './correct.ts';
export { NBodyModel, bPlane, bPlaneAxes, burnActions, conicStart, flyNBody } from './verify.ts';
export type { BPlane, NBodyAction, NBodyModelOptions, NBodySoiChange, NBodyState, FlyResult } from './verify.ts';
