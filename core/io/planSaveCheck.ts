/**
 * What a plan would meet if it were saved now and opened again: the plan is written as a file
 * (serializePlanFile) and read back by the loader (parsePlanFile, with the system it flies in),
 * so an edit is judged by exactly the rules a saved file is — the schema declared in
 * planFileShape.ts, the semantic checks and the checks against the system. The editor refuses
 * an edit whose plan this finds errors in (app/renderer/state/document.ts).
 */
import { ValidationError, type ValidationIssue } from '../math/index.ts';
import type { Plan } from '../plan/index.ts';
import type { StarSystem } from '../system/index.ts';
import { parsePlanFile, serializePlanFile, type PlanSystemRef } from './planFile.ts';

/** The system is passed to the loader, so the file names it by a path that is never read. */
const PROBE_REF: PlanSystemRef = { kind: 'path', path: 'system.json' };

/** Every issue (errors and warnings, file field paths) of `plan` saved and re-opened in `system`. */
export function planSaveIssues(plan: Plan, system: StarSystem): ValidationIssue[] {
  try {
    return parsePlanFile(serializePlanFile(plan, PROBE_REF), { system }).warnings;
  } catch (e) {
    if (e instanceof ValidationError) return e.issues;
    throw e;
  }
}
