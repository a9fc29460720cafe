/**
 * Body of a dispersion pool worker: flies one chunk of samples with the same core functions the
 * in-thread path uses (core/nbody/disperse.ts prepareDispersion + runSamples), and hands the
 * per-sample arrays back by transfer. Sample k always uses random stream k of the seed, so the
 * merged result does not depend on the number of workers or the chunking.
 */
import { move, transferableSymbol, valueSymbol } from 'piscina';
import { prepareDispersion, runSamples, type DispersionOptions, type SampleBlock } from '../../../core/nbody/index.ts';
import type { Plan } from '../../../core/plan/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';

export interface DisperseTask {
  system: StarSystem;
  plan: Plan;
  options: DispersionOptions;
  first: number;
  count: number;
}

export default function disperseChunk(task: DisperseTask): unknown {
  const prepared = prepareDispersion(task.system, task.plan, task.options);
  const block: SampleBlock = runSamples(prepared, task.first, task.count);
  return move({
    get [transferableSymbol]() {
      return [block.margin.buffer, block.periapsisAltitude.buffer, block.magnitudeError.buffer, block.pointingError.buffer];
    },
    get [valueSymbol]() {
      return block;
    },
  } as never);
}
