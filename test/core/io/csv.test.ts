import { describe, expect, it } from 'vitest';
import { BURN_CSV_COLUMNS, EPHEMERIS_CSV_COLUMNS, burnTableCsv, csvField, ephemerisCsv, parseCsv } from '../../../core/io/csv.ts';
import { sampleEphemeris } from '../../../core/conic/ephemerisSampler.ts';
import { ilmar, syntheticBudget, syntheticResult } from './syntheticResult.ts';

describe('CSV (RFC 4180)', () => {
  it('quotes fields with commas, quotes and line breaks as RFC 4180 §2 rules 6 and 7 say', () => {
    expect(csvField('plain')).toBe('plain');
    expect(csvField('a,b')).toBe('"a,b"');
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField('two\nlines')).toBe('"two\nlines"');
    expect(csvField(null)).toBe('');
    expect(() => csvField(Number.NaN)).toThrow(/finite/);
  });

  it('parseCsv reads the RFC 4180 forms back', () => {
    expect(parseCsv('aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n')).toEqual([
      ['aaa', 'bbb', 'ccc'],
      ['zzz', 'yyy', 'xxx'],
    ]);
    expect(parseCsv('"aaa","b\r\nbb","ccc"\r\nzzz,yyy,xxx')).toEqual([
      ['aaa', 'b\r\nbb', 'ccc'],
      ['zzz', 'yyy', 'xxx'],
    ]);
    expect(parseCsv('"aaa","b""bb","ccc"\n,,\n')).toEqual([
      ['aaa', 'b"bb', 'ccc'],
      ['', '', ''],
    ]);
    expect(() => parseCsv('"open')).toThrow(/unclosed/);
  });

  it('ephemeris CSV: the documented columns, one row per sample, every double exact', () => {
    const eph = sampleEphemeris(ilmar, syntheticResult(), { step: 900 });
    const rows = parseCsv(ephemerisCsv(ilmar, eph));
    expect(rows[0]).toEqual([...EPHEMERIS_CSV_COLUMNS]);
    const data = rows.slice(1);
    expect(data.length).toBe(eph.spans.reduce((n, s) => n + s.t.length, 0));
    let j = 0;
    for (const span of eph.spans) {
      for (let k = 0; k < span.t.length; k++, j++) {
        const r = data[j];
        expect(Number(r[0])).toBe(span.t[k]);
        // Exact (=== treats -0, written "0", as equal to 0).
        for (let c = 0; c < 6; c++) expect(Number(r[1 + c]) === span.states[6 * k + c]).toBe(true);
        expect(Number(r[7])).toBe(span.mass[k]);
        expect(r[8]).toBe(ilmar.bodies[span.center].id);
      }
    }
    expect(data[0][8]).toBe('tessel');
    expect(data[data.length - 1][8]).toBe('ilmar');
  });

  it('burn-table CSV: one row per budget row, names quoted, empty for "no value"', () => {
    const b = syntheticBudget();
    const text = burnTableCsv(b);
    // without the plan the card number is empty ("no value")
    expect(text.split('\r\n')[1].startsWith(',"Kick, ""prograde""",kick,4000,3990,4010,1234.5,vnb,')).toBe(true);
    const rows = parseCsv(text);
    expect(rows[0]).toEqual([...BURN_CSV_COLUMNS]);
    expect(rows.length).toBe(1 + b.rows.length);
    const col = (name: string) => BURN_CSV_COLUMNS.indexOf(name as (typeof BURN_CSV_COLUMNS)[number]);
    expect(rows[1][col('name')]).toBe('Kick, "prograde"');
    expect(rows[1][col('gravity_loss_mps')]).toBe('');
    expect(rows[2][col('gravity_loss_mps')]).toBe('0.125');
    expect(rows[2][col('period_fraction')]).toBe('');
    expect(rows[2][col('stages')]).toBe('Kick;Cruise');
    expect(rows[2][col('flags')]).toBe('stage-dry-mid-burn');
    expect(rows[2][col('dv_x_mps')]).toBe('11');
  });

  it("burn-table CSV with the plan: each burn's number is its place among the plan's events, as on its card", () => {
    const b = syntheticBudget();
    const events = [{ id: 'coast-1' }, ...b.rows.map((r) => ({ id: r.planEventId }))].reverse();
    const rows = parseCsv(burnTableCsv(b, { events }));
    const col = (name: string) => BURN_CSV_COLUMNS.indexOf(name as (typeof BURN_CSV_COLUMNS)[number]);
    b.rows.forEach((r, k) => {
      expect(rows[k + 1][col('id')]).toBe(r.planEventId);
      expect(Number(rows[k + 1][col('event')])).toBe(events.findIndex((e) => e.id === r.planEventId) + 1);
    });
  });
});
