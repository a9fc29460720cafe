/**
 * Walks a result (plain objects, arrays, typed arrays) and lists every number that is NaN or
 * infinite, with its path. `PlanResult` (core/plan/result.ts) documents no infinite field:
 * open orbits and missing quantities are written as null (apoapsis altitude, period fraction,
 * closest approach), so every number in it must be finite.
 */

export interface NonFinite {
  path: string;
  value: number;
}

/** Up to `limit` non-finite numbers in `value`; `allowInfinity(path)` may admit documented infinities. */
export function findNonFinite(value: unknown, limit = 5, allowInfinity: (path: string) => boolean = () => false): NonFinite[] {
  const out: NonFinite[] = [];
  const seen = new Set<unknown>();
  const visit = (v: unknown, path: string): void => {
    if (out.length >= limit) return;
    if (typeof v === 'number') {
      if (Number.isNaN(v) || (!Number.isFinite(v) && !allowInfinity(path))) out.push({ path, value: v });
      return;
    }
    if (v === null || typeof v !== 'object') return;
    if (seen.has(v)) return;
    seen.add(v);
    if (ArrayBuffer.isView(v) && !(v instanceof DataView)) {
      const a = v as unknown as ArrayLike<number | bigint>;
      for (let i = 0; i < a.length && out.length < limit; i++) {
        const x = a[i];
        if (typeof x === 'number') visit(x, `${path}[${i}]`);
      }
      return;
    }
    if (Array.isArray(v)) {
      v.forEach((x, i) => visit(x, `${path}[${i}]`));
      return;
    }
    for (const [k, x] of Object.entries(v as Record<string, unknown>)) visit(x, path === '' ? k : `${path}.${k}`);
  };
  visit(value, '');
  return out;
}
