/**
 * Controls on a plan: a burn's Δv components in its own frame (VNB, RTN or inertial).
 *
 * Applying controls returns a new plan and never changes the one given. A burn under control
 * flies the Δv the controls give: its `solve` becomes 'fixed' and its `dv` the controls' values,
 * so a burn first solved by the evaluation (transfer, capture, plane, apsis) is handed over to the
 * targeter at the vector the evaluation resolved (see burnControls). Components not under control
 * keep the burn's written `dv`.
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

/** A new plan with each controlled burn fixed at the controls' values x (m/s); `plan` is left unchanged. */
export function applyControls(plan: Plan, controls: readonly BurnDvControl[], x: ArrayLike<number>): Plan {
  if (!x || x.length !== controls.length) throw new InputError('x', `must have one value per control (${controls.length})`, x?.length);
  const events = plan.events.slice();
  controls.forEach((c, j) => {
    if (c.kind !== 'burn-dv') throw new InputError(`controls[${j}].kind`, "must be 'burn-dv'", c.kind);
    if (!Number.isFinite(x[j])) throw new InputError(`x[${j}]`, 'must be a finite number', x[j]);
    const k = events.findIndex((e) => e.id === c.burnId);
    const ev = events[k];
    if (ev?.type !== 'burn') throw new InputError(`controls[${j}].burnId`, 'must name a burn of the plan', c.burnId);
    const dv: [number, number, number] = [ev.dv[0], ev.dv[1], ev.dv[2]];
    dv[c.component] = x[j];
    events[k] = { ...ev, dv, solve: { kind: 'fixed' } };
  });
  return { ...plan, events };
}
