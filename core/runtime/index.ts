/**
 * Front door of core/runtime. Runtime ephemeris data for a game: piecewise Chebyshev fits of the
 * bodies' and a ship's positions over a plan's span (velocity from the derivative), with the fit
 * error measured and stated; the file in JSON and binary form; the standalone reader (reader.ts)
 * a game copies. Other folders of core/ and the app import from here only.
 */
export { BODY_DEGREE, BODY_FIRST_PIECE, BODY_TOLERANCE, fitBodyTracks } from './bodies.ts';
export type { BodyFitOptions } from './bodies.ts';
export { runtimeEphemeris } from './build.ts';
export type { RuntimeOptions } from './build.ts';
export { MAX_DEGREE, chebyshevPosition, chebyshevVelocity, fitChebyshev3 } from './chebyshev.ts';
export type { VectorSource } from './chebyshev.ts';
export { trackAbsolutePosition, trackCenter, trackIndex, trackPosition, trackVelocity } from './evaluate.ts';
export {
  RUNTIME_FORMAT,
  RUNTIME_MAGIC,
  RUNTIME_VERSION,
  decodeRuntimeBinary,
  decodeRuntimeJson,
  encodeRuntimeBinary,
  encodeRuntimeJson,
} from './format.ts';
export type { RuntimeFile, RuntimeFileArc, RuntimeFileTrack } from './format.ts';
export type { FineWindow, RuntimeArc, RuntimeEphemeris, RuntimeTrack } from './model.ts';
export { openRuntimeEphemeris } from './reader.ts';
export type { RuntimeEphemerisReader } from './reader.ts';
export { FINE_FRACTION, SHIP_DEGREE, SHIP_TOLERANCE, fitShipTrack } from './ship.ts';
export type { FineWindowInput, ShipArcInput, ShipInput } from './ship.ts';
