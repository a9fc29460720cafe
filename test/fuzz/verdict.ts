/**
 * What a fuzz case may end in, and the judge that times it.
 *
 * A case runner returns an outcome label ("loaded", "rejected", "evaluated", "solved" ...) or
 * throws `CaseFailure(kind, detail)` when the code under test broke a rule. Anything else it
 * throws is itself a failure of kind `uncaught <ErrorName>`. A case that takes longer than
 * CASE_TIME_LIMIT_MS fails with kind "slow" (a hang shows up as a case that never returns;
 * the long-run runner's watchdog names it).
 */
import { InputError, SolverError, ValidationError, WaymarkError } from '../../core/math/errors.ts';

/** A single case must finish within this time, ms. */
export const CASE_TIME_LIMIT_MS = 2000;

export class CaseFailure extends Error {
  constructor(
    readonly kind: string,
    readonly detail: string,
  ) {
    super(`${kind}: ${detail}`);
  }
}

export type Verdict = { ok: true; outcome: string; ms: number } | { ok: false; kind: string; detail: string; ms: number };

/**
 * Runs one case. `limitMs` is the wall-clock limit of a case: the long-run fuzzer (run.ts) keeps
 * CASE_TIME_LIMIT_MS to find slow inputs on an idle machine; the CI-budget runs pass Infinity,
 * because a wall clock trips on a loaded machine (their work is bounded by the case count, and a
 * real hang still ends at the test runner's timeout).
 */
export function judge<C>(run: (c: C) => string, c: C, limitMs = CASE_TIME_LIMIT_MS): Verdict {
  const t0 = performance.now();
  let outcome: string;
  try {
    outcome = run(c);
  } catch (e) {
    const ms = performance.now() - t0;
    if (e instanceof CaseFailure) return { ok: false, kind: e.kind, detail: e.detail, ms };
    const name = e instanceof Error ? e.name : typeof e;
    const message = e instanceof Error ? `${e.message}\n${(e.stack ?? '').split('\n').slice(1, 6).join('\n')}` : String(e);
    return { ok: false, kind: `uncaught ${name}`, detail: message, ms };
  }
  const ms = performance.now() - t0;
  if (ms > limitMs) return { ok: false, kind: 'slow', detail: `took ${ms.toFixed(0)} ms (limit ${limitMs} ms); outcome ${outcome}`, ms };
  return { ok: true, outcome, ms };
}

/** Checks a ValidationError is well formed: at least one error, every issue with a path string and a rule. */
export function requireWellFormed(e: ValidationError): void {
  if (!Array.isArray(e.issues) || e.issues.length === 0) throw new CaseFailure('validation-without-issues', e.message);
  if (!e.issues.some((i) => i.severity === 'error')) throw new CaseFailure('validation-without-error', e.message);
  for (const i of e.issues) {
    if (typeof i.path !== 'string' || typeof i.rule !== 'string' || i.rule === '') {
      throw new CaseFailure('malformed-issue', JSON.stringify(i));
    }
  }
}

/** Checks an InputError names a field and a rule. */
export function requireNamed(e: InputError): void {
  if (typeof e.field !== 'string' || e.field === '' || typeof e.rule !== 'string' || e.rule === '') {
    throw new CaseFailure('input-error-unnamed', e.message);
  }
}

/** Classifies an error thrown by the code under test: the typed errors it may throw pass, the rest fail. */
export function typedOrFail(e: unknown, allowed: readonly (new (...args: never[]) => WaymarkError)[], what: string): string {
  for (const T of allowed) {
    if (e instanceof T) {
      if (e instanceof ValidationError) requireWellFormed(e);
      if (e instanceof InputError) requireNamed(e);
      return e.name;
    }
  }
  if (e instanceof SolverError) throw new CaseFailure(`${what}: SolverError escaped`, e.message);
  if (e instanceof WaymarkError) throw new CaseFailure(`${what}: ${e.name} escaped`, e.message);
  throw e;
}
