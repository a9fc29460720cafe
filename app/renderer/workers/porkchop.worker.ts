/// <reference lib="webworker" />
/**
 * A Windows view worker (windows/porkchopClient.ts keeps one or two, started and warmed before
 * the first job). As the leader of a job it computes rows from the top, merges the blocks its
 * helper sends from the bottom, finds the windows and sends them to the page, then rasterises
 * the picture (windows/porkchopJob.ts); as the helper it computes blocks from the bottom and sends them to
 * the leader until told to stop. Typed arrays are transferred, never copied.
 */
import { SolverError } from '../../../core/math/index.ts';
import { planeBuffers, type PorkchopPlanes } from '../../../core/search/index.ts';
import { calendarPair } from '../../../core/survey/index.ts';
import { HelperBlocks, type HelperLink, helpFromBottom, runPorkchopJob, warmPorkchop } from '../windows/porkchopJob.ts';
import type { FromWorker, PeerMessage, ToWorker } from '../windows/protocol.ts';

const scope = self as unknown as DedicatedWorkerGlobalScope;
/** Pause between the two warm-up rounds, ms. */
const WARM_PAUSE_MS = 300;
const cancelled = new Set<number>();
/** The port to the other worker. */
let peer: MessagePort | null = null;
/** Leader: the running job's id and its helper's blocks. */
let merging: { id: number; blocks: HelperBlocks } | null = null;
/** Helper: the jobs the leader has stopped. */
const stopped = new Set<number>();

function post(m: FromWorker, transfer: Transferable[] = []): void {
  scope.postMessage(m, transfer);
}

function onPeer(e: MessageEvent<PeerMessage>): void {
  const m = e.data;
  if (m.type === 'stop') {
    stopped.add(m.id);
    return;
  }
  // a block of the running job (a port keeps the blocks in the order they were sent)
  if (merging?.id === m.id) merging.blocks.accept(m.planes);
}

function helperLink(id: number): (planes: PorkchopPlanes) => HelperLink {
  return (planes) => {
    const blocks = new HelperBlocks(planes, () => {
      if (merging?.blocks === blocks) merging = null;
      peer?.postMessage({ type: 'stop', id } satisfies PeerMessage);
    });
    merging = { id, blocks };
    return blocks;
  };
}

const isCancel = (err: unknown) => err instanceof SolverError && err.reason === 'cancelled';

/**
 * Progress at most every 50 ms, and none at the end: the windows follow at once, and a progress
 * message just before them would have the page draw a frame while they wait.
 */
function progress(id: number): (done: number, total: number) => void {
  let last = 0;
  return (done, total) => {
    const now = performance.now();
    if (now - last > 50 && done < total) {
      last = now;
      post({ type: 'progress', id, done, total });
    }
  };
}

scope.onmessage = async (e: MessageEvent<ToWorker>) => {
  const m = e.data;
  switch (m.type) {
    case 'cancel':
      cancelled.add(m.id);
      stopped.add(m.id);
      return;
    case 'peer':
      peer = m.port;
      peer.onmessage = onPeer;
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
    case 'help': {
      const port = peer;
      try {
        await helpFromBottom(m.system, m.request, {
          shouldStop: () => stopped.has(m.id) || !port,
          send: (planes) => port?.postMessage({ type: 'band', id: m.id, planes } satisfies PeerMessage, planeBuffers(planes)),
        });
      } catch {
        // the leader computes what a failed helper leaves and reports any error itself
      } finally {
        stopped.delete(m.id);
        cancelled.delete(m.id);
      }
      return;
    }
    case 'calendar-pair': {
      // one pair of the window calendar (survey/calendarClient.ts); a cancel takes effect between pairs
      const t0 = performance.now();
      let last = 0;
      try {
        const pair = calendarPair(m.system, m.request, m.pairIndex, {
          onProgress: (done, total) => {
            const now = performance.now();
            if (now - last > 50 && done < total) {
              last = now;
              post({ type: 'calendar-progress', id: m.id, pairIndex: m.pairIndex, done, total });
            }
          },
        });
        const transfer: Transferable[] = pair.curve ? [pair.curve.t.buffer as ArrayBuffer, pair.curve.dv.buffer as ArrayBuffer] : [];
        post({ type: 'calendar-pair-done', id: m.id, pairIndex: m.pairIndex, pair, ms: performance.now() - t0 }, transfer);
      } catch (err) {
        post({ type: 'error', id: m.id, message: err instanceof Error ? err.message : String(err) });
      }
      return;
    }
    case 'run': {
      const startedAt = performance.timeOrigin + performance.now();
      try {
        const r = await runPorkchopJob(
          m.system,
          m.request,
          m.windows,
          { isCancelled: () => cancelled.has(m.id), onProgress: progress(m.id) },
          {
            helper: m.helped && peer ? helperLink(m.id) : undefined,
            raster: m.raster,
            // the list goes to the page before the picture is rasterised
            onWindows: (windows, gridMs, windowsMs) =>
              post({ type: 'listed', id: m.id, windows, gridMs, windowsMs, startedAt, sentAt: performance.timeOrigin + performance.now() }),
          },
        );
        const transfer: Transferable[] = planeBuffers(r.grid.planes);
        if (r.image) transfer.push(r.image.pixels.buffer as ArrayBuffer);
        const sentAt = performance.timeOrigin + performance.now();
        post({ type: 'done', id: m.id, ...r, startedAt, sentAt }, transfer);
      } catch (err) {
        if (isCancel(err)) post({ type: 'cancelled', id: m.id });
        else post({ type: 'error', id: m.id, message: err instanceof Error ? err.message : String(err) });
      } finally {
        cancelled.delete(m.id);
      }
      return;
    }
  }
};
