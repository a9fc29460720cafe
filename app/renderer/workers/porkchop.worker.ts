/// <reference lib="webworker" />
/**
 * A Windows view worker (windows/porkchopClient.ts keeps one per core, up to two, started
 * before the first job). As the leader of a job it computes its band of rows, merges the
 * helpers' bands arriving on its peer ports, finds the windows and rasterises the picture
 * (windows/porkchopJob.ts); as a helper it computes its band and sends it to the leader.
 * Typed arrays are transferred, never copied.
 */
import { SolverError } from '../../../core/math/index.ts';
import { createPlanes, planeBuffers, prepareTransfer } from '../../../core/search/index.ts';
import { computeBand, runPorkchopJob, warmPorkchop, type Band } from '../windows/porkchopJob.ts';
import type { FromWorker, PeerMessage, ToWorker } from '../windows/protocol.ts';

const scope = self as unknown as DedicatedWorkerGlobalScope;
/** Pause between the two warm-up rounds, ms. */
const WARM_PAUSE_MS = 300;
const cancelled = new Set<number>();
/** Ports to the helpers (leader only). */
const peers: MessagePort[] = [];
/** The leader's latest job; bands of earlier jobs are dropped. */
let currentRun = 0;
/** Bands received per job id, and the job waiting for them. */
const received = new Map<number, Band[]>();
const waiters = new Map<number, { need: number; resolve: (b: Band[]) => void; reject: (e: Error) => void }>();

function post(m: FromWorker, transfer: Transferable[] = []): void {
  scope.postMessage(m, transfer);
}

function settle(id: number): void {
  const w = waiters.get(id);
  const got = received.get(id) ?? [];
  if (w && got.length >= w.need) {
    waiters.delete(id);
    received.delete(id);
    w.resolve(got);
  }
}

function onPeer(e: MessageEvent<PeerMessage>): void {
  const m = e.data;
  if (m.id < currentRun) return;
  if (m.type === 'band') {
    if (cancelled.has(m.id)) return;
    const list = received.get(m.id) ?? [];
    list.push({ planes: m.planes, unsolved: m.unsolved });
    received.set(m.id, list);
    settle(m.id);
  } else {
    const w = waiters.get(m.id);
    waiters.delete(m.id);
    received.delete(m.id);
    w?.reject(m.cancelled ? new SolverError('porkchop', 'cancelled', 'a helper was cancelled', {}) : new Error(m.message));
  }
}

function bandsOf(id: number, need: number): () => Promise<Band[]> {
  return () =>
    new Promise<Band[]>((resolve, reject) => {
      waiters.set(id, { need, resolve, reject });
      settle(id);
    });
}

const isCancel = (err: unknown) => err instanceof SolverError && err.reason === 'cancelled';
const text = (err: unknown) => (err instanceof Error ? err.message : String(err));

/** Progress at most every 50 ms (and at the end of a band). */
function progress(id: number): (done: number, total: number) => void {
  let last = 0;
  return (done, total) => {
    const now = performance.now();
    if (now - last > 50 || done === total) {
      last = now;
      post({ type: 'progress', id, done, total });
    }
  };
}

scope.onmessage = async (e: MessageEvent<ToWorker>) => {
  const m = e.data;
  switch (m.type) {
    case 'cancel': {
      cancelled.add(m.id);
      const w = waiters.get(m.id);
      waiters.delete(m.id);
      received.delete(m.id);
      w?.reject(new SolverError('porkchop', 'cancelled', 'cancelled while waiting for the other bands', {}));
      return;
    }
    case 'peer':
      m.port.onmessage = onPeer;
      peers.push(m.port);
      return;
    case 'warm':
      try {
        // twice, a moment apart: the optimising compiler works in the background
        await warmPorkchop(m.system, m.request);
        await new Promise((resolve) => setTimeout(resolve, WARM_PAUSE_MS));
        await warmPorkchop(m.system, m.request);
      } catch {
        // a request the form would refuse: nothing to warm
      }
      return;
    case 'rows': {
      // a helper: the band goes to the leader over this worker's peer port
      const port = peers[0];
      try {
        const setup = prepareTransfer(m.system, m.request);
        const planes = createPlanes(m.rows.rowStart, m.rows.rowEnd - m.rows.rowStart, m.request.second.n);
        const unsolved = await computeBand(m.system, setup, m.rows, planes, { isCancelled: () => cancelled.has(m.id), onProgress: progress(m.id) });
        port?.postMessage({ type: 'band', id: m.id, planes, unsolved } satisfies PeerMessage, planeBuffers(planes));
      } catch (err) {
        port?.postMessage({ type: 'failed', id: m.id, message: text(err), cancelled: isCancel(err) } satisfies PeerMessage);
      } finally {
        cancelled.delete(m.id);
      }
      return;
    }
    case 'run': {
      currentRun = m.id;
      const startedAt = performance.timeOrigin + performance.now();
      for (const id of received.keys()) if (id < m.id) received.delete(id);
      try {
        const r = await runPorkchopJob(
          m.system,
          m.request,
          m.windows,
          { isCancelled: () => cancelled.has(m.id), onProgress: progress(m.id) },
          { rows: m.rows, bands: m.helpers > 0 ? bandsOf(m.id, m.helpers) : undefined, raster: m.raster },
        );
        const transfer: Transferable[] = planeBuffers(r.grid.planes);
        if (r.image) transfer.push(r.image.pixels.buffer as ArrayBuffer);
        const sentAt = performance.timeOrigin + performance.now();
        post({ type: 'done', id: m.id, ...r, startedAt, sentAt }, transfer);
      } catch (err) {
        if (isCancel(err)) post({ type: 'cancelled', id: m.id });
        else post({ type: 'error', id: m.id, message: text(err) });
      } finally {
        cancelled.delete(m.id);
      }
      return;
    }
  }
};
