/**
 * `waymark map --system FILE [--json] [--aero] [--samples N]` — the Δv map of a whole system
 * (core/survey/deltaVMap.ts): per body, surface ⇄ low orbit ⇄ SOI edge; the transfers between
 * siblings and between each planet and its moons, from the best window of a porkchop over one
 * synodic period of departures from the epoch.
 *
 * Text: a table per body (ascent, landing, escape, capture, with the aerobraked figures where
 * the body has air), a transfer table (from, to, best Δv, aerobraked, window date in the
 * system's calendar, flight time in days, range lowest–median–highest over the period,
 * Hohmann estimate), then the rules as footnotes. `--aero`: the Δv columns take the aerobraked
 * figure wherever the arriving body has air (marked *). `--json`: the DeltaVMap in SI (m/s, s,
 * m), both figures of every edge whatever `--aero` says. Progress on stderr at a terminal.
 * `--svg FILE`: also the diagram (core/io deltaVMapSvg, paper theme, aerobraked figures with
 * `--aero`), written atomically with a backup through the output guard (never over the system
 * file read, nor over a file Waymark cannot tell for an earlier map diagram); `-` writes it to
 * standard output instead of the text.
 * Exit codes: 0 done, 2 bad input or file, 3 numerical failure.
 */
import type { Command } from 'commander';
import { InputError } from '../../../core/math/index.ts';
import { DEFAULT_MAP_SAMPLES, deltaVMap, type DeltaVMap, type MapEdge } from '../../../core/survey/index.ts';
import { formatCompactDate, type StarSystem } from '../../../core/system/index.ts';
import { deltaVMapSvg, mapLayoutBodies } from '../../../core/io/index.ts';
import { STDOUT, checkOutputs, loadSystemFile, writeOutput, type OutputRules, type OutputTarget } from '../../node/files.ts';
import { EXIT_OK, guard, printJson, printText, printWarnings } from '../output.ts';
import { createProgress, progressEnabled } from '../progress.ts';

const DAY = 86400;

export interface MapCliOptions {
  system: string;
  json?: boolean;
  aero?: boolean;
  samples: string;
  svg?: string;
}

/** The flags that set each core field, for errors in the user's words. */
const MAP_FLAGS = { samples: '--samples', svg: '--svg' } as const;

function parseSamples(text: string): number {
  const v = Number(text);
  if (!/^\s*\d+\s*$/.test(text) || !Number.isInteger(v) || v < 3 || v > 1000) {
    throw new InputError('--samples', 'must be a whole number from 3 to 1000', text);
  }
  return v;
}

const pad = (s: string, n: number): string => s.padEnd(n);
const padL = (s: string, n: number): string => s.padStart(n);
/** 12345.6 → "12 346": groups of three split by a space, as the map's labels write them. */
const group = (v: number): string => String(Math.round(v)).replace(/\B(?=(\d{3})+(?!\d))/g, ' ');
const ms = (v: number): string => `${group(v)} m/s`;

/** The figure an edge shows: aerobraked where asked and available (marked *). */
function figure(e: MapEdge, aero: boolean): string {
  return aero && e.dvAero !== null ? `${ms(e.dvAero)}*` : ms(e.dv);
}

/** The text report of a map. */
export function mapText(system: StarSystem, map: DeltaVMap, aero: boolean): string {
  const out: string[] = [];
  const byId = new Map(map.nodes.map((n) => [n.id, n]));
  const edge = (from: string, to: string) => map.edges.find((e) => e.from === from && e.to === to);
  out.push(`Δv map of ${map.system}: ${map.nodes.length} places, ${map.edges.length} moves${aero ? ' (* aerobraked where the arriving body has air)' : ''}`);
  for (const b of system.bodies.slice(1)) {
    const nodes = map.nodes.filter((n) => n.body === b.index);
    if (nodes.length === 0) continue;
    const low = nodes.find((n) => n.kind === 'low-orbit')!;
    const soi = nodes.find((n) => n.kind === 'soi-edge')!;
    const surf = nodes.find((n) => n.kind === 'surface');
    out.push('');
    out.push(`${b.name}${b.atmosphereHeight > 0 ? ` (air ${group(b.atmosphereHeight / 1000)} km)` : ''}${surf ? '' : ' (no surface)'}`);
    const rows: [string, MapEdge | undefined][] = [];
    if (surf) {
      rows.push([`surface → ${low.label}`, edge(surf.id, low.id)]);
      rows.push([`${low.label} → surface`, edge(low.id, surf.id)]);
    }
    rows.push([`${low.label} → ${soi.label}`, edge(low.id, soi.id)]);
    rows.push([`${soi.label} → ${low.label}`, edge(soi.id, low.id)]);
    for (const [what, e] of rows) {
      if (!e) continue;
      const alt = e.dvAero === null ? '' : aero ? `   powered ${ms(e.dv)}` : `   aerobraked ${ms(e.dvAero)}`;
      out.push(`  ${pad(what, 44)} ${padL(figure(e, aero), 12)}${alt}`);
    }
  }
  const transfers = map.edges.filter((e) => e.kind === 'transfer');
  if (transfers.length > 0) {
    out.push('');
    out.push('Transfers, low orbit to low orbit (best window over one synodic period from the epoch)');
    out.push(
      [
        pad('from', 10),
        pad('to', 10),
        padL('best Δv', 12),
        padL(aero ? 'powered' : 'aerobraked', 12),
        padL('window', 14),
        padL('flight', 9),
        padL('range lowest–median–highest', 30),
        padL('Hohmann', 12),
      ].join(' '),
    );
    for (const e of transfers) {
      const w = e.window!;
      const range = `${group(w.range.min)}–${group(w.range.median)}–${ms(w.range.max)}`;
      out.push(
        [
          pad(byId.get(e.from)!.bodyName.slice(0, 10), 10),
          pad(byId.get(e.to)!.bodyName.slice(0, 10), 10),
          padL(figure(e, aero), 12),
          padL(e.dvAero === null ? '—' : ms(aero ? e.dv : e.dvAero), 12),
          padL(formatCompactDate(system.calendar, w.depart), 14),
          padL(`${(w.tof / DAY).toFixed(1)} d`, 9),
          padL(range, 30),
          padL(e.hohmann === null ? '—' : ms(e.hohmann), 12),
        ].join(' '),
      );
    }
  }
  out.push('');
  map.rules.forEach((r, k) => out.push(`[${k + 1}] ${r}`));
  return out.join('\n');
}

export function addMapCommand(program: Command): void {
  program
    .command('map')
    .description('the Δv map of a whole system: surface, low orbit, SOI edge of every body and the transfers between them')
    .requiredOption('--system <file>', 'system file (.system.json)')
    .option('--aero', 'show the aerobraked figures where the arriving body has air (JSON always carries both)')
    .option('--samples <n>', 'porkchop samples per axis for each transfer', String(DEFAULT_MAP_SAMPLES))
    .option('--json', 'machine-readable output (the whole map in SI units)')
    // further output options of the map (files of the diagram) go here
    .option('--svg <file>', 'also write the diagram as SVG (paper theme; - for standard output instead of the text)')
    .action((o: MapCliOptions) =>
      guard({ json: !!o.json, flags: MAP_FLAGS }, async () => {
        const samples = parseSamples(o.samples);
        const svgOut: OutputTarget | null = o.svg === undefined ? null : { flag: '--svg', path: o.svg, kind: 'map-svg' };
        if (svgOut?.path === STDOUT && o.json)
          throw new InputError('--svg', 'cannot be - (standard output) together with --json: both would go to standard output', STDOUT);
        const { system, warnings } = await loadSystemFile(o.system);
        const outputRules: OutputRules = { inputs: [{ path: o.system, what: 'the system file read (--system)' }] };
        if (svgOut) await checkOutputs([svgOut], outputRules);
        const bar = createProgress('map', 'transfers', progressEnabled(!!o.json));
        let map: DeltaVMap;
        try {
          map = deltaVMap(system, { samples, onProgress: (done, total) => bar.update(done, total) });
        } finally {
          bar.stop();
        }
        if (svgOut) await writeOutput(svgOut, deltaVMapSvg(map, { theme: 'paper', aero: !!o.aero, bodies: mapLayoutBodies(system) }), outputRules);
        if (o.json) printJson({ ...map, warnings });
        else if (svgOut?.path === STDOUT) printWarnings(warnings);
        else {
          printWarnings(warnings);
          printText(mapText(system, map, !!o.aero));
        }
        return EXIT_OK;
      }),
    );
}
