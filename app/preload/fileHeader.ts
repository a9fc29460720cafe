/**
 * The kind and version a Waymark file declares (`"format"`, `"version"`), read without checking
 * the rest. Shared by the main process (its IPC handlers refuse text that is not the kind of file
 * a channel carries), the renderer's hosts and the command line's plan saves (app/node/files.ts)
 * (none overwrites a file a newer Waymark wrote).
 * The full, field-precise checks stay in core/io (planFile.ts, systemFile.ts), run by the renderer.
 */
import { PLAN_FORMAT, PLAN_VERSION } from '../../core/io/index.ts';
import { SYSTEM_FORMAT, SYSTEM_VERSION } from '../../core/system/index.ts';

export type FileKind = 'plan' | 'system';

export const FILE_FORMATS: Record<FileKind, { format: string; version: number }> = {
  plan: { format: PLAN_FORMAT, version: PLAN_VERSION },
  system: { format: SYSTEM_FORMAT, version: SYSTEM_VERSION },
};

/** What a text declares: null when it is not a JSON object. */
export interface FileHeader {
  format: unknown;
  version: unknown;
}

export function readFileHeader(text: string): FileHeader | null {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch {
    return null;
  }
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) return null;
  const o = raw as Record<string, unknown>;
  return { format: o.format, version: o.version };
}

/**
 * Why `text` is not a `kind` file this program reads, or null when its header fits: a JSON
 * object whose `format` names the kind and whose `version` is an integer from 1 up to the
 * version this program reads (`newer` tells apart a file of a newer Waymark).
 */
export function headerProblem(text: string, kind: FileKind): { rule: string; newer: boolean } | null {
  const h = readFileHeader(text);
  const want = FILE_FORMATS[kind];
  if (!h) return { rule: `is not a Waymark ${kind} file (not a JSON object)`, newer: false };
  if (h.format !== want.format)
    return { rule: `is not a Waymark ${kind} file (its "format" is ${JSON.stringify(h.format) ?? 'missing'}, not "${want.format}")`, newer: false };
  if (typeof h.version !== 'number' || !Number.isInteger(h.version) || h.version < 1) {
    return { rule: `has no valid "version" (got ${JSON.stringify(h.version) ?? 'nothing'})`, newer: false };
  }
  if (h.version > want.version) return { rule: `${NEWER_VERSION_RULE} (version ${h.version}; this one reads up to ${want.version})`, newer: true };
  return null;
}

/**
 * The words every refusal to overwrite a newer file carries; the renderer's Electron host
 * recognises the refusal by them (an error crossing IPC keeps only its message).
 */
export const NEWER_VERSION_RULE = 'was written by a newer version of Waymark';

/** True when `text` is a `kind` file a newer Waymark wrote (one this program must not overwrite). */
export function isNewerVersion(text: string, kind: FileKind): boolean {
  return headerProblem(text, kind)?.newer === true;
}
