import { describe, expect, it } from 'vitest';
import { ValidationError } from '../../../core/math/errors.ts';
import { migrateDocument, type Migration } from '../../../core/io/migrate.ts';

function issue(f: () => unknown): string {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(ValidationError);
    const v = e as ValidationError;
    expect(v.what).toBe('thing file');
    expect(v.issues.length).toBe(1);
    expect(v.issues[0].severity).toBe('error');
    return `${v.issues[0].path}: ${v.issues[0].rule}`;
  }
  return 'no error';
}

describe('version migration', () => {
  // a synthetic format at version 3 whose earlier versions renamed a field and added one
  const table: Record<number, Migration> = {
    1: (d) => {
      const { size, ...rest } = d;
      return { ...rest, length: size, seen: [...((d.seen as number[]) ?? []), d.version as number] };
    },
    2: (d) => ({ ...d, unit: 'm', seen: [...(d.seen as number[]), d.version as number] }),
  };

  it('brings an old document to the current version one step at a time, each step seeing its own version', () => {
    const { doc, fileVersion } = migrateDocument('thing file', { version: 1, size: 5 }, 3, table);
    expect(fileVersion).toBe(1);
    expect(doc).toEqual({ version: 3, length: 5, unit: 'm', seen: [1, 2] });
  });

  it('starts from the version it finds, and passes a current document through unchanged', () => {
    expect(migrateDocument('thing file', { version: 2, length: 5, seen: [] }, 3, table).doc).toEqual({ version: 3, length: 5, unit: 'm', seen: [2] });
    const current = { version: 3, length: 1 };
    const r = migrateDocument('thing file', current, 3, table);
    expect(r.doc).toBe(current);
    expect(r.fileVersion).toBe(3);
  });

  it('does not change the document it was given', () => {
    const raw = { version: 1, size: 5 };
    migrateDocument('thing file', raw, 3, table);
    expect(raw).toEqual({ version: 1, size: 5 });
  });

  it('refuses a missing, non-integer, newer or unmigratable version, naming `version`', () => {
    expect(issue(() => migrateDocument('thing file', { size: 1 }, 3, table))).toBe('version: is required');
    expect(issue(() => migrateDocument('thing file', { version: '2' }, 3, table))).toBe('version: must be an integer (got "2")');
    expect(issue(() => migrateDocument('thing file', { version: 2.5 }, 3, table))).toBe('version: must be an integer (got 2.5)');
    expect(issue(() => migrateDocument('thing file', { version: 4 }, 3, table))).toBe(
      'version: is 4, newer than this program reads (up to 3); use a newer Waymark',
    );
    expect(issue(() => migrateDocument('thing file', { version: 0 }, 3, table))).toBe('version: is 0, which this program cannot read or migrate (it reads 3)');
  });
});
