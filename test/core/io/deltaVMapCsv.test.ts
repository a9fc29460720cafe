import { describe, expect, it } from 'vitest';
import { parseCsv } from '../../../core/io/csv.ts';
import { MAP_CSV_COLUMNS, deltaVMapCsv } from '../../../core/io/deltaVMapCsv.ts';
import { fixtureMap } from './deltaVMapFixture.ts';

describe('Δv map CSV', () => {
  it('one row per edge under the documented header; every double read back exactly, empty where a figure does not apply', () => {
    const map = fixtureMap();
    // a how with a comma, quotes and a line break: RFC 4180 §2 rules 6 and 7
    map.edges[0].how = 'climb, then "coast"\nand circularise';
    const rows = parseCsv(deltaVMapCsv(map));
    expect(rows[0]).toEqual([...MAP_CSV_COLUMNS]);
    expect(rows.length).toBe(map.edges.length + 1);
    const col = (name: (typeof MAP_CSV_COLUMNS)[number]) => MAP_CSV_COLUMNS.indexOf(name);
    map.edges.forEach((e, k) => {
      const r = rows[k + 1];
      expect(r[col('from')]).toBe(e.from);
      expect(r[col('to')]).toBe(e.to);
      expect(r[col('kind')]).toBe(e.kind);
      expect(Number(r[col('dv_mps')])).toBe(e.dv);
      expect(r[col('dv_aero_mps')]).toBe(e.dvAero === null ? '' : String(e.dvAero));
      expect(r[col('how')]).toBe(e.how);
      if (e.window) {
        expect(Number(r[col('depart_s')])).toBe(e.window.depart);
        expect(Number(r[col('tof_s')])).toBe(e.window.tof);
        expect(Number(r[col('range_median_mps')])).toBe(e.window.range.median);
        expect(Number(r[col('synodic_s')])).toBe(e.window.synodic);
        expect(Number(r[col('hohmann_mps')])).toBe(e.hohmann);
      } else {
        for (const c of ['depart_s', 'tof_s', 'dv_depart_mps', 'range_min_mps', 'synodic_s'] as const) expect(r[col(c)]).toBe('');
      }
    });
  });

  it('refuses a figure that is not a number rather than writing NaN', () => {
    const map = fixtureMap();
    map.edges[3].dv = Number.NaN;
    expect(() => deltaVMapCsv(map)).toThrow(/finite/);
  });
});
