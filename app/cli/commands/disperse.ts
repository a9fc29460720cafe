/**
 * `waymark disperse PLAN [--samples N] [--seed S] [--mag-sigma PCT] [--point-sigma DEG]
 *  [--resolve retarget|frozen] [--workers N] [--json]` — Monte Carlo over burn execution errors
 * (core/nbody/disperse.ts): each sample flies the plan with patched conics with every burn's
 * magnitude and pointing perturbed (1σ values, all burns). The defaults (500 samples, 0.5 %,
 * 0.2°, solved burns re-solved) are the app's (core/io/defaults.ts).
 *
 * Samples are spread over `--workers` worker threads (piscina; default: the machine's cores,
 * at most MAX_AUTO_WORKERS; 1 runs in this thread) in chunks; sample k always uses random stream
 * k of the seed, so the numbers do not depend on the worker count. A progress bar counts samples
 * on a terminal. Text: the probabilities and the percentiles; `--json`: the summary in SI (no
 * per-sample arrays). Exit 0 when run, 2 for a bad file or option, 3 for a numerical failure.
 */
import { availableParallelism } from 'node:os';
import type { Command } from 'commander';
import { Piscina } from 'piscina';
import { DISPERSION_DEFAULTS, parseQuantity, RESOLVE_NAMES } from '../../../core/io/index.ts';
import { InputError } from '../../../core/math/index.ts';
import {
  mergeBlocks,
  prepareDispersion,
  runSamples,
  summarizeDispersion,
  type DispersionOptions,
  type DispersionResult,
  type SampleBlock,
} from '../../../core/nbody/index.ts';
import type { Plan } from '../../../core/plan/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import { loadPlanFile } from '../../node/files.ts';
import { EXIT_OK, guard, num, printJson, printText, printWarnings } from '../output.ts';
import { DISPERSE_FLAGS } from '../flags.ts';
import { createProgress, progressEnabled } from '../progress.ts';
import type { DisperseTask } from '../workers/disperseWorker.ts';
import { workerUrl } from '../workers/entry.ts';

export const DISPERSE_WORKER_URL = workerUrl('disperseWorker');
/** Workers used when --workers is not given. */
export const MAX_AUTO_WORKERS = 8;
/** Chunks per worker: load balance and a smooth progress bar. */
export const CHUNKS_PER_WORKER = 8;

function count(field: string, text: string, min: number): number {
  const n = Number(text);
  if (!Number.isInteger(n) || n < min) throw new InputError(field, `must be a whole number >= ${min}`, text);
  return n;
}

/** Runs the samples over `workers` threads (1: this thread) and summarises them. */
export async function runDispersion(
  system: StarSystem,
  plan: Plan,
  options: DispersionOptions,
  workers: number,
  onProgress?: (done: number, total: number) => void,
): Promise<DispersionResult> {
  const prepared = prepareDispersion(system, plan, options); // validates here, not in a worker
  const n = prepared.samples;
  if (workers <= 1) {
    const block = runSamples(prepared, 0, n, { onProgress });
    return summarizeDispersion(prepared, block);
  }
  const chunks = Math.min(n, workers * CHUNKS_PER_WORKER);
  const pool = new Piscina({ filename: DISPERSE_WORKER_URL, minThreads: workers, maxThreads: workers, idleTimeout: 30_000 });
  try {
    let done = 0;
    const tasks: Promise<SampleBlock>[] = [];
    for (let c = 0; c < chunks; c++) {
      const first = Math.floor((c * n) / chunks);
      const last = Math.floor(((c + 1) * n) / chunks);
      const task: DisperseTask = { system, plan, options, first, count: last - first };
      tasks.push(
        pool.run(task).then((b: SampleBlock) => {
          done += b.count;
          onProgress?.(done, n);
          return b;
        }),
      );
    }
    const blocks = await Promise.all(tasks);
    return summarizeDispersion(prepared, mergeBlocks(blocks, n, prepared.burns.length));
  } finally {
    await pool.destroy();
  }
}

function pct(x: number | null): string {
  return x === null ? '—' : `${(100 * x).toFixed(2)} %`;
}

export function addDisperseCommand(program: Command): void {
  program
    .command('disperse')
    .description('Monte Carlo over burn execution errors (patched conics): probability the margin holds and the arrival is safe')
    .argument('<plan>', 'plan file (.plan.json)')
    .option('--samples <n>', 'number of samples', String(DISPERSION_DEFAULTS.samples))
    .option('--seed <s>', 'seed of the random streams (integer)', String(DISPERSION_DEFAULTS.seed))
    .option('--mag-sigma <pct>', '1σ burn magnitude error, percent', String(DISPERSION_DEFAULTS.magnitudeSigmaPct))
    .option('--point-sigma <deg>', '1σ burn pointing error per axis, degrees', String(DISPERSION_DEFAULTS.pointingSigmaDeg))
    .option(
      '--resolve <mode>',
      `retarget: ${RESOLVE_NAMES.retarget}, solved burns re-solve; frozen: ${RESOLVE_NAMES.frozen}, burns fixed to their nominal vectors`,
      DISPERSION_DEFAULTS.resolve,
    )
    .option('--workers <n>', 'worker threads (1: in this thread)')
    .option('--json', 'machine-readable output')
    .action((planPath: string, o: { samples: string; seed: string; magSigma: string; pointSigma: string; resolve: string; workers?: string; json?: boolean }) =>
      guard({ json: !!o.json, flags: DISPERSE_FLAGS }, async () => {
        const samples = count('--samples', o.samples, 1);
        const seedNum = Number(o.seed);
        if (!Number.isSafeInteger(seedNum)) throw new InputError('--seed', 'must be a whole number', o.seed);
        const magnitudeSigma = parseQuantity('--mag-sigma', o.magSigma, 'none');
        const pointingSigma = parseQuantity('--point-sigma', o.pointSigma, 'none');
        if (!(magnitudeSigma >= 0)) throw new InputError('--mag-sigma', 'must be >= 0', o.magSigma);
        if (!(pointingSigma >= 0)) throw new InputError('--point-sigma', 'must be >= 0', o.pointSigma);
        if (o.resolve !== 'frozen' && o.resolve !== 'retarget') throw new InputError('--resolve', "must be 'frozen' or 'retarget'", o.resolve);
        const workers = o.workers !== undefined ? count('--workers', o.workers, 1) : Math.min(MAX_AUTO_WORKERS, Math.max(1, availableParallelism()));
        const loaded = await loadPlanFile(planPath);
        const options: DispersionOptions = { samples, seed: seedNum, magnitudeSigma, pointingSigma, resolve: o.resolve };
        const bar = createProgress('disperse', 'samples', progressEnabled(!!o.json));
        const t0 = performance.now();
        let r: DispersionResult;
        try {
          r = await runDispersion(loaded.system, loaded.plan, options, Math.min(workers, samples), (d, t) => bar.update(d, t));
        } finally {
          bar.stop();
        }
        const seconds = (performance.now() - t0) / 1000;
        const { perSample, ...summary } = r;
        void perSample;
        if (o.json) {
          printJson({ plan: loaded.plan.name, ...summary, magnitudeSigma, pointingSigma, workers: Math.min(workers, samples), seconds });
        } else {
          printWarnings(loaded.warnings);
          const km = (m: number): string => num(m / 1e3, 1);
          const lines = [
            `dispersion of ${loaded.plan.name}: ${samples} samples, seed ${o.seed}, σ magnitude ${num(magnitudeSigma, 3)} %, σ pointing ${num(pointingSigma, 3)}° (${r.resolve})`,
            `P(margin >= 0)             ${pct(r.pMarginHolds)}   (nominal margin ${num(r.nominal.margin, 1)} m/s)`,
            `margin m/s   p5 ${num(r.margin.p5, 1)}   p50 ${num(r.margin.p50, 1)}   p95 ${num(r.margin.p95, 1)}   mean ${num(r.margin.mean, 1)}`,
          ];
          if (r.pArrive !== null) {
            lines.push(`P(arrives)                 ${pct(r.pArrive)}`);
            lines.push(
              `P(periapsis >= ${km(r.safeAltitude!)} km)  ${pct(r.pPeriapsisSafe)}   (nominal ${r.nominal.periapsisAltitude === null ? '—' : km(r.nominal.periapsisAltitude)} km)`,
            );
            if (r.periapsisAltitude) {
              lines.push(`periapsis km p5 ${km(r.periapsisAltitude.p5)}   p50 ${km(r.periapsisAltitude.p50)}   p95 ${km(r.periapsisAltitude.p95)}`);
            }
          }
          if (r.failed > 0) lines.push(`${r.failed} samples could not be evaluated (counted as not holding)`);
          if (r.impacts > 0) lines.push(`${r.impacts} samples end in an impact (counted as not holding)`);
          if (r.missed > 0)
            lines.push(
              `${r.missed} samples never reach ${loaded.system.bodies.find((b) => b.id === loaded.plan.target?.body)?.name ?? 'the target'} (counted as not holding)`,
            );
          lines.push(`${num(samples / seconds, 0)} samples/s on ${Math.min(workers, samples)} worker${workers === 1 ? '' : 's'}`);
          printText(lines.join('\n'));
        }
        return EXIT_OK;
      }),
    );
}
