/**
 * The CI-budget run of a fuzz target (test/fuzz/targets.ts): fast-check runs `runs` cases from a
 * fixed seed (override with WAYMARK_FUZZ_SEED to explore), each judged by the target's runner;
 * the first failure fails the test with its kind, the case and fast-check's replay seed and path.
 * The long runs are test/fuzz/run.ts (`npm run fuzz`).
 */
import fc from 'fast-check';
import type { Target } from '../fuzz/targets.ts';
import { judge } from '../fuzz/verdict.ts';

export const FUZZ_SEED = process.env.WAYMARK_FUZZ_SEED ? Number(process.env.WAYMARK_FUZZ_SEED) : 20_260_601;

/** Runs the target; returns the outcome counts (the test may check the mix). Throws on the first failure. */
export function runBudget<C>(t: Target<C>, runs: number, seed = FUZZ_SEED): Map<string, number> {
  const outcomes = new Map<string, number>();
  fc.assert(
    fc.property(t.cases, (c) => {
      const v = judge(t.run, c, Infinity); // bounded by work (the case count), never by a wall clock
      if (!v.ok) throw new Error(`${v.kind}: ${v.detail}\n  case: ${t.describe(c)}`);
      const key = v.outcome.replace(/\s*\(.*$/s, '');
      outcomes.set(key, (outcomes.get(key) ?? 0) + 1);
      return true;
    }),
    // no shrinking: a failing case is reported as generated (shrinking re-runs slow cases)
    { numRuns: runs, seed, endOnFailure: true },
  );
  return outcomes;
}

/** Sum of the counts whose outcome starts with `prefix`. */
export function count(outcomes: Map<string, number>, prefix: string): number {
  let n = 0;
  for (const [k, v] of outcomes) if (k.startsWith(prefix)) n += v;
  return n;
}
