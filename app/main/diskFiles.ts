/**
 * The main process's file access (the `files` dependency of the IPC handlers, the recent list
 * and the recovery copy), on the shared routines of app/node/files.ts:
 * - reads go through `readTextFile`: regular files only (a FIFO, a device or a link to one is
 *   refused on the opened descriptor, without blocking), at most MAX_FILE_CHARS bytes (the IPC
 *   limit), strict UTF-8, timed out;
 * - `realpath` resolves every symbolic link (the handlers confine reads by real paths);
 * - saves are atomic with a backup; a save of a plan or an export passes the output guard first
 *   with the desktop rules (the save dialog has asked "replace?", so only Waymark plan and
 *   system files, newer versions, folders and devices are protected).
 * Plain functions over Node's file system, no Electron: tests run them on real files.
 */
import * as fsp from 'node:fs/promises';
import { basename } from 'node:path';
import { decodeUtf8 } from '../../core/io/index.ts';
import { atomicWriteFile, readRegularFile, writeOutput, type OutputKind } from '../node/files.ts';
import { MAX_FILE_CHARS } from '../preload/api.ts';
import type { HandlerDeps } from './ipcHandlers.ts';

export type DiskFiles = HandlerDeps['files'] & { remove(path: string): Promise<void> };

export function createDiskFiles(): DiskFiles {
  return {
    // Strict UTF-8: a file that is not is refused with its name and the offset of its first bad byte.
    readText: async (path) => decodeUtf8(await readRegularFile(path, { maxBytes: MAX_FILE_CHARS }), basename(path)),
    realpath: (path) => fsp.realpath(path),
    writeAtomic: (path: string, text: string | Uint8Array, kind?: OutputKind) =>
      kind === undefined
        ? atomicWriteFile(path, text)
        : writeOutput({ flag: kind === 'plan' ? 'Save' : 'Export', path, kind }, text, { unidentified: 'replace' }),
    remove: (path) => fsp.rm(path, { force: true }),
  };
}
