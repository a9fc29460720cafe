/**
 * Output and failure handling shared by every command: `--json` prints one JSON document on
 * stdout; otherwise a human-readable text. Errors print their message on stderr and set the
 * exit code: 2 for bad input or a bad file, 3 for a numerical failure, 1 is reserved for
 * "the answer is no" (a plan whose margin does not hold).
 *
 * Names come from files (bodies, plans, vehicles, burns) and may hold control characters: text
 * for a terminal goes through `termSafe`, which shows them as `\u001b` instead of letting them
 * act (clear the screen, retitle the window, move the cursor); JSON escapes them too.
 */
import { InputError, SolverError, ValidationError, WaymarkError } from '../../core/math/index.ts';
import { inFlagWords, type FlagNames } from './flags.ts';

export const EXIT_OK = 0;
export const EXIT_NO = 1;
export const EXIT_BAD_INPUT = 2;
export const EXIT_SOLVER = 3;

/**
 * Characters that act on a terminal or reorder what it shows rather than print: the C0 controls
 * (ECMA-48: ESC starts escape sequences, BEL ends window-title sequences, CR returns to the start
 * of the line to overwrite it ...) except newline and tab, DEL, the C1 controls U+0080–U+009F
 * (CSI U+009B and OSC U+009D act like ESC [ and ESC ]), and the bidirectional formatting
 * characters (Unicode UAX #9) that make text display in another order than it reads.
 */
// biome-ignore lint/suspicious/noControlCharactersInRegex: matching terminal control characters is the point
const TERMINAL_CONTROL = /[\u0000-\u0008\u000b-\u001f\u007f-\u009f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/g;

const escapeChar = (c: string): string => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`;

/** Text safe for a terminal: control characters shown as `\u001b`; newline, tab and every other character (Δ, é) as written. */
export function termSafe(text: string): string {
  return text.replace(TERMINAL_CONTROL, escapeChar);
}

/** Human-readable text on stdout, one line break after, control characters shown escaped. */
export function printText(text: string): void {
  process.stdout.write(`${termSafe(text)}\n`);
}

/**
 * A document's warnings on stderr, one per line, control characters shown escaped: in the
 * user's words with the field path on a details line when the loader gave words
 * (core/io/issueWords.ts), else the path and the rule.
 */
export function printWarnings(warnings: readonly { path: string; rule: string; words?: string }[]): void {
  for (const w of warnings) {
    const text = w.words ? `warning: ${w.words}${w.path ? `\n         (plan field: ${w.path})` : ''}` : `warning: ${w.path || '(document)'} ${w.rule}`;
    process.stderr.write(`${termSafe(text)}\n`);
  }
}

/**
 * Data (CSV, OEM ...) on stdout: as written when it goes to a pipe or a file, control
 * characters escaped when it goes to a terminal.
 */
export function printData(text: string, stream: { isTTY?: boolean; write(s: string): unknown } = process.stdout): void {
  stream.write(stream.isTTY === true ? termSafe(text) : text);
}

/**
 * One JSON document on stdout. JSON.stringify escapes U+0000–U+001F; the other terminal
 * controls (DEL, C1, bidirectional formatting) are escaped here too, which leaves the same JSON.
 */
export function printJson(value: unknown): void {
  process.stdout.write(`${jsonText(value)}\n`);
}

/** The JSON text printJson writes (no control character left raw). */
export function jsonText(value: unknown): string {
  return JSON.stringify(value, jsonReplacer, 2).replace(TERMINAL_CONTROL, escapeChar);
}

/** Typed arrays become plain arrays; non-finite numbers become null (JSON has no NaN). */
export function jsonReplacer(_key: string, value: unknown): unknown {
  if (ArrayBuffer.isView(value) && !(value instanceof DataView)) return Array.from(value as unknown as ArrayLike<number>);
  if (typeof value === 'number' && !Number.isFinite(value)) return null;
  return value;
}

/**
 * Runs a command body, mapping core errors to messages and exit codes. `output.flags` names
 * the flag that sets each core field (app/cli/flags.ts), so errors speak of `--revs`, not `maxRevs`.
 */
export async function guard(
  output: boolean | { json: boolean; flags?: FlagNames },
  body: () => Promise<number | undefined> | number | undefined,
): Promise<void> {
  const json = typeof output === 'boolean' ? output : output.json;
  try {
    const code = await body();
    process.exitCode = code ?? EXIT_OK;
  } catch (caught) {
    const err = typeof output === 'boolean' || !output.flags ? caught : inFlagWords(caught, output.flags);
    const code =
      err instanceof InputError || err instanceof ValidationError
        ? EXIT_BAD_INPUT
        : err instanceof SolverError
          ? EXIT_SOLVER
          : err instanceof WaymarkError
            ? EXIT_BAD_INPUT
            : 70;
    if (json) {
      const e = err as Error & Partial<InputError & ValidationError & SolverError>;
      printJson({
        error: {
          type: e.name,
          message: e.message,
          field: e.field,
          rule: e.rule,
          issues: e.issues,
          reason: e.reason,
        },
      });
    } else {
      process.stderr.write(`${termSafe(`waymark: ${(err as Error).message}`)}\n`);
      if (code === 70) process.stderr.write(`${termSafe(String((err as Error).stack ?? ''))}\n`);
    }
    process.exitCode = code;
  }
}

/** Fixed-width number for text tables. */
export function num(x: number, digits = 3): string {
  if (!Number.isFinite(x)) return '—';
  const a = Math.abs(x);
  if (a !== 0 && (a < 1e-3 || a >= 1e9)) return x.toExponential(digits);
  return x.toFixed(digits);
}

export function vecText(v: ArrayLike<number>, scale = 1, digits = 4): string {
  return `[${Array.from(v, (c) => num(c / scale, digits)).join(', ')}]`;
}
