import { describe, expect, it } from 'vitest';
import { calendarDay, compactDate, date, distance, duration, elapsed, grouped, mass, speed } from '../../../../app/renderer/format/format.ts';
import type { SystemCalendar } from '../../../../core/system/model.ts';

const cal: SystemCalendar = { yearLength: 400 * 93600, dayLength: 93600, yearAtEpoch: 412, era: 'TR', homeIndex: 2 };
const N = '\u202f';

describe('formatting for the screens', () => {
  it('groups digits in threes with a narrow space and uses a true minus (ISO 80000-1 style)', () => {
    expect(grouped(1234567.891, 2)).toBe(`1${N}234${N}567.89`);
    expect(grouped(-1108.84, 1)).toBe(`\u22121${N}108.8`);
    expect(grouped(999)).toBe('999');
    expect(grouped(-0.01, 1)).toBe('0.0');
    expect(grouped(Number.NaN)).toBe('—');
  });
  it('writes speeds, masses and distances in their units', () => {
    expect(speed(3632.08)).toBe(`3${N}632.1 m/s`);
    expect(mass(845.4)).toBe('845 kg');
    expect(mass(32_200)).toBe('32.20 t');
    expect(distance(400_000)).toBe('400 km');
    expect(distance(1.31278e11)).toBe('131.278 Gm');
    expect(distance(3500)).toBe('3.50 km');
  });
  it('writes durations by their size', () => {
    expect(duration(12.345)).toBe('12.3 s');
    expect(duration(192)).toBe('3 min 12 s');
    expect(duration(7500)).toBe('2 h 05 min');
    expect(duration(4 * 86400 + 6 * 3600)).toBe('4 d 06 h');
  });
  it('writes times in the system calendar and as mission elapsed time', () => {
    expect(date(cal, 0)).toBe('Year 412 TR, day 1, 00:00');
    expect(date(cal, 93600 + 3600 * 25.5, true)).toBe('Year 412 TR, day 2, 25:30:00');
    expect(compactDate(cal, 93600 * 36 + 60)).toBe('412-037T00:01:00');
    // Elapsed time counts standard days of 86 400 s whatever the calendar's day.
    expect(elapsed(cal, 86400 * 2 + 61, 0)).toBe('T+ 2 d 00 h 01 min 01 s');
    expect(elapsed(cal, 0, 10)).toBe('T− 0 d 00 h 00 min 10 s');
  });
});

describe('calendarDay', () => {
  it("names the home world whose day the calendar counts, and the day's length", () => {
    const bodies = [{ name: 'Ilmar' }, { name: 'Kiln' }, { name: 'Tessel' }] as unknown as Parameters<typeof calendarDay>[0]['bodies'];
    // 93 600 s = 26 h 00 min; 93 983.76 s (the demo's mean solar day) = 26 h 06 min.
    expect(calendarDay({ calendar: cal, bodies })).toBe('days of Tessel: 26 h 00 min');
    expect(calendarDay({ calendar: { ...cal, dayLength: 93983.76 }, bodies })).toBe('days of Tessel: 26 h 06 min');
    expect(calendarDay({ calendar: { ...cal, dayLength: 90000, homeIndex: -1 }, bodies })).toBe('calendar day: 25 h 00 min');
  });
});
