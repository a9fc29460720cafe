/**
 * Controls on a plan: a burn's Δv components in its own frame (VNB, RTN or inertial), a burn's
 * time, a solved transfer's arrival time, a coast's duration.
 *
 * Applying controls returns a new plan and never changes the one given. A burn under a Δv control
 * flies the Δv the controls give: its `solve` becomes 'fixed' and its `dv` the controls' values,
 * so a burn first solved by the evaluation (transfer, capture, plane, apsis) is handed over to the
 * targeter at the vector the evaluation resolved (see burnControls). Components not under control
 * keep the burn's written `dv`. A time control sets the burn's `t` (s from the epoch); an arrival
 * control the `arrive` of a 'transfer' burn; a duration control the `dt` of a 'duration' coast.
 */
import { InputError } from '../math/index.ts';
import type { BurnEvent, Plan, PlanResult } from '../plan/index.ts';
import type { Control } from './solve.ts';

/** A control on one component (0, 1, 2 in the burn's frame) of a burn's Δv. */
export interface BurnDvControl extends Control {
  kind: 'burn-dv';
  burnId: string;
  component: 0 | 1 | 2;
}

/** A control on a burn's time, a transfer burn's arrival time, or a duration coast's length (s). */
export interface EventTimeControl extends Control {
  kind: 'burn-time' | 'transfer-arrival' | 'coast-duration';
  /** The plan event's id (a burn, or a coast for 'coast-duration'). */
  eventId: string;
}

export type PlanControl = BurnDvControl | EventTimeControl;

/**
 * A control on an event's timing, starting from its written value (for a burn timed by the event
 * before it, the time `result` flew it at; SI seconds, scale 1 hour unless given).
 */
export function timeControl(
  plan: Plan,
  kind: EventTimeControl['kind'],
  eventId: string,
  result?: PlanResult,
  scale = 3600,
): { control: EventTimeControl; x0: number } {
  const ev = plan.events.find((e) => e.id === eventId);
  if (!ev) throw new InputError('eventId', 'must name an event of the plan', eventId);
  if (!(scale > 0) || !Number.isFinite(scale)) throw new InputError('scale', 'must be a finite number > 0', scale);
  const control = (name: string): EventTimeControl => ({
    kind,
    eventId,
    name,
    scale,
    units: kind === 'coast-duration' ? 'h' : 'days',
    unitScale: kind === 'coast-duration' ? 3600 : 86400,
  });
  if (kind === 'coast-duration') {
    if (ev.type !== 'coast' || ev.until.kind !== 'duration') throw new InputError('eventId', 'must name a coast that lasts a duration', eventId);
    return { control: control(`${ev.name} duration`), x0: ev.until.dt };
  }
  if (ev.type !== 'burn') throw new InputError('eventId', 'must name a burn of the plan', eventId);
  if (kind === 'transfer-arrival') {
    if (ev.solve.kind !== 'transfer') throw new InputError('eventId', 'must name a burn solved as a transfer (it has an arrival time)', eventId);
    return { control: control(`${ev.name} arrival`), x0: ev.solve.arrive };
  }
  let t = ev.t;
  if (t === null) {
    const row = result?.budget.rows.find((r) => r.planEventId === eventId);
    if (!row) throw new InputError('eventId', `names a burn timed by the event before it; fly the plan first to give it a time`, eventId);
    t = row.t;
  }
  return { control: control(`${ev.name} time`), x0: t };
}

const AXES: Record<BurnEvent['frame'], [string, string, string]> = {
  vnb: ['prograde', 'normal', 'binormal'],
  rtn: ['radial', 'transverse', 'normal'],
  inertial: ['x', 'y', 'z'],
};

function findBurn(plan: Plan, burnId: string): BurnEvent {
  const ev = plan.events.find((e) => e.id === burnId);
  if (ev?.type !== 'burn') throw new InputError('burnId', 'must name a burn of the plan', burnId);
  return ev;
}

/**
 * Controls on the three Δv components of a burn, scaled by `scale` (m/s), with their starting
 * values: the vector the conic evaluation flew (its budget row) when a result is given, else the
 * burn's written `dv`.
 */
export function burnControls(plan: Plan, burnId: string, scale: number, result?: PlanResult): { controls: BurnDvControl[]; x0: number[] } {
  const burn = findBurn(plan, burnId);
  if (!(scale > 0) || !Number.isFinite(scale)) throw new InputError('scale', 'must be a finite number > 0', scale);
  let x0: number[] = [...burn.dv];
  if (result) {
    const row = result.budget.rows.find((r) => r.planEventId === burnId);
    if (!row) throw new InputError('result', `has no budget row for burn "${burnId}" (was it flown?)`, burnId);
    x0 = [...row.dvFrame];
  }
  const axes = AXES[burn.frame];
  const controls = ([0, 1, 2] as const).map(
    (component): BurnDvControl => ({ kind: 'burn-dv', burnId, component, name: `${burn.name} Δv ${axes[component]}`, scale, units: 'm/s' }),
  );
  return { controls, x0 };
}

/** A new plan with each control at its value x (Δv m/s, times s); `plan` is left unchanged. */
export function applyControls(plan: Plan, controls: readonly PlanControl[], x: ArrayLike<number>): Plan {
  if (!x || x.length !== controls.length) throw new InputError('x', `must have one value per control (${controls.length})`, x?.length);
  const events = plan.events.slice();
  controls.forEach((c, j) => {
    if (!Number.isFinite(x[j])) throw new InputError(`x[${j}]`, 'must be a finite number', x[j]);
    if (c.kind === 'burn-dv') {
      const k = events.findIndex((e) => e.id === c.burnId);
      const ev = events[k];
      if (ev?.type !== 'burn') throw new InputError(`controls[${j}].burnId`, 'must name a burn of the plan', c.burnId);
      const dv: [number, number, number] = [ev.dv[0], ev.dv[1], ev.dv[2]];
      dv[c.component] = x[j];
      events[k] = { ...ev, dv, solve: { kind: 'fixed' } };
      return;
    }
    const k = events.findIndex((e) => e.id === c.eventId);
    const ev = events[k];
    if (c.kind === 'coast-duration') {
      if (ev?.type !== 'coast' || ev.until.kind !== 'duration')
        throw new InputError(`controls[${j}].eventId`, 'must name a coast that lasts a duration', c.eventId);
      if (!(x[j] >= 0)) throw new InputError(`x[${j}]`, 'must be a duration >= 0 s', x[j]);
      events[k] = { ...ev, until: { kind: 'duration', dt: x[j] } };
    } else if (c.kind === 'transfer-arrival') {
      if (ev?.type !== 'burn' || ev.solve.kind !== 'transfer') throw new InputError(`controls[${j}].eventId`, 'must name a transfer burn', c.eventId);
      events[k] = { ...ev, solve: { ...ev.solve, arrive: x[j] } };
    } else if (c.kind === 'burn-time') {
      if (ev?.type !== 'burn') throw new InputError(`controls[${j}].eventId`, 'must name a burn of the plan', c.eventId);
      events[k] = { ...ev, t: x[j] };
    } else {
      throw new InputError(`controls[${j}].kind`, "must be 'burn-dv', 'burn-time', 'transfer-arrival' or 'coast-duration'", (c as PlanControl).kind);
    }
  });
  return { ...plan, events };
}
