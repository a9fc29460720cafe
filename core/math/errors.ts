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
 * A `ValidationError` lists at most MAX_LISTED_ISSUES issues; the rest are folded into one
 * closing issue that counts them ("… and 4,321 more problems"), so a file with a problem in each
 * of ten thousand array items gives a readable refusal (and a bounded one to draw).
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
  /** Set only on the closing issue of a capped list: how many issues it stands for. */
  more?: number;
  /**
   * The issue in the user's words, set where the plan and its system are known
   * (core/io/issueWords.ts): "Burn 1 'Departure': arrival must be later than the burn (412-149T24:13)".
   * Messages then show these words and the path only in a details line.
   */
  words?: string;
}

/** Issues a ValidationError (or a list of warnings) shows one by one; the rest are counted. */
export const MAX_LISTED_ISSUES = 100;

/** A whole number with thousands separated by commas: 4321 → "4,321". */
export function formatCount(n: number): string {
  return Number.isSafeInteger(n) ? n.toLocaleString('en-US') : String(n);
}

/** How many problems a list of issues stands for (a closing count issue counts as its `more`). */
export function countIssues(issues: readonly ValidationIssue[]): number {
  let n = 0;
  for (const i of issues) n += i.more ?? 1;
  return n;
}

/**
 * The first `max` issues, then (when there are more) one closing issue counting the rest:
 * path '', rule "… and 4,321 more problems", `more` = 4321, severity 'error' when any issue it
 * stands for is an error. Linear; a list already capped comes back unchanged.
 */
export function capIssues(issues: readonly ValidationIssue[], max = MAX_LISTED_ISSUES): ValidationIssue[] {
  const listed: ValidationIssue[] = [];
  let more = 0;
  let error = false;
  for (const i of issues) {
    if (i.more === undefined && listed.length < max) listed.push(i);
    else {
      more += i.more ?? 1;
      if (i.severity === 'error') error = true;
    }
  }
  if (more === 0) return listed;
  listed.push({ path: '', rule: `… and ${formatCount(more)} more problem${more === 1 ? '' : 's'}`, severity: error ? 'error' : 'warning', more });
  return listed;
}

export class ValidationError extends WaymarkError {
  override name = 'ValidationError';
  /** At most MAX_LISTED_ISSUES issues, then (when there were more) one closing issue counting the rest. */
  readonly issues: ValidationIssue[];
  constructor(
    readonly what: string,
    issues: ValidationIssue[],
  ) {
    const listed = capIssues(issues);
    const total = countIssues(listed);
    super(
      `${what}: ${formatCount(total)} problem${total === 1 ? '' : 's'}\n` +
        listed
          .map((i) =>
            i.more !== undefined
              ? `  ${i.rule}`
              : i.words
                ? `  ${i.words}${i.path ? `\n    (plan field: ${i.path})` : ''}`
                : `  ${i.path || '(document)'} ${i.rule}`,
          )
          .join('\n'),
    );
    this.issues = listed;
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
  | 'singular'
  /** The answer exists but double precision cannot resolve it (e.g. the phase after 10¹⁵ revolutions). */
  | 'precision-lost'
  /** The motion runs into the centre of attraction (a radial fall through r = 0). */
  | 'collision';

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
