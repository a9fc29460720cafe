/**
 * Markdown report of a plan's Δv budget: the vehicle, one table row per burn, the totals with
 * the reserve and the margin, every flag, and how the final orbit compares with the target.
 * Times in the system's calendar (core/system/calendar.ts) with seconds from the epoch beside
 * them; Δv in m/s, masses in kg, durations in s (and minutes). Plain GitHub-flavoured Markdown
 * tables; `|` in names is escaped.
 */

import { G0 } from '../plan/index.ts';
import type { Plan } from '../plan/index.ts';
import type { Flag, PlanResult } from '../plan/index.ts';
import { formatDate, formatElapsed } from '../system/index.ts';
import type { StarSystem } from '../system/index.ts';

const DEG = 180 / Math.PI;

function cell(s: string): string {
  return s.replace(/\|/g, '\\|').replace(/[\r\n]+/g, ' ');
}

function fmt(x: number | null | undefined, digits: number): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—';
  return x.toFixed(digits);
}

function km(m: number | null | undefined): string {
  return m === null || m === undefined || !Number.isFinite(m) ? '—' : `${(m / 1e3).toFixed(1)} km`;
}

function flagLine(f: Flag, plan: Plan): string {
  const where = f.planEventId ? ` (${cell(plan.events.find((e) => e.id === f.planEventId)?.name || f.planEventId)})` : '';
  return `- **${f.severity}** \`${f.code}\`${where}: ${cell(f.message)}`;
}

export interface ReportOptions {
  /** Report title (default "Δv budget: <plan name>"). */
  title?: string;
}

/** The Markdown text of the budget report. */
export function budgetReport(system: StarSystem, plan: Plan, result: PlanResult, options: ReportOptions = {}): string {
  const cal = system.calendar;
  const b = result.budget;
  const out: string[] = [];
  out.push(`# ${cell(options.title ?? `Δv budget: ${plan.name}`)}`, '');
  if (plan.description) out.push(cell(plan.description), '');
  out.push(
    `- System: ${cell(system.name)}`,
    `- Vehicle: ${cell(plan.vehicle.name)}`,
    `- Flown: ${formatDate(cal, result.t0)} to ${formatDate(cal, result.t1)} (${formatElapsed(cal, result.t1 - result.t0)}), model: ${result.model === 'conic' ? 'patched conics' : result.model}`,
    '',
  );

  // Vehicle.
  out.push('## Vehicle', '', '| stage | dry (kg) | propellant (kg) | Isp (s) | thrust (N) | Δv alone (m/s) |', '|---|---:|---:|---:|---:|---:|');
  let above = plan.vehicle.payloadMass;
  const stageRows: string[] = [];
  for (let k = plan.vehicle.stages.length - 1; k >= 0; k--) {
    const s = plan.vehicle.stages[k];
    const m0 = above + s.dryMass + s.propellantMass;
    const mf = above + s.dryMass;
    // Tsiolkovsky Δv of the stage carrying everything above it (the stack it pushes).
    const dv = mf > 0 ? G0 * s.isp * Math.log(m0 / mf) : NaN;
    stageRows.unshift(`| ${cell(s.name)} | ${fmt(s.dryMass, 0)} | ${fmt(s.propellantMass, 0)} | ${fmt(s.isp, 1)} | ${fmt(s.thrust, 0)} | ${fmt(dv, 1)} |`);
    above = m0;
  }
  out.push(...stageRows, '', `Payload ${fmt(plan.vehicle.payloadMass, 0)} kg; mass at start ${fmt(above, 0)} kg.`, '');

  // Burns.
  out.push(
    '## Burns',
    '',
    '| burn | time | Δv (m/s) | duration (s) | propellant (kg) | mass after (kg) | stages | Δv left (m/s) | flags |',
    '|---|---|---:|---:|---:|---:|---|---:|---|',
  );
  for (const r of b.rows) {
    out.push(
      `| ${cell(r.name || r.planEventId)} | ${formatDate(cal, r.t)} (t = ${fmt(r.t, 0)} s) | ${fmt(r.dv, 1)} | ${fmt(r.duration, 1)} | ${fmt(r.propellantUsed, 1)} | ${fmt(r.massAfter, 1)} | ${cell(r.stages.join(', '))} | ${fmt(r.dvLeft, 1)} | ${r.flags.map((f) => f.code).join(', ')} |`,
    );
  }
  if (b.rows.length === 0) out.push('| (no burns) | | | | | | | | |');
  out.push('');

  // Totals.
  const holds = b.margin >= 0 && !result.flags.some((f) => f.severity === 'error');
  out.push(
    '## Budget',
    '',
    '| | m/s |',
    '|---|---:|',
    `| Δv capacity of the vehicle | ${fmt(b.capacity, 1)} |`,
    `| Δv planned (sum of burns) | ${fmt(b.total, 1)} |`,
    `| Δv left after the last burn | ${fmt(b.dvLeft, 1)} |`,
    `| reserve (${fmt(plan.reserve.percent, 1)} % + ${fmt(plan.reserve.absolute, 1)} m/s) | ${fmt(b.reserve, 1)} |`,
    `| **margin** | **${fmt(b.margin, 1)}** |`,
    '',
    `Propellant used ${fmt(b.propellantUsed, 1)} kg; final mass ${fmt(b.finalMass, 1)} kg.`,
    '',
    holds ? '**The margin holds.**' : '**The margin does not hold.**',
    '',
  );

  // Flags.
  out.push('## Flags', '');
  if (result.flags.length === 0) out.push('None.');
  else out.push(...result.flags.map((f) => flagLine(f, plan)));
  out.push('');

  // Target.
  out.push('## Target', '');
  const t = result.target;
  if (!t) out.push('The plan has no target.');
  else {
    const name = system.bodies[t.body]?.name ?? String(t.body);
    out.push(`${cell(name)}: ${t.reached ? '**reached**' : '**not reached**'}.`, '', '| | desired | achieved |', '|---|---:|---:|');
    const a = t.achieved;
    out.push(`| periapsis altitude | ${km(t.desired.periapsisAltitude)} | ${km(a?.periapsisAltitude)} |`);
    if (t.desired.e !== null || a) out.push(`| eccentricity | ${fmt(t.desired.e, 4)} | ${fmt(a?.e, 4)} |`);
    if (t.desired.apoapsisAltitude !== null || a?.apoapsisAltitude != null) {
      out.push(`| apoapsis altitude | ${km(t.desired.apoapsisAltitude)} | ${km(a?.apoapsisAltitude)} |`);
    }
    out.push(`| inclination | ${t.desired.i === null ? 'any' : `${fmt(t.desired.i * DEG, 2)}°`} | ${a ? `${fmt(a.i * DEG, 2)}°` : '—'} |`);
    if (t.closestApproach) {
      out.push('', `Closest approach: ${km(t.closestApproach.altitude)} altitude at ${formatDate(cal, t.closestApproach.t)}.`);
    }
  }
  out.push('');
  return out.join('\n');
}
