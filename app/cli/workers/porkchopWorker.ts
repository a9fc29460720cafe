/**
 * Body of a porkchop pool worker: computes one chunk (a band of departure rows) of a grid with
 * the same core function the in-thread path uses, and hands the planes back by transfer
 * (no copy). Runs in a Node worker thread under piscina (see ../pool.ts).
 */
import { move, transferableSymbol, valueSymbol } from 'piscina';
import { computePorkchopRows } from '../../../core/search/index.ts';
import { createPlanes, planeBuffers, type PorkchopPlanes } from '../../../core/search/index.ts';
import type { PorkchopRequest } from '../../../core/search/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';

export interface ChunkTask {
  system: StarSystem;
  request: PorkchopRequest;
  rowStart: number;
  rowEnd: number;
}

export interface ChunkResult {
  planes: PorkchopPlanes;
  unsolved: number;
}

export default function computeChunk(task: ChunkTask): unknown {
  const { system, request, rowStart, rowEnd } = task;
  const planes = createPlanes(rowStart, rowEnd - rowStart, request.second.n);
  const unsolved = computePorkchopRows(system, request, rowStart, rowEnd, planes);
  const result: ChunkResult = { planes, unsolved };
  return move({
    get [transferableSymbol]() {
      return planeBuffers(planes);
    },
    get [valueSymbol]() {
      return result;
    },
  } as never);
}
