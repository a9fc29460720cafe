/**
 * Checks of the values that cross the IPC boundary. The renderer is treated as untrusted:
 * every argument is checked for type, size and shape before main acts on it.
 */
import { isAbsolute } from 'node:path';
import { MAX_FILE_CHARS, type DocumentState, type ExportKind, type RecoverySnapshot } from '../preload/api.ts';
import { headerProblem, type FileKind } from '../preload/fileHeader.ts';

/** A bad argument from the renderer: names the argument and the rule it broke. */
export class ArgumentError extends Error {
  override name = 'ArgumentError';
  constructor(
    readonly argument: string,
    readonly rule: string,
  ) {
    super(`${argument} ${rule}`);
  }
}

// biome-ignore lint/suspicious/noControlCharactersInRegex: finding control characters in argument text is the point
const CONTROL = /[\u0000-\u001f\u007f]/;

export function requireText(name: string, v: unknown, max = MAX_FILE_CHARS): string {
  if (typeof v !== 'string') throw new ArgumentError(name, 'must be a string');
  if (v.length > max) throw new ArgumentError(name, `must be at most ${max} characters`);
  return v;
}

/**
 * Text of a `kind` file (plan or system): a string within the size limit whose JSON header
 * declares that kind, in a version this program reads. (The renderer checks the rest, field by field.)
 */
export function requireFileText(name: string, v: unknown, kind: FileKind): string {
  const text = requireText(name, v);
  const problem = headerProblem(text, kind);
  if (problem) throw new ArgumentError(name, problem.rule);
  return text;
}

/** An absolute path without control characters, ending in one of `extensions`. */
export function requireFilePath(name: string, v: unknown, extensions: readonly string[]): string {
  const p = requireText(name, v, 4096);
  if (p === '' || CONTROL.test(p)) throw new ArgumentError(name, 'must be a non-empty path without control characters');
  if (!isAbsolute(p)) throw new ArgumentError(name, 'must be an absolute path');
  if (!extensions.some((e) => p.toLowerCase().endsWith(e))) throw new ArgumentError(name, `must end in ${extensions.join(' or ')}`);
  return p;
}

/** A bare file name (no directory part) for a save dialog's default. */
export function requireFileName(name: string, v: unknown): string {
  const s = requireText(name, v, 200);
  if (s.trim() === '' || CONTROL.test(s) || /[/\\]/.test(s) || s === '.' || s === '..') {
    throw new ArgumentError(name, 'must be a file name without a directory part');
  }
  return s;
}

export const EXPORT_KINDS: readonly ExportKind[] = [
  'oem',
  'csv',
  'burns-csv',
  'report',
  'schedule-json',
  'schedule-csv',
  'runtime-json',
  'runtime-bin',
  'map-svg',
  'map-png',
  'map-json',
  'map-csv',
  'calendar-csv',
  'calendar-json',
];

/** Bytes (a Uint8Array) within the size limit. */
export function requireBytes(name: string, v: unknown, max = MAX_FILE_CHARS): Uint8Array {
  if (!(v instanceof Uint8Array)) throw new ArgumentError(name, 'must be bytes (a Uint8Array)');
  if (v.byteLength > max) throw new ArgumentError(name, `must be at most ${max} bytes`);
  return v;
}

export function requireExportKind(name: string, v: unknown): ExportKind {
  if (typeof v !== 'string' || !(EXPORT_KINDS as readonly string[]).includes(v)) {
    throw new ArgumentError(name, `must be one of ${EXPORT_KINDS.join(', ')}`);
  }
  return v as ExportKind;
}

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

export function requireRecoverySnapshot(name: string, v: unknown): RecoverySnapshot {
  if (!isRecord(v)) throw new ArgumentError(name, 'must be an object');
  const keys = Object.keys(v).sort().join(',');
  if (keys !== 'name,path,savedAt,text') throw new ArgumentError(name, 'must have exactly the fields name, path, text, savedAt');
  const snapshotName = requireText(`${name}.name`, v.name, 300);
  const path = v.path === null ? null : requireText(`${name}.path`, v.path, 4096);
  const text = requireFileText(`${name}.text`, v.text, 'plan');
  if (typeof v.savedAt !== 'number' || !Number.isFinite(v.savedAt)) throw new ArgumentError(`${name}.savedAt`, 'must be a finite number');
  return { name: snapshotName, path, text, savedAt: v.savedAt };
}

export function requireDocumentState(name: string, v: unknown): DocumentState {
  if (!isRecord(v)) throw new ArgumentError(name, 'must be an object');
  const title = requireText(`${name}.title`, v.title, 300);
  if (typeof v.dirty !== 'boolean') throw new ArgumentError(`${name}.dirty`, 'must be true or false');
  return { title, dirty: v.dirty };
}

export function requireNoArguments(args: readonly unknown[]): void {
  if (args.length !== 0) throw new ArgumentError('arguments', 'must be empty');
}

/** Exactly the named arguments, no more and no fewer. */
export function requireArguments(args: readonly unknown[], names: readonly string[]): void {
  if (args.length !== names.length) throw new ArgumentError('arguments', `must be (${names.join(', ')})`);
}
