/**
 * A ship's track: its path given as arcs (each a function of time giving the state relative to
 * one body), cut at its discontinuities (burns: the velocity jumps, so a series across one would
 * need many short pieces) and fitted by bisected pieces (pieces.ts fitBisected) to a position
 * tolerance, tighter inside `fine` windows (near burns and periapses, where a game's eye and its
 * own physics are most sensitive).
 *
 * Degree: measured on the demo plan's patched-conic flight (10 m; 1 m in 20-minute windows around
 * the burns and periapses), the coefficient count hardly depends on it (degree 8: 2,295; 10: 2,112;
 * 12: 2,145; 14: 2,250; 16: 2,193; 20: 2,331), so 12, as for the bodies (55 pieces; the per-track
 * table is printed by `npm run bench -- runtime`).
 */
import { InputError, requireFinite, requirePositive } from '../math/index.ts';
import type { StarSystem } from '../system/index.ts';
import { type VectorSource, requireDegree } from './chebyshev.ts';
import type { FineWindow, RuntimeArc, RuntimeTrack } from './model.ts';
import { DEFAULT_PIECE_LIMITS, fitBisected } from './pieces.ts';

/** Default position tolerance of a ship's track, m. */
export const SHIP_TOLERANCE = 10;
/** Default degree of a ship's pieces. */
export const SHIP_DEGREE = 12;
/** A fine window's default tolerance, as a fraction of the track's. */
export const FINE_FRACTION = 0.1;

/** A stretch of the path about one body: `sample(t, out6)` writes [x, y, z, vx, vy, vz] relative to that body (m, m/s) for t in [t0, t1]. */
export interface ShipArcInput {
  t0: number;
  t1: number;
  /** Index of the centre in the system (0: the star). */
  center: number;
  /** At t0 and t1 it must give this arc's own state (the limit from inside), even where the next arc has another centre. */
  sample: VectorSource;
}

export interface FineWindowInput {
  t0: number;
  t1: number;
  /** Position tolerance in the window, m (default the track's tolerance × FINE_FRACTION). */
  tolerance?: number;
}

export interface ShipInput {
  /** Name of the track (unique in the file). */
  name: string;
  /** Arcs in time order, contiguous (each starts exactly where the previous ends). */
  arcs: ShipArcInput[];
  /** Times where the path is not smooth (burns); no piece spans one. */
  breaks?: number[];
  fine?: FineWindowInput[];
  /** Position tolerance, m (default SHIP_TOLERANCE). */
  tolerance?: number;
  /** Degree of the series (default SHIP_DEGREE). */
  degree?: number;
}

/** The ship's track; arc centres are mapped to track indices (body j → track j − 1, the star → −1). */
export function fitShipTrack(system: StarSystem, input: ShipInput): RuntimeTrack {
  if (typeof input.name !== 'string' || input.name.length === 0) throw new InputError('ship.name', 'must be a non-empty string', input.name);
  const tolerance = requirePositive('ship.tolerance', input.tolerance ?? SHIP_TOLERANCE);
  const degree = requireDegree('ship.degree', input.degree ?? SHIP_DEGREE);
  const arcs = input.arcs;
  if (!Array.isArray(arcs) || arcs.length === 0) throw new InputError('ship.arcs', 'must list at least one arc', arcs);
  arcs.forEach((arc, k) => {
    requireFinite(`ship.arcs[${k}].t0`, arc.t0);
    requireFinite(`ship.arcs[${k}].t1`, arc.t1);
    if (!(arc.t1 > arc.t0)) throw new InputError(`ship.arcs[${k}].t1`, `must be later than t0 (${arc.t0})`, arc.t1);
    if (k > 0 && arc.t0 !== arcs[k - 1].t1) throw new InputError(`ship.arcs[${k}].t0`, `must equal the previous arc's t1 (${arcs[k - 1].t1})`, arc.t0);
    if (!(Number.isInteger(arc.center) && arc.center >= 0 && arc.center < system.bodies.length)) {
      throw new InputError(`ship.arcs[${k}].center`, `must be a body index in [0, ${system.bodies.length - 1}]`, arc.center);
    }
    if (typeof arc.sample !== 'function') throw new InputError(`ship.arcs[${k}].sample`, 'must be a function (t, out6) => void', arc.sample);
  });
  const breaks = (input.breaks ?? []).map((t, k) => requireFinite(`ship.breaks[${k}]`, t));
  const fine: FineWindow[] = (input.fine ?? []).map((w, k) => {
    requireFinite(`ship.fine[${k}].t0`, w.t0);
    requireFinite(`ship.fine[${k}].t1`, w.t1);
    if (!(w.t1 > w.t0)) throw new InputError(`ship.fine[${k}].t1`, `must be later than t0 (${w.t0})`, w.t1);
    const tol = requirePositive(`ship.fine[${k}].tolerance`, w.tolerance ?? tolerance * FINE_FRACTION);
    return { t0: w.t0, t1: w.t1, tolerance: tol, maxError: 0 };
  });
  const toleranceOf = (a: number, b: number): number => {
    let tol = tolerance;
    for (const w of fine) if (a < w.t1 && b > w.t0 && w.tolerance < tol) tol = w.tolerance;
    return tol;
  };

  const out: RuntimeArc[] = [];
  let maxError = 0;
  for (const arc of arcs) {
    // cut points strictly inside the arc
    const cuts = [arc.t0, ...breaks.filter((t) => t > arc.t0 && t < arc.t1).sort((x, y) => x - y), arc.t1];
    const bounds: number[] = [arc.t0];
    const coef: Float64Array[] = [];
    for (let k = 0; k + 1 < cuts.length; k++) {
      if (!(cuts[k + 1] > cuts[k])) continue; // a repeated break
      const fit = fitBisected(arc.sample, cuts[k], cuts[k + 1], degree, toleranceOf, DEFAULT_PIECE_LIMITS);
      for (let i = 1; i < fit.breaks!.length; i++) bounds.push(fit.breaks![i]);
      coef.push(fit.coefficients);
      if (fit.maxError > maxError) maxError = fit.maxError;
      for (const w of fine) {
        for (let i = 0; i < fit.count; i++) {
          const a = fit.breaks![i];
          const b = fit.breaks![i + 1];
          if (a < w.t1 && b > w.t0 && fit.errors[i] > w.maxError) w.maxError = fit.errors[i];
        }
      }
    }
    const coefficients = new Float64Array(coef.reduce((n, c) => n + c.length, 0));
    let o = 0;
    for (const c of coef) {
      coefficients.set(c, o);
      o += c.length;
    }
    out.push({
      center: system.bodies[arc.center].id,
      centerIndex: arc.center - 1,
      t0: arc.t0,
      t1: arc.t1,
      count: bounds.length - 1,
      length: null,
      breaks: Float64Array.from(bounds),
      coefficients,
    });
  }
  return { name: input.name, kind: 'ship', degree, tolerance, maxError, fine, arcs: out };
}
