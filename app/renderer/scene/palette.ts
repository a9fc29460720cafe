/**
 * Waymark's own palette ("chart room at night"): ink-teal grounds, chalk text, mint for the
 * planned path, amber for burns, and three hues for the axes of a burn frame. Shared by the
 * 3D view, the charts and the legend so a colour means the same thing everywhere.
 */
export const PALETTE = {
  ground: '#0f1416',
  panel: '#151c1f',
  rule: '#26322f',
  chalk: '#dfe6e1',
  muted: '#8c9b95',
  path: '#6fdcae',
  burn: '#ff9b45',
  ship: '#f4f1e8',
  warn: '#e9b949',
  error: '#f06b5b',
  good: '#7fd67a',
  cursor: '#f4f1e8',
  grid: '#1d2a28',
  /** The n-body verification's path. */
  nbody: '#b9a4ff',
} as const;

/**
 * Hues of a burn's Δv components, grouped by what the axis means physically:
 * along-track (VNB's V, RTN's T, inertial X) saffron; in-plane cross-track (VNB's B, RTN's R,
 * inertial Y) orchid; out-of-plane (N in either local frame, inertial Z) sky. The total Δv is
 * drawn in chalk.
 */
export const AXIS_HUE = { along: '#f4b942', inPlane: '#d672c9', normal: '#58c4f0', total: '#dfe6e1' } as const;

export type AxisRole = 'along' | 'inPlane' | 'normal';

/** Axis names and roles of each burn frame, in component order. */
export const FRAME_AXES: Record<'vnb' | 'rtn' | 'inertial', { name: string; role: AxisRole }[]> = {
  vnb: [
    { name: 'V', role: 'along' },
    { name: 'N', role: 'normal' },
    { name: 'B', role: 'inPlane' },
  ],
  rtn: [
    { name: 'R', role: 'inPlane' },
    { name: 'T', role: 'along' },
    { name: 'N', role: 'normal' },
  ],
  inertial: [
    { name: 'X', role: 'along' },
    { name: 'Y', role: 'inPlane' },
    { name: 'Z', role: 'normal' },
  ],
};

/** Colours for bodies whose file gives none (by depth: planets warm greys, moons cool greys). */
const FALLBACK = ['#b8a88a', '#8fa3a8', '#a89bb5', '#9db58f', '#b59a8f'];

export function bodyColour(colour: string | null, index: number): string {
  return colour ?? FALLBACK[index % FALLBACK.length];
}
