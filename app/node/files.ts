/**
 * File input and output on Node (command line and the desktop app's main process): one safe
 * read, one atomic save with a backup, one guard for every output path, and the loaders that
 * resolve a plan's system file.
 *
 * Reading (`readRegularFile`, `readTextFile`): every file Waymark reads — a path on the command
 * line, a plan's `system.path`, a file the desktop app opens — goes through one routine that
 * reads regular files only:
 *  1. open with O_RDONLY|O_NONBLOCK|O_NOCTTY, so opening a FIFO (named pipe) returns at once
 *     instead of waiting for a writer, and a terminal never becomes the controlling one;
 *  2. fstat the OPENED descriptor (after every symbolic link is resolved, so a link to
 *     /dev/zero is seen as the device it is, and nothing can be swapped in between a check
 *     and the read) and refuse anything that is not a regular file: "… is not a regular file
 *     (it is a FIFO (named pipe))";
 *  3. refuse a file larger than the limit before reading a byte (MAX_READ_BYTES, 32 MiB, the
 *     desktop app's IPC limit too: a plan or system file is kilobytes), and stop reading a file
 *     that grows past it while being read;
 *  4. give up after READ_TIMEOUT_MS (30 s) without an answer from the disk (a stalled network
 *     share): the caller gets a FileError instead of waiting forever.
 * Text is then decoded strictly as UTF-8 (core/io/utf8.ts).
 *
 * Atomic save (`atomicWriteFile`), the classic write-to-temporary-then-rename pattern (POSIX
 * rename(2) replaces the target atomically within one file system):
 *  1. check the target: a symbolic link is followed to the file it names (the save goes there:
 *     the link stays a link); the folder must exist; an existing target must be a regular file
 *     (a folder, FIFO, device or socket is refused: renaming over it would replace a device node
 *     with an ordinary file);
 *  2. write the data to a new temporary file in the SAME folder (`.<name>.<pid>-<random>.tmp`,
 *     created exclusively), in chunks until every byte is written (a write may take fewer bytes
 *     than it was given, e.g. on a full disk), then fsync it so the bytes are on disk before
 *     the name points at them;
 *  3. keep the previous version: `<name>.bak` is replaced by a COPY of the current target, read
 *     through a descriptor checked to be a regular file (never a hard link: a link would share
 *     whatever the name points at), written to a temporary name, fsynced and renamed, so an old
 *     backup is never left half-written;
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
 * Output guard (`checkOutput`, `checkOutputs`, `writeOutput`): every file a command writes (an
 * export, a corrected plan, a porkchop grid) and every save of the desktop app is checked
 * first, against the rules below; `-` means standard output and is never a file.
 *  - never one of the command's input files (compared by device and inode, so a symbolic or
 *    hard link to an input is caught too), and never two outputs of one command to one file;
 *  - never a folder, FIFO, device or socket;
 *  - a Waymark plan or system file is replaced only by a save of that same kind, and never when
 *    a newer Waymark wrote it (this program would drop what that version added);
 *  - an export replaces a previous export of the same kind (recognised by its first line: the
 *    OEM's `CCSDS_OEM_VERS`, each CSV's header, the report's title, the grid's `{"request":`)
 *    and an empty file; on the command line, where no dialog asked "replace?", any other file
 *    (another kind of export, JSON Waymark cannot identify, any other text) is refused —
 *    "choose another file or remove it first"; the desktop app's save dialog has asked, so
 *    there only Waymark plan and system files are protected (`unidentified: 'replace'`).
 * Refusals name the option and the path as the user wrote them:
 * `--report v2.plan.json: not written: it is a Waymark plan file …`. The save itself is the
 * atomic save above (backed up).
 *
 * Limits: stray temporary files of killed saves are not cleaned up automatically. A read that
 * the operating system never answers keeps one of Node's file-system threads busy after the
 * time-out; the caller gets its answer regardless.
 */
import { constants as FS, type Stats } from 'node:fs';
import * as fsp from 'node:fs/promises';
import { randomBytes } from 'node:crypto';
import { basename, dirname, isAbsolute, join, resolve } from 'node:path';
import { ValidationError, WaymarkError, type ValidationIssue } from '../../core/math/index.ts';
import {
  PLAN_FORMAT,
  PLAN_VERSION,
  parsePlanFile,
  requirePlanFitsSystem,
  serializePlanFile,
  staleResolvedIssues,
  type PlanSystemRef,
} from '../../core/io/index.ts';
import { decodeUtf8, issuesInWords, parseSystemFile } from '../../core/io/index.ts';
import type { Plan } from '../../core/plan/index.ts';
import { SYSTEM_FORMAT, SYSTEM_VERSION, type StarSystem } from '../../core/system/index.ts';
import type { ExportKind } from '../preload/api.ts';
import { NEWER_VERSION_RULE, readFileHeader } from '../preload/fileHeader.ts';

/**
 * A file could not be read or written; `reason` is the plain explanation, `code` the OS code.
 * `field` names the command-line option (or the desktop action) whose path it is, when there
 * is one: the message then starts with it, as the user wrote it ("--csv out.csv: not written: …").
 */
export class FileError extends WaymarkError {
  override name = 'FileError';
  readonly field: string | undefined;
  constructor(
    readonly path: string,
    readonly action: 'read' | 'save',
    readonly reason: string,
    readonly code: string | null = null,
    field?: string,
  ) {
    super(field ? `${field} ${path}: not ${action === 'save' ? 'written' : 'read'}: ${reason}` : `cannot ${action} ${path}: ${reason}`);
    this.field = field;
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
    ENXIO: `${subject} is not a regular file (a socket, or a device with nothing behind it)`,
    ELOOP: `${subject} is a loop of symbolic links`,
    ENAMETOOLONG: `the path of ${subject} is too long`,
  };
  const msg = (e as Error)?.message ?? String(e);
  return { reason: code && words[code] ? `${words[code]} (${code})` : msg, code };
}

/** What a file that is not a regular file is, in words ("a FIFO (named pipe)", "a character device" …). */
export function fileTypeWords(st: Stats): string {
  if (st.isDirectory()) return 'a folder';
  if (st.isFIFO()) return 'a FIFO (named pipe)';
  if (st.isCharacterDevice()) return 'a character device';
  if (st.isBlockDevice()) return 'a block device';
  if (st.isSocket()) return 'a socket';
  if (st.isSymbolicLink()) return 'a symbolic link';
  return 'a special file';
}

/** Bytes in words: "40.0 MiB", "512 bytes". */
function byteWords(n: number): string {
  return n >= 1 << 20 ? `${(n / (1 << 20)).toFixed(1)} MiB` : `${n.toLocaleString('en-US')} bytes`;
}

// ---------------------------------------------------------------------------------------------
// Reading

/**
 * The largest file Waymark reads, in bytes: 32 MiB (33,554,432), the same as the desktop app's
 * IPC limit (app/preload/api.ts MAX_FILE_CHARS). A plan or system file is kilobytes (the demo
 * system 10 KB; a system at the 2,000-body limit about 1.5 MB); the limit stops a hostile or
 * mistaken file before it fills memory.
 */
export const MAX_READ_BYTES = 32 * 1024 * 1024;

/** How long a read may wait for the disk before it gives up, ms. */
export const READ_TIMEOUT_MS = 30_000;

/** Bytes per read call. */
const READ_CHUNK = 1 << 20;

/** Open for reading without blocking on a FIFO and without taking a terminal (0 where a platform lacks a flag). */
const OPEN_READ = FS.O_RDONLY | (FS.O_NONBLOCK ?? 0) | (FS.O_NOCTTY ?? 0);

export interface ReadOptions {
  /** Refuse a file larger than this many bytes (default MAX_READ_BYTES). */
  maxBytes?: number;
  /** Give up after this long without an answer, ms (default READ_TIMEOUT_MS). */
  timeoutMs?: number;
  /** Read only the first `prefix` bytes (at most `maxBytes`) and never refuse a larger file: for recognising what a file is. */
  prefix?: number;
  /** The file-system calls (injectable: tests stall one). */
  fs?: ReadFs;
}

/** The part of node:fs/promises the read uses. */
export type ReadFs = Pick<typeof fsp, 'open'>;

/** A regular file's bytes, read the safe way (see the file comment); FileError naming `path` when it cannot. */
export async function readRegularFile(path: string, options: ReadOptions = {}): Promise<Buffer> {
  const max = options.maxBytes ?? MAX_READ_BYTES;
  const timeoutMs = options.timeoutMs ?? READ_TIMEOUT_MS;
  const fs = options.fs ?? fsp;
  const fail = (reason: string, code: string | null = null): never => {
    throw new FileError(path, 'read', reason, code);
  };
  let timer: ReturnType<typeof setTimeout> | undefined;
  let timedOut = false;
  const expired = new Promise<never>((_, reject) => {
    timer = setTimeout(() => {
      timedOut = true;
      reject(new FileError(path, 'read', `the disk did not answer within ${timeoutMs / 1000} s (a stalled disk or network share?)`, 'ETIMEDOUT'));
    }, timeoutMs);
  });
  expired.catch(() => undefined); // only ever raced below
  const within = <T>(p: Promise<T>): Promise<T> => Promise.race([p, expired]);

  const opening = fs.open(path, OPEN_READ);
  let fh: fsp.FileHandle | null = null;
  try {
    try {
      fh = await within(opening);
    } catch (e) {
      if (e instanceof FileError) throw e;
      const w = why(e, path);
      fail(w.reason, w.code);
    }
    const st = await within(fh!.stat());
    if (st.isDirectory()) fail('it is a folder, not a file', 'EISDIR');
    if (!st.isFile()) fail(`it is not a regular file (it is ${fileTypeWords(st)}); Waymark reads regular files only`);
    if (options.prefix === undefined && st.size > max) {
      fail(`it is ${byteWords(st.size)}, more than the ${byteWords(max)} Waymark reads (a plan or system file is kilobytes)`, 'EFBIG');
    }
    // One byte past the limit tells a file that grew past it while being read.
    const want = options.prefix !== undefined ? Math.min(options.prefix, max) : max + 1;
    const chunks: Buffer[] = [];
    let total = 0;
    while (total < want) {
      const b = Buffer.allocUnsafe(Math.min(READ_CHUNK, want - total, Math.max(st.size - total + 1, 1)));
      const { bytesRead } = await within(fh!.read(b, 0, b.length, total));
      if (bytesRead === 0) break;
      chunks.push(bytesRead === b.length ? b : b.subarray(0, bytesRead));
      total += bytesRead;
    }
    if (options.prefix === undefined && total > max) fail(`it grew past the ${byteWords(max)} Waymark reads while being read`, 'EFBIG');
    return Buffer.concat(chunks, total);
  } catch (e) {
    if (e instanceof FileError) throw e;
    const w = why(e, path);
    return fail(w.reason, w.code);
  } finally {
    clearTimeout(timer);
    if (fh) {
      const closing = fh.close().catch(() => undefined); // nothing left to release
      if (!timedOut) await closing;
    } else {
      // An open that answers after the time-out: release its descriptor then.
      opening.then((h) => h.close()).catch(() => undefined);
    }
  }
}

/** Reads a text file (strict UTF-8) through readRegularFile; FileError with the reason when it cannot. */
export async function readTextFile(path: string, options: ReadOptions = {}): Promise<string> {
  const bytes = await readRegularFile(path, options);
  try {
    return decodeUtf8(bytes, 'it');
  } catch (e) {
    throw new FileError(path, 'read', (e as Error).message);
  }
}

// ---------------------------------------------------------------------------------------------
// Writing

export interface AtomicWriteOptions {
  /** Keep the previous version as `<name>.bak` (default true). */
  backup?: boolean;
  /** Bytes per write call (default 1 MiB). */
  chunkSize?: number;
  /** Called after each chunk reaches the temporary file, with bytes written so far and in all. */
  onProgress?: (written: number, total: number) => void;
  /**
   * Called as the save passes each later step (the data is on disk in the temporary file; the
   * backup is in place; the rename is done); awaited. Tests stop the save there.
   */
  onStep?: (step: 'written' | 'backed-up' | 'renamed') => void | Promise<void>;
}

/** Path of the backup kept beside `path`. */
export function backupPath(path: string): string {
  return `${path}.bak`;
}

/** A fresh temporary name in `dir` for the file `name` (`.<name>.<pid>-<random>.tmp`; `tag` "bak" for the backup's). */
function tempPath(dir: string, name: string, tag = ''): string {
  return join(dir, `.${name}${tag ? `.${tag}` : ''}.${process.pid}-${randomBytes(4).toString('hex')}.tmp`);
}

/** What step 1 found: the file the save goes to (links followed), its folder, and whether it exists. */
interface SaveTarget {
  target: string;
  dir: string;
  name: string;
  exists: boolean;
}

/** Step 1: follows a symbolic link to its file; the folder must exist and an existing target must be a regular file. */
async function checkTarget(path: string, fs: AtomicFs): Promise<SaveTarget> {
  const fail = (reason: string, code: string | null = null): never => {
    throw new FileError(path, 'save', reason, code);
  };
  let target = resolve(path);
  let st: Stats | null = null;
  try {
    st = await fs.lstat(target);
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code !== 'ENOENT') {
      const w = why(e, target);
      fail(w.reason, w.code);
    }
  }
  if (st?.isSymbolicLink()) {
    try {
      target = await fs.realpath(target);
      st = await fs.stat(target);
    } catch (e) {
      const code = (e as NodeJS.ErrnoException).code ?? null;
      if (code === 'ENOENT') fail('it is a symbolic link to a file that does not exist (Waymark saves through a link only to an existing file)', code);
      const w = why(e, target);
      fail(w.reason, w.code);
    }
  }
  const dir = dirname(target);
  let d: Stats;
  try {
    d = await fs.stat(dir);
  } catch (e) {
    const w = why(e, `the folder ${dir}`);
    fail(w.reason, w.code);
  }
  if (!d!.isDirectory()) fail(`${dir} is not a folder`);
  if (st?.isDirectory()) fail(`${target} is a folder, not a file`, 'EISDIR');
  if (st && !st.isFile()) fail(`it is not a regular file (it is ${fileTypeWords(st)}); Waymark saves over regular files only`);
  return { target, dir, name: basename(target), exists: st !== null };
}

/** The part of node:fs/promises the save uses (injectable: tests make one step fail). */
export type AtomicFs = Pick<typeof fsp, 'stat' | 'lstat' | 'realpath' | 'open' | 'rename' | 'unlink'>;

/** Writes all of `bytes` to `fh` from its current position, however few bytes each call takes. */
async function writeAll(fh: fsp.FileHandle, bytes: Uint8Array, chunk: number, onProgress?: (written: number, total: number) => void): Promise<void> {
  let written = 0;
  while (written < bytes.length) {
    const { bytesWritten } = await fh.write(bytes, written, Math.min(chunk, bytes.length - written));
    written += bytesWritten;
    onProgress?.(written, bytes.length);
  }
}

/** Step 3: `bak` becomes a copy of `target`, read through a descriptor that is checked to be a regular file. */
async function copyBackup(target: string, bakTmp: string, bak: string, fs: AtomicFs): Promise<void> {
  let src: fsp.FileHandle | null = null;
  let dst: fsp.FileHandle | null = null;
  try {
    src = await fs.open(target, OPEN_READ);
    const st = await src.stat();
    if (!st.isFile()) throw new Error(`${target} is no longer a regular file (it is ${fileTypeWords(st)})`);
    dst = await fs.open(bakTmp, 'wx', 0o644);
    const buf = Buffer.allocUnsafe(READ_CHUNK);
    for (let pos = 0; ; ) {
      const { bytesRead } = await src.read(buf, 0, buf.length, pos);
      if (bytesRead === 0) break;
      await writeAll(dst, buf.subarray(0, bytesRead), READ_CHUNK);
      pos += bytesRead;
    }
    await dst.sync();
  } finally {
    await src?.close().catch(() => undefined); // already closed: nothing left to release
    await dst?.close().catch(() => undefined);
  }
  await fs.rename(bakTmp, bak);
}

/** Saves `data` to `path` atomically, keeping the previous version as `<path>.bak` (see the file comment). */
export async function atomicWriteFile(path: string, data: string | Uint8Array, options: AtomicWriteOptions = {}, fs: AtomicFs = fsp): Promise<void> {
  const fail = (reason: string, code: string | null = null): never => {
    throw new FileError(path, 'save', reason, code);
  };

  // 1. The target (links followed), its folder.
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
    await writeAll(fh!, bytes, chunk, options.onProgress);
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
  await options.onStep?.('written');

  // 3. Backup of the previous version: a copy, never a link.
  if (targetExists && options.backup !== false) {
    const bak = backupPath(target);
    const bakTmp = tempPath(dir, name, 'bak');
    try {
      await copyBackup(target, bakTmp, bak, fs);
    } catch (e) {
      await fs.unlink(bakTmp).catch(() => undefined); // not created
      await cleanup();
      const w = why(e, bak);
      fail(`cannot keep the previous version as ${bak}: ${w.reason}; ${path} is unchanged`, w.code);
    }
    await options.onStep?.('backed-up');
  }

  // 4. Rename over the target; make the rename durable.
  try {
    await fs.rename(tmp, target);
  } catch (e) {
    await cleanup();
    const w = why(e, target);
    fail(`${w.reason}; ${path} is unchanged`, w.code);
  }
  await options.onStep?.('renamed');
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

// ---------------------------------------------------------------------------------------------
// The output guard

/** Standard output, written as a path: every export accepts it, so exports can be piped. */
export const STDOUT = '-';

/** What a command or the desktop app writes: a plan or system file, an export of the app, or a porkchop grid of `waymark windows`. */
export type OutputKind = 'plan' | 'system' | ExportKind | 'grid-json' | 'grid-csv';

/** Each kind in words, for messages. */
export const OUTPUT_KIND_WORDS: Record<OutputKind, string> = {
  plan: 'a Waymark plan file',
  system: 'a Waymark system file',
  oem: 'a CCSDS OEM ephemeris',
  csv: 'an ephemeris CSV',
  'burns-csv': 'a burn table (CSV)',
  report: 'a Markdown budget report',
  'schedule-json': 'a burn schedule for a game (JSON)',
  'schedule-csv': 'a burn schedule for a game (CSV)',
  'runtime-json': 'a runtime ephemeris (JSON)',
  'runtime-bin': 'a runtime ephemeris (binary)',
  'map-svg': 'a Δv map diagram (SVG)',
  'map-png': 'a Δv map diagram (PNG)',
  'map-json': 'a Δv map (JSON)',
  'map-csv': 'a Δv map table (CSV)',
  'calendar-csv': 'a window calendar (CSV)',
  'calendar-json': 'a window calendar (JSON)',
  'grid-json': 'a porkchop grid (JSON)',
  'grid-csv': 'a porkchop grid (CSV)',
};

/**
 * How each export's text begins (its first line), as the writers in core/io and
 * app/cli/commands/windows.ts write it: the OEM's first keyword (CCSDS 502.0-B-3), each CSV's
 * header, the report's title, the grid's first key. Tested against the writers' output.
 */
const EXPORT_SIGNATURES: [ExportKind | 'grid-json' | 'grid-csv', RegExp][] = [
  ['oem', /^CCSDS_OEM_VERS\s*=/],
  ['csv', /^t_s,x_m,y_m,z_m,vx_mps,vy_mps,vz_mps,/],
  ['burns-csv', /^(?:event,name,id|id,name),t_s,t_start_s,t_end_s,dv_mps,/],
  ['report', /^# Δv budget: /],
  ['schedule-json', /^\{\s*"format"\s*:\s*"waymark-game-schedule"/],
  ['schedule-csv', /^step,elapsed_(?:s|steps),id,name,central,dv_x_/],
  ['runtime-json', /^\{\s*"format"\s*:\s*"waymark-runtime-ephemeris"/],
  ['runtime-bin', /^WMRE/],
  // the Δv map: the SVG's root names the map's system (core/io deltaVMapSvg.ts), the PNG signature (ISO/IEC 15948 §5.2; byte 0x89 reads as U+FFFD), the JSON's first key, the table's header
  ['map-svg', /^<svg xmlns="http:\/\/www\.w3\.org\/2000\/svg"[^>]* data-map-system="/],
  ['map-png', /^\uFFFDPNG\r\n/],
  ['map-json', /^\{\s*"system"\s*:\s*"[^"]*"\s*,\s*"nodes"\s*:/],
  ['map-csv', /^from,to,kind,dv_mps,/],
  // the window calendar: the CSV's header (core/io calendarCsv.ts), the Calendar's first keys (core/survey calendar.ts)
  ['calendar-csv', /^from,to,window,opens_s,opens_date,/],
  ['calendar-json', /^\{\s*"system"\s*:\s*"[^"]*"\s*,\s*"start"\s*:/],
  ['grid-json', /^\{"request":\{/],
  ['grid-csv', /^i,j,departure_s,(tof_s|arrival_s),/],
];

/** What an existing file holds, as far as the guard needs to know. */
export interface IdentifiedFile {
  kind: OutputKind | 'empty' | 'json' | 'unknown';
  /** The version a plan or system file declares. */
  version?: unknown;
}

/** Bytes read to recognise a file. */
const SNIFF_BYTES = 64 * 1024;

/** Recognises an existing regular file by its start (and, for a JSON object or array, its header). */
export async function identifyFile(path: string): Promise<IdentifiedFile> {
  const head = await readRegularFile(path, { prefix: SNIFF_BYTES });
  if (head.length === 0) return { kind: 'empty' };
  const text = head.toString('utf8').replace(/^\uFEFF/, '');
  for (const [kind, sig] of EXPORT_SIGNATURES) if (sig.test(text)) return { kind };
  const start = text.trimStart();
  if (start.startsWith('{') || start.startsWith('[')) {
    let header = null;
    try {
      header = readFileHeader(await readTextFile(path));
    } catch {
      // too large or not UTF-8: JSON Waymark cannot identify
    }
    if (header?.format === PLAN_FORMAT) return { kind: 'plan', version: header.version };
    if (header?.format === SYSTEM_FORMAT) return { kind: 'system', version: header.version };
    return { kind: 'json' };
  }
  if (start === '') return { kind: 'empty' };
  return { kind: 'unknown' };
}

/** An output of a command: the option that names it, the path as the user wrote it (or `-`), what is written. */
export interface OutputTarget {
  /** The option or action, as the user knows it: "--csv", "-o", "--grid-out", "Save". */
  flag: string;
  path: string;
  kind: OutputKind;
}

/** An input of a command: its path and what it is, in words ("the plan file being flown"). */
export interface InputFile {
  path: string;
  what: string;
}

export interface OutputRules {
  /** The command's input files: never written over. */
  inputs?: readonly InputFile[];
  /**
   * An existing file that is not a Waymark file of the kind being written (another kind of
   * export, JSON Waymark cannot identify, any other text): 'refuse' on the command line (the
   * default), 'replace' where a save dialog has asked already. Plan and system files are
   * protected either way.
   */
  unidentified?: 'refuse' | 'replace';
}

/** The newest version of each Waymark document kind this program writes. */
const WRITES_VERSION: Record<'plan' | 'system', number> = { plan: PLAN_VERSION, system: SYSTEM_VERSION };

/** Identity of an existing file (device and inode), or null when there is none. */
async function fileId(path: string): Promise<string | null> {
  try {
    const st = await fsp.stat(path);
    return `${st.dev}:${st.ino}`;
  } catch {
    return null;
  }
}

/**
 * Checks one output against the rules (see the file comment); resolves to the file the save
 * will go to (links followed), or null for standard output. FileError naming the option and
 * the path when refused.
 */
export async function checkOutput(t: OutputTarget, rules: OutputRules = {}): Promise<string | null> {
  if (t.path === STDOUT) return null;
  const refuse = (reason: string, code: string | null = null): never => {
    throw new FileError(t.path, 'save', reason, code, t.flag);
  };
  const given = resolve(t.path);
  let st: Stats | null = null;
  let real = given;
  try {
    st = await fsp.lstat(given);
    if (st.isSymbolicLink()) {
      real = await fsp.realpath(given);
      st = await fsp.stat(real);
    }
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code ?? null;
    if (code === 'ENOENT' && st?.isSymbolicLink()) refuse('it is a symbolic link to a file that does not exist', code);
    if (code !== 'ENOENT') refuse(why(e, t.path).reason, code);
    st = null;
  }
  if (st === null) return real;
  if (st.isDirectory()) refuse('it is a folder; name a file', 'EISDIR');
  if (!st.isFile()) {
    refuse(`it is not a regular file (it is ${fileTypeWords(st)}); Waymark writes regular files, or standard output with ${t.flag} -`);
  }
  const id = `${st.dev}:${st.ino}`;
  for (const input of rules.inputs ?? []) {
    if ((await fileId(input.path)) === id) refuse(`it is ${input.what}, an input of this command; choose another file`);
  }
  const found = await identifyFile(real);
  const words = OUTPUT_KIND_WORDS[t.kind];
  if (found.kind === 'empty') return real;
  if (found.kind === 'plan' || found.kind === 'system') {
    const v = found.version;
    if (typeof v === 'number' && v > WRITES_VERSION[found.kind]) {
      refuse(
        `it ${NEWER_VERSION_RULE} (${found.kind} file version ${v}; this program writes version ${WRITES_VERSION[found.kind]}); ` +
          'saving would lose what that version added — choose another file',
      );
    }
    if (found.kind !== t.kind) refuse(`it is ${OUTPUT_KIND_WORDS[found.kind]}, which ${words} would replace; choose another file`);
    return real;
  }
  if (found.kind === t.kind || rules.unidentified === 'replace') return real;
  const holds =
    found.kind === 'json' ? 'a JSON document Waymark did not write' : found.kind === 'unknown' ? 'a file Waymark did not write' : OUTPUT_KIND_WORDS[found.kind];
  return refuse(`it holds ${holds}, not ${words}; Waymark replaces only its own ${words.replace(/^an? /, '')} — choose another file or remove it first`);
}

/**
 * Checks every output of one command before it starts work (so a refusal comes before a long
 * run, not after): each against the rules, no two to one file, at most one to standard output.
 */
export async function checkOutputs(targets: readonly OutputTarget[], rules: OutputRules = {}): Promise<void> {
  const toStdout = targets.filter((t) => t.path === STDOUT);
  if (toStdout.length > 1) {
    throw new FileError(
      STDOUT,
      'save',
      `${toStdout.map((t) => t.flag).join(' and ')} cannot all go to standard output; give all but one a file`,
      null,
      toStdout[1].flag,
    );
  }
  const seen = new Map<string, OutputTarget>();
  for (const t of targets) {
    const real = await checkOutput(t, rules);
    if (real === null) continue;
    const key = (await fileId(real)) ?? real;
    const other = seen.get(key);
    if (other) throw new FileError(t.path, 'save', `${other.flag} writes the same file; give each output its own file`, null, t.flag);
    seen.set(key, t);
  }
}

/** Where standard output goes (injectable for tests). */
export interface StdoutLike {
  isTTY?: boolean;
  write(chunk: string, callback: (err?: Error | null) => void): boolean;
  on(event: 'error', listener: (err: Error) => void): unknown;
}

let stdoutErrorsHandled = false;

export interface StdoutOptions {
  /** Applied to the text when standard output is a terminal (the command line shows control characters escaped there). */
  forTerminal?: (text: string) => string;
}

/**
 * Writes `data` to standard output and waits until it is handed over. A reader that stops early
 * (`waymark fly --csv - | head`) closes the pipe: the rest is dropped quietly (EPIPE), as a
 * pipeline expects, instead of ending in a stack trace.
 */
export function writeStdout(data: string, out: StdoutLike = process.stdout, options: StdoutOptions = {}): Promise<void> {
  if (out === process.stdout && !stdoutErrorsHandled) {
    stdoutErrorsHandled = true;
    process.stdout.on('error', (e: NodeJS.ErrnoException) => {
      if (e.code !== 'EPIPE') throw e;
    });
  }
  return new Promise((resolvePromise, reject) => {
    out.write(options.forTerminal && out.isTTY === true ? options.forTerminal(data) : data, (err) => {
      if (err && (err as NodeJS.ErrnoException).code !== 'EPIPE') reject(err);
      else resolvePromise();
    });
  });
}

/** Writes one output: text to standard output for `-` (bytes never go there), else checked (checkOutput) and saved atomically with a backup. */
export async function writeOutput(
  t: OutputTarget,
  data: string | Uint8Array,
  rules: OutputRules = {},
  options: AtomicWriteOptions & StdoutOptions = {},
): Promise<void> {
  const { forTerminal, ...write } = options;
  if (t.path === STDOUT) {
    if (typeof data !== 'string')
      throw new FileError(STDOUT, 'save', `${OUTPUT_KIND_WORDS[t.kind]} is binary and does not go to standard output; name a file`, null, t.flag);
    return writeStdout(data, process.stdout, { forTerminal });
  }
  await checkOutput(t, rules);
  await atomicWriteFile(t.path, data, write);
}

// ---------------------------------------------------------------------------------------------
// Loading and saving plans and systems

export interface LoadedSystem {
  system: StarSystem;
  warnings: ValidationIssue[];
  path: string;
}

/** Reads and checks a system file. ValidationError's `what` names the file. */
export async function loadSystemFile(path: string): Promise<LoadedSystem> {
  const text = await readTextFile(path);
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
  /** Warnings of the plan, its system, the plan-against-system checks and the burns' stale saved figures (core/io staleResolvedIssues). */
  warnings: ValidationIssue[];
  fileVersion: number;
}

/** Where a plan's system file is: `ref` resolved against the plan file's folder. */
export function resolveSystemPath(planPath: string, ref: string): string {
  return isAbsolute(ref) ? ref : resolve(dirname(resolve(planPath)), ref);
}

/**
 * Reads a plan file and its system (the file named by `system.path`, relative to the plan
 * file, or the embedded system), and checks the plan against the system. Both are read with
 * readTextFile (regular files only, size-capped, timed out).
 * Throws FileError (unreadable plan or system file), ValidationError('plan file' or 'system file <path>').
 */
export async function loadPlanFile(path: string): Promise<LoadedPlan> {
  const text = await readTextFile(path);
  let parsed: ReturnType<typeof parsePlanFile>;
  try {
    parsed = parsePlanFile(text);
  } catch (e) {
    if (e instanceof ValidationError) throw new ValidationError(`plan file ${path}`, await planIssuesInWords(path, text, e.issues, null));
    throw e;
  }
  const warnings: ValidationIssue[] = issuesInWords(parsed.warnings, parsed.plan, parsed.system.kind === 'embedded' ? parsed.system.system : null);
  if (parsed.system.kind === 'embedded') {
    // the burns' saved figures (derived) against the plan's evaluation now: a stale block is a warning
    warnings.push(...issuesInWords(staleResolvedIssues(parsed.system.system, parsed.plan, parsed.resolved), parsed.plan, parsed.system.system));
    return { plan: parsed.plan, system: parsed.system.system, systemRef: parsed.system, systemPath: null, warnings, fileVersion: parsed.fileVersion };
  }
  const systemPath = resolveSystemPath(path, parsed.system.path);
  let sys: LoadedSystem;
  try {
    sys = await loadSystemFile(systemPath);
  } catch (e) {
    if (e instanceof FileError && e.code === 'ENOENT') {
      throw new ValidationError(`plan file ${path}`, [
        { path: 'system.path', rule: `names "${parsed.system.path}", which does not exist (looked for ${systemPath})`, severity: 'error' },
      ]);
    }
    throw e;
  }
  warnings.push(...sys.warnings.map((w) => ({ ...w, path: `(system file) ${w.path}` })));
  try {
    warnings.push(...issuesInWords(requirePlanFitsSystem(parsed.plan, sys.system), parsed.plan, sys.system));
  } catch (e) {
    if (e instanceof ValidationError) throw new ValidationError(`plan file ${path}`, issuesInWords(e.issues, parsed.plan, sys.system));
    throw e;
  }
  warnings.push(...issuesInWords(staleResolvedIssues(sys.system, parsed.plan, parsed.resolved), parsed.plan, sys.system));
  return { plan: parsed.plan, system: sys.system, systemRef: parsed.system, systemPath, warnings, fileVersion: parsed.fileVersion };
}

/**
 * Issues of a plan file the reader refused, in the user's words (core/io/issueWords.ts): events
 * and stages named from the file's own text, dates in the calendar of its system when that
 * system can be read (else in seconds from the epoch). Best effort: the issues come back
 * unchanged in words only where the text or the system cannot be read.
 */
/** Every issue of a plan file read with the system it names (parsePlanFile reports them together), or null when it loads. */
function planFileIssues(text: string, system: StarSystem): ValidationIssue[] | null {
  try {
    parsePlanFile(text, { system });
    return null;
  } catch (e) {
    return e instanceof ValidationError ? e.issues : null;
  }
}

async function planIssuesInWords(path: string, text: string, issues: ValidationIssue[], system: StarSystem | null): Promise<ValidationIssue[]> {
  let doc: unknown = null;
  try {
    doc = JSON.parse(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
  } catch {
    return issues;
  }
  let sys = system;
  const ref = typeof doc === 'object' && doc !== null ? (doc as { system?: { path?: unknown; embedded?: unknown } }).system : undefined;
  if (!sys && typeof ref?.path === 'string') {
    try {
      sys = (await loadSystemFile(resolveSystemPath(path, ref.path))).system;
    } catch {
      sys = null;
    }
    // With its system at hand, the plan's problems against it join the file's own: every problem at once.
    if (sys) issues = planFileIssues(text, sys) ?? issues;
  } else if (!sys && ref?.embedded !== undefined) {
    try {
      sys = parseSystemFile(JSON.stringify(ref.embedded)).system;
    } catch {
      sys = null;
    }
  }
  return issuesInWords(issues, doc, sys);
}

export interface SavePlanOptions extends AtomicWriteOptions, OutputRules {
  /** The option that named the path, for messages (e.g. "--output"). */
  flag?: string;
}

/**
 * Saves a plan atomically (keeping `<path>.bak`), through the output guard: never over an
 * input, a system file, a plan file a newer Waymark wrote (this one would silently drop
 * whatever the newer format holds), or — unless `unidentified: 'replace'` — any file that is
 * not a Waymark plan (FileError, nothing written).
 */
export async function savePlanFile(path: string, plan: Plan, systemRef: PlanSystemRef, options: SavePlanOptions = {}): Promise<void> {
  const { flag, inputs, unidentified, ...write } = options;
  // Without an option naming the path, the message is the plain "cannot save <path>: …".
  await checkOutput({ flag: flag ?? '', path, kind: 'plan' }, { inputs, unidentified });
  await atomicWriteFile(path, serializePlanFile(plan, systemRef), write);
}
