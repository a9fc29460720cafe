import { describe, expect, it } from 'vitest';
import { porkchopPair } from '../../../core/search/pair.ts';
import { FROM_PARENT, prepareTransfer, SIBLINGS, TO_PARENT } from '../../../core/search/transfer.ts';
import { InputError } from '../../../core/math/errors.ts';
import type { StarSystem } from '../../../core/system/model.ts';
import { demoSystem } from './fixtures.ts';

const sys = demoSystem();
const id = (s: StarSystem, k: number): string => s.bodies[k].id;
const k = (name: string): number => sys.indexById[name];

/** Bodies from k up to (not including) the star, k first. */
function selfAndAncestors(s: StarSystem, j: number): number[] {
  const out: number[] = [];
  for (let x = j; x > 0; x = s.bodies[x].parentIndex) out.push(x);
  return out;
}
const depth = (s: StarSystem, j: number): number => selfAndAncestors(s, j).length;

/** The geometry a single transfer covers, read straight off the parent links (transfer.ts's three cases). */
function geometry(s: StarSystem, a: number, b: number): number | null {
  const A = s.bodies[a];
  const B = s.bodies[b];
  if (a === b) return null;
  if (A.parentIndex === B.parentIndex) return SIBLINGS;
  if (B.parentIndex === a) return FROM_PARENT;
  if (A.parentIndex === b) return TO_PARENT;
  return null;
}

describe('porkchopPair: the leg that has the window, for every pair of the demo system', () => {
  it('is, by brute force over the ancestors, the covered pair closest to the bodies asked (analytic: tree search)', () => {
    let lifted = 0;
    for (let a = 1; a < sys.bodies.length; a++) {
      for (let b = 1; b < sys.bodies.length; b++) {
        if (a === b) continue;
        // every (ancestor-or-self of a, ancestor-or-self of b) a single transfer covers; the deepest wins
        let best: [number, number] | null = null;
        for (const x of selfAndAncestors(sys, a))
          for (const y of selfAndAncestors(sys, b))
            if (geometry(sys, x, y) !== null && (!best || depth(sys, x) + depth(sys, y) > depth(sys, best[0]) + depth(sys, best[1]))) best = [x, y];
        const p = porkchopPair(sys, a, b);
        const label = `${id(sys, a)} → ${id(sys, b)}`;
        expect([id(sys, p.from), id(sys, p.to)], label).toEqual([id(sys, best![0]), id(sys, best![1])]);
        expect(p.kind, label).toBe(geometry(sys, p.from, p.to));
        expect([p.askedFrom, p.askedTo]).toEqual([a, b]);
        // a pair covered as it is names no other leg; a lifted one says which leg is shown
        if (p.from === a && p.to === b) expect(p.through, label).toBeNull();
        else {
          lifted++;
          expect(p.through, label).toContain(`the window shown is ${sys.bodies[p.from].name} → ${sys.bodies[p.to].name}`);
        }
        // the transfer search accepts the leg
        expect(
          () =>
            prepareTransfer(sys, {
              from: p.from,
              to: p.to,
              depart: { start: 0, end: 1, n: 2 },
              secondAxis: 'tof',
              second: { start: 1, end: 2, n: 2 },
              parkingAltitude: 2e6,
              arrivalAltitude: 2e6,
            }),
          label,
        ).not.toThrow();
      }
    }
    // 7 bodies with orbits: 42 ordered pairs, of which the moon cases below are lifted
    expect(lifted).toBeGreaterThan(0);
  });

  it('says in words how a moon of another planet is reached (the issue: Tessel → Skerry shows Tessel → Moravel)', () => {
    const p = porkchopPair(sys, k('tessel'), k('skerry'));
    expect([id(sys, p.from), id(sys, p.to), p.kind]).toEqual(['tessel', 'moravel', SIBLINGS]);
    expect(p.through).toBe('Skerry is reached through Moravel: the window shown is Tessel → Moravel');
    const q = porkchopPair(sys, k('quill'), k('lough'));
    expect([id(sys, q.from), id(sys, q.to)]).toEqual(['tessel', 'moravel']);
    expect(q.through).toBe('Quill leaves through Tessel and Lough is reached through Moravel: the window shown is Tessel → Moravel');
    const r = porkchopPair(sys, k('skerry'), k('ochre'));
    expect(r.through).toBe('Skerry leaves through Moravel: the window shown is Moravel → Ochre');
  });

  it('keeps the three geometries a single transfer covers as they are', () => {
    expect(porkchopPair(sys, k('tessel'), k('quill'))).toMatchObject({ kind: FROM_PARENT, through: null });
    expect(porkchopPair(sys, k('skerry'), k('moravel'))).toMatchObject({ kind: TO_PARENT, through: null });
    expect(porkchopPair(sys, k('skerry'), k('lough'))).toMatchObject({ kind: SIBLINGS, through: null });
  });

  it('refuses the star, a body to itself and an index out of range with a typed error', () => {
    expect(() => porkchopPair(sys, 0, k('tessel'))).toThrow(InputError);
    expect(() => porkchopPair(sys, k('tessel'), k('tessel'))).toThrow(/must differ/);
    expect(() => porkchopPair(sys, k('tessel'), 99)).toThrow(InputError);
  });
});
