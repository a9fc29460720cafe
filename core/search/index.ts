/**
 * Front door of core/search. Transfer-window search: porkchop grids, work chunks, window minima refined; multi-leg flyby sequences.
 * Other folders of core/ and the app import from here only.
 */
export { mergeChunk, partitionRows } from './chunks.ts';
export { FLOAT_PLANES, INT_PLANES, createPlanes, planeBuffers } from './planes.ts';
export type { PorkchopPlanes } from './planes.ts';
export { computePorkchopAsync, computePorkchopRows, createGrid, gridCell, gridMinimum, metricPlane } from './porkchop.ts';
export type { PorkchopGrid } from './porkchop.ts';
export { PORKCHOP_METRICS } from './request.ts';
export type { PorkchopMetric, PorkchopRequest } from './request.ts';
export { porkchopPair } from './pair.ts';
export type { PorkchopPair } from './pair.ts';
export { FROM_PARENT, SIBLINGS, TO_PARENT, prepareTransfer } from './transfer.ts';
export type { TransferCell } from './transfer.ts';
export { SEQUENCE_METHOD, searchSequence } from './sequence.ts';
export type { SequenceFlyby, SequenceLeg, SequenceRequest, SequenceResult, SequenceSolution } from './sequence.ts';
export { findWindows } from './windows.ts';
export type { TransferWindow, WindowOptions } from './windows.ts';
export { evaluateTransfer, transferMetric } from './transfer.ts';
export { nelderMead } from './refine.ts';
