/**
 * The table of game axis conventions (core/io/gameAxes.ts) against linear algebra: each matrix is
 * orthogonal (MᵀM = I) with determinant +1 when it says right-handed and −1 when it says
 * left-handed, and fromGameAxes undoes toGameAxes. (How the conventions act on vectors — lengths,
 * dot and cross products, the up axis — is checked through the schedule in gameSchedule.test.ts.)
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { GAME_AXES, GAME_AXES_NAMES, fromGameAxes, toGameAxes } from '../../../core/io/gameAxes.ts';

/** Determinant of a 3×3 matrix by cofactor expansion along the first row. */
const det = (m: readonly (readonly number[])[]): number =>
  m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1]) - m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0]) + m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0]);

describe('game axis conventions', () => {
  it('names exactly the conventions of the table', () => {
    expect([...GAME_AXES_NAMES].sort()).toEqual(Object.keys(GAME_AXES).sort());
  });

  for (const name of GAME_AXES_NAMES) {
    const { matrix: m, handed, up } = GAME_AXES[name];
    it(`${name}: orthogonal, det ${handed === 'right' ? '+1' : '−1'}, named for its up axis and handedness`, () => {
      for (let i = 0; i < 3; i++) {
        for (let j = 0; j < 3; j++) {
          const mtm = m[0][i] * m[0][j] + m[1][i] * m[1][j] + m[2][i] * m[2][j];
          expect(mtm).toBe(i === j ? 1 : 0);
        }
      }
      expect(det(m)).toBe(handed === 'right' ? 1 : -1);
      expect(name).toBe(`${up}-up-${handed}-handed`);
    });

    it(`${name}: fromGameAxes undoes toGameAxes (a signed permutation: exactly, with no scaling)`, () => {
      const x = fc.double({ min: -1e15, max: 1e15, noNaN: true });
      fc.assert(
        fc.property(fc.tuple(x, x, x), (v) => {
          const back = fromGameAxes(name, toGameAxes(name, v, 1, 1, [0, 0, 0]), 1, 1, [0, 0, 0]);
          expect(back.map((c) => c + 0)).toEqual(v.map((c) => c + 0));
        }),
        { numRuns: 200, seed: 15 },
      );
    });
  }
});
