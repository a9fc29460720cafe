/**
 * The Δv map's table as CSV (RFC 4180 through csv.ts): one row per directed edge, SI units in
 * the column names, empty fields where a figure does not apply (no air, not a transfer).
 */
import type { DeltaVMap } from '../survey/index.ts';
import { CSV_EOL, csvRow } from './csv.ts';

export const MAP_CSV_COLUMNS = [
  'from',
  'to',
  'kind',
  'dv_mps',
  'dv_aero_mps',
  'depart_s',
  'tof_s',
  'dv_depart_mps',
  'dv_capture_mps',
  'range_min_mps',
  'range_median_mps',
  'range_max_mps',
  'synodic_s',
  'hohmann_mps',
  'how',
] as const;

/** The map's edges as CSV rows, in the map's order; node ids in from/to. */
export function deltaVMapCsv(map: DeltaVMap): string {
  const out = [csvRow([...MAP_CSV_COLUMNS])];
  for (const e of map.edges) {
    const w = e.window;
    out.push(
      csvRow([
        e.from,
        e.to,
        e.kind,
        e.dv,
        e.dvAero,
        w?.depart ?? null,
        w?.tof ?? null,
        w?.dvDepart ?? null,
        w?.dvCapture ?? null,
        w?.range.min ?? null,
        w?.range.median ?? null,
        w?.range.max ?? null,
        w?.synodic ?? null,
        e.hohmann,
        e.how,
      ]),
    );
  }
  return out.join(CSV_EOL) + CSV_EOL;
}
