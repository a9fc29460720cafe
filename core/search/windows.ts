/**
 * Transfer windows from a porkchop grid: the grid's local minima of a metric, each refined by
 * a local optimiser on the continuous transfer cost, kept one per departure period.
 *
 * Steps
 * 1. Local minima: cells whose metric is below all 8 neighbours (ties broken by cell order,
 *    so a flat-bottomed basin gives one candidate); unsolved cells never qualify.
 * 2. Refinement: the downhill simplex (refine.ts) on (departure time, second-axis value) in a
 *    box of ±REFINE_BOX_CELLS grid steps around the cell, clipped to the grid's ranges, started
 *    from the cell with an initial step of one grid step, stopped when the metric spread over
 *    the simplex is ≤ REFINE_FTOL (0.01 m/s, or 0.01 m²/s² for C3) — well inside 1 m/s.
 * 3. Separation: candidates are taken best first; one whose refined departure lies within
 *    `minSeparation` of an accepted window with the same revolution count is the same window
 *    and is dropped. Each revolution count thus keeps one window per departure period (the
 *    short- and long-way minima of one period merge), and with multi-revolution arcs allowed a
 *    period may list a direct and a multi-revolution window side by side.
 * 4. The accepted windows whose departure lies in `span` are listed in departure order, the
 *    first `count` of them ("the next K windows").
 *
 * A window whose refined point lies on the boundary of the searched ranges is flagged
 * `atEdge`: its true minimum may lie outside the grid (widen the ranges to see it).
 */
import { InputError, requireFinite } from '../math/index.ts';
import { synodicPeriod } from '../orbit/index.ts';
import type { StarSystem } from '../system/index.ts';
import { metricPlane, type PorkchopGrid } from './porkchop.ts';
import { nelderMead } from './refine.ts';
import { axisStep, PORKCHOP_METRICS, type PorkchopMetric, type PorkchopRequest } from './request.ts';
import { evaluateTransfer, prepareTransfer, SIBLINGS, transferMetric, type TransferCell } from './transfer.ts';

/** Half-width of the refinement box, in grid steps. */
export const REFINE_BOX_CELLS = 2;
/** Metric spread at which the refinement stops (m/s, or m²/s² for C3). */
export const REFINE_FTOL = 0.01;
/** Simplex size at which the refinement stops, in grid steps. */
export const REFINE_XTOL = 1e-3;
/** Evaluation budget per refinement. */
export const REFINE_MAX_EVALUATIONS = 800;

export interface GridPoint {
  i: number;
  j: number;
  value: number;
}

export interface WindowOptions {
  /** Metric to minimise; default the grid request's. */
  metric?: PorkchopMetric;
  /** How many windows to list (K); default 5. */
  count?: number;
  /** Departure times to list windows from (s from the epoch); default the grid's departure range. */
  span?: { start: number; end: number };
  /** Least departure-time gap between two windows of the same revolution count, s; default `defaultSeparation`. */
  minSeparation?: number;
  /** Refine each minimum (default true); false reports the grid cells themselves. */
  refine?: boolean;
}

export interface TransferWindow extends TransferCell {
  /** The grid's local minimum the window came from. */
  grid: GridPoint;
  /** Metric evaluations spent refining (0 when not refined). */
  evaluations: number;
  /** True when the refinement met its tolerance (or no refinement was asked). */
  converged: boolean;
  /** The refined point lies on the boundary of the grid's ranges. */
  atEdge: boolean;
}

/** Local minima of a row-major plane (8-neighbourhood; ties go to the earlier cell), in cell order. */
export function localMinima(plane: ArrayLike<number>, nRows: number, nCols: number): GridPoint[] {
  if (plane.length < nRows * nCols) throw new InputError('plane', `must hold ${nRows * nCols} cells`, plane.length);
  const out: GridPoint[] = [];
  for (let i = 0; i < nRows; i++) {
    for (let j = 0; j < nCols; j++) {
      const k = i * nCols + j;
      const v = plane[k];
      if (!(v < Infinity)) continue;
      let isMin = true;
      for (let di = -1; di <= 1 && isMin; di++) {
        const ii = i + di;
        if (ii < 0 || ii >= nRows) continue;
        for (let dj = -1; dj <= 1; dj++) {
          const jj = j + dj;
          if ((di === 0 && dj === 0) || jj < 0 || jj >= nCols) continue;
          const m = ii * nCols + jj;
          const w = plane[m];
          // strictly lower than earlier cells, not higher than later ones
          if (m < k ? !(v < w) : !(v <= w)) {
            isMin = false;
            break;
          }
        }
      }
      if (isMin) out.push({ i, j, value: v });
    }
  }
  return out;
}

/**
 * Default least gap between windows: half the synodic period of the two bodies when they
 * orbit the same parent (windows recur once per synodic period), half the moon's period for a
 * planet–moon pair, and the whole departure range when the periods are equal.
 */
export function defaultSeparation(system: StarSystem, request: PorkchopRequest): number {
  const s = prepareTransfer(system, request);
  const span = Math.max(s.request.depart.end - s.request.depart.start, 0);
  if (s.kind === SIBLINGS) {
    const T1 = system.bodies[s.from].derived.period;
    const T2 = system.bodies[s.to].derived.period;
    if (T1 === T2) return span;
    return 0.5 * synodicPeriod(T1, T2);
  }
  const moon = s.central === s.from ? s.to : s.from;
  return 0.5 * system.bodies[moon].derived.period;
}

/** Windows of a computed grid: see the file comment. */
export function findWindows(system: StarSystem, grid: PorkchopGrid, options: WindowOptions = {}): TransferWindow[] {
  const req = grid.request;
  const metric = options.metric ?? req.metric;
  if (!PORKCHOP_METRICS.includes(metric)) throw new InputError('metric', `must be one of ${PORKCHOP_METRICS.join(', ')}`, metric);
  const count = options.count ?? 5;
  if (!Number.isInteger(count) || count < 1) throw new InputError('count', 'must be an integer >= 1', count);
  const span = options.span ?? { start: req.depart.start, end: req.depart.end };
  requireFinite('span.start', span.start);
  requireFinite('span.end', span.end);
  if (!(span.end >= span.start)) throw new InputError('span.end', 'must be >= span.start', span.end);
  const setup = prepareTransfer(system, { ...req, metric });
  const minSep = options.minSeparation ?? defaultSeparation(system, req);
  if (!(minSep >= 0) || !Number.isFinite(minSep)) throw new InputError('minSeparation', 'must be a finite number >= 0', minSep);
  const refine = options.refine ?? true;

  const { nRows, nCols } = grid.planes;
  const candidates = localMinima(metricPlane(grid.planes, metric), nRows, nCols).sort((a, b) => a.value - b.value || a.i - b.i || a.j - b.j);
  const arrivalAxis = req.secondAxis === 'arrival';
  const dStep = axisStep(req.depart);
  const yStep = axisStep(req.second);
  // f(departure, second-axis value)
  const f = (x: number[]): number => transferMetric(system, setup, x[0], arrivalAxis ? x[1] - x[0] : x[1]);

  const accepted: TransferWindow[] = [];
  const near = (t: number, revs: number): boolean => accepted.some((w) => w.revs === revs && Math.abs(w.departure - t) < minSep);
  const revsPlane = grid.planes.revs;
  for (const c of candidates) {
    const t0 = grid.departTimes[c.i];
    const y0 = grid.secondValues[c.j];
    if (near(t0, revsPlane[c.i * nCols + c.j])) continue;
    let tDep = t0;
    let y = y0;
    let evaluations = 0;
    let converged = true;
    if (refine) {
      const r = nelderMead(f, [t0, y0], [dStep, yStep], {
        lower: [Math.max(req.depart.start, t0 - REFINE_BOX_CELLS * dStep), Math.max(req.second.start, y0 - REFINE_BOX_CELLS * yStep)],
        upper: [Math.min(req.depart.end, t0 + REFINE_BOX_CELLS * dStep), Math.min(req.second.end, y0 + REFINE_BOX_CELLS * yStep)],
        fTol: REFINE_FTOL,
        xTol: REFINE_XTOL,
        maxEvaluations: REFINE_MAX_EVALUATIONS,
      });
      tDep = r.x[0];
      y = r.x[1];
      evaluations = r.evaluations;
      converged = r.converged;
    }
    const cell = evaluateTransfer(system, setup, tDep, arrivalAxis ? y - tDep : y);
    if (!cell.solved || near(tDep, cell.revs)) continue;
    const edge = (v: number, lo: number, hi: number, step: number): boolean => step > 0 && (v - lo <= 1e-6 * step || hi - v <= 1e-6 * step);
    accepted.push({
      ...cell,
      grid: c,
      evaluations,
      converged,
      atEdge: edge(tDep, req.depart.start, req.depart.end, dStep) || edge(y, req.second.start, req.second.end, yStep),
    });
  }
  return accepted
    .filter((w) => w.departure >= span.start && w.departure <= span.end)
    .sort((a, b) => a.departure - b.departure)
    .slice(0, count);
}
