/**
 * Runtime ephemeris data in memory: piecewise Chebyshev series of the positions of a system's
 * bodies and of a ship over a span, each track with the tolerance it was fitted to and the error
 * measured on it. Plain data (typed arrays included); format.ts writes and reads it as JSON and
 * binary, reader.ts is the standalone reader a game copies.
 *
 * Units: metres and seconds; times in seconds from the system's epoch (its t = 0); axes the
 * system's own (non-rotating, centred on the star, x and y in the reference plane).
 *
 * Tracks: first the bodies in the system's order without the star (the body with system index j
 * is track j − 1), then the ships. A track is a run of arcs; an arc holds positions relative to one
 * centre: another track (`centerIndex` ≥ 0) or the star (−1, the origin of the axes). A body's
 * track is one arc relative to its parent with pieces of equal length; a ship's track has one arc
 * per stretch flown about one body, its pieces listed by their boundaries.
 */

/** A time window fitted to a tighter tolerance (near a burn or a periapsis), with the error measured there. */
export interface FineWindow {
  t0: number;
  t1: number;
  /** Position tolerance asked in the window, m. */
  tolerance: number;
  /** Largest error measured on the pieces that overlap the window, m. */
  maxError: number;
}

/** A stretch of a track relative to one centre. */
export interface RuntimeArc {
  /** Name of the centre: a track's name, or the star's id for the origin. */
  center: string;
  /** Index of the centre's track, or −1 for the star. */
  centerIndex: number;
  /** Span, s from the epoch. */
  t0: number;
  t1: number;
  /** Number of pieces. */
  count: number;
  /** Equal pieces: their length, s (piece k covers [t0 + k·length, t0 + k·length + length]); null when listed. */
  length: number | null;
  /** Listed pieces: count + 1 boundaries (t0 first, t1 last); null for equal pieces. */
  breaks: Float64Array | null;
  /** count × 3(degree + 1) coefficients, piece after piece, each [x_0..x_N, y_0..y_N, z_0..z_N], m. */
  coefficients: Float64Array;
}

export interface RuntimeTrack {
  /** A body's id, or the ship's name. */
  name: string;
  kind: 'body' | 'ship';
  /** Degree of every piece's series (degree + 1 coefficients per axis). */
  degree: number;
  /** Position tolerance asked, m. */
  tolerance: number;
  /** Largest position error measured over the whole track, m (≤ tolerance). */
  maxError: number;
  /** Finer windows (ships; none for bodies). */
  fine: FineWindow[];
  /** Arcs in time order, contiguous: each starts where the previous ends. */
  arcs: RuntimeArc[];
}

export interface RuntimeEphemeris {
  /** The system's name, its star's id (the origin of the axes) and its epoch's label (time zero). */
  system: string;
  origin: string;
  epoch: string;
  /** Span of the bodies' tracks, s from the epoch (ships' tracks lie within it). */
  t0: number;
  t1: number;
  tracks: RuntimeTrack[];
}
