/**
 * Messages between the Windows view and its porkchop workers. One worker leads a job and the
 * other (when there are two) helps from the grid's far end, sending its blocks of rows straight
 * to the leader over a MessageChannel port (typed arrays transferred, never copied through the
 * page); the leader finds the windows and sends them to the page at once (`listed`, a few
 * dozen numbers), then rasterises the picture and sends one `done` with the grid and the
 * picture transferred (windows/porkchopJob.ts), so the list never waits for the picture.
 */
import type { PorkchopGrid, PorkchopPlanes, PorkchopRequest, TransferWindow, WindowOptions } from '../../../core/search/index.ts';
import type { CalendarPair, CalendarRequest } from '../../../core/survey/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import type { PlotLevels } from './porkchopRaster.ts';

/** Size in device pixels of the picture to rasterise. */
export interface RasterSize {
  width: number;
  height: number;
}

export type ToWorker =
  /** The port to the other worker (the leader's to its helper, the helper's to its leader). */
  | { type: 'peer'; port: MessagePort }
  /** Compile the hot code before the first real job: a small grid of `request` and its windows. */
  | { type: 'warm'; system: StarSystem; request: PorkchopRequest }
  /** To the leader: the job; `helped` when the other worker helps from the far end. */
  | { type: 'run'; id: number; system: StarSystem; request: PorkchopRequest; windows: WindowOptions; helped: boolean; raster: RasterSize | null }
  /** To the helper: compute blocks from the last row up and send them to the leader, until told to stop. */
  | { type: 'help'; id: number; system: StarSystem; request: PorkchopRequest }
  | { type: 'cancel'; id: number }
  /**
   * The Survey screen's window calendar (survey/calendarClient.ts): the windows of one pair of the
   * request (core/survey calendarPair); the page hands the pairs out one per free worker.
   */
  | { type: 'calendar-pair'; id: number; system: StarSystem; request: CalendarRequest; pairIndex: number };

/** Between the two workers, over their port: a helper's block to the leader; the leader's stop to the helper. */
export type PeerMessage = { type: 'band'; id: number; planes: PorkchopPlanes } | { type: 'stop'; id: number };

export interface DoneImage extends RasterSize {
  pixels: Uint8ClampedArray;
  levels: PlotLevels;
}

export type FromWorker =
  /** Cells finished of this worker's band. */
  | { type: 'progress'; id: number; done: number; total: number }
  /** The job's windows, sent before the picture is rasterised; the `done` that follows repeats them. */
  | {
      type: 'listed';
      id: number;
      windows: TransferWindow[];
      /** The leader's times, ms: grid (until every band is in), windows. */
      gridMs: number;
      windowsMs: number;
      /** When the leader started the job and sent this message (performance.timeOrigin + now, ms). */
      startedAt: number;
      sentAt: number;
    }
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
  | { type: 'error'; id: number; message: string }
  /** A calendar pair's departure samples done (throttled), and its result (curve arrays transferred). */
  | { type: 'calendar-progress'; id: number; pairIndex: number; done: number; total: number }
  | { type: 'calendar-pair-done'; id: number; pairIndex: number; pair: CalendarPair; ms: number };
