/**
 * Messages between the Windows view and its porkchop workers. One worker leads a job: it
 * computes its band of rows, receives the other workers' bands over a port of its own (as
 * transferred typed arrays, never copied through the page), then finds the windows and
 * rasterises the picture, and sends the page one `done` with everything transferred.
 */
import type { PorkchopGrid, PorkchopPlanes, PorkchopRequest, TransferWindow, WindowOptions } from '../../../core/search/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import type { PlotLevels } from './porkchopRaster.ts';

/** A band of departure rows [rowStart, rowEnd). */
export interface Rows {
  rowStart: number;
  rowEnd: number;
}

/** Size in device pixels of the picture to rasterise. */
export interface RasterSize {
  width: number;
  height: number;
}

export type ToWorker =
  /** To the leader: the port a helper sends its bands on. */
  | { type: 'peer'; port: MessagePort }
  /** Compile the hot code before the first real job: a small grid of `request` and its windows. */
  | { type: 'warm'; system: StarSystem; request: PorkchopRequest }
  /** To the leader: compute `rows`, gather `helpers` bands from the peers, find the windows, rasterise. */
  | { type: 'run'; id: number; system: StarSystem; request: PorkchopRequest; windows: WindowOptions; rows: Rows; helpers: number; raster: RasterSize | null }
  /** To a helper: compute `rows` and send them to the leader. */
  | { type: 'rows'; id: number; system: StarSystem; request: PorkchopRequest; rows: Rows }
  | { type: 'cancel'; id: number };

/** From a helper to the leader, over the peer port. */
export type PeerMessage =
  | { type: 'band'; id: number; planes: PorkchopPlanes; unsolved: number }
  | { type: 'failed'; id: number; message: string; cancelled: boolean };

export interface DoneImage extends RasterSize {
  pixels: Uint8ClampedArray;
  levels: PlotLevels;
}

export type FromWorker =
  /** Cells finished of this worker's band. */
  | { type: 'progress'; id: number; done: number; total: number }
  | {
      type: 'done';
      id: number;
      grid: PorkchopGrid;
      windows: TransferWindow[];
      /** The leader's times, ms: grid (until every band is in), windows, picture. */
      gridMs: number;
      windowsMs: number;
      rasterMs: number;
      /** When the leader started the job and sent this message (performance.timeOrigin + now, ms). */
      startedAt: number;
      sentAt: number;
      image: DoneImage | null;
    }
  | { type: 'cancelled'; id: number }
  | { type: 'error'; id: number; message: string };
