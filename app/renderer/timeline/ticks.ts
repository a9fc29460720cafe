/**
 * Time-axis ticks in the system's own calendar: steps of seconds, minutes, hours, days or
 * years, aligned to the start of the calendar unit that contains them (a day-step tick falls on
 * a day start of the system's day, restarting at each year like the calendar's day numbers), so
 * labels read as round calendar values.
 */
import { dateParts } from '../../../core/system/index.ts';
import type { SystemCalendar } from '../../../core/system/index.ts';

export interface Tick {
  t: number;
  label: string;
  /** Starts a larger unit (a new day on an hour axis, a new year on a day axis). */
  major: boolean;
}

type Unit = 'second' | 'minute' | 'hour' | 'day' | 'year';

interface Step {
  unit: Unit;
  count: number;
  seconds: number;
}

export function candidateSteps(cal: SystemCalendar): Step[] {
  const out: Step[] = [];
  for (const c of [1, 2, 5, 10, 15, 30]) out.push({ unit: 'second', count: c, seconds: c });
  for (const c of [1, 2, 5, 10, 15, 30]) out.push({ unit: 'minute', count: c, seconds: 60 * c });
  for (const c of [1, 2, 3, 6, 12]) if (3600 * c < cal.dayLength) out.push({ unit: 'hour', count: c, seconds: 3600 * c });
  for (const c of [1, 2, 5, 10, 20, 50, 100, 200]) if (c * cal.dayLength < cal.yearLength) out.push({ unit: 'day', count: c, seconds: c * cal.dayLength });
  for (const c of [1, 2, 5, 10, 20, 50, 100, 200, 500, 1000]) out.push({ unit: 'year', count: c, seconds: c * cal.yearLength });
  return out;
}

function pad(n: number, w = 2): string {
  return String(n).padStart(w, '0');
}

function clock(sec: number, seconds: boolean): string {
  const s = Math.floor(sec + 1e-6);
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  return seconds ? `${pad(h)}:${pad(m)}:${pad(s % 60)}` : `${pad(h)}:${pad(m)}`;
}

/** Ticks for [a, b] (s from the epoch), about `target` of them and never more than 4 × target. */
export function calendarTicks(cal: SystemCalendar, a: number, b: number, target = 8): Tick[] {
  if (!(b > a) || !Number.isFinite(a) || !Number.isFinite(b)) return [];
  const span = b - a;
  const steps = candidateSteps(cal);
  const step = steps.find((s) => span / s.seconds <= target) ?? steps[steps.length - 1];
  const ticks: Tick[] = [];
  const Y = cal.yearLength;
  const D = cal.dayLength;
  const limit = 4 * target + 2;

  if (step.unit === 'year') {
    const y0 = Math.ceil(a / Y / step.count) * step.count;
    for (let y = y0; y * Y <= b && ticks.length < limit; y += step.count) {
      ticks.push({ t: y * Y, label: `Year ${cal.yearAtEpoch + y}`, major: true });
    }
    return ticks;
  }
  // Walk containers (years for day steps, days for sub-day steps) that overlap [a, b].
  const container = step.unit === 'day' ? Y : D;
  const yearOf = (t: number) => Math.floor(t / Y);
  let cStart: number;
  if (step.unit === 'day') cStart = yearOf(a) * Y;
  else {
    const y = yearOf(a);
    cStart = y * Y + Math.floor((a - y * Y) / D) * D;
  }
  while (cStart <= b && ticks.length < limit) {
    const yStart = yearOf(cStart + 1e-9) * Y;
    const cEnd = Math.min(cStart + container, step.unit === 'day' ? cStart + Y : yStart + Y);
    for (let k = 0; ; k++) {
      const t = cStart + k * step.seconds;
      if (t >= cEnd - 1e-9 || t > b || ticks.length >= limit) break;
      if (t < a) continue;
      const p = dateParts(cal, t);
      let label: string;
      let major = k === 0;
      if (step.unit === 'day') label = k === 0 ? `${p.year}-${pad(p.day, 3)}` : `day ${p.day}`;
      else if (k === 0) label = `${p.year}-${pad(p.day, 3)}`;
      else label = clock(p.secondOfDay, step.unit === 'second');
      if (step.unit === 'day' && k === 0) major = true;
      ticks.push({ t, label, major });
    }
    // A tick crowding the next container's first (major) tick is dropped.
    const last = ticks[ticks.length - 1];
    if (last && !last.major && cEnd - last.t < 0.6 * step.seconds && cEnd <= b) ticks.pop();
    cStart = cEnd;
  }
  return ticks;
}
