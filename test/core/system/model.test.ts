import { describe, expect, it } from 'vitest';
import { findBodyIndex, STAR_INDEX } from '../../../core/system/model.ts';
import { planet, smallSystem } from './fixtures.ts';

describe('star system model', () => {
  const s = smallSystem([planet('constructor', {}), planet('world', {})]);

  it('finds bodies by id, the star at STAR_INDEX', () => {
    expect(findBodyIndex(s, 'sun')).toBe(STAR_INDEX);
    expect(s.bodies[STAR_INDEX].parentIndex).toBe(-1);
    expect(findBodyIndex(s, 'world')).toBe(2);
    expect(findBodyIndex(s, 'constructor')).toBe(1); // a legal slug that every object also inherits
  });

  it('answers −1 for unknown ids, including names every object inherits', () => {
    expect(findBodyIndex(s, 'nowhere')).toBe(-1);
    for (const id of ['__proto__', 'hasOwnProperty', 'toString', 'valueOf']) expect(findBodyIndex(s, id)).toBe(-1);
  });

  it('is plain data: survives structured cloning into a worker', () => {
    const c = structuredClone(s);
    expect(c.bodies).toEqual(s.bodies);
    expect(c.ephemeris.k).toBeInstanceOf(Float64Array);
    expect(findBodyIndex(c, 'world')).toBe(2);
  });
});
