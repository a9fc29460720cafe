import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/errors.ts';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import {
  dateParts,
  dateToSeconds,
  daysInYear,
  formatCompactDate,
  formatDate,
  formatDayLength,
  formatElapsed,
  parseDate,
} from '../../../core/system/calendar.ts';
import type { SystemCalendar } from '../../../core/system/model.ts';
import { demoText } from './fixtures.ts';

const DAY = 86400;
const simple: SystemCalendar = { yearLength: 360 * DAY, dayLength: DAY, yearAtEpoch: 100, era: '', homeIndex: -1 };
const withEra: SystemCalendar = { ...simple, era: 'TR' };
// A leap year of the Gregorian calendar as a one-year "calendar" (ISO 8601 ordinal dates).
const leap2024: SystemCalendar = { yearLength: 366 * DAY, dayLength: DAY, yearAtEpoch: 2024, era: '', homeIndex: -1 };
const demo = parseSystemFile(demoText()).system.calendar;

describe('formatDate', () => {
  it('writes known values', () => {
    const t = 36 * DAY + 6 * 3600 + 12 * 60 + 59;
    expect(formatDate(simple, t)).toBe('Year 100, day 37, 06:12');
    expect(formatDate(withEra, t)).toBe('Year 100 TR, day 37, 06:12');
    expect(formatDate(simple, t, { seconds: true })).toBe('Year 100, day 37, 06:12:59');
    expect(formatDate(simple, 0)).toBe('Year 100, day 1, 00:00');
    expect(formatDate(simple, 360 * DAY * 312 + 1)).toBe('Year 412, day 1, 00:00');
  });

  it('counts back before the epoch', () => {
    expect(formatDate(simple, -1, { seconds: true })).toBe('Year 99, day 360, 23:59:59');
    expect(formatDate(simple, -360 * DAY)).toBe('Year 99, day 1, 00:00');
  });

  it('matches ISO 8601 ordinal dates for a leap year: 29 February 2024 is 2024-060, 31 December 2024 is 2024-366 (common practice)', () => {
    const feb29 = (Date.UTC(2024, 1, 29, 13, 5) - Date.UTC(2024, 0, 1)) / 1000;
    const dec31 = (Date.UTC(2024, 11, 31) - Date.UTC(2024, 0, 1)) / 1000;
    expect(formatCompactDate(leap2024, feb29)).toBe('2024-060T13:05');
    expect(formatCompactDate(leap2024, dec31)).toBe('2024-366T00:00');
    expect(parseDate(leap2024, '2024-060T13:05')).toBe(feb29);
  });

  it('shows the demo epoch as its label, and the demo day runs past 24 h', () => {
    const sys = parseSystemFile(demoText()).system;
    expect(formatDate(demo, 0)).toBe(sys.epoch.label);
    // Demo day ≈ 93,984 s = 26 h 06 min: the last minute of day 1 reads 26:06.
    expect(formatDate(demo, demo.dayLength - 1)).toBe('Year 412 TR, day 1, 26:06');
    expect(formatDate(demo, demo.dayLength)).toBe('Year 412 TR, day 2, 00:00');
    expect(formatDate(demo, demo.yearLength)).toBe('Year 413 TR, day 1, 00:00');
  });

  it('cuts the last day of a year that is not a whole number of days', () => {
    // Demo year / day ≈ 243.9: day 244 is partial and the next year starts at day 1.
    expect(daysInYear(demo)).toBe(244);
    expect(dateParts(demo, demo.yearLength - 10).day).toBe(244);
    expect(dateParts(demo, demo.yearLength + 10)).toMatchObject({ year: 413, day: 1 });
  });
});

describe('formatElapsed', () => {
  it('writes mission elapsed time in standard days, each field with its unit', () => {
    expect(formatElapsed(simple, 12 * DAY + 4 * 3600 + 33 * 60 + 10)).toBe('T+ 12 d 04 h 33 min 10 s');
    expect(formatElapsed(simple, -300)).toBe('T− 0 d 00 h 05 min 00 s');
    expect(formatElapsed(simple, 0)).toBe('T+ 0 d 00 h 00 min 00 s');
  });

  it('counts 86 400 s days on a calendar whose day is 26 h 06 min, so the hours never pass 23', () => {
    // The demo day (≈ 93 984 s) is longer than a standard day: one demo day and a minute is 1 d 02 h 07 min.
    expect(formatElapsed(demo, demo.dayLength + 60)).toBe('T+ 1 d 02 h 07 min 23 s');
    fc.assert(
      fc.property(fc.double({ min: -1e10, max: 1e10, noNaN: true }), (dt) => {
        const m = /^T[+−] (\d+) d (\d\d) h (\d\d) min (\d\d) s$/.exec(formatElapsed(demo, dt));
        expect(m).not.toBeNull();
        const [, d, h, min, sec] = (m as RegExpExecArray).map(Number);
        expect(h).toBeLessThan(24);
        // The fields add up to |dt| truncated to the second (slack of a microsecond for rounding).
        expect(Math.abs(dt) - (d * 86400 + h * 3600 + min * 60 + sec)).toBeGreaterThan(-1e-6 - 8 * Number.EPSILON * Math.abs(dt));
        expect(Math.abs(dt) - (d * 86400 + h * 3600 + min * 60 + sec)).toBeLessThan(1);
      }),
      { numRuns: 500 },
    );
  });
});

describe('formatDayLength', () => {
  it('writes the day in hours and minutes', () => {
    expect(formatDayLength(simple)).toBe('24 h 00 min');
    // Demo day 93 983.76 s = 26 h 06 min 23.76 s.
    expect(formatDayLength(demo)).toBe('26 h 06 min');
  });
});

describe('parseDate', () => {
  it('reads the compact and the long forms', () => {
    expect(parseDate(simple, '100-001')).toBe(0);
    expect(parseDate(simple, '100-037T06:12')).toBe(36 * DAY + 6 * 3600 + 12 * 60);
    expect(parseDate(simple, '  101-002T00:00:30.5 ')).toBe(361 * DAY + 30.5);
    expect(parseDate(simple, '99-360T23:59:59')).toBe(-1);
    expect(parseDate(withEra, 'Year 100 TR, day 37, 06:12')).toBe(36 * DAY + 6 * 3600 + 12 * 60);
    expect(parseDate(withEra, 'year 100, day 37')).toBe(36 * DAY);
    expect(parseDate({ ...simple, yearAtEpoch: 2 }, '-3-001')).toBe(-5 * 360 * DAY);
  });

  it('reads hours past 23 within a long day', () => {
    expect(parseDate(demo, '412-001T26:05')).toBe(26 * 3600 + 5 * 60);
    expect(() => parseDate(demo, '412-001T26:07')).toThrow(InputError);
  });

  const bad: [string, RegExp][] = [
    ['tomorrow', /must be a date like/],
    ['100-361', /day must be a whole day number from 1 to 360/],
    ['100-000', /day must be a whole day number from 1 to 360/],
    ['100-010T24:00', /time must lie within day 10/],
    ['100-010T06:75', /minutes and seconds below 60/],
    ['Year 100 AX, day 3', /must not carry an era label/],
  ];
  for (const [text, rule] of bad) {
    it(`rejects "${text}" with InputError`, () => {
      try {
        parseDate(simple, text, 'depart');
      } catch (e) {
        expect(e).toBeInstanceOf(InputError);
        expect((e as InputError).field).toBe('depart');
        expect((e as InputError).rule).toMatch(rule);
        return;
      }
      throw new Error('expected InputError');
    });
  }

  it('rejects a wrong era', () => {
    expect(() => parseDate(withEra, 'Year 100 XX, day 3')).toThrow(/must use the era "TR"/);
  });

  it('property: compact form with seconds reads back exactly for whole seconds (calendar of whole-second days)', () => {
    fc.assert(
      fc.property(fc.integer({ min: -1e10, max: 1e10 }), (t) => {
        expect(parseDate(withEra, formatCompactDate(withEra, t, { seconds: true }))).toBe(t);
        expect(parseDate(withEra, formatDate(withEra, t, { seconds: true }))).toBe(t);
      }),
      { numRuns: 1000 },
    );
  });

  it('property: on the demo calendar (fractional day and year) format → parse lands within the shown second, never after', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e10, max: 1e10, noNaN: true }), (t) => {
        const back = parseDate(demo, formatCompactDate(demo, t, { seconds: true }));
        // "Never after" beyond the reading's rounding slack: a time within a microsecond (or a
        // few ulps of |t|) below a whole second reads as that second.
        expect(back - t).toBeLessThanOrEqual(1e-6 + 8 * Number.EPSILON * (Math.abs(t) + demo.yearLength));
        expect(t - back).toBeLessThan(1 + 1e-6);
      }),
      { numRuns: 1000 },
    );
  });

  it('gives back a typed date exactly as typed on the demo calendar (416-062T13:00 once read as 12:59:59, and 416-062T00:00 as 416-061T26:06:23)', () => {
    expect(formatCompactDate(demo, parseDate(demo, '416-062T13:00'))).toBe('416-062T13:00');
    expect(formatCompactDate(demo, parseDate(demo, '416-062T00:00'))).toBe('416-062T00:00');
    expect(formatCompactDate(demo, parseDate(demo, '412-149T24:13:23'), { seconds: true })).toBe('412-149T24:13:23');
  });

  it('property: every canonical compact text on the demo calendar reads back exactly as written', () => {
    const nDays = daysInYear(demo);
    fc.assert(
      fc.property(
        fc.integer({ min: -3000, max: 3000 }),
        fc.integer({ min: 1, max: nDays - 1 }),
        fc.integer({ min: 0, max: Math.floor(demo.dayLength) - 1 }),
        (year, day, second) => {
          const hh = Math.floor(second / 3600);
          const mm = Math.floor((second % 3600) / 60);
          const ss = second % 60;
          const p = (n: number) => String(n).padStart(2, '0');
          const text = `${year}-${String(day).padStart(3, '0')}T${p(hh)}:${p(mm)}:${p(ss)}`;
          expect(formatCompactDate(demo, parseDate(demo, text), { seconds: true })).toBe(text);
          const short = `${year}-${String(day).padStart(3, '0')}T${p(hh)}:${p(mm)}`;
          expect(formatCompactDate(demo, parseDate(demo, short))).toBe(short);
        },
      ),
      { numRuns: 2000 },
    );
  });

  it('inverts dateParts through dateToSeconds', () => {
    const p = dateParts(demo, 7.77e8);
    expect(dateToSeconds(demo, p.year, p.day, p.secondOfDay)).toBeCloseTo(7.77e8, 5);
  });
});
