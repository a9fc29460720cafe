/**
 * The storage of a porkchop grid, or of a band of its rows: one typed array per quantity
 * ("plane"), row-major — cell (i, j), departure sample i and second-axis sample j, sits at
 * (i − rowStart)·nCols + j.
 *
 * Float quantities are Float32Array (about 7 significant digits: a relative rounding of at
 * most 2^−24, below 1 mm/s for speeds up to 16.7 km/s; 1000 × 1000 cells take 4 MB per
 * plane). Unsolved cells hold +Infinity in every float plane and −1 in `revs` and `branch` —
 * never NaN.
 */

export interface PorkchopPlanes {
  /** First departure row held. */
  rowStart: number;
  /** Number of departure rows held. */
  nRows: number;
  /** Second-axis samples per row. */
  nCols: number;
  /** Departure burn, m/s. */
  dvDepart: Float32Array;
  /** Capture burn, m/s. */
  dvArrive: Float32Array;
  /** Sum of the two, m/s. */
  dvTotal: Float32Array;
  /** Characteristic energy at departure, m²/s². */
  c3: Float32Array;
  /** Excess speed at departure, m/s. */
  vInfDepart: Float32Array;
  /** Excess speed at arrival, m/s. */
  vInfArrive: Float32Array;
  /** Complete revolutions of the chosen arc (−1 unsolved). */
  revs: Int8Array;
  /** Branch of the chosen arc: 0 single, 1 left, 2 right (Izzo), −1 unsolved. */
  branch: Int8Array;
}

/** Names of the float planes, in a fixed order. */
export const FLOAT_PLANES = ['dvDepart', 'dvArrive', 'dvTotal', 'c3', 'vInfDepart', 'vInfArrive'] as const;
/** Names of the integer planes. */
export const INT_PLANES = ['revs', 'branch'] as const;

export type FloatPlaneName = (typeof FLOAT_PLANES)[number];

/** Empty planes for rows [rowStart, rowStart + nRows) of nCols columns. */
export function createPlanes(rowStart: number, nRows: number, nCols: number): PorkchopPlanes {
  const n = nRows * nCols;
  return {
    rowStart,
    nRows,
    nCols,
    dvDepart: new Float32Array(n),
    dvArrive: new Float32Array(n),
    dvTotal: new Float32Array(n),
    c3: new Float32Array(n),
    vInfDepart: new Float32Array(n),
    vInfArrive: new Float32Array(n),
    revs: new Int8Array(n),
    branch: new Int8Array(n),
  };
}

/** The ArrayBuffers behind the planes (for a transfer list). */
export function planeBuffers(p: PorkchopPlanes): ArrayBuffer[] {
  return [...FLOAT_PLANES.map((k) => p[k].buffer), ...INT_PLANES.map((k) => p[k].buffer)] as ArrayBuffer[];
}
