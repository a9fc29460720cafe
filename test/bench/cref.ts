/**
 * C references for the benchmarks: compiles test/bench/c/<name>.c with `gcc -O2` into a
 * temporary directory (once per run) and runs it on input written by the bench. Without gcc
 * the reference is skipped with a message and the bench prints its own figures only.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = join(dirname(fileURLToPath(import.meta.url)), 'c');
let dir: string | null = null;

/** Path of the compiled reference `name`, or null (with a message) when gcc is missing or fails. */
export function buildC(name: string): string | null {
  dir ??= mkdtempSync(join(tmpdir(), 'waymark-cref-'));
  const bin = join(dir, name);
  const r = spawnSync('gcc', ['-O2', '-o', bin, join(here, `${name}.c`), '-lm'], { encoding: 'utf8' });
  if (r.error || r.status !== 0) {
    console.log(`  (C reference ${name}.c skipped: ${r.error ? 'gcc not found' : `gcc failed: ${r.stderr.trim().split('\n')[0]}`})`);
    return null;
  }
  return bin;
}

/**
 * Runs a compiled reference with `input` as its IN file; returns its stdout numbers and the
 * doubles it wrote to its OUT file, or null (with a message) if it failed.
 */
export function runC(bin: string, input: Float64Array, reps: number): { figures: number[]; out: Float64Array } | null {
  const d = dir as string;
  const inPath = join(d, 'in.bin');
  const outPath = join(d, 'out.bin');
  writeFileSync(inPath, new Uint8Array(input.buffer, input.byteOffset, input.byteLength));
  const r = spawnSync(bin, [inPath, outPath, String(reps)], { encoding: 'utf8' });
  if (r.error || r.status !== 0) {
    console.log(`  (C reference ${bin} failed: ${r.error?.message ?? `exit ${r.status}`})`);
    return null;
  }
  const buf = readFileSync(outPath);
  const out = new Float64Array(buf.buffer.slice(buf.byteOffset, buf.byteOffset + buf.byteLength));
  return { figures: r.stdout.trim().split(/\s+/).map(Number), out };
}
