/** Messages between the Windows view and its porkchop worker. */
import type { PorkchopGrid } from '../../../core/search/index.ts';
import type { PorkchopRequest } from '../../../core/search/index.ts';
import type { TransferWindow, WindowOptions } from '../../../core/search/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';

export type ToWorker = { type: 'run'; id: number; system: StarSystem; request: PorkchopRequest; windows: WindowOptions } | { type: 'cancel'; id: number };

export type FromWorker =
  | { type: 'progress'; id: number; done: number; total: number }
  | { type: 'done'; id: number; grid: PorkchopGrid; windows: TransferWindow[]; gridMs: number; windowsMs: number }
  | { type: 'cancelled'; id: number }
  | { type: 'error'; id: number; message: string };
