/** Shared test inputs: the demo file's text and small hand-made documents. */
import { readFileSync } from 'node:fs';
import { buildStarSystem } from '../../../core/system/build.ts';
import type { BodyDocument, SystemDocument } from '../../../core/system/document.ts';
import type { StarSystem } from '../../../core/system/model.ts';

export const DEMO_PATH = new URL('../../../assets/systems/ilmar.system.json', import.meta.url);

export function demoText(): string {
  return readFileSync(DEMO_PATH, 'utf8');
}

export function demoDocument(): SystemDocument {
  return JSON.parse(demoText()) as SystemDocument;
}

/** A star of μ = 1e20 m³/s² with the given bodies; explicit calendar of 360 days of 86400 s. */
export function smallDocument(bodies: BodyDocument[], starMu = 1e20): SystemDocument {
  return {
    format: 'waymark-system',
    version: 1,
    name: 'Test',
    epoch: { label: 'Year 100, day 1, 00:00' },
    calendar: { year_s: 360 * 86400, day_s: 86400, year_at_epoch: 100 },
    star: { id: 'sun', name: 'Sun', mu_m3_s2: starMu, radius_m: 5e8 },
    bodies,
  };
}

export function planet(id: string, orbit: Partial<BodyDocument['orbit']>, extra: Partial<BodyDocument> = {}): BodyDocument {
  return {
    id,
    name: id,
    parent: 'sun',
    mu_m3_s2: 3e14,
    radius_m: 6e6,
    min_safe_altitude_m: 1e5,
    orbit: { a_m: 1e11, e: 0, i_deg: 0, raan_deg: 0, argp_deg: 0, mean_anomaly_deg: 0, ...orbit },
    ...extra,
  };
}

export function smallSystem(bodies: BodyDocument[], starMu = 1e20): StarSystem {
  return buildStarSystem(smallDocument(bodies, starMu));
}
