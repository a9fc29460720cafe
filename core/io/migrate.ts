/**
 * Version migration shared by the system and plan files: a document of any supported earlier
 * version is brought to the current one step by step (table[v] turns version v into v + 1);
 * a missing, non-integer, newer or unmigratable version is a ValidationError on `version`.
 */
import { ValidationError } from '../math/index.ts';

export type Migration = (doc: Record<string, unknown>) => Record<string, unknown>;

export function migrateDocument(
  what: string,
  raw: Record<string, unknown>,
  current: number,
  table: Readonly<Record<number, Migration>>,
): { doc: Record<string, unknown>; fileVersion: number } {
  const fail = (rule: string): never => {
    throw new ValidationError(what, [{ path: 'version', rule, severity: 'error' }]);
  };
  if (!('version' in raw)) fail('is required');
  const v = raw.version;
  if (typeof v !== 'number' || !Number.isInteger(v)) return fail(`must be an integer (got ${JSON.stringify(v)})`);
  if (v > current) fail(`is ${v}, newer than this program reads (up to ${current}); use a newer Waymark`);
  let doc = raw;
  for (let from = v; from < current; from++) {
    const step = table[from];
    if (!step) fail(`is ${v}, which this program cannot read or migrate (it reads ${current})`);
    doc = { ...step(doc), version: from + 1 };
  }
  return { doc, fileVersion: v };
}
