/**
 * The window calendar as CSV (core/survey/calendar.ts): one row per window, in pair order then
 * date order. Dialect and number form as csv.ts (RFC 4180, CRLF, SI units in the headers, the
 * shortest round-trip form of each double). Dates appear twice: s from the epoch, and the
 * system's compact calendar date (core/system formatCompactDate, with seconds). A window cut by
 * the calendar's start or end says so in `opens_cut` / `closes_cut` (true/false).
 */
import type { Calendar } from '../survey/index.ts';
import { formatCompactDate, type StarSystem } from '../system/index.ts';
import { CSV_EOL, csvRow } from './csv.ts';

export const CALENDAR_CSV_COLUMNS = [
  'from',
  'to',
  'window',
  'opens_s',
  'opens_date',
  'opens_cut',
  'best_depart_s',
  'best_depart_date',
  'closes_s',
  'closes_date',
  'closes_cut',
  'best_dv_mps',
  'dv_depart_mps',
  'dv_capture_mps',
  'tof_s',
  'arrive_s',
  'arrive_date',
] as const;

/** The calendar's windows as CSV text (header line first, CRLF line ends). */
export function calendarCsv(system: StarSystem, calendar: Calendar): string {
  const cal = system.calendar;
  const date = (t: number): string => formatCompactDate(cal, t, { seconds: true });
  const out: string[] = [csvRow([...CALENDAR_CSV_COLUMNS])];
  for (const p of calendar.pairs) {
    p.windows.forEach((w, k) => {
      const arrive = w.best.depart + w.best.tof;
      out.push(
        csvRow([
          p.from,
          p.to,
          k + 1,
          w.opens,
          date(w.opens),
          w.opensCut ? 'true' : 'false',
          w.best.depart,
          date(w.best.depart),
          w.closes,
          date(w.closes),
          w.closesCut ? 'true' : 'false',
          w.best.dv,
          w.best.dvDepart,
          w.best.dvCapture,
          w.best.tof,
          arrive,
          date(arrive),
        ]),
      );
    });
  }
  return out.join(CSV_EOL) + CSV_EOL;
}
