/**
 * The bodies a route passes: up the body tree from the departure body to the lowest common
 * ancestor's child, across to the arrival branch, and down to the arrival body (the lowest common
 * ancestor of two nodes of a rooted tree, walked by parent links — common practice). Each step is a
 * hop of one kind:
 * - 'to-parent': a moon to the body it orbits (leaving the moon's sphere of influence inwards);
 * - 'siblings': two bodies orbiting the same parent (planet to planet, moon to sister moon);
 * - 'to-moon': a body to one of its moons, inside the body's sphere of influence.
 */
import { InputError } from '../math/index.ts';
import { findBodyIndex, type StarSystem } from '../system/index.ts';

export type RouteHopKind = 'siblings' | 'to-moon' | 'to-parent';

/** One hop of a route without its times: its kind and the body ids it joins. */
export interface RouteLink {
  kind: RouteHopKind;
  from: string;
  to: string;
}

/** Words for each hop kind, for lists and panels. */
export const ROUTE_HOP_WORDS: Record<RouteHopKind, string> = {
  siblings: 'between bodies of the same parent',
  'to-moon': 'down to a moon',
  'to-parent': 'out of a moon to its planet',
};

function bodyOf(system: StarSystem, field: string, id: string): number {
  const k = typeof id === 'string' ? findBodyIndex(system, id) : -1;
  if (k < 0) throw new InputError(field, `must name a body of ${system.name}`, id);
  if (k === 0 || system.bodies[k].parentIndex < 0) throw new InputError(field, `must name a planet or moon, not the star ${system.bodies[k].name}`, id);
  return k;
}

/** Body indices from k up to the star, k first. */
function ancestry(system: StarSystem, k: number): number[] {
  const out: number[] = [];
  for (let b = k; b >= 0; b = system.bodies[b].parentIndex) out.push(b);
  return out;
}

/**
 * The hops from body `from` to body `to` (ids), in order. InputError ('from' or 'to') when a body
 * is unknown or the star, or both are the same body.
 */
export function routeChain(system: StarSystem, from: string, to: string): RouteLink[] {
  const a = bodyOf(system, 'from', from);
  const b = bodyOf(system, 'to', to);
  if (a === b) throw new InputError('to', 'must differ from the departure body', to);
  const up = ancestry(system, a);
  const down = ancestry(system, b);
  const inDown = new Set(down);
  const lca = up.find((k) => inDown.has(k)) ?? 0;
  const links: RouteLink[] = [];
  const id = (k: number): string => system.bodies[k].id;
  // up: moon → parent while the parent is not the common ancestor
  let i = 0;
  while (up[i] !== lca && system.bodies[up[i]].parentIndex !== lca) {
    links.push({ kind: 'to-parent', from: id(up[i]), to: id(up[i + 1]) });
    i++;
  }
  const j0 = down.indexOf(lca);
  if (up[i] === lca) {
    // the departure body is an ancestor of the arrival body: straight down
  } else if (down[j0 - 1] === undefined) {
    // the arrival body is the common ancestor: the last step up
    links.push({ kind: 'to-parent', from: id(up[i]), to: id(lca) });
  } else if (down[j0 - 1] !== up[i]) {
    links.push({ kind: 'siblings', from: id(up[i]), to: id(down[j0 - 1]) });
  }
  // down: from the common ancestor's child (or the ancestor itself) to the arrival body
  let j = up[i] === lca ? j0 : j0 - 1;
  while (j > 0) {
    links.push({ kind: 'to-moon', from: id(down[j]), to: id(down[j - 1]) });
    j--;
  }
  return links;
}
