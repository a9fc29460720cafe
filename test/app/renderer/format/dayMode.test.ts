/**
 * The standard-day option and typed times: a date typed in the editor's form comes back exactly
 * as typed, in the home world's days and in standard days (property test over the whole range
 * of years, days and clock times the calendar allows).
 */
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseSystemFile } from '../../../../core/io/systemFile.ts';
import type { SystemCalendar } from '../../../../core/system/index.ts';
import { DAY_MODE_KEY, displayCalendar, readDayMode } from '../../../../app/renderer/format/dayMode.ts';
import { calendarDay, compactDate } from '../../../../app/renderer/format/format.ts';
import { timeKind } from '../../../../app/renderer/plan/fieldKinds.ts';

const system = parseSystemFile(readFileSync(new URL('../../../../assets/systems/ilmar.system.json', import.meta.url), 'utf8')).system;
const home = system.calendar;
const standard = displayCalendar(home, 'standard');
const pad = (n: number, w = 2) => String(n).padStart(w, '0');

/** A date string in the editor's form for `cal`, with or without seconds, inside the calendar's year and day. */
function typedDate(cal: SystemCalendar, withSeconds: boolean): fc.Arbitrary<string> {
  const days = Math.ceil(cal.yearLength / cal.dayLength - 1e-12);
  const width = Math.max(3, String(days).length);
  return fc
    .record({
      year: fc.integer({ min: -20, max: 3000 }),
      day: fc.integer({ min: 1, max: days }),
      frac: fc.double({ min: 0, max: 1, noNaN: true, maxExcluded: true }),
    })
    .map(({ year, day, frac }) => {
      // the last day of the year is cut short where the year ends
      const dayEnd = Math.min(cal.dayLength, cal.yearLength - (day - 1) * cal.dayLength);
      const step = withSeconds ? 1 : 60;
      const sod = Math.floor((frac * dayEnd) / step) * step;
      const clock = `${pad(Math.floor(sod / 3600))}:${pad(Math.floor((sod % 3600) / 60))}`;
      return `${year}-${pad(day, width)}T${clock}${withSeconds ? `:${pad(sod % 60)}` : ''}`;
    });
}

describe('typed dates come back as typed', () => {
  for (const [name, cal] of [
    ['home days', home],
    ['standard days', standard],
  ] as const) {
    it(`in ${name}: parse → seconds → format gives the typed text (seconds added as :00 when not typed)`, () => {
      const kind = timeKind('Time', cal);
      const roundTrip = (text: string) => {
        const parsed = kind.parse(text);
        if (!parsed.ok) throw new Error(`${text}: ${parsed.message}`);
        return kind.format(parsed.value);
      };
      fc.assert(
        fc.property(typedDate(cal, true), (text) => roundTrip(text) === text),
        { numRuns: 2000 },
      );
      fc.assert(
        fc.property(typedDate(cal, false), (text) => roundTrip(text) === `${text}:00`),
        { numRuns: 2000 },
      );
    });
  }

  it('the two cases of the issue read as typed', () => {
    const kind = timeKind('Time', home);
    for (const text of ['416-062T13:00', '416-062T00:00']) {
      const p = kind.parse(text);
      expect(p.ok && kind.format(p.value)).toBe(`${text}:00`);
    }
  });
});

describe('the standard-day option', () => {
  it('counts the same years in days of 86 400 s: day numbers and clock from the year start, never past 23:59', () => {
    expect(standard.yearLength).toBe(home.yearLength);
    expect(standard.dayLength).toBe(86400);
    expect(displayCalendar(home, 'standard')).toBe(standard); // one object per calendar (no needless redraws)
    expect(displayCalendar(home, 'home')).toBe(home);
    // five standard days and an hour into the epoch year: day 6, 01:00 (Tessel's longer days count fewer)
    const t = 5 * 86400 + 3600;
    expect(compactDate(standard, t)).toBe(`${home.yearAtEpoch}-006T01:00:00`);
    expect(compactDate(home, t)).not.toBe(compactDate(standard, t));
  });

  it('says which day is in use and how long it is', () => {
    expect(calendarDay(system, 'home')).toBe('days of Tessel: 26 h 06 min');
    expect(calendarDay(system, 'standard')).toBe('standard days: 24 h 00 min');
  });

  it('is read from the stored view preference (home days when none or unreadable)', () => {
    const store = (v: string | null) => ({ getItem: (k: string) => (k === DAY_MODE_KEY ? v : null) });
    expect(readDayMode(store('standard'))).toBe('standard');
    expect(readDayMode(store('home'))).toBe('home');
    expect(readDayMode(store(null))).toBe('home');
    expect(readDayMode(store('weird'))).toBe('home');
    expect(
      readDayMode({
        getItem: () => {
          throw new Error('denied');
        },
      }),
    ).toBe('home');
    expect(readDayMode(null)).toBe('home');
  });
});
