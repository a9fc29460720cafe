import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parsePlanFile } from '../../../../core/io/planFile.ts';
import { parseSystemFile } from '../../../../core/io/systemFile.ts';
import { formatCompactDate } from '../../../../core/system/index.ts';
import { DRAG_THRESHOLD_PX, draggedTime, whyNotDraggable } from '../../../../app/renderer/timeline/burnDrag.ts';
import { retimeBurn } from '../../../../app/renderer/plan/edits.ts';
import { displayCalendar } from '../../../../app/renderer/format/dayMode.ts';

const root = new URL('../../../../', import.meta.url);
const system = parseSystemFile(readFileSync(new URL('assets/systems/ilmar.system.json', root), 'utf8')).system;
const plan = parsePlanFile(readFileSync(new URL('assets/plans/tessel-to-ochre.plan.json', root), 'utf8')).plan;
const cal = system.calendar;

describe('dragging a burn on the Timeline', () => {
  it('moves its time by the pixels dragged at the axis scale, snapped to the nearest whole minute of the shown clock', () => {
    const t0 = 24184348.873735305; // a flown departure time, not on a whole minute
    const spp = 3600; // an hour per pixel
    for (const c of [cal, displayCalendar(cal, 'standard')]) {
      for (const dx of [5, -5, 17, 240]) {
        const t = draggedTime(c, t0, dx, spp);
        // within half a minute of the unsnapped time, on a whole minute
        expect(Math.abs(t - (t0 + dx * spp))).toBeLessThanOrEqual(30 + 1e-6);
        expect(formatCompactDate(c, t, { seconds: true })).toMatch(/:00$/);
        expect(Math.sign(t - t0)).toBe(Math.sign(dx));
      }
    }
    // a press that moves less than the threshold is a click: the time stays
    expect(draggedTime(cal, t0, DRAG_THRESHOLD_PX - 1, spp)).toBe(t0);
    // at a fine scale a small drag still lands on whole minutes (here 4 px × 10 s = 40 s → nearest minute)
    const fine = draggedTime(cal, 1_000_000, 4, 10);
    expect(formatCompactDate(cal, fine, { seconds: true })).toMatch(/:00$/);
    expect(Math.abs(fine - 1_000_040)).toBeLessThanOrEqual(30);
  });

  it('only burns with a time of their own drag; the others say why, naming the event before them as on its card', () => {
    expect(plan.events[0].type === 'burn' && plan.events[0].t).not.toBeNull();
    expect(whyNotDraggable(plan, plan.events[0].id)).toBeNull(); // the departure has its time
    const first = { ...plan, events: [{ ...plan.events[0], t: null }, ...plan.events.slice(1)] };
    expect(whyNotDraggable(first, plan.events[0].id)).toMatch(/Departure has no time of its own: it fires at the plan's start/);
    const k = plan.events.findIndex((e) => e.name === 'Ochre capture');
    expect(whyNotDraggable(plan, plan.events[k].id)).toBe(
      `Ochre capture has no time of its own: it fires at the end of ${k} ${plan.events[k - 1].name}. Give it a time in its card to drag it here.`,
    );
    const timed = retimeBurn(plan, plan.events[k].id, 34_900_000);
    expect(whyNotDraggable(timed, plan.events[k].id)).toBeNull();
    expect(whyNotDraggable(plan, plan.events[1].id)).toBe('not a burn of the plan');
  });

  it('the edit sets the burn time only, and leaves the plan alone for anything but a burn', () => {
    const id = plan.events[0].id;
    const next = retimeBurn(plan, id, 123);
    expect(next.events[0]).toEqual({ ...plan.events[0], t: 123 });
    expect(next.events.slice(1)).toEqual(plan.events.slice(1));
    expect(retimeBurn(plan, plan.events[1].id, 123)).toBe(plan);
  });
});
