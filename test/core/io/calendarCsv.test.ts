import { describe, expect, it } from 'vitest';
import { CALENDAR_CSV_COLUMNS, calendarCsv } from '../../../core/io/calendarCsv.ts';
import { parseCsv } from '../../../core/io/csv.ts';
import type { Calendar } from '../../../core/survey/calendar.ts';
import { parseDate } from '../../../core/system/calendar.ts';
import { demoSystem } from '../search/fixtures.ts';

const DAY = 86400;

describe('calendar CSV', () => {
  const sys = demoSystem();
  // a hand-made calendar (the CSV only writes what it is given)
  const cal: Calendar = {
    system: 'Ilmar',
    start: 0,
    end: 100 * DAY,
    within: 0.1,
    pairs: [
      {
        from: 'tessel',
        to: 'ochre',
        fromName: 'Tessel',
        toName: 'Ochre',
        through: null,
        synodic: 553 * DAY,
        solves: 0,
        windows: [
          {
            opens: 0,
            closes: 30 * DAY,
            opensCut: true,
            closesCut: false,
            best: { depart: 10 * DAY, tof: 200 * DAY, dv: 5800.5, dvDepart: 3000.25, dvCapture: 2800.25 },
          },
          {
            opens: 60 * DAY,
            closes: 100 * DAY,
            opensCut: false,
            closesCut: true,
            best: { depart: 99.5 * DAY, tof: 1e7, dv: 6000, dvDepart: 3500, dvCapture: 2500 },
          },
        ],
      },
    ],
  };

  it('writes one row per window with SI numbers that read back exactly and dates of the system calendar', () => {
    const text = calendarCsv(sys, cal);
    expect(text.endsWith('\r\n')).toBe(true);
    const rows = parseCsv(text);
    expect(rows[0]).toEqual([...CALENDAR_CSV_COLUMNS]);
    expect(rows.length).toBe(3);
    const col = (name: (typeof CALENDAR_CSV_COLUMNS)[number]): number => CALENDAR_CSV_COLUMNS.indexOf(name);
    const [a, b] = [rows[1], rows[2]];
    expect(a[col('from')]).toBe('tessel');
    expect(a[col('window')]).toBe('1');
    expect(a[col('opens_cut')]).toBe('true');
    expect(b[col('closes_cut')]).toBe('true');
    expect(Number(a[col('best_dv_mps')])).toBe(5800.5);
    expect(Number(a[col('dv_depart_mps')]) + Number(a[col('dv_capture_mps')])).toBe(5800.5);
    expect(Number(b[col('tof_s')])).toBe(1e7);
    expect(Number(b[col('arrive_s')])).toBe(99.5 * DAY + 1e7);
    // the dates read back (core/system parseDate) to the seconds written, to the second shown
    for (const r of [a, b]) {
      for (const [s, d] of [
        ['opens_s', 'opens_date'],
        ['best_depart_s', 'best_depart_date'],
        ['closes_s', 'closes_date'],
        ['arrive_s', 'arrive_date'],
      ] as const) {
        expect(Math.abs(parseDate(sys.calendar, r[col(d)]) - Number(r[col(s)]))).toBeLessThan(1);
      }
    }
  });
});
