/**
 * The star system as a designer writes it: the plain-data shape of a version-1 system file.
 * SI units with the unit in each field name; angles in DEGREES. The shape is declared once, in
 * systemFileShape.ts (which also gives assets/schema/system.schema.json); this module names its
 * types for the rest of the code without loading zod. `build.ts` turns a checked document into
 * the in-memory `StarSystem` (radians, derived quantities, ephemeris tables);
 * `systemToDocument` in build.ts goes back.
 */

import type { SystemDocument } from './systemFileShape.ts';

export type { BodyDocument, CalendarDocument, OrbitDocument, StarDocument, SystemDocument } from './systemFileShape.ts';

// The format's tag and version, held to the declaration by the type checker.
export const SYSTEM_FORMAT = 'waymark-system' satisfies SystemDocument['format'];
export const SYSTEM_VERSION = 1 satisfies SystemDocument['version'];

/** Newtonian constant of gravitation, m³/(kg·s²) (CODATA 2018 recommended value). */
export const G_NEWTON = 6.6743e-11;
