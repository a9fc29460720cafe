import { describe, expect, it } from 'vitest';
import { AnalysisClient } from '../../../../app/renderer/analysis/client.ts';
import { deltaVMap } from '../../../../core/survey/index.ts';
import { ilmar } from '../../../core/io/syntheticResult.ts';
import { inThreadWorker } from './inThreadWorker.ts';

describe('the Δv map job of the analysis worker', () => {
  it('answers with the core map of the system, progress counted in transfers up to the whole', async () => {
    const client = new AnalysisClient(inThreadWorker);
    const seen: number[] = [];
    const done = await client.run({ kind: 'dv-map', system: ilmar, samples: 24 }, (f) => seen.push(f));
    expect(done?.output.kind).toBe('dv-map');
    if (done?.output.kind !== 'dv-map') return;
    expect(done.output.map).toEqual(deltaVMap(ilmar, { samples: 24 }));
    expect(seen.at(-1)).toBe(1);
    for (let k = 1; k < seen.length; k++) expect(seen[k]).toBeGreaterThanOrEqual(seen[k - 1]);
  });

  it('a cancelled map job resolves null', async () => {
    const w = inThreadWorker();
    const client = new AnalysisClient(() => w);
    const p = client.run({ kind: 'dv-map', system: ilmar, samples: 24 }, () => undefined);
    client.cancel();
    expect(await p).toBeNull();
    expect(w.terminated).toBe(1);
  });
});
