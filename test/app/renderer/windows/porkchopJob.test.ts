import { readFileSync } from 'node:fs';
import { describe, expect, it, vi } from 'vitest';
import { SolverError } from '../../../../core/math/errors.ts';
import { parseSystemFile } from '../../../../core/io/systemFile.ts';
import { computePorkchop } from '../../../../core/search/porkchop.ts';
import type { PorkchopRequest } from '../../../../core/search/request.ts';
import { computeBand, macrotask, runPorkchopJob, warmPorkchop } from '../../../../app/renderer/windows/porkchopJob.ts';
import { createPlanes, FLOAT_PLANES, INT_PLANES } from '../../../../core/search/planes.ts';
import { partitionRows } from '../../../../core/search/chunks.ts';
import { prepareTransfer } from '../../../../core/search/transfer.ts';
import { findWindows } from '../../../../core/search/windows.ts';
import { plotLevels, rasterPorkchop } from '../../../../app/renderer/windows/porkchopRaster.ts';
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

  it("split over two bands (the leader's and a helper's), gives the same grid, windows and picture as the core in one thread", async () => {
    const [lead, help] = partitionRows(request.depart.n, 2);
    const hooks = { isCancelled: () => false, onProgress: () => undefined };
    const helper = createPlanes(help.rowStart, help.rowEnd - help.rowStart, request.second.n);
    const helperUnsolved = await computeBand(system, prepareTransfer(system, request), help, helper, hooks);
    const r = await runPorkchopJob(system, request, { count: 3 }, hooks, {
      rows: lead,
      bands: async () => [{ planes: helper, unsolved: helperUnsolved }],
      raster: { width: 90, height: 70 },
    });
    const ref = computePorkchop(system, request);
    for (const k of [...FLOAT_PLANES, ...INT_PLANES]) expect(Array.from(r.grid.planes[k])).toEqual(Array.from(ref.planes[k]));
    expect(r.grid.unsolved).toBe(ref.unsolved);
    expect(r.windows).toEqual(findWindows(system, ref, { count: 3 }));
    const levels = plotLevels(ref.planes.dvTotal);
    expect(r.image?.levels).toEqual(levels);
    const picture = rasterPorkchop(
      { plane: ref.planes.dvTotal, departTimes: ref.departTimes, secondValues: ref.secondValues, secondAxis: 'tof' },
      levels,
      90,
      70,
    );
    expect(Array.from(r.image!.pixels)).toEqual(Array.from(picture));
  });

  it('a band reports progress in its own cells, up to its total', async () => {
    const seen: [number, number][] = [];
    const rows = { rowStart: 30, rowEnd: 120 };
    const out = createPlanes(30, 90, request.second.n);
    await computeBand(system, request, rows, out, { isCancelled: () => false, onProgress: (d, t) => seen.push([d, t]), yieldNow: async () => undefined });
    expect(seen.at(-1)).toEqual([90 * request.second.n, 90 * request.second.n]);
  });

  it('the warm-up runs a small grid of the same pair and its windows', async () => {
    const r = await warmPorkchop(system, request);
    expect(r.grid.planes.nRows * r.grid.planes.nCols).toBeLessThan(request.depart.n * request.second.n);
    expect(r.grid.request.from).toBe(request.from);
    expect(r.windows.length).toBe(1);
  });

  it('a macrotask lets a message posted before it in', async () => {
    const ch = new MessageChannel();
    let got = false;
    ch.port1.onmessage = () => {
      got = true;
    };
    ch.port2.postMessage(0);
    await macrotask();
    await macrotask();
    ch.port1.close();
    expect(got).toBe(true);
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
    const c = new PorkchopClient(() => w, 1);
    const onProgress = vi.fn();
    const p1 = c.run(system, request, {}, onProgress);
    expect(sent[0]).toMatchObject({ type: 'run', rows: { rowStart: 0, rowEnd: request.depart.n }, helpers: 0, raster: null });
    const id1 = (sent[0] as { id: number }).id;
    w.emit({ type: 'progress', id: id1, done: 5, total: 10 });
    // progress in cells of the whole grid
    expect(onProgress).toHaveBeenCalledWith(5, request.depart.n * request.second.n);
    // A second run cancels the first.
    const p2 = c.run(system, request, {}, vi.fn());
    expect(sent[1]).toEqual({ type: 'cancel', id: id1 });
    w.emit({ type: 'cancelled', id: id1 });
    await expect(p1).resolves.toBeNull();
    const id2 = (sent[2] as { id: number }).id;
    w.emit({ type: 'error', id: id2, message: 'bad request' });
    await expect(p2).rejects.toThrow('bad request');
  });

  it('splits a job over two workers: the leader gets the first band and a port, the helper the second band and the other end; progress is summed; a cancel reaches both', async () => {
    const a = fakeWorker();
    const b = fakeWorker();
    const made = [a.w, b.w];
    const c = new PorkchopClient(() => made.shift()!, 2);
    const onProgress = vi.fn();
    const job = c.run(system, request, { count: 2 }, onProgress, { width: 40, height: 30 });
    const [peerA, runA] = a.sent;
    const [peerB, rowsB] = b.sent;
    expect(peerA.type).toBe('peer');
    expect(peerB.type).toBe('peer');
    const bands = partitionRows(request.depart.n, 2);
    expect(runA).toMatchObject({ type: 'run', rows: bands[0], helpers: 1, raster: { width: 40, height: 30 } });
    expect(rowsB).toMatchObject({ type: 'rows', rows: bands[1] });
    const id = (runA as { id: number }).id;
    a.w.emit({ type: 'progress', id, done: 100, total: 60 * 90 });
    b.w.emit({ type: 'progress', id, done: 200, total: 60 * 90 });
    expect(onProgress).toHaveBeenLastCalledWith(300, request.depart.n * request.second.n);
    c.cancel();
    expect(a.sent.at(-1)).toEqual({ type: 'cancel', id });
    expect(b.sent.at(-1)).toEqual({ type: 'cancel', id });
    a.w.emit({ type: 'cancelled', id });
    await expect(job).resolves.toBeNull();
    for (const m of [peerA, peerB]) (m as { port: MessagePort }).port.close();
    c.dispose();
    expect(a.w.terminate).toHaveBeenCalled();
    expect(b.w.terminate).toHaveBeenCalled();
  });
});
