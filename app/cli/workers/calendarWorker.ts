/**
 * Body of a calendar pool worker: the windows of one pair of the calendar (core/survey
 * calendarPair), the same function the in-thread path runs, so pooled and in-thread calendars
 * are the same bits. Runs in a Node worker thread under piscina (see ../calendarPool.ts).
 */
import { calendarPair, type CalendarPair, type CalendarRequest } from '../../../core/survey/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';

export interface CalendarTask {
  system: StarSystem;
  request: CalendarRequest;
  pairIndex: number;
}

export default function computeCalendarPair(task: CalendarTask): CalendarPair {
  return calendarPair(task.system, task.request, task.pairIndex);
}
