/**
 * Document ↔ model: `buildStarSystem` turns a checked system document (degrees, file field
 * names) into the in-memory `StarSystem` (radians, derived quantities, ephemeris tables);
 * `systemToDocument` turns a model back into a document with a fixed key order.
 *
 * `buildStarSystem` assumes the document passed the schema and `checkSystemDocument` with no
 * errors (core/io/systemFile.ts does both); it still refuses structural breakage with an
 * InputError rather than building a broken model.
 */

import { InputError } from '../math/index.ts';
import { bodyDerived, meanSolarDay, starDerived } from './derived.ts';
import { G_NEWTON, SYSTEM_FORMAT, SYSTEM_VERSION, type BodyDocument, type CalendarDocument, type StarDocument, type SystemDocument } from './document.ts';
import { buildEphemerisTables } from './ephemeris.ts';
import type { Body, StarSystem, SystemCalendar } from './model.ts';

const DEG = Math.PI / 180;

export function buildStarSystem(doc: SystemDocument): StarSystem {
  const s = doc.star;
  const bodies: Body[] = [
    {
      index: 0,
      id: s.id,
      name: s.name,
      description: s.description ?? null,
      parentIndex: -1,
      children: [],
      mu: s.mu_m3_s2 ?? G_NEWTON * (s.mass_kg as number),
      massKg: s.mu_m3_s2 !== undefined ? null : (s.mass_kg as number),
      radius: s.radius_m,
      safeAlt: s.min_safe_altitude_m ?? 0,
      atmosphereHeight: 0,
      hasSurface: false,
      rotationPeriod: null,
      colour: s.colour ?? null,
      elements: null,
      derived: starDerived(),
    },
  ];
  const indexById: Record<string, number> = {};
  indexById[s.id] = 0;
  doc.bodies.forEach((b, k) => {
    if (Object.hasOwn(indexById, b.id)) throw new InputError(`bodies[${k}].id`, 'must be unique', b.id);
    indexById[b.id] = k + 1;
    bodies.push({
      index: k + 1,
      id: b.id,
      name: b.name,
      description: b.description ?? null,
      parentIndex: -2,
      children: [],
      mu: b.mu_m3_s2 ?? G_NEWTON * (b.mass_kg as number),
      massKg: b.mu_m3_s2 !== undefined ? null : (b.mass_kg as number),
      radius: b.radius_m,
      safeAlt: b.min_safe_altitude_m,
      atmosphereHeight: b.atmosphere_height_m ?? 0,
      hasSurface: b.surface ?? true,
      rotationPeriod: b.rotation_period_s ?? null,
      colour: b.colour ?? null,
      elements: {
        a: b.orbit.a_m,
        e: b.orbit.e,
        i: b.orbit.i_deg * DEG,
        raan: b.orbit.raan_deg * DEG,
        argp: b.orbit.argp_deg * DEG,
        M0: b.orbit.mean_anomaly_deg * DEG,
      },
      derived: starDerived(),
    });
  });
  doc.bodies.forEach((b, k) => {
    if (!Object.hasOwn(indexById, b.parent)) throw new InputError(`bodies[${k}].parent`, 'must name a body', b.parent);
    const p = indexById[b.parent];
    bodies[k + 1].parentIndex = p;
    bodies[p].children.push(k + 1);
  });
  // Depth by walking the chains (a cycle would never reach the star).
  const depth = (j: number): number => {
    let d = 0;
    for (let x = j; x !== 0; x = bodies[x].parentIndex) {
      if (++d > bodies.length) throw new InputError(`bodies[${j - 1}].parent`, 'must not form a cycle', bodies[j].id);
    }
    return d;
  };
  for (let j = 1; j < bodies.length; j++) {
    const b = bodies[j];
    b.derived = bodyDerived(b.elements!, b.mu, bodies[b.parentIndex].mu, depth(j));
  }
  const calendar = buildCalendar(doc.calendar, bodies, indexById);
  return {
    name: doc.name,
    description: doc.description ?? null,
    epoch: { label: doc.epoch.label },
    calendar,
    bodies,
    indexById,
    ephemeris: buildEphemerisTables(bodies),
  };
}

function buildCalendar(c: CalendarDocument, bodies: Body[], indexById: Record<string, number>): SystemCalendar {
  if (c.home !== undefined) {
    const h = Object.hasOwn(indexById, c.home) ? indexById[c.home] : -1;
    const home = bodies[h];
    if (!home || h === 0 || home.rotationPeriod === null) {
      throw new InputError('calendar.home', 'must name a body with rotation_period_s', c.home);
    }
    return {
      yearLength: home.derived.period,
      dayLength: meanSolarDay(home.rotationPeriod, home.derived.period),
      yearAtEpoch: c.year_at_epoch,
      era: c.era ?? '',
      homeIndex: h,
    };
  }
  return {
    yearLength: c.year_s as number,
    dayLength: c.day_s as number,
    yearAtEpoch: c.year_at_epoch,
    era: c.era ?? '',
    homeIndex: -1,
  };
}

/** Degrees for the file, rounded to 12 significant digits to drop the rad↔deg round-off. */
function deg(rad: number): number {
  return Number((rad / DEG).toPrecision(12));
}

/** The document of a model, keys in the order of the schema. */
export function systemToDocument(system: StarSystem): SystemDocument {
  const [star, ...rest] = system.bodies;
  const cal = system.calendar;
  const calendar: CalendarDocument =
    cal.homeIndex >= 0
      ? { home: system.bodies[cal.homeIndex].id, year_at_epoch: cal.yearAtEpoch }
      : { year_s: cal.yearLength, day_s: cal.dayLength, year_at_epoch: cal.yearAtEpoch };
  if (cal.era) calendar.era = cal.era;

  const starDoc: Partial<StarDocument> = { id: star.id, name: star.name };
  if (star.description !== null) starDoc.description = star.description;
  if (star.massKg !== null) starDoc.mass_kg = star.massKg;
  else starDoc.mu_m3_s2 = star.mu;
  starDoc.radius_m = star.radius;
  if (star.safeAlt !== 0) starDoc.min_safe_altitude_m = star.safeAlt;
  if (star.colour !== null) starDoc.colour = star.colour;

  const bodies: BodyDocument[] = rest.map((b) => {
    const d: Partial<BodyDocument> = { id: b.id, name: b.name };
    if (b.description !== null) d.description = b.description;
    d.parent = system.bodies[b.parentIndex].id;
    if (b.massKg !== null) d.mass_kg = b.massKg;
    else d.mu_m3_s2 = b.mu;
    d.radius_m = b.radius;
    d.min_safe_altitude_m = b.safeAlt;
    if (b.atmosphereHeight !== 0) d.atmosphere_height_m = b.atmosphereHeight;
    if (!b.hasSurface) d.surface = false;
    if (b.rotationPeriod !== null) d.rotation_period_s = b.rotationPeriod;
    if (b.colour !== null) d.colour = b.colour;
    const el = b.elements!;
    d.orbit = {
      a_m: el.a,
      e: el.e,
      i_deg: deg(el.i),
      raan_deg: deg(el.raan),
      argp_deg: deg(el.argp),
      mean_anomaly_deg: deg(el.M0),
    };
    return d as BodyDocument;
  });

  const doc: Partial<SystemDocument> = { format: SYSTEM_FORMAT, version: SYSTEM_VERSION, name: system.name };
  if (system.description !== null) doc.description = system.description;
  doc.epoch = { label: system.epoch.label };
  doc.calendar = calendar;
  doc.star = starDoc as StarDocument;
  doc.bodies = bodies;
  return doc as SystemDocument;
}
