/**
 * Front door of core/conic. Patched-conic evaluation: evaluate, SOI crossings, solved burns, finite burns, sampling of the flight, plans from a window pick.
 * Other folders of core/ and the app import from here only.
 */
export { sampleEphemeris } from './ephemerisSampler.ts';
export type { EphemerisSpan, SampledEphemeris } from './ephemerisSampler.ts';
export { evaluate } from './evaluate.ts';
export { passReport } from './flybyReport.ts';
export type { PassStates } from './flybyReport.ts';
export { planFromWindow } from './fromWindow.ts';
export { conicInfo, createConicInfo, timeToApsis } from './soiCrossing.ts';
export type { ConicInfo } from './soiCrossing.ts';
export { shipStateAt } from './shipState.ts';
export { solveBurn } from './solveBurn.ts';
