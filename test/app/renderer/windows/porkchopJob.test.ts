import { readFileSync } from 'node:fs';
import { describe, expect, it, vi } from 'vitest';
import { SolverError } from '../../../../core/math/errors.ts';
import { parseSystemFile } from '../../../../core/io/systemFile.ts';
import { computePorkchop } from '../../../../core/search/porkchop.ts';
import type { PorkchopRequest } from '../../../../core/search/request.ts';
import { runPorkchopJob } from '../../../../app/renderer/windows/porkchopJob.ts';
import { PorkchopClient, type WorkerLike } from '../../../../app/renderer/windows/porkchopClient.ts';
import type { FromWorker, ToWorker } from '../../../../app/renderer/windows/protocol.ts';

const system = parseSystemFile(readFileSync(new URL('../../../../assets/systems/ilmar.system.json', import.meta.url), 'utf8')).system;
const DAY = 86400;
const request: PorkchopRequest = {
  from: system.indexById.tessel,
  to: system.indexById.ochre,
  depart: { start: 0, end: 400 * DAY, n: 120 },
  secondAxis: 'tof',
  second: { start: 100 * DAY, end: 400 * DAY, n: 90 },
  parkingAltitude: 300_000,
  arrivalAltitude: 400_000,
};

describe('porkchop job (what the Windows worker runs)', () => {
  it('computes the same grid as the core in one go, reporting progress up to the total', async () => {
    const progress: number[] = [];
    const r = await runPorkchopJob(
      system,
      request,
      { count: 3 },
      { isCancelled: () => false, onProgress: (d, t) => progress.push(d / t), yieldNow: async () => undefined },
    );
    const ref = computePorkchop(system, request);
    expect(Array.from(r.grid.planes.dvTotal)).toEqual(Array.from(ref.planes.dvTotal));
    expect(progress.at(-1)).toBe(1);
    for (let k = 1; k < progress.length; k++) expect(progress[k]).toBeGreaterThan(progress[k - 1]);
    expect(r.windows.length).toBeGreaterThan(0);
    // The demo plan departs near day 162 with a 241-day flight (test/fixtures/demoPlan.ts).
    const first = r.windows[0];
    expect(Math.abs(first.departure / DAY - 162)).toBeLessThan(3);
    expect(Math.abs(first.tof / DAY - 241)).toBeLessThan(3);
  });

  it('stops with a cancelled SolverError when cancelled between blocks', async () => {
    let calls = 0;
    const job = runPorkchopJob(
      system,
      { ...request, depart: { ...request.depart, n: 400 } },
      {},
      {
        isCancelled: () => calls > 0,
        onProgress: () => void calls++,
        yieldNow: async () => undefined,
      },
    );
    await expect(job).rejects.toSatisfy((e: unknown) => e instanceof SolverError && e.reason === 'cancelled');
  });
});

describe('porkchop client', () => {
  function fakeWorker() {
    const sent: ToWorker[] = [];
    const w: WorkerLike & { emit(m: FromWorker): void } = {
      onmessage: null,
      postMessage: (m) => void sent.push(m),
      terminate: vi.fn(),
      emit(m) {
        w.onmessage?.({ data: m } as MessageEvent<FromWorker>);
      },
    };
    return { w, sent };
  }

  it('forwards progress, resolves with the result, and null when cancelled', async () => {
    const { w, sent } = fakeWorker();
    const c = new PorkchopClient(() => w);
    const onProgress = vi.fn();
    const p1 = c.run(system, request, {}, onProgress);
    const id1 = (sent[0] as { id: number }).id;
    w.emit({ type: 'progress', id: id1, done: 5, total: 10 });
    expect(onProgress).toHaveBeenCalledWith(5, 10);
    // A second run cancels the first.
    const p2 = c.run(system, request, {}, vi.fn());
    expect(sent[1]).toEqual({ type: 'cancel', id: id1 });
    w.emit({ type: 'cancelled', id: id1 });
    await expect(p1).resolves.toBeNull();
    const id2 = (sent[2] as { id: number }).id;
    w.emit({ type: 'error', id: id2, message: 'bad request' });
    await expect(p2).rejects.toThrow('bad request');
  });
});
