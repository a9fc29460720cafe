/**
 * File input and output on Node (command line and the desktop app's main process): atomic
 * saves with a backup, and loaders that resolve a plan's system file.
 *
 * Atomic save (`atomicWriteFile`), the classic write-to-temporary-then-rename pattern (POSIX
 * rename(2) replaces the target atomically within one file system):
 *  1. check the target: its folder must exist and it must not be a folder itself;
 *  2. write the data to a new temporary file in the SAME folder (`.<name>.<pid>-<random>.tmp`,
 *     created exclusively), in chunks until every byte is written (a write may take fewer bytes
 *     than it was given, e.g. on a full disk), then fsync it so the bytes are on disk before
 *     the name points at them;
 *  3. keep the previous version: `<name>.bak` is replaced by the current target (a hard link,
 *     or a copy where the file system has no hard links), itself through a temporary name so
 *     an old backup is never left half-written;
 *  4. rename the temporary file over the target, then fsync the folder (where the platform
 *     allows) so the rename itself is durable.
 * A failure at any step removes the temporary file, leaves the target as it was, and throws a
 * `FileError` whose message says what failed and why ("the folder ... is not writable",
 * "... is a folder", "the disk is full" ...). A process killed during the save leaves the
 * target untouched (the old version or, after step 4, the new one — never a mix) and at worst
 * a stray `.<name>.*.tmp` file beside it.
 *
 * One routine serves the command line and the main process (which must not block its event
 * loop): it is asynchronous, on node:fs/promises, and its file-system calls can be injected
 * (tests make one step fail). It is written here rather than taken from the write-file-atomic
 * package (7.0.1), which would not keep these guarantees: it writes the data with one write
 * call and does not check how many bytes were taken, so a short write would be renamed over
 * the target; it keeps no backup and does not fsync the folder after the rename.
 *
 * Limits: stray temporary files of killed saves are not cleaned up automatically.
 */
import { existsSync, lstatSync, readFileSync } from 'node:fs';
import * as fsp from 'node:fs/promises';
import { randomBytes } from 'node:crypto';
import { basename, dirname, isAbsolute, join, resolve } from 'node:path';
import { ValidationError, WaymarkError, type ValidationIssue } from '../../core/math/index.ts';
import { PLAN_VERSION, parsePlanFile, requirePlanFitsSystem, serializePlanFile, type PlanSystemRef } from '../../core/io/index.ts';
import { decodeUtf8, parseSystemFile } from '../../core/io/index.ts';
import type { Plan } from '../../core/plan/index.ts';
import type { StarSystem } from '../../core/system/index.ts';
import { headerProblem, readFileHeader } from '../preload/fileHeader.ts';

/** A file could not be read or written; `reason` is the plain explanation, `code` the OS code. */
export class FileError extends WaymarkError {
  override name = 'FileError';
  constructor(
    readonly path: string,
    readonly action: 'read' | 'save',
    readonly reason: string,
    readonly code: string | null = null,
  ) {
    super(`cannot ${action} ${path}: ${reason}`);
  }
}

/** Plain words for the usual OS error codes. */
function why(e: unknown, subject: string): { reason: string; code: string | null } {
  const code = (e as NodeJS.ErrnoException)?.code ?? null;
  const words: Record<string, string> = {
    EACCES: `permission denied (${subject} is not writable or readable by this user)`,
    EPERM: `the operation is not permitted on ${subject}`,
    ENOENT: `${subject} does not exist`,
    ENOTDIR: `a part of the path of ${subject} is not a folder`,
    EISDIR: `${subject} is a folder`,
    ENOSPC: 'the disk is full',
    EDQUOT: 'the disk quota is exhausted',
    EROFS: `${subject} is on a read-only file system`,
    EEXIST: `${subject} already exists`,
    EMFILE: 'too many files are open',
    EBUSY: `${subject} is busy (locked by another program)`,
  };
  const msg = (e as Error)?.message ?? String(e);
  return { reason: code && words[code] ? `${words[code]} (${code})` : msg, code };
}

export interface AtomicWriteOptions {
  /** Keep the previous version as `<name>.bak` (default true). */
  backup?: boolean;
  /** Bytes per write call (default 1 MiB). */
  chunkSize?: number;
  /** Called after each chunk reaches the temporary file, with bytes written so far and in all. */
  onProgress?: (written: number, total: number) => void;
}

/** Path of the backup kept beside `path`. */
export function backupPath(path: string): string {
  return `${path}.bak`;
}

/** A fresh temporary name in `dir` for the file `name` (`.<name>.<pid>-<random>.tmp`; `tag` "bak" for the backup's). */
function tempPath(dir: string, name: string, tag = ''): string {
  return join(dir, `.${name}${tag ? `.${tag}` : ''}.${process.pid}-${randomBytes(4).toString('hex')}.tmp`);
}

/** What step 1 found: the resolved target, its folder and whether it exists. */
interface SaveTarget {
  target: string;
  dir: string;
  name: string;
  exists: boolean;
}

/** Step 1: the folder must exist and the target must not be a folder. */
async function checkTarget(path: string, fs: AtomicFs): Promise<SaveTarget> {
  const target = resolve(path);
  const dir = dirname(target);
  let d;
  try {
    d = await fs.stat(dir);
  } catch (e) {
    const w = why(e, `the folder ${dir}`);
    throw new FileError(path, 'save', w.reason, w.code);
  }
  if (!d.isDirectory()) throw new FileError(path, 'save', `${dir} is not a folder`);
  let exists = false;
  try {
    if ((await fs.stat(target)).isDirectory()) throw new FileError(path, 'save', `${target} is a folder, not a file`, 'EISDIR');
    exists = true;
  } catch (e) {
    if (e instanceof FileError) throw e;
    if ((e as NodeJS.ErrnoException).code !== 'ENOENT') {
      const w = why(e, target);
      throw new FileError(path, 'save', w.reason, w.code);
    }
  }
  return { target, dir, name: basename(target), exists };
}

/** The part of node:fs/promises the save uses (injectable: tests make one step fail). */
export type AtomicFs = Pick<typeof fsp, 'stat' | 'open' | 'link' | 'copyFile' | 'rename' | 'unlink'>;

/** Saves `data` to `path` atomically, keeping the previous version as `<path>.bak` (see the file comment). */
export async function atomicWriteFile(path: string, data: string | Uint8Array, options: AtomicWriteOptions = {}, fs: AtomicFs = fsp): Promise<void> {
  const fail = (reason: string, code: string | null = null): never => {
    throw new FileError(path, 'save', reason, code);
  };

  // 1. The folder and the target.
  const { target, dir, name, exists: targetExists } = await checkTarget(path, fs);

  const bytes = typeof data === 'string' ? Buffer.from(data, 'utf8') : data;
  const chunk = Math.max(1, Math.floor(options.chunkSize ?? 1 << 20));
  const tmp = tempPath(dir, name);
  let fh: fsp.FileHandle | null = null;
  const cleanup = async (): Promise<void> => {
    if (fh) {
      await fh.close().catch(() => undefined); // already closed: nothing left to release
      fh = null;
    }
    await fs.unlink(tmp).catch(() => undefined); // never created, or already gone
  };

  // 2. Temporary file, written and flushed.
  try {
    fh = await fs.open(tmp, 'wx', 0o644);
  } catch (e) {
    const w = why(e, `the folder ${dir}`);
    fail(`cannot create a temporary file: ${w.reason}`, w.code);
  }
  try {
    let written = 0;
    while (written < bytes.length) {
      const { bytesWritten } = await fh!.write(bytes, written, Math.min(chunk, bytes.length - written));
      written += bytesWritten;
      options.onProgress?.(written, bytes.length);
    }
    if (bytes.length === 0) options.onProgress?.(0, 0);
    await fh!.sync();
    const open = fh!;
    fh = null;
    await open.close();
  } catch (e) {
    await cleanup();
    const w = why(e, tmp);
    fail(`writing the temporary file failed: ${w.reason}; ${path} is unchanged`, w.code);
  }

  // 3. Backup of the previous version.
  if (targetExists && options.backup !== false) {
    const bak = backupPath(target);
    const bakTmp = tempPath(dir, name, 'bak');
    try {
      try {
        await fs.link(target, bakTmp);
      } catch {
        await fs.copyFile(target, bakTmp);
      }
      await fs.rename(bakTmp, bak);
    } catch (e) {
      await fs.unlink(bakTmp).catch(() => undefined); // not created
      await cleanup();
      const w = why(e, bak);
      fail(`cannot keep the previous version as ${bak}: ${w.reason}; ${path} is unchanged`, w.code);
    }
  }

  // 4. Rename over the target; make the rename durable.
  try {
    await fs.rename(tmp, target);
  } catch (e) {
    await cleanup();
    const w = why(e, target);
    fail(`${w.reason}; ${path} is unchanged`, w.code);
  }
  try {
    const d = await fs.open(dir, 'r');
    try {
      await d.sync();
    } finally {
      await d.close();
    }
  } catch {
    // Some platforms (Windows) cannot fsync a folder; the rename has happened regardless.
  }
}

/** Reads a text file (UTF-8); FileError with the reason when it cannot. */
export function readTextFile(path: string): string {
  try {
    if (lstatSync(path).isDirectory()) throw new FileError(path, 'read', 'it is a folder, not a file', 'EISDIR');
    return decodeUtf8(readFileSync(path), 'it');
  } catch (e) {
    if (e instanceof FileError) throw e;
    const w = why(e, path);
    throw new FileError(path, 'read', w.reason, w.code);
  }
}

export interface LoadedSystem {
  system: StarSystem;
  warnings: ValidationIssue[];
  path: string;
}

/** Reads and checks a system file. ValidationError's `what` names the file. */
export function loadSystemFile(path: string): LoadedSystem {
  const text = readTextFile(path);
  try {
    const parsed = parseSystemFile(text);
    return { system: parsed.system, warnings: parsed.warnings, path };
  } catch (e) {
    if (e instanceof ValidationError) throw new ValidationError(`system file ${path}`, e.issues);
    throw e;
  }
}

export interface LoadedPlan {
  plan: Plan;
  system: StarSystem;
  /** The reference as written in the plan file (kept for saving the plan back). */
  systemRef: PlanSystemRef;
  /** Absolute path of the system file, or null when the system is embedded. */
  systemPath: string | null;
  /** Warnings of the plan, its system and the plan-against-system checks. */
  warnings: ValidationIssue[];
  fileVersion: number;
}

/** Where a plan's system file is: `ref` resolved against the plan file's folder. */
export function resolveSystemPath(planPath: string, ref: string): string {
  return isAbsolute(ref) ? ref : resolve(dirname(resolve(planPath)), ref);
}

/**
 * Reads a plan file and its system (the file named by `system.path`, relative to the plan
 * file, or the embedded system), and checks the plan against the system.
 * Throws FileError (unreadable plan), ValidationError('plan file' or 'system file <path>').
 */
export function loadPlanFile(path: string): LoadedPlan {
  const parsed = (() => {
    const text = readTextFile(path);
    try {
      return parsePlanFile(text);
    } catch (e) {
      if (e instanceof ValidationError) throw new ValidationError(`plan file ${path}`, e.issues);
      throw e;
    }
  })();
  const warnings = [...parsed.warnings];
  if (parsed.system.kind === 'embedded') {
    return { plan: parsed.plan, system: parsed.system.system, systemRef: parsed.system, systemPath: null, warnings, fileVersion: parsed.fileVersion };
  }
  const systemPath = resolveSystemPath(path, parsed.system.path);
  if (!existsSync(systemPath)) {
    throw new ValidationError(`plan file ${path}`, [
      { path: 'system.path', rule: `names "${parsed.system.path}", which does not exist (looked for ${systemPath})`, severity: 'error' },
    ]);
  }
  const sys = loadSystemFile(systemPath);
  warnings.push(...sys.warnings.map((w) => ({ ...w, path: `(system file) ${w.path}` })));
  try {
    warnings.push(...requirePlanFitsSystem(parsed.plan, sys.system));
  } catch (e) {
    if (e instanceof ValidationError) throw new ValidationError(`plan file ${path}`, e.issues);
    throw e;
  }
  return { plan: parsed.plan, system: sys.system, systemRef: parsed.system, systemPath, warnings, fileVersion: parsed.fileVersion };
}

/**
 * Saves a plan atomically (keeping `<path>.bak`). Refuses (FileError, nothing written) to save
 * over a plan file written by a newer version of the program: this one would silently drop
 * whatever the newer format holds. A target that is not a readable plan file (missing, another
 * kind of file, damaged JSON) is saved over as usual. The same header rule
 * (app/preload/fileHeader.ts) keeps the desktop app's saves off such files.
 */
export async function savePlanFile(path: string, plan: Plan, systemRef: PlanSystemRef, options: AtomicWriteOptions = {}): Promise<void> {
  let text: string | null = null;
  try {
    text = await fsp.readFile(path, 'utf8');
  } catch {
    // nothing readable there: nothing to protect
  }
  if (text !== null && headerProblem(text, 'plan')?.newer) {
    throw new FileError(
      path,
      'save',
      `it was written by a newer Waymark (plan file version ${readFileHeader(text)!.version}; this program writes version ${PLAN_VERSION}); saving would lose what that version added — save under another name`,
    );
  }
  await atomicWriteFile(path, serializePlanFile(plan, systemRef), options);
}
