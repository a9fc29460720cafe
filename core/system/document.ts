/**
 * The star system as a designer writes it: the plain-data shape of a version-1 system file
 * (assets/schema/system.schema.json). SI units with the unit in each field name; angles in
 * DEGREES. `build.ts` turns a checked document into the in-memory `StarSystem` (radians,
 * derived quantities, ephemeris tables); `toDocument` in build.ts goes back.
 */

export const SYSTEM_FORMAT = 'waymark-system';
export const SYSTEM_VERSION = 1;

export interface OrbitDocument {
  /** Semi-major axis, m. */
  a_m: number;
  /** Eccentricity, 0 ≤ e < 1. */
  e: number;
  /** Inclination to the reference plane, degrees. */
  i_deg: number;
  /** Longitude of the ascending node, degrees. */
  raan_deg: number;
  /** Argument of periapsis, degrees. */
  argp_deg: number;
  /** Mean anomaly at the epoch, degrees. */
  mean_anomaly_deg: number;
}

export interface StarDocument {
  id: string;
  name: string;
  description?: string;
  mu_m3_s2?: number;
  mass_kg?: number;
  radius_m: number;
  min_safe_altitude_m?: number;
  colour?: string;
}

export interface BodyDocument {
  id: string;
  name: string;
  description?: string;
  parent: string;
  mu_m3_s2?: number;
  mass_kg?: number;
  radius_m: number;
  min_safe_altitude_m: number;
  rotation_period_s?: number;
  colour?: string;
  orbit: OrbitDocument;
}

export interface CalendarDocument {
  home?: string;
  year_s?: number;
  day_s?: number;
  year_at_epoch: number;
  era?: string;
}

export interface SystemDocument {
  format: typeof SYSTEM_FORMAT;
  version: typeof SYSTEM_VERSION;
  name: string;
  description?: string;
  epoch: { label: string };
  calendar: CalendarDocument;
  star: StarDocument;
  bodies: BodyDocument[];
}

/** Newtonian constant of gravitation, m³/(kg·s²) (CODATA 2018 recommended value). */
export const G_NEWTON = 6.6743e-11;
