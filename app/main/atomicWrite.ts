/**
 * Atomic text-file save: write a temporary file beside the target, flush it to disk, keep the
 * previous version as `<file>.bak`, then rename the temporary file over the target (a rename
 * within one directory is atomic on POSIX file systems and on NTFS), and flush the directory.
 * A crash at any point leaves either the old file or the new one, never a torn one.
 */
import * as nodeFs from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';

/** The part of node:fs/promises the save uses (injectable for tests). */
export interface AtomicFs {
  open: typeof nodeFs.open;
  rename: typeof nodeFs.rename;
  copyFile: typeof nodeFs.copyFile;
  unlink: typeof nodeFs.unlink;
  access: typeof nodeFs.access;
}

/** Suffix of the backup of the previous version. */
export const BACKUP_SUFFIX = '.bak';

export async function atomicWriteFile(path: string, text: string, fs: AtomicFs = nodeFs): Promise<void> {
  const dir = dirname(path);
  const tmp = join(dir, `.${basename(path)}.${process.pid}.${Date.now().toString(36)}${Math.random().toString(36).slice(2, 8)}.tmp`);
  const fh = await fs.open(tmp, 'wx', 0o644);
  try {
    try {
      await fh.writeFile(text, 'utf8');
      await fh.sync();
    } finally {
      await fh.close();
    }
    let existed = true;
    try {
      await fs.access(path);
    } catch {
      existed = false;
    }
    if (existed) await fs.copyFile(path, path + BACKUP_SUFFIX);
    await fs.rename(tmp, path);
  } catch (err) {
    await fs.unlink(tmp).catch(() => undefined);
    throw err;
  }
  // Flush the directory entry so the rename itself survives a power cut (POSIX; best effort elsewhere).
  try {
    const d = await fs.open(dir, 'r');
    try {
      await d.sync();
    } finally {
      await d.close();
    }
  } catch {
    /* directories cannot be opened for sync on some platforms (Windows) */
  }
}
