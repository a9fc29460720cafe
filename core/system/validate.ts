/**
 * Semantic checks of a system document that has already passed the JSON Schema: the rules a
 * schema cannot express (references between bodies, mass ordering, geometry, plausibility).
 *
 * Errors (the file does not load): duplicate ids, unknown or self parents, parent cycles,
 * a mass so small that G·mass underflows to 0, a child at least as massive as its parent, a periapsis that puts the body's surface inside
 * the parent, a calendar home that is missing, the star, without rotation or tidally locked,
 * an explicit day longer than the year.
 *
 * Warnings (the file loads): a moon whose apoapsis leaves the parent's sphere of influence or
 * lies beyond half the parent's Hill radius, sibling orbits whose distance ranges overlap
 * (at most MAX_OVERLAP_WARNINGS of them, then one warning counting the rest),
 * a periapsis inside the parent's atmosphere / terrain band, an implausible minimum safe
 * altitude (larger than the body's radius), an atmosphere higher than the body's radius or than
 * its minimum safe altitude, an implausible mean density, a sphere of
 * influence smaller than the body itself.
 */

import type { ValidationIssue } from '../math/index.ts';
import { G_NEWTON, type SystemDocument } from './document.ts';
import { hillRadiusOf, laplaceSoiRadius, meanSolarDay, orbitalPeriod } from './derived.ts';

/** Mean densities outside this range (kg/m³) draw a warning: looser than any known planet or moon. */
export const PLAUSIBLE_DENSITY_KG_M3: readonly [number, number] = [200, 30000];

/**
 * Long-term stable prograde satellite orbits lie inside about half the Hill radius
 * (Domingos, Winter & Yokoyama, MNRAS 373 (2006) 1227: ≈ 0.49 R_H for prograde orbits).
 */
export const STABLE_HILL_FRACTION = 0.5;

/** Sibling-overlap warnings listed one by one; further overlapping pairs are counted in one warning. */
export const MAX_OVERLAP_WARNINGS = 100;

interface Node {
  path: string;
  id: string;
  mu: number;
  muField: string;
  radius: number;
  safeAlt: number;
  /** Atmosphere height, m (0 airless, and for the star). */
  air: number;
  parent: number; // index into nodes, −1 for the star, −2 unknown
  a: number;
  e: number;
}

/** Every semantic issue of a schema-valid document, errors and warnings together. */
export function checkSystemDocument(doc: SystemDocument): ValidationIssue[] {
  const issues: ValidationIssue[] = [];
  const error = (path: string, rule: string) => issues.push({ path, rule, severity: 'error' });
  const warn = (path: string, rule: string) => issues.push({ path, rule, severity: 'warning' });

  // Node 0 is the star, node k is bodies[k − 1] (the model's layout).
  const nodes: Node[] = [];
  const s = doc.star;
  nodes.push({
    path: 'star',
    id: s.id,
    mu: s.mu_m3_s2 ?? G_NEWTON * (s.mass_kg as number),
    muField: s.mu_m3_s2 !== undefined ? 'mu_m3_s2' : 'mass_kg',
    radius: s.radius_m,
    safeAlt: s.min_safe_altitude_m ?? 0,
    air: 0,
    parent: -1,
    a: 0,
    e: 0,
  });
  doc.bodies.forEach((b, k) => {
    nodes.push({
      path: `bodies[${k}]`,
      id: b.id,
      mu: b.mu_m3_s2 ?? G_NEWTON * (b.mass_kg as number),
      muField: b.mu_m3_s2 !== undefined ? 'mu_m3_s2' : 'mass_kg',
      radius: b.radius_m,
      safeAlt: b.min_safe_altitude_m,
      air: b.atmosphere_height_m ?? 0,
      parent: -2,
      a: b.orbit.a_m,
      e: b.orbit.e,
    });
  });

  // Unique ids.
  const firstById = new Map<string, number>();
  nodes.forEach((n, k) => {
    const first = firstById.get(n.id);
    if (first === undefined) firstById.set(n.id, k);
    else error(`${n.path}.id`, `duplicates the id "${n.id}" of ${nodes[first].path}`);
  });

  // Parents exist and are not the body itself.
  let structureOk = firstById.size === nodes.length;
  doc.bodies.forEach((b, k) => {
    const node = nodes[k + 1];
    const p = firstById.get(b.parent);
    if (p === undefined) {
      error(`${node.path}.parent`, `names no body: "${b.parent}"`);
      structureOk = false;
    } else if (p === k + 1) {
      error(`${node.path}.parent`, 'must not be the body itself');
      structureOk = false;
    } else {
      node.parent = p;
    }
  });

  // Cycles: follow each chain; a chain that returns to a node already on it is a cycle.
  // Report each cycle once, on its member that comes first in the file.
  const state = new Int8Array(nodes.length); // 0 unvisited, 1 on current chain, 2 done
  state[0] = 2;
  for (let start = 1; start < nodes.length; start++) {
    if (state[start] !== 0) continue;
    const chain: number[] = [];
    let k = start;
    while (k >= 0 && state[k] === 0) {
      state[k] = 1;
      chain.push(k);
      k = nodes[k].parent;
    }
    if (k >= 0 && state[k] === 1) {
      const cycle = chain.slice(chain.indexOf(k));
      const first = Math.min(...cycle);
      const from = cycle.indexOf(first);
      const ordered = [...cycle.slice(from), ...cycle.slice(0, from), first].map((j) => nodes[j].id);
      error(`${nodes[first].path}.parent`, `forms a cycle: ${ordered.join(' → ')}`);
      structureOk = false;
    }
    for (const j of chain) state[j] = 2;
  }

  // Calendar.
  const cal = doc.calendar;
  if (cal.home !== undefined) {
    const h = firstById.get(cal.home);
    if (h === undefined) error('calendar.home', `names no body: "${cal.home}"`);
    else if (h === 0) error('calendar.home', 'must name a body that orbits, not the star');
    else {
      const hb = doc.bodies[h - 1];
      if (hb.rotation_period_s === undefined) {
        error('calendar.home', `names "${hb.id}", which has no rotation_period_s; add it or give calendar.year_s and calendar.day_s`);
      } else if (structureOk) {
        const parent = nodes[nodes[h].parent];
        const period = orbitalPeriod(parent.mu + nodes[h].mu, hb.orbit.a_m);
        const day = meanSolarDay(hb.rotation_period_s, period);
        if (!Number.isFinite(day) || day > period) {
          error(
            'calendar.home',
            `names "${hb.id}", whose rotation is (nearly) locked to its orbit so it has no usable day; give calendar.year_s and calendar.day_s`,
          );
        }
      }
    }
  } else if (cal.day_s !== undefined && cal.year_s !== undefined && cal.day_s > cal.year_s) {
    error('calendar.day_s', `must be <= calendar.year_s (${cal.year_s})`);
  }

  if (!structureOk) return issues;

  // Mass ordering and periapsis clearance.
  for (let k = 1; k < nodes.length; k++) {
    const n = nodes[k];
    const p = nodes[n.parent];
    if (!(n.mu > 0)) {
      // a mass so small that G·mass underflows to 0 (the schema only asks for mass > 0)
      error(`${n.path}.${n.muField}`, `gives μ = G·mass = ${n.mu} m³/s²; it must be > 0 (the mass is too small to represent)`);
      continue;
    }
    if (!(n.mu < p.mu)) {
      error(`${n.path}.${n.muField}`, `must give a smaller μ than the parent "${p.id}" (${sci(n.mu)} >= ${sci(p.mu)} m³/s²)`);
      continue;
    }
    const q = n.a * (1 - n.e);
    if (!(q > p.radius + n.radius)) {
      error(`${n.path}.orbit`, `periapsis ${km(q)} puts the body inside "${p.id}" (radii add to ${km(p.radius + n.radius)})`);
      continue;
    }
    if (q - n.radius < p.radius + p.safeAlt) {
      warn(`${n.path}.orbit`, `periapsis ${km(q)} dips below "${p.id}"'s minimum safe altitude (${km(p.radius + p.safeAlt)} from its centre)`);
    }
  }
  if (issues.some((i) => i.severity === 'error')) return issues;

  // Warnings: spheres of influence, stability, sibling overlap, plausibility.
  for (let k = 1; k < nodes.length; k++) {
    const n = nodes[k];
    const p = nodes[n.parent];
    const Q = n.a * (1 + n.e);
    const soi = laplaceSoiRadius(n.a, n.mu, p.mu);
    if (soi < n.radius) {
      warn(`${n.path}.orbit`, `gives a sphere of influence (${km(soi)}) smaller than the body's radius (${km(n.radius)})`);
    }
    if (n.parent !== 0) {
      const g = nodes[p.parent];
      const pSoi = laplaceSoiRadius(p.a, p.mu, g.mu);
      const pHill = hillRadiusOf(p.a, p.e, p.mu, g.mu);
      if (Q > pSoi) {
        warn(`${n.path}.orbit`, `apoapsis ${km(Q)} leaves "${p.id}"'s sphere of influence (${km(pSoi)})`);
      } else if (Q > STABLE_HILL_FRACTION * pHill) {
        warn(`${n.path}.orbit`, `apoapsis ${km(Q)} lies beyond half of "${p.id}"'s Hill radius (${km(pHill)}); such moon orbits are not long-term stable`);
      }
    }
    if (n.safeAlt > n.radius) {
      warn(`${n.path}.min_safe_altitude_m`, `is larger than the body's radius (${km(n.safeAlt)} > ${km(n.radius)}); check the units`);
    }
    if (n.air > n.radius) {
      warn(`${n.path}.atmosphere_height_m`, `is larger than "${n.id}"'s radius (${km(n.air)} > ${km(n.radius)}); check the units`);
    } else if (n.air > n.safeAlt) {
      warn(
        `${n.path}.atmosphere_height_m`,
        `is above "${n.id}"'s minimum safe altitude (${km(n.air)} > ${km(n.safeAlt)}); the minimum safe altitude is meant to clear the air`,
      );
    }
    const density = n.mu / G_NEWTON / ((4 / 3) * Math.PI * n.radius ** 3);
    if (density < PLAUSIBLE_DENSITY_KG_M3[0] || density > PLAUSIBLE_DENSITY_KG_M3[1]) {
      warn(
        `${n.path}.radius_m`,
        `gives an implausible mean density of ${sci(density)} kg/m³ with this μ (expected ${PLAUSIBLE_DENSITY_KG_M3[0]}–${PLAUSIBLE_DENSITY_KG_M3[1]})`,
      );
    }
  }
  // Pairs grow as n²: past MAX_OVERLAP_WARNINGS the rest are counted in one closing warning
  // (a file of a thousand asteroids would otherwise carry hundreds of thousands of warnings).
  let overlaps = 0;
  for (let k = 1; k < nodes.length; k++) {
    for (let j = 1; j < k; j++) {
      const a = nodes[j];
      const b = nodes[k];
      if (a.parent !== b.parent) continue;
      const qa = a.a * (1 - a.e);
      const Qa = a.a * (1 + a.e);
      const qb = b.a * (1 - b.e);
      const Qb = b.a * (1 + b.e);
      if (qa <= Qb && qb <= Qa) {
        if (++overlaps > MAX_OVERLAP_WARNINGS) continue;
        warn(`${b.path}.orbit`, `distance range ${km(qb)}–${km(Qb)} overlaps that of sibling "${a.id}" (${km(qa)}–${km(Qa)}); the orbits may cross`);
      }
    }
  }
  if (overlaps > MAX_OVERLAP_WARNINGS) {
    warn('bodies', `${overlaps - MAX_OVERLAP_WARNINGS} more pairs of sibling orbits overlap in distance (only the first ${MAX_OVERLAP_WARNINGS} are listed)`);
  }
  return issues;
}

function km(m: number): string {
  return `${Number((m / 1000).toPrecision(4)).toLocaleString('en-US', { maximumFractionDigits: 3 })} km`;
}

function sci(x: number): string {
  return x.toPrecision(4);
}
