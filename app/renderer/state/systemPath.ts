/**
 * Paths of a plan's system file relative to the plan file's folder, in the renderer (no
 * node:path there): a plan names its system by a path from its own folder, so the two resolve
 * together wherever both are copied. Absolute paths are the host's (POSIX `/a/b`, Windows `C:\a\b`);
 * relative paths are written with `/`, which every platform reads.
 */

/** The segments of a path, `.` dropped and `..` applied; a `..` above the start is kept. */
function normalize(parts: string[]): string[] {
  const out: string[] = [];
  for (const p of parts) {
    if (p === '' || p === '.') continue;
    if (p === '..' && out.length > 0 && out[out.length - 1] !== '..') out.pop();
    else out.push(p);
  }
  return out;
}

/** The root of an absolute path (`/`, `C:`, `\\server\share`), or null when it is relative. */
function rootOf(path: string): string | null {
  if (/^[A-Za-z]:[\\/]/.test(path)) return path.slice(0, 2).toUpperCase();
  if (/^[\\/]{2}[^\\/]+[\\/][^\\/]+/.test(path))
    return path
      .split(/[\\/]+/)
      .slice(1, 3)
      .join('/')
      .toLowerCase()
      .replace(/^/, '//');
  if (/^[\\/]/.test(path)) return '/';
  return null;
}

function segments(path: string): string[] {
  const root = rootOf(path);
  const rest = root === null ? path : root.startsWith('//') ? path.replace(/^[\\/]{2}[^\\/]+[\\/][^\\/]+/, '') : path.slice(root === '/' ? 1 : 2);
  return normalize(rest.split(/[\\/]/));
}

/** The absolute path `rel` names from the folder of the file at `filePath` (absolute), as root + segments. */
export function resolveFrom(filePath: string, rel: string): { root: string; parts: string[] } | null {
  const root = rootOf(filePath);
  if (root === null) return null;
  if (rootOf(rel) !== null) return { root: rootOf(rel)!, parts: segments(rel) };
  const dir = segments(filePath).slice(0, -1);
  return { root, parts: normalize([...dir, ...rel.split(/[\\/]/)]) };
}

/**
 * The relative path (with `/`) from the folder of the file at `fromFile` to `target`, both
 * absolute; null when they share no root (two Windows drives) or either is not absolute.
 */
export function relativeFrom(fromFile: string, target: { root: string; parts: string[] } | string): string | null {
  const t = typeof target === 'string' ? (rootOf(target) === null ? null : { root: rootOf(target)!, parts: segments(target) }) : target;
  const root = rootOf(fromFile);
  if (t === null || root === null || root !== t.root) return null;
  const from = segments(fromFile).slice(0, -1);
  let k = 0;
  while (k < from.length && k < t.parts.length - 1 && from[k] === t.parts[k]) k++;
  const up = from.slice(k).map(() => '..');
  return [...up, ...t.parts.slice(k)].join('/');
}

/**
 * The path that names, from the plan saved at `newPlan`, the system file the plan at `oldPlan`
 * named by `rel`; null when it cannot be named relatively (no common root).
 */
export function rebaseSystemPath(oldPlan: string, newPlan: string, rel: string): string | null {
  const abs = resolveFrom(oldPlan, rel);
  return abs === null ? null : relativeFrom(newPlan, abs);
}
