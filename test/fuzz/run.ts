/**
 * Long fuzz runs beside the CI budget (test/robust/):
 *
 *   npm run fuzz -- --runs 100000 [--seed S] [--target system|plan|lambert|kepler|evaluate|rk45|all] [--time SECONDS]
 *   npm run fuzz -- --target plan --seed S --case N        replays one case and prints it in full
 *
 * `--runs` is the number of cases in all; with `--target all` (the default) it is shared evenly
 * among the targets, each with its own seed (S + its position in the list). Case N of a run is
 * generated from its own seed (caseSeed), so `--case N` rebuilds exactly that case. `--time`
 * stops each target after its share of the time. Prints the cases run, the outcomes, the failures by kind
 * (with the first case of each kind, replayable with --case) and the time taken.
 *
 * A case that runs longer than CASE_TIME_LIMIT_MS is a failure of kind "slow". A case that
 * never returns (a hang) cannot be interrupted from inside: a watchdog thread prints which case
 * it was and ends the run after HANG_LIMIT_MS.
 */
import { writeSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import fc from 'fast-check';
import { TARGETS, TARGET_NAMES, type Target, type TargetName } from './targets.ts';
import { CASE_TIME_LIMIT_MS, judge } from './verdict.ts';

/** A case running this long is taken for a hang and ends the run, ms. */
export const HANG_LIMIT_MS = 60_000;

interface Args {
  runs: number;
  seed: number;
  targets: TargetName[];
  time: number;
  caseIndex: number | null;
}

function parseArgs(argv: string[]): Args {
  const args: Args = { runs: 1000, seed: Date.now() % 1_000_000_007, targets: [...TARGET_NAMES], time: Infinity, caseIndex: null };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const value = (): string => {
      const v = argv[++i];
      if (v === undefined) throw new Error(`${a} needs a value`);
      return v;
    };
    const int = (v: string): number => {
      const n = Number(v);
      if (!Number.isInteger(n) || n < 0) throw new Error(`${a} must be a non-negative integer (got ${v})`);
      return n;
    };
    if (a === '--runs') args.runs = int(value());
    else if (a === '--seed') args.seed = int(value());
    else if (a === '--case') args.caseIndex = int(value());
    else if (a === '--time') args.time = 1000 * Number(value());
    else if (a === '--target') {
      const t = value();
      if (t === 'all') args.targets = [...TARGET_NAMES];
      else if ((TARGET_NAMES as string[]).includes(t)) args.targets = [t as TargetName];
      else throw new Error(`--target must be one of ${TARGET_NAMES.join(', ')}, all (got ${t})`);
    } else if (a === '--help' || a === '-h') {
      console.log('npm run fuzz -- --runs N [--seed S] [--target system|plan|lambert|kepler|evaluate|rk45|all] [--time SECONDS] [--case N]');
      process.exit(0);
    } else throw new Error(`unknown option ${a}`);
  }
  return args;
}

// Watchdog: the main thread bumps a counter as each case starts and marks itself busy; a worker
// thread polls every WATCH_MS and calls it a hang when the same case has been busy for
// HANG_LIMIT_MS of polls. Counting polls (timers are monotonic) rather than comparing clocks
// across threads: the wall clock can jump and fake a hang. [started, busy, index, position, seed]
const WATCH_MS = 500;
export const shared = new Int32Array(new SharedArrayBuffer(5 * 4));
export function startWatchdog(names: string[], limitMs = HANG_LIMIT_MS): void {
  const code = `
    const { workerData } = require('node:worker_threads');
    const { writeSync } = require('node:fs');
    const a = new Int32Array(workerData.sab);
    let last = -1, stuck = 0;
    setInterval(() => {
      const started = Atomics.load(a, 0);
      if (Atomics.load(a, 1) === 1 && started === last) stuck += workerData.every; else stuck = 0;
      last = started;
      if (stuck > workerData.limit) {
        const name = workerData.names[a[3]];
        writeSync(2, '\\nHANG: target ' + name + ' case ' + a[2] + ' (seed ' + a[4] + ') ran for more than ' + workerData.limit + ' ms; replay with --target ' + name + ' --seed ' + a[4] + ' --case ' + a[2] + '\\n');
        process.kill(process.pid, 'SIGKILL');
      }
    }, workerData.every);`;
  const w = new Worker(code, { eval: true, workerData: { sab: shared.buffer, limit: limitMs, every: WATCH_MS, names } });
  w.unref();
}

interface Tally {
  runs: number;
  outcomes: Map<string, number>;
  failures: Map<string, { count: number; first: string }>;
  ms: number;
  slowest: number;
}

/** Seed of case `index` of a run with seed `seed`: every case is generated on its own, so any one replays alone. */
export function caseSeed(seed: number, index: number): number {
  return (Math.imul(seed, 0x9e3779b1) + Math.imul(index, 0x85ebca6b)) | 0;
}

/** Case `index` of target `t` in a run with seed `seed`. */
export function caseAt<C>(t: Target<C>, seed: number, index: number): C {
  return fc.sample(t.cases, { seed: caseSeed(seed, index), numRuns: 1 })[0];
}

function runTarget<C>(t: Target<C>, position: number, runs: number, seed: number, timeMs: number): Tally {
  const tally: Tally = { runs: 0, outcomes: new Map(), failures: new Map(), ms: 0, slowest: 0 };
  const t0 = performance.now();
  for (let index = 0; index < runs && performance.now() - t0 < timeMs; index++) {
    const c = caseAt(t, seed, index);
    shared[2] = index;
    shared[3] = position;
    shared[4] = seed;
    Atomics.add(shared, 0, 1);
    Atomics.store(shared, 1, 1);
    const v = judge(t.run, c);
    Atomics.store(shared, 1, 0);
    tally.runs++;
    tally.slowest = Math.max(tally.slowest, v.ms);
    if (v.ok) {
      const key = v.outcome.replace(/\s*\(.*$/s, '');
      tally.outcomes.set(key, (tally.outcomes.get(key) ?? 0) + 1);
    } else {
      const f = tally.failures.get(v.kind);
      if (f) f.count++;
      else tally.failures.set(v.kind, { count: 1, first: `case ${index}: ${t.describe(c)}\n      ${v.detail.replace(/\n/g, '\n      ')}` });
    }
  }
  tally.ms = performance.now() - t0;
  return tally;
}

function replay<C>(t: Target<C>, seed: number, index: number): void {
  const c = caseAt(t, seed, index);
  console.log(`target ${t.name}, seed ${seed}, case ${index}: ${t.describe(c)}`);
  const text = JSON.stringify(c, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? String(v) : v), 2);
  console.log(text.length > 20_000 ? `${text.slice(0, 20_000)}\n... (${text.length} characters)` : text);
  const v = judge(t.run, c);
  console.log(v.ok ? `ok: ${v.outcome} (${v.ms.toFixed(1)} ms)` : `FAILED ${v.kind} (${v.ms.toFixed(1)} ms)\n${v.detail}`);
  process.exitCode = v.ok ? 0 : 1;
}

function main(): void {
  const args = parseArgs(process.argv.slice(2));
  if (args.caseIndex !== null) {
    if (args.targets.length !== 1) throw new Error('--case needs one --target');
    replay(TARGETS[args.targets[0]] as Target<unknown>, args.seed, args.caseIndex);
    return;
  }
  startWatchdog(args.targets);
  const per = Math.max(1, Math.floor(args.runs / args.targets.length));
  const timePer = args.time / args.targets.length;
  console.log(`fuzz: ${per} cases per target (${args.targets.join(', ')}), seed ${args.seed}, case time limit ${CASE_TIME_LIMIT_MS} ms`);
  const t0 = performance.now();
  let total = 0;
  let failed = 0;
  for (const [position, name] of args.targets.entries()) {
    const seed = args.seed + position;
    const tally = runTarget(TARGETS[name] as Target<unknown>, position, per, seed, timePer);
    total += tally.runs;
    const nf = [...tally.failures.values()].reduce((s, f) => s + f.count, 0);
    failed += nf;
    console.log(`\n${name} (seed ${seed}): ${tally.runs} cases in ${(tally.ms / 1000).toFixed(1)} s, slowest ${tally.slowest.toFixed(0)} ms, ${nf} failed`);
    for (const [k, n] of [...tally.outcomes].sort((a, b) => b[1] - a[1])) console.log(`  ${String(n).padStart(8)}  ${k}`);
    for (const [k, f] of tally.failures) console.log(`  FAIL ${String(f.count).padStart(6)}  ${k}\n      first: ${f.first}`);
  }
  const s = (performance.now() - t0) / 1000;
  writeSync(1, `\ntotal: ${total} cases, ${failed} failed, ${s.toFixed(1)} s\n`);
  process.exitCode = failed > 0 ? 1 : 0;
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) main();
