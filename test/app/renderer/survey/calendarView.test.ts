import { describe, expect, it } from 'vitest';
import { calendarFile, calendarRows, dvColourScale, flightDays, pairLabel } from '../../../../app/renderer/survey/calendarView.ts';
import { parseCsv } from '../../../../core/io/csv.ts';
import { CALENDAR_CSV_COLUMNS } from '../../../../core/io/index.ts';
import { windowCalendar } from '../../../../core/survey/index.ts';
import { demoSystem } from '../../../core/search/fixtures.ts';

const system = demoSystem();
const cal = windowCalendar(system, {
  years: 4,
  pairs: [
    { from: 'tessel', to: 'ochre' },
    { from: 'kiln', to: 'tessel' },
  ],
});

describe('calendar view', () => {
  it('names the pairs "From → To" and lists one row per window with units, cut ends marked', () => {
    expect(pairLabel(cal.pairs[0])).toBe('Tessel → Ochre');
    const rows = calendarRows(cal, system.calendar);
    expect(rows.length).toBe(cal.pairs[0].windows.length + cal.pairs[1].windows.length);
    for (const r of rows) {
      expect(r.dv).toMatch(/^[\d\u202f ,]+ m\/s$/);
      expect(r.tof).toMatch(/^\d+\.\d d$/);
      expect(r.best).toMatch(/^\d{3}-\d{3}T\d\d:\d\d$/);
    }
    const cut = cal.pairs.flatMap((p) => p.windows).findIndex((w) => w.closesCut || w.opensCut);
    if (cut >= 0) expect(`${rows[cut].opens} ${rows[cut].closes}`).toMatch(/[≤≥]/);
    expect(flightDays(86400 * 238.44)).toBe('238.4 d');
  });

  it('exports the CSV and the JSON under the system’s name, the JSON the Calendar itself', () => {
    const csv = calendarFile('calendar-csv', cal, system);
    expect(csv.name).toBe('ilmar.calendar.csv');
    expect(parseCsv(csv.data)[0]).toEqual([...CALENDAR_CSV_COLUMNS]);
    const json = calendarFile('calendar-json', cal, system);
    expect(json.name).toBe('ilmar.calendar.json');
    const back = JSON.parse(json.data);
    expect(back.system).toBe('Ilmar');
    expect(back.pairs[0].windows).toEqual(cal.pairs[0].windows);
    expect(back.pairs[0].curve.t).toEqual(Array.from(cal.pairs[0].curve!.t));
  });

  it('colours the lowest best Δv mint and the dearest red, in between on a log scale', () => {
    const { colour, domain } = dvColourScale(cal);
    const dvs = cal.pairs.flatMap((p) => p.windows.map((w) => w.best.dv));
    expect(domain[0]).toBe(Math.min(...dvs));
    expect(colour(domain[0])).toBe('rgb(111, 220, 174)');
    expect(colour(domain[1] * 2)).toBe('rgb(255, 107, 90)');
  });
});
