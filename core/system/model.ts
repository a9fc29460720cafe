/**
 * The in-memory star system: SI units and radians throughout.
 *
 * Layout: one flat `bodies` array. The star is always `bodies[0]` (parentIndex −1, no
 * elements); the bodies of the file follow in file order, so `bodies[k]` is the file's
 * `bodies[k − 1]`. A parent may have a higher index than its child (the file allows any
 * order); `children` lists each body's direct children.
 *
 * Orbital elements are osculating Keplerian elements at the epoch (t = 0), centred on the
 * parent, in the system's single inertial frame. The two-body gravitational parameter of an
 * orbit is μ_parent + μ_body (Kepler's third law in its exact two-body form), so the conic
 * ephemeris of an isolated parent–child pair is the exact relative motion.
 *
 * The whole object is plain data (arrays, Float64Array, records), so it survives structured
 * cloning into a worker.
 */

export interface OrbitalElements {
  /** Semi-major axis, m (> 0). */
  a: number;
  /** Eccentricity, 0 ≤ e < 1. */
  e: number;
  /** Inclination, rad, [0, π]. */
  i: number;
  /** Longitude of the ascending node, rad. */
  raan: number;
  /** Argument of periapsis, rad. */
  argp: number;
  /** Mean anomaly at the epoch, rad. */
  M0: number;
}

export interface BodyDerived {
  /** μ used for the orbit: μ_parent + μ_body, m³/s²; 0 for the star. */
  orbitMu: number;
  /** Orbital period, s (Infinity for the star). */
  period: number;
  /** Mean motion, rad/s (0 for the star). */
  meanMotion: number;
  /** Periapsis and apoapsis distances from the parent, m (0 for the star). */
  periapsis: number;
  apoapsis: number;
  /** Laplace sphere-of-influence radius, m (Infinity for the star). */
  soiRadius: number;
  /** Hill radius at periapsis, m (Infinity for the star). */
  hillRadius: number;
  /** Depth in the body tree: 0 for the star, 1 for its planets, 2 for their moons ... */
  depth: number;
}

export interface Body {
  /** Position in `StarSystem.bodies`. */
  index: number;
  /** Lowercase slug, unique within the system. */
  id: string;
  name: string;
  description: string | null;
  /** Index of the parent body; −1 for the star. */
  parentIndex: number;
  /** Indices of the bodies that orbit this one directly. */
  children: number[];
  /** Gravitational parameter GM, m³/s². */
  mu: number;
  /** Mass as written in the file, kg, or null when the file gave μ directly. */
  massKg: number | null;
  /** Mean radius, m. */
  radius: number;
  /** Minimum safe altitude above the mean radius (atmosphere top or terrain), m. */
  safeAlt: number;
  /** Height of the atmosphere above the mean radius, m: where the air is too thin to matter; 0 for an airless body. */
  atmosphereHeight: number;
  /** False for a body without a solid surface to land on or launch from (a gas giant, and the star); true otherwise. */
  hasSurface: boolean;
  /** Sidereal rotation period, s (negative: retrograde), or null when not given. */
  rotationPeriod: number | null;
  /** Display colour #rrggbb, or null when the file gives none (the view picks one). */
  colour: string | null;
  /** Elements at the epoch relative to the parent; null for the star. */
  elements: OrbitalElements | null;
  derived: BodyDerived;
}

export interface SystemCalendar {
  /** Calendar year, s. */
  yearLength: number;
  /** Calendar day, s. */
  dayLength: number;
  /** Number of the year that begins at the epoch. */
  yearAtEpoch: number;
  /** Era label printed after the year number ("" for none). */
  era: string;
  /** Index of the home body the lengths came from, or −1 when they were given explicitly. */
  homeIndex: number;
}

export interface StarSystem {
  name: string;
  description: string | null;
  epoch: { label: string };
  calendar: SystemCalendar;
  /** bodies[0] is the star. */
  bodies: Body[];
  /** Index of each body by id. */
  indexById: Record<string, number>;
  /** Precomputed per-body constants for fast conic evaluation (see ephemeris.ts). */
  ephemeris: EphemerisTables;
}

/** Index of the star in `StarSystem.bodies`. */
export const STAR_INDEX = 0;

/** Index of the body with this id, or −1 when there is none. */
export function findBodyIndex(system: StarSystem, id: string): number {
  return Object.hasOwn(system.indexById, id) ? system.indexById[id] : -1;
}

/** Per-body constants of the conic ephemeris (built by ephemeris.ts buildEphemerisTables). */
export interface EphemerisTables {
  /** Number of bodies including the star. */
  count: number;
  /** Parent index per body (−1 for the star). */
  parent: Int32Array;
  /** Depth in the body tree per body (0 for the star). */
  depth: Int32Array;
  /** EPHEMERIS_STRIDE constants per body; the star's row is zeros. */
  k: Float64Array;
}
