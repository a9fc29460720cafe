/**
 * Small dense linear algebra on row-major Float64Array / number[] matrices, for Newton
 * corrections and fits with a handful of unknowns.
 *
 * - `solve` / `solveInPlace`: A·x = b by Gaussian elimination with scaled partial pivoting,
 *   after equilibrating the columns (Golub & Van Loan, Matrix Computations, 4th ed., §3.2 and
 *   §3.5.2; implicit row scaling as in Press et al., Numerical Recipes, 3rd ed., §2.3). Column
 *   equilibration makes the singularity test independent of the units of the unknowns, which
 *   matters when a Jacobian mixes metres and metres per second.
 * - `dampedLeastSquares`: minimises |J·x − r|² + λ|x|², i.e. solves (JᵀJ + λI)·x = Jᵀr (the
 *   Levenberg–Marquardt step), by Householder QR of the stacked system [J; √λ·I] (Golub & Van
 *   Loan §5.3; Nocedal & Wright, Numerical Optimization, 2nd ed., §10.3), never forming JᵀJ.
 *   `leastSquares` is the λ = 0 case.
 *
 * Singular or rank-deficient systems raise SolverError('linalg', 'no-solution', ...); bad
 * shapes or non-finite entries raise InputError.
 */
import { InputError, SolverError } from './errors.ts';

const EPS = Number.EPSILON;
/** A pivot below SINGULAR_FACTOR·n·ε of its (scaled) row counts as zero. */
export const SINGULAR_FACTOR = 8;

type Vec = Float64Array | number[];

// Module-scope scratch, grown on demand: the hot path reuses it and allocates nothing.
let colScale = new Float64Array(8);
let rowScale = new Float64Array(8);

function ensureScratch(n: number): void {
  if (colScale.length < n) {
    colScale = new Float64Array(n);
    rowScale = new Float64Array(n);
  }
}

function checkFinite(field: string, a: ArrayLike<number>, len: number): void {
  if (!a || a.length !== len) throw new InputError(field, `must have ${len} entries`, a?.length);
  for (let k = 0; k < len; k++) {
    if (typeof a[k] !== 'number' || !Number.isFinite(a[k])) throw new InputError(`${field}[${k}]`, 'must be a finite number', a[k]);
  }
}

/**
 * Solves A·x = b in place: A (n×n, row-major) is overwritten with its eliminated form and b
 * with x. Allocation-free after the first call of a given size. Returns b.
 */
export function solveInPlace(n: number, A: Vec, b: Vec): Vec {
  if (!Number.isInteger(n) || n < 1) throw new InputError('n', 'must be an integer >= 1', n);
  checkFinite('A', A, n * n);
  checkFinite('b', b, n);
  ensureScratch(n);
  // column equilibration: Ã = A·D⁻¹ with D = diag(max |A_ij| over i)
  for (let j = 0; j < n; j++) {
    let m = 0;
    for (let i = 0; i < n; i++) m = Math.max(m, Math.abs(A[i * n + j]));
    if (m === 0) throw new SolverError('linalg', 'no-solution', `matrix is singular: column ${j} is zero`, { n, column: j });
    colScale[j] = m;
    for (let i = 0; i < n; i++) A[i * n + j] /= m;
  }
  for (let i = 0; i < n; i++) {
    let m = 0;
    for (let j = 0; j < n; j++) m = Math.max(m, Math.abs(A[i * n + j]));
    if (m === 0) throw new SolverError('linalg', 'no-solution', `matrix is singular: row ${i} is zero`, { n, row: i });
    rowScale[i] = m;
  }
  const tiny = SINGULAR_FACTOR * n * EPS;
  for (let k = 0; k < n; k++) {
    // scaled partial pivoting
    let p = k;
    let best = -1;
    for (let i = k; i < n; i++) {
      const s = Math.abs(A[i * n + k]) / rowScale[i];
      if (s > best) {
        best = s;
        p = i;
      }
    }
    if (!(best > tiny)) {
      throw new SolverError('linalg', 'no-solution', `matrix is singular to working precision (pivot ${k})`, { n, pivot: k, scaledPivot: best });
    }
    if (p !== k) {
      for (let j = 0; j < n; j++) {
        const t = A[k * n + j];
        A[k * n + j] = A[p * n + j];
        A[p * n + j] = t;
      }
      const tb = b[k];
      b[k] = b[p];
      b[p] = tb;
      const ts = rowScale[k];
      rowScale[k] = rowScale[p];
      rowScale[p] = ts;
    }
    const piv = A[k * n + k];
    for (let i = k + 1; i < n; i++) {
      const f = A[i * n + k] / piv;
      if (f === 0) continue;
      A[i * n + k] = 0;
      for (let j = k + 1; j < n; j++) A[i * n + j] -= f * A[k * n + j];
      b[i] -= f * b[k];
    }
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i];
    for (let j = i + 1; j < n; j++) s -= A[i * n + j] * b[j];
    b[i] = s / A[i * n + i];
  }
  for (let j = 0; j < n; j++) b[j] /= colScale[j];
  for (let j = 0; j < n; j++) {
    if (!Number.isFinite(b[j])) throw new SolverError('linalg', 'non-finite', `solution component ${j} is ${b[j]}`, { n });
  }
  return b;
}

/**
 * x with A·x = b, A square (n×n row-major, n = b.length). A and b are left unchanged.
 * Allocates a copy of A; use `solveInPlace` in loops.
 */
export function solve(A: ArrayLike<number>, b: ArrayLike<number>, out?: Vec): Vec {
  const n = b?.length ?? 0;
  if (n < 1) throw new InputError('b', 'must have at least one entry', b);
  if (!A || A.length !== n * n) throw new InputError('A', `must have ${n * n} entries (n×n with n = b.length = ${n})`, A?.length);
  const a = Float64Array.from(A);
  const x = out ?? new Float64Array(n);
  if (x.length !== n) throw new InputError('out', `must have ${n} entries`, x.length);
  for (let k = 0; k < n; k++) x[k] = b[k];
  return solveInPlace(n, a, x);
}

/**
 * x minimising |J·x − r|² + λ|x|² for J (m×n row-major), i.e. the solution of
 * (JᵀJ + λI)·x = Jᵀr. λ = 0 needs m ≥ n and J of full column rank. Columns are equilibrated
 * before the QR, so the rank test does not depend on the units of x.
 */
export function dampedLeastSquares(J: ArrayLike<number>, r: ArrayLike<number>, m: number, n: number, lambda: number, out?: Vec): Vec {
  if (!Number.isInteger(m) || m < 1) throw new InputError('m', 'must be an integer >= 1', m);
  if (!Number.isInteger(n) || n < 1) throw new InputError('n', 'must be an integer >= 1', n);
  checkFinite('J', J, m * n);
  checkFinite('r', r, m);
  if (typeof lambda !== 'number' || !Number.isFinite(lambda) || lambda < 0) throw new InputError('lambda', 'must be a finite number >= 0', lambda);
  if (lambda === 0 && m < n) throw new InputError('m', `must be >= n (${n}) for an undamped least-squares fit`, m);
  const x = out ?? new Float64Array(n);
  if (x.length !== n) throw new InputError('out', `must have ${n} entries`, x.length);

  const rows = lambda > 0 ? m + n : m;
  const a = new Float64Array(rows * n);
  const rhs = new Float64Array(rows);
  const scale = new Float64Array(n);
  const sl = Math.sqrt(lambda);
  for (let i = 0; i < m; i++) {
    for (let j = 0; j < n; j++) a[i * n + j] = J[i * n + j];
    rhs[i] = r[i];
  }
  if (lambda > 0) for (let j = 0; j < n; j++) a[(m + j) * n + j] = sl;
  // column equilibration by the 2-norm of each stacked column
  for (let j = 0; j < n; j++) {
    let s = 0;
    for (let i = 0; i < rows; i++) s = Math.max(s, Math.abs(a[i * n + j]));
    let ss = 0;
    if (s > 0) for (let i = 0; i < rows; i++) ss += (a[i * n + j] / s) ** 2;
    const c = s * Math.sqrt(ss);
    if (c === 0) throw new SolverError('linalg', 'no-solution', `least-squares matrix is rank deficient: column ${j} is zero`, { m, n, column: j });
    scale[j] = c;
    for (let i = 0; i < rows; i++) a[i * n + j] /= c;
  }
  // Householder QR, applying each reflector to the remaining columns and to rhs
  const tiny = SINGULAR_FACTOR * rows * EPS;
  for (let k = 0; k < n; k++) {
    let sigma = 0;
    for (let i = k; i < rows; i++) sigma += a[i * n + k] ** 2;
    sigma = Math.sqrt(sigma);
    if (!(sigma > tiny)) {
      throw new SolverError('linalg', 'no-solution', `least-squares matrix is rank deficient (column ${k})`, { m, n, column: k, lambda });
    }
    const akk = a[k * n + k];
    const alpha = akk > 0 ? -sigma : sigma;
    // v = a[k:, k] − alpha·e_k, stored in place; vᵀv = 2σ(σ + |akk|)
    a[k * n + k] = akk - alpha;
    const vtv = 2 * sigma * (sigma + Math.abs(akk));
    for (let j = k + 1; j < n; j++) {
      let d = 0;
      for (let i = k; i < rows; i++) d += a[i * n + k] * a[i * n + j];
      const f = (2 * d) / vtv;
      for (let i = k; i < rows; i++) a[i * n + j] -= f * a[i * n + k];
    }
    let d = 0;
    for (let i = k; i < rows; i++) d += a[i * n + k] * rhs[i];
    const f = (2 * d) / vtv;
    for (let i = k; i < rows; i++) rhs[i] -= f * a[i * n + k];
    a[k * n + k] = alpha; // R_kk
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = rhs[i];
    for (let j = i + 1; j < n; j++) s -= a[i * n + j] * x[j];
    x[i] = s / a[i * n + i];
  }
  for (let j = 0; j < n; j++) {
    x[j] /= scale[j];
    if (!Number.isFinite(x[j])) throw new SolverError('linalg', 'non-finite', `solution component ${j} is ${x[j]}`, { m, n, lambda });
  }
  return x;
}

/** x minimising |J·x − r|² for J (m×n row-major, m ≥ n, full column rank). */
export function leastSquares(J: ArrayLike<number>, r: ArrayLike<number>, m: number, n: number, out?: Vec): Vec {
  return dampedLeastSquares(J, r, m, n, 0, out);
}
