import { describe, expect, it } from 'vitest';
import { parseCsv } from '../../../../core/io/csv.ts';
import { dvWords } from '../../../../core/io/index.ts';
import { formatDate } from '../../../../core/system/index.ts';
import { dvRange, mapFile, mapFileBase, mapFitsSystem, mapPngName, mapTableRows } from '../../../../app/renderer/survey/mapView.ts';
import { fixtureMap } from '../../../core/io/deltaVMapFixture.ts';
import { ilmar } from '../../../core/io/syntheticResult.ts';

describe('Δv map panel helpers', () => {
  it('names the files after the system', () => {
    expect(mapFileBase('Ilmar')).toBe('ilmar');
    expect(mapFileBase('Brin & <Co>')).toBe('brin-co');
    expect(mapFileBase('Ærø Ünder')).toBe('r-under');
    expect(mapFileBase('***')).toBe('system');
    const map = { ...fixtureMap(), system: 'Ilmar' };
    expect(mapPngName(map)).toBe('ilmar.dv-map.png');
    expect(mapFile('map-svg', map, ilmar, false).name).toBe('ilmar.dv-map.svg');
    expect(mapFile('map-json', map, ilmar, false).name).toBe('ilmar.dv-map.json');
    expect(mapFile('map-csv', map, ilmar, false).name).toBe('ilmar.dv-map.csv');
  });

  it('a range writes its unit once when the three figures share it', () => {
    expect(dvRange(5123, 5404, 7911)).toBe('5.12 – 5.40 – 7.91 km/s');
    expect(dvRange(312, 450, 998)).toBe('312 – 450 – 998 m/s');
    expect(dvRange(850, 1200, 2500)).toBe('850 m/s – 1.20 km/s – 2.50 km/s');
  });

  it('the table: one row per edge, every figure with its unit, dates in the system calendar, "—" where nothing applies', () => {
    const map = fixtureMap();
    const rows = mapTableRows(map, ilmar.calendar);
    expect(rows.map((r) => r.id)).toEqual(map.edges.map((e) => e.id));
    map.edges.forEach((e, k) => {
      const r = rows[k];
      expect(r.dv).toBe(dvWords(e.dv));
      expect(r.dv).toMatch(/ (m|km)\/s$/);
      expect(r.kind).toBe(e.kind);
      expect(r.from.startsWith(map.nodes.find((n) => n.id === e.from)?.bodyName ?? '?')).toBe(true);
      if (e.window) {
        expect(r.window).toBe(formatDate(ilmar.calendar, e.window.depart, { seconds: false }));
        expect(r.range).toBe(dvRange(e.window.range.min, e.window.range.median, e.window.range.max));
        expect(r.tof).toMatch(/ d /);
      } else {
        expect([r.window, r.tof, r.range, r.hohmann]).toEqual(['—', '—', '—', '—']);
      }
      expect(r.dvAero).toBe(e.dvAero === null ? '—' : dvWords(e.dvAero));
      for (const v of Object.values(r)) expect(String(v)).not.toMatch(/NaN|undefined|Infinity/);
    });
  });

  it('the exports: SVG in the paper theme, the map itself as JSON, the table as CSV', () => {
    const map = fixtureMap();
    const svg = mapFile('map-svg', map, ilmar, true).data;
    expect(svg.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
    expect(svg).toContain('fill="#ffffff"');
    expect(JSON.parse(mapFile('map-json', map, ilmar, false).data)).toEqual(map);
    expect(parseCsv(mapFile('map-csv', map, ilmar, false).data).length).toBe(map.edges.length + 1);
  });

  it('a map belongs to a system of the same name and bodies only', () => {
    const ids = ilmar.bodies.slice(1);
    const own = {
      ...fixtureMap(),
      system: ilmar.name,
      nodes: ids.map((b, k) => ({
        id: `${b.id}:low-orbit`,
        body: k + 1,
        bodyId: b.id,
        bodyName: b.name,
        kind: 'low-orbit' as const,
        label: 'low orbit',
        altitude: 1,
      })),
    };
    expect(mapFitsSystem(own, ilmar)).toBe(true);
    expect(mapFitsSystem({ ...own, system: 'Other' }, ilmar)).toBe(false);
    expect(mapFitsSystem({ ...own, nodes: own.nodes.slice(1) }, ilmar)).toBe(false);
  });
});
