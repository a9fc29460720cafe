/**
 * Retiming a burn by dragging its mark on the Timeline, as pure functions: which burns can be
 * dragged (those with a written time; a burn timed by the event before it has none to move)
 * and the time a drag gives (the burn's time moved by the pixels dragged at the axis's scale,
 * snapped to a whole minute of the shown clock). The chart previews it while dragging; one
 * edit is made on release.
 */
import type { Plan } from '../../../core/plan/index.ts';
import type { SystemCalendar } from '../../../core/system/index.ts';
import { snapToMinute } from '../plan/newBurn.ts';

/** Pixels a pointer must move before a press on a burn mark is a drag rather than a click. */
export const DRAG_THRESHOLD_PX = 3;
/** Width of a burn mark's grab area, px (at least this, centred on the burn, however short the burn). */
export const BURN_HIT_PX = 12;
/** Keyboard nudge of a selected burn's time: one minute; with Shift an hour. */
export const NUDGE_S = 60;
export const NUDGE_BIG_S = 3600;

/** Null when the burn can be dragged, else why not (for its tooltip). */
export function whyNotDraggable(plan: Plan, id: string): string | null {
  const k = plan.events.findIndex((e) => e.id === id);
  const ev = plan.events[k];
  if (ev?.type !== 'burn') return 'not a burn of the plan';
  if (ev.t !== null) return null;
  const before = plan.events[k - 1];
  return before
    ? `${ev.name} has no time of its own: it fires at the end of ${k} ${before.name}. Give it a time in its card to drag it here.`
    : `${ev.name} has no time of its own: it fires at the plan's start. Give it a time in its card to drag it here.`;
}

/**
 * The time a drag gives: `t0` moved by `dxPx` pixels at `secondsPerPx`, snapped to the nearest
 * whole minute of the clock of `cal`; a drag shorter than the threshold leaves t0 as it was.
 */
export function draggedTime(cal: SystemCalendar, t0: number, dxPx: number, secondsPerPx: number): number {
  if (Math.abs(dxPx) < DRAG_THRESHOLD_PX || !(secondsPerPx > 0)) return t0;
  return snapToMinute(cal, t0 + dxPx * secondsPerPx);
}
