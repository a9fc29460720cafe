/** Test systems for the window search: hand-made circular coplanar systems and the demo file. */
import { readFileSync } from 'node:fs';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import { buildStarSystem } from '../../../core/system/build.ts';
import type { BodyDocument, SystemDocument } from '../../../core/system/document.ts';
import type { StarSystem } from '../../../core/system/model.ts';

export const DEMO_PATH = new URL('../../../assets/systems/ilmar.system.json', import.meta.url);

export function demoSystem(): StarSystem {
  return parseSystemFile(readFileSync(DEMO_PATH, 'utf8')).system;
}

export interface CircularBody {
  id: string;
  parent?: string;
  a: number;
  mu: number;
  radius: number;
  /** Mean anomaly (= true longitude for these orbits) at the epoch, degrees. */
  lonDeg?: number;
}

/**
 * A star of μ = starMu (m³/s²) with bodies on circular, coplanar (i = 0) orbits; explicit
 * calendar of 360 days of 86 400 s. Built with the model builder (no file checks), so bodies
 * may have tiny μ.
 */
export function circularSystem(bodies: CircularBody[], starMu = 1.32712440018e20): StarSystem {
  const doc: SystemDocument = {
    format: 'waymark-system',
    version: 1,
    name: 'Circular',
    epoch: { label: 'Year 1, day 1, 00:00' },
    calendar: { year_s: 360 * 86400, day_s: 86400, year_at_epoch: 1 },
    star: { id: 'sun', name: 'Sun', mu_m3_s2: starMu, radius_m: 7e8 },
    bodies: bodies.map(
      (b): BodyDocument => ({
        id: b.id,
        name: b.id,
        parent: b.parent ?? 'sun',
        mu_m3_s2: b.mu,
        radius_m: b.radius,
        min_safe_altitude_m: 0,
        orbit: { a_m: b.a, e: 0, i_deg: 0, raan_deg: 0, argp_deg: 0, mean_anomaly_deg: b.lonDeg ?? 0 },
      }),
    ),
  };
  return buildStarSystem(doc);
}
