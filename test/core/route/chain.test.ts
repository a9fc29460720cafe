import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/index.ts';
import { ROUTE_HOP_WORDS, routeChain } from '../../../core/route/chain.ts';
import { demoSystem } from '../plan/helpers.ts';

const sys = demoSystem();
const kinds = (from: string, to: string): string[] => routeChain(sys, from, to).map((l) => `${l.kind} ${l.from}→${l.to}`);

/** The body tree of Ilmar (assets/systems/ilmar.system.json): Kiln, Tessel+Quill, Ochre, Moravel+Skerry+Lough, Fennick. */
describe('routeChain on the demo system', () => {
  it('planet to planet: one hop between siblings of the star', () => {
    expect(kinds('tessel', 'ochre')).toEqual(['siblings tessel→ochre']);
    expect(kinds('fennick', 'kiln')).toEqual(['siblings fennick→kiln']);
  });
  it('planet to its own moon, and back', () => {
    expect(kinds('tessel', 'quill')).toEqual(['to-moon tessel→quill']);
    expect(kinds('quill', 'tessel')).toEqual(['to-parent quill→tessel']);
  });
  it('moon to sister moon: siblings of the planet', () => {
    expect(kinds('skerry', 'lough')).toEqual(['siblings skerry→lough']);
  });
  it('moon to another planet: out to the planet, then across', () => {
    expect(kinds('quill', 'moravel')).toEqual(['to-parent quill→tessel', 'siblings tessel→moravel']);
  });
  it("planet to another planet's moon: across, then down", () => {
    expect(kinds('tessel', 'skerry')).toEqual(['siblings tessel→moravel', 'to-moon moravel→skerry']);
  });
  it("moon to another planet's moon: out, across, down", () => {
    expect(kinds('quill', 'skerry')).toEqual(['to-parent quill→tessel', 'siblings tessel→moravel', 'to-moon moravel→skerry']);
    expect(kinds('lough', 'quill')).toEqual(['to-parent lough→moravel', 'siblings moravel→tessel', 'to-moon tessel→quill']);
  });
  it('every hop kind has words for the panel', () => {
    for (const k of ['siblings', 'to-moon', 'to-parent'] as const) expect(ROUTE_HOP_WORDS[k].length).toBeGreaterThan(0);
  });
  it('refuses the star, an unknown body and the same body, naming the field', () => {
    const err = (f: () => unknown): InputError => {
      try {
        f();
      } catch (e) {
        return e as InputError;
      }
      throw new Error('no error');
    };
    expect(err(() => routeChain(sys, 'ilmar', 'tessel')).field).toBe('from');
    expect(err(() => routeChain(sys, 'tessel', 'nowhere')).field).toBe('to');
    const same = err(() => routeChain(sys, 'skerry', 'skerry'));
    expect(same).toBeInstanceOf(InputError);
    expect(same.field).toBe('to');
  });
});
