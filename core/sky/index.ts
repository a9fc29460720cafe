/** Light time and sunlight/shadow of a ship: readouts for authors (front door). */
export { SPEED_OF_LIGHT, lightTimeAt, lightTimes } from './lightTime.ts';
export { discFraction, PENUMBRA, SUNLIGHT, UMBRA, shadowAngles, shadowKind, sunlitFraction, umbraLength } from './shadow.ts';
export type { ShadowModel } from './shadow.ts';
export { REACH_CONES, shadowPasses } from './shadowPasses.ts';
export type { ShadowOptions, ShadowPass, ShadowResult, ShipAt } from './shadowPasses.ts';
