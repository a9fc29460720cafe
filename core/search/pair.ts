/**
 * The porkchop of any pair of bodies: the leg that has the transfer window. A pair the transfer
 * geometries of transfer.ts cover (SIBLINGS, FROM_PARENT, TO_PARENT) is its own leg; any other
 * pair (a moon to another planet, a planet to another planet's moon, a moon to a moon of another
 * planet) is lifted to the ancestors below their lowest common ancestor, which orbit that body
 * side by side, and the window shown is theirs (Tessel → Skerry: Tessel → Moravel). The words
 * say so on screen.
 *
 * Method: lowest common ancestor in the tree of parent links (common practice for rooted trees).
 */
import { InputError } from '../math/index.ts';
import type { StarSystem } from '../system/index.ts';
import { FROM_PARENT, SIBLINGS, TO_PARENT } from './transfer.ts';

export interface PorkchopPair {
  /** The bodies asked for (indices into system.bodies). */
  askedFrom: number;
  askedTo: number;
  /** The leg whose porkchop is computed. */
  from: number;
  to: number;
  kind: typeof SIBLINGS | typeof FROM_PARENT | typeof TO_PARENT;
  /** null when the leg is the pair asked for; else why another leg is shown, in words. */
  through: string | null;
}

/** Body indices from `k` up to the star, `k` first. */
function chain(system: StarSystem, k: number): number[] {
  const out: number[] = [];
  for (let j = k; j >= 0; j = system.bodies[j].parentIndex) out.push(j);
  return out;
}

/** The geometry of a pair that one transfer covers, or null. */
function directKind(system: StarSystem, from: number, to: number): PorkchopPair['kind'] | null {
  const a = system.bodies[from];
  const b = system.bodies[to];
  if (a.parentIndex === b.parentIndex) return SIBLINGS;
  if (b.parentIndex === a.index) return FROM_PARENT;
  if (a.parentIndex === b.index) return TO_PARENT;
  return null;
}

/** The leg whose porkchop answers the pair from → to (body indices); InputError for the star or a body to itself. */
export function porkchopPair(system: StarSystem, from: number, to: number): PorkchopPair {
  const n = system.bodies.length;
  for (const [field, k] of [
    ['from', from],
    ['to', to],
  ] as const) {
    if (!Number.isInteger(k) || k < 0 || k >= n) throw new InputError(field, `must be a body index below ${n}`, k);
    if (k === 0) throw new InputError(field, 'must name a body with an orbit (not the star)', system.bodies[0].id);
  }
  if (from === to) throw new InputError('to', 'must differ from the departure body', system.bodies[to].id);
  const direct = directKind(system, from, to);
  if (direct !== null) return { askedFrom: from, askedTo: to, from, to, kind: direct, through: null };
  const up = chain(system, from);
  const down = chain(system, to);
  const common = up.find((k) => down.includes(k))!; // the star is on both chains
  // The child of `common` on each chain (or the body itself when it is the common ancestor).
  const below = (c: number[]): number => (c[0] === common ? common : c[c.indexOf(common) - 1]);
  const legFrom = below(up);
  const legTo = below(down);
  const kind = directKind(system, legFrom, legTo)!;
  const B = system.bodies;
  const parts: string[] = [];
  if (legFrom !== from) parts.push(`${B[from].name} leaves through ${B[legFrom].name}`);
  if (legTo !== to) parts.push(`${B[to].name} is reached through ${B[legTo].name}`);
  const through = `${parts.join(' and ')}: the window shown is ${B[legFrom].name} → ${B[legTo].name}`;
  return { askedFrom: from, askedTo: to, from: legFrom, to: legTo, kind, through };
}
