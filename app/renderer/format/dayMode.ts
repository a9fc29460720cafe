/**
 * Which day the app's dates count: the home world's (the calendar's own, "days of Tessel:
 * 26 h 06 min") or standard days of 86 400 s. Durations and elapsed times always count standard
 * days (format.ts); this choice is for calendar dates, shown and typed. The year stays the
 * calendar's year; with standard days the day number counts 86 400 s days from the year's start
 * and the clock stops at 23:59:59. Kept in localStorage like the rest of the view's state.
 */
import { STANDARD_DAY } from '../../../core/system/index.ts';
import type { SystemCalendar } from '../../../core/system/index.ts';
import { Observable } from '../state/observable.ts';

export type DayMode = 'home' | 'standard';

export const DAY_MODE_KEY = 'waymark.view.dayMode';

function storage(): Storage | null {
  try {
    return typeof localStorage === 'undefined' ? null : localStorage;
  } catch {
    return null;
  }
}

/** The stored choice (home days when none or unreadable). */
export function readDayMode(store: Pick<Storage, 'getItem'> | null = storage()): DayMode {
  try {
    return store?.getItem(DAY_MODE_KEY) === 'standard' ? 'standard' : 'home';
  } catch {
    return 'home';
  }
}

/** The app's choice; setting it stores it. */
export const dayMode = new Observable<DayMode>(readDayMode());
dayMode.subscribe((m) => {
  try {
    storage()?.setItem(DAY_MODE_KEY, m);
  } catch {
    // storage full or refused: the choice lasts for this session only
  }
});

const standardOf = new WeakMap<SystemCalendar, SystemCalendar>();

/** The calendar dates are shown and typed in: the system's own, or the same years counted in standard days (one object per calendar). */
export function displayCalendar(cal: SystemCalendar, mode: DayMode): SystemCalendar {
  if (mode === 'home' || cal.dayLength === STANDARD_DAY) return cal;
  let s = standardOf.get(cal);
  if (!s) {
    s = { ...cal, dayLength: STANDARD_DAY };
    standardOf.set(cal, s);
  }
  return s;
}
