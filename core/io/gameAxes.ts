/**
 * The axis conventions a game's world may use, each as the matrix that takes a vector's
 * components in Waymark's axes (star-centred, x and y in the system's reference plane, z towards
 * its north pole, right-handed) to the same vector's components in the game's axes:
 *   v_game = M · v_waymark,   v_waymark = Mᵀ · v_game   (every M is a signed permutation: Mᵀ = M⁻¹).
 *
 * Rule of the table: det M = +1 for a right-handed game (a rotation: cross products carry
 * over, a × b ↦ a' × b'), det M = −1 for a left-handed one (a reflection: a × b ↦ −(a' × b'));
 * "up" names the game axis that Waymark's +z (north of the reference plane) becomes.
 *
 * | name                | x' | y' | z' | det |
 * |---------------------|----|----|----|-----|
 * | z-up-right-handed   |  x |  y |  z | +1  |  (Waymark's own: the identity)
 * | y-up-right-handed   |  x |  z | −y | +1  |
 * | y-up-left-handed    |  x |  z |  y | −1  |
 * | z-up-left-handed    |  x | −y |  z | −1  |
 *
 * Method: change of basis by an orthogonal matrix (any linear-algebra text; an orthogonal M
 * keeps lengths and dot products, and M(a × b) = det M · (Ma × Mb)).
 */
import type { Vec3Like } from '../math/index.ts';

type Out = [number, number, number];

export type GameAxesName = 'z-up-right-handed' | 'y-up-right-handed' | 'y-up-left-handed' | 'z-up-left-handed';

export interface GameAxes {
  /** The game axis Waymark's +z becomes. */
  up: 'y' | 'z';
  handed: 'right' | 'left';
  /** Rows of M: game component i = Σ_j matrix[i][j] · Waymark component j. */
  matrix: readonly [readonly [number, number, number], readonly [number, number, number], readonly [number, number, number]];
}

export const GAME_AXES: Readonly<Record<GameAxesName, GameAxes>> = {
  'z-up-right-handed': {
    up: 'z',
    handed: 'right',
    matrix: [
      [1, 0, 0],
      [0, 1, 0],
      [0, 0, 1],
    ],
  },
  'y-up-right-handed': {
    up: 'y',
    handed: 'right',
    matrix: [
      [1, 0, 0],
      [0, 0, 1],
      [0, -1, 0],
    ],
  },
  'y-up-left-handed': {
    up: 'y',
    handed: 'left',
    matrix: [
      [1, 0, 0],
      [0, 0, 1],
      [0, 1, 0],
    ],
  },
  'z-up-left-handed': {
    up: 'z',
    handed: 'left',
    matrix: [
      [1, 0, 0],
      [0, -1, 0],
      [0, 0, 1],
    ],
  },
};

/** The convention names, in the table's order. */
export const GAME_AXES_NAMES = ['z-up-right-handed', 'y-up-right-handed', 'y-up-left-handed', 'z-up-left-handed'] as const satisfies readonly GameAxesName[];

/** `v` (Waymark's axes) in the game's axes (M · v), times `mul`, divided by `div`, written to `out`. */
export function toGameAxes(axes: GameAxesName, v: Vec3Like, mul: number, div: number, out: Out): Out {
  const m = GAME_AXES[axes].matrix;
  const x = v[0];
  const y = v[1];
  const z = v[2];
  out[0] = ((m[0][0] * x + m[0][1] * y + m[0][2] * z) * mul) / div;
  out[1] = ((m[1][0] * x + m[1][1] * y + m[1][2] * z) * mul) / div;
  out[2] = ((m[2][0] * x + m[2][1] * y + m[2][2] * z) * mul) / div;
  return out;
}

/** `v` (the game's axes) in Waymark's axes (Mᵀ · v), the inverse of `toGameAxes` with the same `mul` and `div`, written to `out`. */
export function fromGameAxes(axes: GameAxesName, v: Vec3Like, mul: number, div: number, out: Out): Out {
  const m = GAME_AXES[axes].matrix;
  const x = v[0];
  const y = v[1];
  const z = v[2];
  out[0] = ((m[0][0] * x + m[1][0] * y + m[2][0] * z) * div) / mul;
  out[1] = ((m[0][1] * x + m[1][1] * y + m[2][1] * z) * div) / mul;
  out[2] = ((m[0][2] * x + m[1][2] * y + m[2][2] * z) * div) / mul;
  return out;
}
