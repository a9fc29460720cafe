/**
 * What a file case expects of the reader, and the check of it.
 *
 * - any: the file loads, or is refused with a well-formed ValidationError;
 * - named: loads, or is refused with an error that names the broken field (its path, a parent
 *   or child of it, one of the related paths, or the path quoted in the rule);
 * - reject: must be refused, naming the field as for `named` (paths [] accepts any path);
 * - warn: must load, with a warning at one of the paths whose rule contains `rule`.
 */
import type { ValidationIssue } from '../../core/math/errors.ts';
import { pathsRelated } from './json.ts';
import { CaseFailure } from './verdict.ts';

export type Expectation =
  | { kind: 'any' }
  | { kind: 'named'; paths: string[] }
  | { kind: 'reject'; paths: string[] }
  | { kind: 'warn'; paths: string[]; rule: string };

export interface FileCase {
  /** Short description of how the file was made (for reports). */
  label: string;
  text: string;
  expect: Expectation;
}

function names(issue: ValidationIssue, paths: readonly string[]): boolean {
  return paths.some((p) => pathsRelated(issue.path, p) || (p !== '' && issue.rule.includes(p)));
}

/** Throws CaseFailure unless the reader's answer fits the expectation. `issues` is null when the file loaded. */
export function checkExpectation(c: FileCase, refused: ValidationIssue[] | null, warnings: ValidationIssue[]): void {
  const ex = c.expect;
  const list = (xs: ValidationIssue[]) =>
    xs
      .slice(0, 4)
      .map((i) => `${i.path || '(document)'} ${i.rule}`)
      .join('; ');
  if (refused === null) {
    if (ex.kind === 'reject') throw new CaseFailure('accepted a broken file', `${c.label}: expected an error naming ${ex.paths.join(' or ') || 'any field'}`);
    if (ex.kind === 'warn' && !warnings.some((w) => w.severity === 'warning' && w.rule.includes(ex.rule) && names(w, ex.paths))) {
      throw new CaseFailure('missing warning', `${c.label}: expected a warning "${ex.rule}" at ${ex.paths.join(' or ')}; got ${list(warnings) || 'none'}`);
    }
    return;
  }
  if (ex.kind === 'warn') throw new CaseFailure('refused a file that should load with a warning', `${c.label}: ${list(refused)}`);
  if ((ex.kind === 'named' || ex.kind === 'reject') && ex.paths.length > 0) {
    const errors = refused.filter((i) => i.severity === 'error');
    if (!errors.some((i) => names(i, ex.paths))) {
      throw new CaseFailure('error does not name the field', `${c.label}: expected ${ex.paths.join(' or ')}; got ${list(errors)}`);
    }
  }
}
