/**
 * Small helpers over plain JSON documents for the fuzz cases: list every field with its path
 * (written the way the file readers write issue paths, `bodies[3].orbit.e`), read and replace a
 * field by path, delete one, and nest a value very deeply.
 */

export type Json = null | boolean | number | string | Json[] | { [k: string]: Json };
export type Key = string | number;

/** Path of keys → issue-path text: ['bodies', 3, 'orbit', 'e'] → "bodies[3].orbit.e". */
export function pathText(keys: readonly Key[]): string {
  let out = '';
  for (const k of keys) {
    if (typeof k === 'number') out += `[${k}]`;
    else out += out === '' ? k : `.${k}`;
  }
  return out;
}

export interface Field {
  keys: Key[];
  path: string;
  value: Json;
}

/** Every field (objects' properties and arrays' items, at every depth), parents before children. */
export function fields(doc: Json, under: Key[] = []): Field[] {
  const out: Field[] = [];
  const walk = (v: Json, keys: Key[]): void => {
    if (Array.isArray(v)) {
      v.forEach((x, i) => {
        const k = [...keys, i];
        out.push({ keys: k, path: pathText(k), value: x });
        walk(x, k);
      });
    } else if (v !== null && typeof v === 'object') {
      for (const [name, x] of Object.entries(v)) {
        const k = [...keys, name];
        out.push({ keys: k, path: pathText(k), value: x });
        walk(x, k);
      }
    }
  };
  walk(doc, under);
  return out;
}

export function getAt(doc: Json, keys: readonly Key[]): Json | undefined {
  let v: Json | undefined = doc;
  for (const k of keys) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<string, Json>)[k as string];
  }
  return v;
}

/** Replaces the field at `keys` (which must exist up to its parent). */
export function setAt(doc: Json, keys: readonly Key[], value: Json): void {
  const parent = getAt(doc, keys.slice(0, -1)) as Record<string, Json> | Json[];
  (parent as Record<string, Json>)[keys[keys.length - 1] as string] = value;
}

/** Removes the field at `keys` (an array item is spliced out). */
export function deleteAt(doc: Json, keys: readonly Key[]): void {
  const parent = getAt(doc, keys.slice(0, -1));
  const last = keys[keys.length - 1];
  if (Array.isArray(parent)) parent.splice(last as number, 1);
  else if (parent && typeof parent === 'object') delete (parent as Record<string, Json>)[last as string];
}

export function clone<T>(x: T): T {
  return structuredClone(x);
}

/** JSON text of `doc` with the field at `keys` replaced by raw text (for values JSON.stringify cannot make). */
export function withRawValue(doc: Json, keys: readonly Key[], raw: string): string {
  const marker = '@@raw-value-5e1f@@';
  const copy = clone(doc);
  setAt(copy, keys, marker);
  return JSON.stringify(copy).replace(JSON.stringify(marker), () => raw);
}

/** Text of `depth` nested arrays, or objects `{"a": ...}`, around a 0. */
export function deepText(depth: number, kind: 'array' | 'object'): string {
  return kind === 'array' ? `${'['.repeat(depth)}0${']'.repeat(depth)}` : `${'{"a":'.repeat(depth)}0${'}'.repeat(depth)}`;
}

/** True when issue path `a` is the field `b`, inside it, or one of its parents (not the document). */
export function pathsRelated(a: string, b: string): boolean {
  if (a === '' || b === '') return a === b;
  const within = (x: string, y: string) => x === y || x.startsWith(`${y}.`) || x.startsWith(`${y}[`);
  return within(a, b) || within(b, a);
}
