/**
 * The small set of error types every layer of the core raises.
 *
 * - `InputError`: a caller passed a value that breaks a rule (NaN, μ ≤ 0, zero vector ...).
 *   Carries the field name and the rule, e.g. field "mu", rule "must be > 0".
 * - `ValidationError`: a document (system file, plan file) broke one or more rules; carries
 *   every issue found, each with a JSON-pointer-like path ("bodies[3].orbit.e") and its rule.
 * - `SolverError`: a numerical method could not produce an answer; carries a machine-readable
 *   reason and the inputs that caused it.
 *
 * No NaN leaves the core: functions check their inputs and their outputs and throw one of these.
 */

export class WaymarkError extends Error {
  override name = 'WaymarkError';
}

export class InputError extends WaymarkError {
  override name = 'InputError';
  constructor(
    readonly field: string,
    readonly rule: string,
    readonly value?: unknown,
  ) {
    super(`${field} ${rule}${value === undefined ? '' : ` (got ${formatValue(value)})`}`);
  }
}

export interface ValidationIssue {
  /** Field path, e.g. "bodies[3].orbit.e"; "" for the document itself. */
  path: string;
  /** The rule broken, e.g. "must be < 1". */
  rule: string;
  /** "error" stops the document from loading; "warning" is reported but the document loads. */
  severity: 'error' | 'warning';
}

export class ValidationError extends WaymarkError {
  override name = 'ValidationError';
  constructor(
    readonly what: string,
    readonly issues: ValidationIssue[],
  ) {
    super(
      `${what}: ${issues.length} problem${issues.length === 1 ? '' : 's'}\n` +
        issues.map((i) => `  ${i.path || '(document)'} ${i.rule}`).join('\n'),
    );
  }
}

export type SolverReason =
  | 'no-convergence'
  | 'step-underflow'
  | 'step-budget'
  | 'no-bracket'
  | 'no-solution'
  | 'non-finite'
  | 'cancelled'
  | 'singular';

export class SolverError extends WaymarkError {
  override name = 'SolverError';
  constructor(
    readonly solver: string,
    readonly reason: SolverReason,
    detail: string,
    readonly inputs: Record<string, unknown> = {},
  ) {
    super(`${solver}: ${reason}: ${detail}`);
  }
}

function formatValue(v: unknown): string {
  if (typeof v === 'number') return String(v);
  if (ArrayBuffer.isView(v) || Array.isArray(v)) return `[${Array.from(v as ArrayLike<unknown>).join(', ')}]`;
  try {
    return JSON.stringify(v);
  } catch {
    return String(v);
  }
}

/** Throws InputError unless x is a finite number. */
export function requireFinite(field: string, x: number): number {
  if (typeof x !== 'number' || !Number.isFinite(x)) throw new InputError(field, 'must be a finite number', x);
  return x;
}

/** Throws InputError unless x is finite and > 0. */
export function requirePositive(field: string, x: number): number {
  requireFinite(field, x);
  if (!(x > 0)) throw new InputError(field, 'must be > 0', x);
  return x;
}

/** Throws InputError unless x is finite and ≥ 0. */
export function requireNonNegative(field: string, x: number): number {
  requireFinite(field, x);
  if (!(x >= 0)) throw new InputError(field, 'must be >= 0', x);
  return x;
}

/** Throws InputError unless every component of v is finite and v has `n` components. */
export function requireFiniteVector(field: string, v: ArrayLike<number>, n = 3): void {
  if (!v || v.length !== n) throw new InputError(field, `must have ${n} components`, v);
  for (let i = 0; i < n; i++) {
    if (typeof v[i] !== 'number' || !Number.isFinite(v[i])) {
      throw new InputError(`${field}[${i}]`, 'must be a finite number', v[i]);
    }
  }
}

/** Throws InputError unless v is finite and not the zero vector. */
export function requireNonZeroVector(field: string, v: ArrayLike<number>): void {
  requireFiniteVector(field, v, 3);
  if (v[0] === 0 && v[1] === 0 && v[2] === 0) throw new InputError(field, 'must not be the zero vector', v);
}
