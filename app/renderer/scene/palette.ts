/**
 * Waymark's own palette ("chart room at night"): ink-teal grounds, chalk text, mint for the
 * planned path, amber for burns, and a hue, shaft and head for each axis of a burn frame.
 * Shared by the 3D view, the charts and the legend so a colour means the same thing everywhere.
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
 * Waymark's burn-direction arrows, told apart by lightness and shape first and hue second, so
 * they read for every common colour-vision deficiency (no pair relies on red against green):
 * - along-track (VNB's V, RTN's T, inertial X): chalk white, the lightest, a solid shaft with a
 *   cone (triangle) head;
 * - in-plane cross-track (VNB's B, RTN's R, inertial Y): sea teal, mid lightness, a dashed
 *   shaft with a diamond head;
 * - out-of-plane (N in either local frame, inertial Z): rust, the darkest, a dotted shaft
 *   ending in a flat bar;
 * - the total Δv: the burn's own orange (as the burn markers), a solid shaft with a cone head,
 *   always the longest arrow.
 * The legend under the System view draws the same shafts and heads.
 */
export type ShaftStyle = 'solid' | 'dashed' | 'dotted';
export type HeadShape = 'cone' | 'diamond' | 'bar';

export const AXIS_STYLE = {
  along: { hue: '#f4f1e8', shaft: 'solid', head: 'cone' },
  inPlane: { hue: '#3fb59e', shaft: 'dashed', head: 'diamond' },
  normal: { hue: '#cc6a3f', shaft: 'dotted', head: 'bar' },
  total: { hue: '#ff9b45', shaft: 'solid', head: 'cone' },
} as const satisfies Record<string, { hue: string; shaft: ShaftStyle; head: HeadShape }>;

/** The arrows' hues alone (chips beside the Δv fields, charts). */
export const AXIS_HUE = {
  along: AXIS_STYLE.along.hue,
  inPlane: AXIS_STYLE.inPlane.hue,
  normal: AXIS_STYLE.normal.hue,
  total: AXIS_STYLE.total.hue,
} as const;

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
