import { describe, expect, it } from 'vitest';
import { UNITS, formatNumber, formatTime, parseNumber, parseTime } from '../../../../app/renderer/plan/fieldText.ts';
import type { SystemCalendar } from '../../../../core/system/model.ts';

const cal: SystemCalendar = { yearLength: 400 * 93600, dayLength: 93600, yearAtEpoch: 412, era: 'TR', homeIndex: 2 };

describe('editor field text', () => {
  it('shows SI values in the display unit without trailing zeros', () => {
    expect(formatNumber(300_000, UNITS.km)).toBe('300');
    // a tiny negative reads 0, not "-0" (a targeted Δv component of −1e-9 m/s showed "-0")
    expect(formatNumber(-1e-4, UNITS.km)).toBe('0');
    expect(formatNumber(-0, UNITS.km)).toBe('0');
    expect(formatNumber(-2_000, UNITS.km)).toBe('-2');
    expect(formatNumber(23.354 * (Math.PI / 180), UNITS.deg)).toBe('23.354');
    expect(formatNumber(27_000, UNITS.t)).toBe('27');
    expect(formatNumber(null, UNITS.km)).toBe('');
  });
  it('reads plain numbers in the display unit, or any known unit suffix', () => {
    expect(parseNumber('Altitude', '300', UNITS.km)).toEqual({ ok: true, value: 300_000 });
    expect(parseNumber('Altitude', '250000m', UNITS.km)).toEqual({ ok: true, value: 250_000 });
    expect(parseNumber('Δv V', '\u221212.5', UNITS.mps)).toEqual({ ok: true, value: -12.5 });
    expect(parseNumber('Δv V', '1.2km/s', UNITS.mps)).toEqual({ ok: true, value: 1200 });
    expect(parseNumber('Payload', `3${'\u202f'}000`, UNITS.kg)).toEqual({ ok: true, value: 3000 });
  });
  it('names the field in every message', () => {
    const r = parseNumber('Stage 1 Isp', 'fast', UNITS.isp);
    expect(r.ok).toBe(false);
    expect(!r.ok && r.message).toMatch(/^Stage 1 Isp must be a number/);
    const u = parseNumber('Altitude', '3 parsecs', UNITS.km);
    expect(!u.ok && u.message).toMatch(/^Altitude/);
    expect(parseNumber('Revolutions', '1.5', UNITS.count, { integer: true })).toEqual({ ok: false, message: 'Revolutions must be a whole number' });
    expect(parseNumber('Eccentricity', '', UNITS.none)).toEqual({ ok: false, message: 'Eccentricity is required' });
    expect(parseNumber('Eccentricity', '', UNITS.none, { nullable: true })).toEqual({ ok: true, value: null });
  });
  it('reads dates in the system calendar, or seconds from the epoch with a unit', () => {
    const t = 93600 * 148 + 3600 * 23 + 60;
    expect(formatTime(cal, t)).toBe('412-149T23:01:00');
    expect(parseTime('Time', '412-149T23:01', cal)).toEqual({ ok: true, value: t });
    expect(parseTime('Time', 'Year 412 TR, day 149, 23:01', cal)).toEqual({ ok: true, value: t });
    expect(parseTime('Time', '150d', cal)).toEqual({ ok: true, value: 150 * 86400 });
    expect(parseTime('Time', '', cal, { nullable: true })).toEqual({ ok: true, value: null });
    const bad = parseTime('Arrive', '412-999', cal);
    expect(!bad.ok && bad.message).toMatch(/^Arrive/);
  });
});
