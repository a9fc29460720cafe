/**
 * Piecewise Chebyshev fits of a 3-vector function over [t0, t1] to a stated position tolerance,
 * with the error *measured*: on each piece, the largest distance between the series and the
 * function at the check points of chebyshev.ts (the extremes of T_{N+1}, where the
 * interpolation error peaks, and the points midway between them).
 *
 * - Uniform pieces (the bodies): n equal pieces, so a reader finds a piece by index. Starting from
 *   a count the caller suggests, the count is halved while the fit holds and doubled while it
 *   fails, then bisected between the last count that failed and the first that held: the
 *   smallest count that meets the tolerance (the error falls as pieces shorten, Numerical Recipes,
 *   3rd ed., §5.8, from memory: geometrically for a smooth function).
 * - Bisected pieces (the ship): a piece whose error exceeds its tolerance is cut in half, and
 *   each half fitted again (adaptive subdivision, e.g. the recursive strategy of adaptive
 *   quadrature, Press et al., §4.7, from memory), so pieces are short only where the path bends
 *   fast (near periapses). A piece's tolerance may depend on where it lies (finer windows).
 *
 * Piece k of a uniform fit covers [t0 + k·length, t0 + k·length + length]; the evaluation and the
 * reader compute its ends by exactly that expression.
 */
import { InputError, SolverError } from '../math/index.ts';
import { MAX_DEGREE, type VectorSource, checkPoints, chebyshevPosition, fitChebyshev3 } from './chebyshev.ts';

/** The pieces of one fitted interval (one arc of a track). */
export interface FittedPieces {
  /** Span covered, s from the system epoch. */
  t0: number;
  t1: number;
  /** Degree of every piece's series. */
  degree: number;
  /** Number of pieces. */
  count: number;
  /** Uniform pieces: their common length, s; null when the pieces are listed by `breaks`. */
  length: number | null;
  /** Listed pieces: their count + 1 boundaries, t0 first and t1 last; null for uniform pieces. */
  breaks: Float64Array | null;
  /** count × 3(degree + 1) coefficients, piece after piece, each [x_0..x_N, y_0..y_N, z_0..z_N], m. */
  coefficients: Float64Array;
  /** Position error measured on each piece, m. */
  errors: Float64Array;
  /** The largest of `errors`, m. */
  maxError: number;
}

/** Limits of one fit (work bound: a tolerance below what double precision can hold must fail, not run on). */
export interface PieceLimits {
  /** Most pieces in one fitted interval. */
  maxPieces: number;
  /** Shortest piece, s. */
  minLength: number;
}

export const DEFAULT_PIECE_LIMITS: PieceLimits = { maxPieces: 100_000, minLength: 1e-3 };

const state = new Float64Array(6);
const fitted = new Float64Array(3);

/** Sampled errors below this fraction of a piece's largest are not refined (see `pieceError`). */
const REFINE_FRACTION = 0.98;
/** Golden-section steps per refined peak: the bracket shrinks to 0.618^24 ≈ 1e-5 of the spacing of the check points. */
const REFINE_STEPS = 24;
/**
 * Added to each piece's measured error: 16 units of roundoff of its largest coordinate, the
 * double-precision noise of the series' sum and of the source's own evaluation, which no sampling
 * can bound (it differs from one time to the next).
 */
export const NOISE_ULPS = 16;

const sampled = new Float64Array(2 * MAX_DEGREE + 3);
let largest = 0;

/** Distance between the series and f at t (and the largest |coordinate| of f seen, in `largest`). */
function distance(f: VectorSource, coef: Float64Array, offset: number, degree: number, a: number, b: number, t: number): number {
  f(t, state);
  if (!(Number.isFinite(state[0]) && Number.isFinite(state[1]) && Number.isFinite(state[2]))) {
    throw new InputError('source', `must give a finite position (at t = ${t})`, [state[0], state[1], state[2]]);
  }
  chebyshevPosition(coef, offset, degree, a, b, t, fitted);
  const r = Math.max(Math.abs(state[0]), Math.abs(state[1]), Math.abs(state[2]));
  if (r > largest) largest = r;
  return Math.hypot(fitted[0] - state[0], fitted[1] - state[1], fitted[2] - state[2]);
}

/**
 * Measured position error of the piece at `offset` of `coef` on [a, b] against f (m): the
 * largest distance at the check points; each local peak within REFINE_FRACTION of that largest is
 * then refined by golden-section search between its neighbouring check points (a peak of the
 * error sits a little off the extreme of T_{N+1} where the next terms tilt it; Press et al.,
 * §10.2, from memory); plus NOISE_ULPS units of roundoff of the largest coordinate. Throws
 * InputError when f gives a non-finite position.
 */
export function pieceError(f: VectorSource, coef: Float64Array, offset: number, degree: number, a: number, b: number, points: Float64Array): number {
  const half = 0.5 * (b - a);
  const n = points.length;
  // both ends exactly (t = b, t = a), the interior points through the mid-point form
  const at = (s: number, m: number): number => (m === 0 ? b : m === n - 1 ? a : a + half + half * s);
  largest = 0;
  let worst = 0;
  for (let m = 0; m < n; m++) {
    const d = distance(f, coef, offset, degree, a, b, at(points[m], m));
    sampled[m] = d;
    if (d > worst) worst = d;
  }
  let refined = worst;
  const g = 0.5 * (Math.sqrt(5) - 1);
  for (let m = 1; m < n - 1; m++) {
    if (!(sampled[m] >= REFINE_FRACTION * worst && sampled[m] >= sampled[m - 1] && sampled[m] >= sampled[m + 1])) continue;
    // golden-section search for the largest distance with s between the neighbouring check points
    let lo = points[m + 1];
    let hi = points[m - 1];
    let x1 = hi - g * (hi - lo);
    let x2 = lo + g * (hi - lo);
    let d1 = distance(f, coef, offset, degree, a, b, at(x1, m));
    let d2 = distance(f, coef, offset, degree, a, b, at(x2, m));
    for (let i = 0; i < REFINE_STEPS; i++) {
      if (d1 >= d2) {
        hi = x2;
        x2 = x1;
        d2 = d1;
        x1 = hi - g * (hi - lo);
        d1 = distance(f, coef, offset, degree, a, b, at(x1, m));
      } else {
        lo = x1;
        x1 = x2;
        d1 = d2;
        x2 = lo + g * (hi - lo);
        d2 = distance(f, coef, offset, degree, a, b, at(x2, m));
      }
    }
    refined = Math.max(refined, d1, d2);
  }
  return refined + NOISE_ULPS * Number.EPSILON * largest;
}

function tooFine(what: string, detail: string, inputs: Record<string, unknown>): SolverError {
  return new SolverError('runtime-fit', 'precision-lost', `${what}: ${detail}`, inputs);
}

/**
 * `count` uniform pieces on [t0, t1]: returns the largest measured error, stopping at the first
 * piece over `stopAbove` (then the result is that piece's error).
 */
function tryUniform(
  f: VectorSource,
  t0: number,
  t1: number,
  degree: number,
  count: number,
  stopAbove: number,
  coef: Float64Array,
  errors: Float64Array,
): number {
  const stride = 3 * (degree + 1);
  const length = (t1 - t0) / count;
  const points = checkPoints(degree);
  let worst = 0;
  for (let k = 0; k < count; k++) {
    const a = t0 + k * length;
    const b = a + length;
    fitChebyshev3(f, a, b, degree, coef, k * stride);
    const e = pieceError(f, coef, k * stride, degree, a, b, points);
    errors[k] = e;
    if (!(e <= worst)) worst = e;
    if (!(e <= stopAbove)) return e;
  }
  return worst;
}

/**
 * The fewest equal pieces of degree `degree` on [t0, t1] whose measured error is within
 * `tolerance`, searched from `firstCount` (see the file comment). Throws SolverError when more than
 * `limits.maxPieces` pieces (or pieces shorter than `limits.minLength`) would be needed.
 */
export function fitUniform(
  f: VectorSource,
  t0: number,
  t1: number,
  degree: number,
  tolerance: number,
  firstCount: number,
  limits: PieceLimits = DEFAULT_PIECE_LIMITS,
): FittedPieces {
  const stride = 3 * (degree + 1);
  const span = t1 - t0;
  const maxCount = Math.max(1, Math.min(limits.maxPieces, Math.floor(span / limits.minLength)));
  const ok = (count: number): boolean => {
    const coef = new Float64Array(count * stride);
    const errors = new Float64Array(count);
    return tryUniform(f, t0, t1, degree, count, tolerance, coef, errors) <= tolerance;
  };
  let good = Number.isFinite(firstCount) ? Math.min(Math.max(1, Math.round(firstCount)), maxCount) : 1;
  let bad = 0; // largest count known to fail (0: none yet)
  if (ok(good)) {
    while (good > 1) {
      const fewer = Math.floor(good / 2);
      if (!ok(fewer)) {
        bad = fewer;
        break;
      }
      good = fewer;
    }
  } else {
    bad = good;
    for (;;) {
      if (bad >= maxCount) {
        throw tooFine('uniform pieces', `the tolerance ${tolerance} m is not met with ${maxCount} pieces of degree ${degree}`, { t0, t1, degree, tolerance });
      }
      const more = Math.min(2 * bad, maxCount);
      if (ok(more)) {
        good = more;
        break;
      }
      bad = more;
    }
  }
  while (good - bad > 1) {
    const mid = (good + bad) >> 1;
    if (ok(mid)) good = mid;
    else bad = mid;
  }
  const coefficients = new Float64Array(good * stride);
  const errors = new Float64Array(good);
  const maxError = tryUniform(f, t0, t1, degree, good, Infinity, coefficients, errors);
  return { t0, t1, degree, count: good, length: span / good, breaks: null, coefficients, errors, maxError };
}

/**
 * Pieces of degree `degree` on [t0, t1] by bisection: a piece whose measured error exceeds
 * `toleranceOf(a, b)` is halved. Throws SolverError when a piece would get shorter than
 * `limits.minLength` or the pieces more than `limits.maxPieces`.
 */
export function fitBisected(
  f: VectorSource,
  t0: number,
  t1: number,
  degree: number,
  toleranceOf: (a: number, b: number) => number,
  limits: PieceLimits = DEFAULT_PIECE_LIMITS,
): FittedPieces {
  const stride = 3 * (degree + 1);
  const points = checkPoints(degree);
  const piece = new Float64Array(stride);
  const breaks: number[] = [t0];
  const coef: number[] = [];
  const errors: number[] = [];
  // Intervals still to fit, the leftmost on top, so accepted pieces come out in time order.
  const todo: number[] = [t1, t0];
  while (todo.length > 0) {
    const a = todo.pop()!;
    const b = todo.pop()!;
    fitChebyshev3(f, a, b, degree, piece, 0);
    const e = pieceError(f, piece, 0, degree, a, b, points);
    const tol = toleranceOf(a, b);
    if (e <= tol) {
      breaks.push(b);
      for (let i = 0; i < stride; i++) coef.push(piece[i]);
      errors.push(e);
      if (errors.length > limits.maxPieces) {
        throw tooFine('bisected pieces', `more than ${limits.maxPieces} pieces of degree ${degree} are needed`, { t0, t1, degree });
      }
      continue;
    }
    const m = a + 0.5 * (b - a);
    if (!(m - a >= limits.minLength)) {
      throw tooFine('bisected pieces', `the tolerance ${tol} m is not met near t = ${a} s even by pieces ${limits.minLength} s long (error ${e} m)`, {
        a,
        b,
        degree,
        tolerance: tol,
      });
    }
    todo.push(b, m, m, a);
  }
  let maxError = 0;
  for (const e of errors) if (e > maxError) maxError = e;
  // the last boundary is exactly t1 (the rightmost piece ends at it)
  return {
    t0,
    t1,
    degree,
    count: errors.length,
    length: null,
    breaks: Float64Array.from(breaks),
    coefficients: Float64Array.from(coef),
    errors: Float64Array.from(errors),
    maxError,
  };
}
