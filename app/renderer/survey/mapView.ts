/**
 * The Survey screen's Δv map as the panel shows it: the table's rows in words (system calendar
 * dates, units on every figure), the export files (SVG in the paper theme, JSON, CSV; PNG bytes
 * are made in the page, survey/svgPng.ts) named after the system, and whether a map still
 * belongs to the open system.
 */
import { deltaVMapCsv, deltaVMapSvg, dvWords, mapLayoutBodies } from '../../../core/io/index.ts';
import type { DeltaVMap, MapEdge, MapNode } from '../../../core/survey/index.ts';
import type { StarSystem, SystemCalendar } from '../../../core/system/index.ts';
import type { MapExportKind } from '../../preload/api.ts';
import { date, duration } from '../format/format.ts';

export interface MapTableRow {
  id: string;
  from: string;
  to: string;
  kind: string;
  dv: string;
  dvAero: string;
  window: string;
  tof: string;
  range: string;
  hohmann: string;
  how: string;
}

const KIND_WORDS: Record<MapEdge['kind'], string> = {
  ascent: 'ascent',
  landing: 'landing',
  escape: 'escape',
  capture: 'capture',
  transfer: 'transfer',
};

/** Lowest – median – highest: one unit at the end when all three share it ("5.12 – 5.40 – 7.91 km/s"). */
export function dvRange(min: number, median: number, max: number): string {
  const words = [min, median, max].map(dvWords);
  const unit = / (k?m\/s)$/.exec(words[0])?.[1];
  if (unit && words.every((w) => w.endsWith(` ${unit}`))) return `${words.map((w) => w.slice(0, -unit.length - 1)).join(' – ')} ${unit}`;
  return words.join(' – ');
}

/** A node in words: "Tessel low orbit 100 km". */
export function nodeWords(n: MapNode | undefined, id: string): string {
  return n ? `${n.bodyName} ${n.label}` : id;
}

/** The table: one row per directed edge in the map's order; "—" where a figure does not apply. */
export function mapTableRows(map: DeltaVMap, cal: SystemCalendar): MapTableRow[] {
  const nodes = new Map(map.nodes.map((n) => [n.id, n]));
  return map.edges.map((e) => {
    const w = e.window;
    return {
      id: e.id,
      from: nodeWords(nodes.get(e.from), e.from),
      to: nodeWords(nodes.get(e.to), e.to),
      kind: KIND_WORDS[e.kind],
      dv: dvWords(e.dv),
      dvAero: e.dvAero === null ? '—' : dvWords(e.dvAero),
      window: w ? date(cal, w.depart) : '—',
      tof: w ? duration(w.tof) : '—',
      range: w ? dvRange(w.range.min, w.range.median, w.range.max) : '—',
      hohmann: e.hohmann === null ? '—' : dvWords(e.hohmann),
      how: e.how,
    };
  });
}

/** The files' base name from the system's: lower case, runs of other characters as one hyphen ("Ilmar" → "ilmar"). */
export function mapFileBase(systemName: string): string {
  const s = systemName
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '');
  return s === '' ? 'system' : s.slice(0, 80);
}

export interface MapFile {
  kind: MapExportKind;
  name: string;
  data: string;
}

/** The diagram for print (paper theme), as the SVG export and the PNG's source. */
export function paperSvg(map: DeltaVMap, system: StarSystem, aero: boolean): string {
  return deltaVMapSvg(map, { theme: 'paper', aero, bodies: mapLayoutBodies(system) });
}

/** A text export of the map: the SVG (paper theme), the map as JSON, or the table as CSV, named `<system>.dv-map.<ext>`. */
export function mapFile(kind: Exclude<MapExportKind, 'map-png'>, map: DeltaVMap, system: StarSystem, aero: boolean): MapFile {
  const base = `${mapFileBase(map.system)}.dv-map`;
  if (kind === 'map-svg') return { kind, name: `${base}.svg`, data: paperSvg(map, system, aero) };
  if (kind === 'map-json') return { kind, name: `${base}.json`, data: `${JSON.stringify(map, null, 2)}\n` };
  return { kind, name: `${base}.csv`, data: deltaVMapCsv(map) };
}

/** The PNG export's name. */
export function mapPngName(map: DeltaVMap): string {
  return `${mapFileBase(map.system)}.dv-map.png`;
}

/** True when the map was computed for this system: the same name and the same bodies (a map of another system is stale). */
export function mapFitsSystem(map: DeltaVMap, system: StarSystem): boolean {
  if (map.system !== system.name) return false;
  const ids = new Set(map.nodes.map((n) => n.bodyId));
  const bodies = system.bodies.slice(1).map((b) => b.id);
  return bodies.length === ids.size && bodies.every((id) => ids.has(id));
}
