import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { calendarTicks } from '../../../../app/renderer/timeline/ticks.ts';
import { dateParts } from '../../../../core/system/calendar.ts';
import type { SystemCalendar } from '../../../../core/system/model.ts';

// A 26 h day and a year of 400.3 days: day starts drift against whole hours and years.
const cal: SystemCalendar = { yearLength: 400.3 * 93600, dayLength: 93600, yearAtEpoch: 412, era: 'TR', homeIndex: 2 };

describe('calendar ticks', () => {
  it('puts day ticks on day starts of the system calendar', () => {
    const ticks = calendarTicks(cal, 10 * 93600 + 5, 17 * 93600, 8);
    expect(ticks.length).toBeGreaterThanOrEqual(5);
    for (const t of ticks) expect(dateParts(cal, t.t).secondOfDay).toBeCloseTo(0, 6);
    expect(ticks[0].label).toMatch(/^day \d+$/);
  });

  it('restarts day numbering at each year, marking the year start as major', () => {
    const y = cal.yearLength;
    const ticks = calendarTicks(cal, y - 30 * 93600, y + 30 * 93600, 8);
    const major = ticks.find((t) => t.major)!;
    expect(major.t).toBeCloseTo(y, 6);
    expect(major.label).toBe('413-001');
  });

  it('uses hours inside a day, labelled as clock times', () => {
    const ticks = calendarTicks(cal, 93600 * 3, 93600 * 3 + 12 * 3600, 6);
    expect(ticks.map((t) => t.label).slice(1, 3)).toEqual(['02:00', '04:00']);
  });

  it('stays within [a, b], increasing, and never crowds (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 1e9, noNaN: true }),
        fc.double({ min: 10, max: 5e8, noNaN: true }),
        fc.integer({ min: 3, max: 12 }),
        (a, span, target) => {
          const ticks = calendarTicks(cal, a, a + span, target);
          for (let k = 0; k < ticks.length; k++) {
            if (ticks[k].t < a - 1e-6 || ticks[k].t > a + span + 1e-6) return false;
            if (k > 0 && !(ticks[k].t > ticks[k - 1].t)) return false;
          }
          return ticks.length <= 4 * target + 2;
        },
      ),
    );
  });
});
