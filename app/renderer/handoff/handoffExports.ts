/**
 * The files "Retarget for my game" saves: the burn schedule for a game (core/io gameSchedule.ts,
 * JSON or CSV in the game's units and axes) and the runtime ephemeris of the bodies and the
 * ship's path (core/runtime format.ts, JSON or binary), each with its export kind and a file name
 * from the plan's.
 */
import { gameScheduleCsv, gameScheduleJson, type GameScheduleOptions } from '../../../core/io/index.ts';
import type { GameSchedule } from '../../../core/handoff/index.ts';
import { encodeRuntimeBinary, encodeRuntimeJson, type RuntimeEphemeris } from '../../../core/runtime/index.ts';
import type { HandoffExportKind } from '../host/host.ts';
import { baseName } from '../state/exports.ts';

export interface HandoffFile {
  kind: HandoffExportKind;
  name: string;
  data: string | Uint8Array;
}

/** The schedule as JSON (`format` 'json') or CSV, named `<plan>.schedule.json|csv`. */
export function scheduleFile(schedule: GameSchedule, format: 'json' | 'csv', options: Partial<GameScheduleOptions>, fileName: string): HandoffFile {
  const base = baseName(fileName);
  return format === 'json'
    ? { kind: 'schedule-json', name: `${base}.schedule.json`, data: `${JSON.stringify(gameScheduleJson(schedule, options), null, 2)}\n` }
    : { kind: 'schedule-csv', name: `${base}.schedule.csv`, data: gameScheduleCsv(schedule, options) };
}

/** The runtime ephemeris as JSON or binary, named `<plan>.runtime.json|bin`. */
export function runtimeFile(data: RuntimeEphemeris, format: 'json' | 'bin', fileName: string): HandoffFile {
  const base = baseName(fileName);
  return format === 'json'
    ? { kind: 'runtime-json', name: `${base}.runtime.json`, data: `${JSON.stringify(encodeRuntimeJson(data))}\n` }
    : { kind: 'runtime-bin', name: `${base}.runtime.bin`, data: new Uint8Array(encodeRuntimeBinary(data)) };
}
