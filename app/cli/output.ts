/**
 * Output and failure handling shared by every command: `--json` prints one JSON document on
 * stdout; otherwise a human-readable text. Errors print their message on stderr and set the
 * exit code: 2 for bad input or a bad file, 3 for a numerical failure, 1 is reserved for
 * "the answer is no" (a plan whose margin does not hold).
 */
import { InputError, SolverError, ValidationError, WaymarkError } from '../../core/math/index.ts';

export const EXIT_OK = 0;
export const EXIT_NO = 1;
export const EXIT_BAD_INPUT = 2;
export const EXIT_SOLVER = 3;

export function printJson(value: unknown): void {
  process.stdout.write(JSON.stringify(value, jsonReplacer, 2) + '\n');
}

/** Typed arrays become plain arrays; non-finite numbers become null (JSON has no NaN). */
export function jsonReplacer(_key: string, value: unknown): unknown {
  if (ArrayBuffer.isView(value) && !(value instanceof DataView)) return Array.from(value as unknown as ArrayLike<number>);
  if (typeof value === 'number' && !Number.isFinite(value)) return null;
  return value;
}

/** Runs a command body, mapping core errors to messages and exit codes. */
export async function guard(json: boolean, body: () => Promise<number | void> | number | void): Promise<void> {
  try {
    const code = await body();
    process.exitCode = code ?? EXIT_OK;
  } catch (err) {
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
      process.stderr.write(`waymark: ${(err as Error).message}\n`);
      if (code === 70) process.stderr.write(String((err as Error).stack ?? '') + '\n');
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
