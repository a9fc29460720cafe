import { readFileSync } from 'node:fs';
import { describe, expect, it, vi } from 'vitest';
import { SolverError } from '../../../../core/math/errors.ts';
import { parseSystemFile } from '../../../../core/io/systemFile.ts';
import { computePorkchop } from '../../../../core/search/porkchop.ts';
import type { PorkchopRequest } from '../../../../core/search/request.ts';
import { HelperBlocks, helpFromBottom, macrotask, rowsPerBlock, runPorkchopJob, warmPorkchop } from '../../../../app/renderer/windows/porkchopJob.ts';
import { createPlanes, FLOAT_PLANES, INT_PLANES } from '../../../../core/search/planes.ts';
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

  it('shared with a helper from the far end, gives the same grid, windows and picture as the core in one thread, however fast the helper runs', async () => {
    const ref = computePorkchop(system, request);
    const refWindows = findWindows(system, ref, { count: 3 });
    const levels = plotLevels(ref.planes.dvTotal);
    const picture = rasterPorkchop(
      { plane: ref.planes.dvTotal, departTimes: ref.departTimes, secondValues: ref.secondValues, secondAxis: 'tof' },
      levels,
      90,
      70,
    );
    const per = rowsPerBlock(request.second.n);
    // the helper: interleaved with the leader block by block, never scheduled, or done before the leader starts
    for (const pace of ['interleaved', 'starved', 'ahead'] as const) {
      let blocks: HelperBlocks | null = null;
      let stops = 0;
      const pending: Parameters<HelperBlocks['accept']>[0][] = [];
      const helper = helpFromBottom(system, request, {
        shouldStop: () => stops > 0,
        send: (planes) => pending.push(planes),
        yieldNow: macrotask,
      });
      if (pace === 'ahead') await helper;
      const r = await runPorkchopJob(
        system,
        request,
        { count: 3 },
        {
          isCancelled: () => false,
          onProgress: () => undefined,
          // the helper's messages arrive while the leader yields
          yieldNow: async () => {
            await macrotask();
            if (pace !== 'starved') while (pending.length) blocks!.accept(pending.shift()!);
          },
        },
        {
          helper: (planes) => {
            blocks = new HelperBlocks(planes, () => void stops++);
            if (pace === 'ahead') while (pending.length) blocks.accept(pending.shift()!);
            return blocks;
          },
          raster: { width: 90, height: 70 },
        },
      );
      await helper;
      expect(stops).toBe(1);
      if (pace === 'ahead') expect(blocks!.received()).toBe(0);
      if (pace === 'interleaved') expect(blocks!.received()).toBeLessThan(request.depart.n - per);
      if (pace === 'starved') expect(blocks!.received()).toBe(request.depart.n);
      for (const k of [...FLOAT_PLANES, ...INT_PLANES]) expect(Array.from(r.grid.planes[k])).toEqual(Array.from(ref.planes[k]));
      expect(r.grid.unsolved).toBe(ref.unsolved);
      expect(r.windows).toEqual(refWindows);
      expect(r.image?.levels).toEqual(levels);
      expect(Array.from(r.image!.pixels)).toEqual(Array.from(picture));
    }
  });

  it('hands the windows on before the picture is rasterised, the same windows the result carries', async () => {
    const order: string[] = [];
    let handed: unknown = null;
    const r = await runPorkchopJob(
      system,
      request,
      { count: 3 },
      { isCancelled: () => false, onProgress: () => undefined, yieldNow: async () => undefined },
      {
        raster: { width: 60, height: 40 },
        onWindows: (windows, gridMs, windowsMs) => {
          order.push('windows');
          handed = windows;
          expect(gridMs).toBeGreaterThanOrEqual(0);
          expect(windowsMs).toBeGreaterThanOrEqual(0);
        },
      },
    );
    order.push('returned');
    expect(order).toEqual(['windows', 'returned']);
    expect(handed).toBe(r.windows);
    expect(r.windows).toEqual(findWindows(system, computePorkchop(system, request), { count: 3 }));
    expect(r.image?.pixels.length).toBe(60 * 40 * 4);
  });

  it("the leader takes only a block that continues the helper's run from the last row", () => {
    const planes = createPlanes(0, 10, 4);
    const blocks = new HelperBlocks(planes, () => undefined);
    const block = (start: number, n: number) => {
      const b = createPlanes(start, n, 4);
      b.dvTotal.fill(start + 1);
      return b;
    };
    expect(blocks.accept(block(5, 3))).toBe(false); // rows 5..7 leave 8..9 missing
    expect(blocks.accept(block(7, 3))).toBe(true);
    expect(blocks.accept(block(3, 4))).toBe(true);
    expect(blocks.received()).toBe(3);
    expect(Array.from(planes.dvTotal.subarray(12, 28))).toEqual([...Array(16).fill(4)]);
    expect(Array.from(planes.dvTotal.subarray(28, 40))).toEqual([...Array(12).fill(8)]);
    expect(Array.from(planes.dvTotal.subarray(0, 12))).toEqual([...Array(12).fill(0)]);
  });

  it('reports progress in cells of the whole grid, up to the total', async () => {
    const seen: [number, number][] = [];
    await runPorkchopJob(system, request, {}, { isCancelled: () => false, onProgress: (d, t) => seen.push([d, t]), yieldNow: async () => undefined });
    const total = request.depart.n * request.second.n;
    expect(seen.at(-1)).toEqual([total, total]);
    for (const [d, t] of seen) {
      expect(t).toBe(total);
      expect(d).toBeLessThanOrEqual(total);
    }
  });

  it('the warm-up runs a small grid of the same pair and its windows', async () => {
    const r = await warmPorkchop(system, request);
    expect(r.grid.planes.nRows * r.grid.planes.nCols).toBeLessThan(request.depart.n * request.second.n);
    expect(r.grid.request.from).toBe(request.from);
    expect(r.windows.length).toBe(1);
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
    expect(sent[0]).toMatchObject({ type: 'run', helped: false, raster: null });
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

  it("hands the current job's windows on before its result, and a replaced job's never", async () => {
    const { w, sent } = fakeWorker();
    const c = new PorkchopClient(() => w, 1);
    const listed1 = vi.fn();
    const listed2 = vi.fn();
    const p1 = c.run(system, request, {}, vi.fn(), null, listed1);
    const id1 = (sent[0] as { id: number }).id;
    const p2 = c.run(system, request, {}, vi.fn(), null, listed2);
    const id2 = (sent[2] as { id: number }).id;
    const listed = (id: number): FromWorker => ({ type: 'listed', id, windows: [], gridMs: 1, windowsMs: 1, startedAt: 0, sentAt: 0 });
    // the first job finished before the cancel reached it: its windows are not shown
    w.emit(listed(id1));
    expect(listed1).not.toHaveBeenCalled();
    w.emit({ type: 'cancelled', id: id1 });
    await expect(p1).resolves.toBeNull();
    w.emit(listed(id2));
    expect(listed2).toHaveBeenCalledWith(listed(id2));
    w.emit({ type: 'cancelled', id: id2 });
    await expect(p2).resolves.toBeNull();
  });

  it('shares a job between two workers: the leader gets the job and a port, the helper the other end and the far end of the grid; a cancel reaches both', async () => {
    const a = fakeWorker();
    const b = fakeWorker();
    const made = [a.w, b.w];
    const c = new PorkchopClient(() => made.shift()!, 2);
    const onProgress = vi.fn();
    const job = c.run(system, request, { count: 2 }, onProgress, { width: 40, height: 30 });
    const [peerA, runA] = a.sent;
    const [peerB, helpB] = b.sent;
    expect(peerA.type).toBe('peer');
    expect(peerB.type).toBe('peer');
    expect(runA).toMatchObject({ type: 'run', helped: true, raster: { width: 40, height: 30 }, request });
    expect(helpB).toMatchObject({ type: 'help', request, id: (runA as { id: number }).id });
    const id = (runA as { id: number }).id;
    a.w.emit({ type: 'progress', id, done: 300, total: 120 * 90 });
    expect(onProgress).toHaveBeenLastCalledWith(300, 120 * 90);
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
