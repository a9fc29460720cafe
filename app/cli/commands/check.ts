/**
 * `waymark check PLAN [--json]` — flies a plan file (patched conics) and prints its Δv budget
 * and margin. Exit code (for content pipelines that gate on it):
 *   0  the margin holds: margin >= 0 and no error flag (impact, stage out of propellant ...);
 *   1  it does not;
 *   2  the plan file (or its system file) cannot be read or is invalid — the message names
 *      the file and every field at fault, e.g. `events[2].dv_mps[0] must be a number`;
 *   3  a numerical method failed.
 * Text: a table of burns (time in the system calendar, Δv, duration, propellant, mass after,
 * Δv left, flags), then capacity, total, reserve and margin, the flags and the target; file
 * warnings go to stderr. `--json`: { plan, holds, budget, flags, target, warnings } in SI.
 */
import type { Command } from 'commander';
import { evaluate } from '../../../core/conic/index.ts';
import type { Plan } from '../../../core/plan/index.ts';
import type { PlanResult } from '../../../core/plan/index.ts';
import { formatCompactDate } from '../../../core/system/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import { loadPlanFile } from '../../node/files.ts';
import { addFlyCommand } from './fly.ts';
import { EXIT_NO, EXIT_OK, guard, num, printJson, printText, printWarnings } from '../output.ts';

const DEG = 180 / Math.PI;

/** The plan closes: margin >= 0 and no error flag. */
export function marginHolds(result: PlanResult): boolean {
  return result.budget.margin >= 0 && !result.flags.some((f) => f.severity === 'error');
}

function pad(s: string, n: number, right = false): string {
  return right ? s.padStart(n) : s.padEnd(n);
}

/** The text budget table of `waymark check`. */
export function budgetText(system: StarSystem, plan: Plan, result: PlanResult): string {
  const cal = system.calendar;
  const b = result.budget;
  const out: string[] = [];
  out.push(`plan ${plan.name} — vehicle ${plan.vehicle.name}, system ${system.name}`);
  out.push('');
  const head = [
    pad('burn', 22),
    pad('time', 17),
    pad('Δv m/s', 9, true),
    pad('dur s', 9, true),
    pad('prop kg', 10, true),
    pad('mass kg', 10, true),
    pad('left m/s', 10, true),
    '  flags',
  ];
  out.push(head.join(' '));
  for (const r of b.rows) {
    out.push(
      [
        pad((r.name || r.planEventId).slice(0, 22), 22),
        pad(formatCompactDate(cal, r.t), 17),
        pad(num(r.dv, 1), 9, true),
        pad(num(r.duration, 1), 9, true),
        pad(num(r.propellantUsed, 1), 10, true),
        pad(num(r.massAfter, 1), 10, true),
        pad(num(r.dvLeft, 1), 10, true),
        `  ${r.flags.map((f) => f.code).join(', ')}`,
      ].join(' '),
    );
  }
  if (b.rows.length === 0) out.push('(no burns)');
  out.push('');
  out.push(`capacity   ${pad(num(b.capacity, 1), 10, true)} m/s`);
  out.push(`planned    ${pad(num(b.total, 1), 10, true)} m/s`);
  out.push(`left       ${pad(num(b.dvLeft, 1), 10, true)} m/s`);
  out.push(`reserve    ${pad(num(b.reserve, 1), 10, true)} m/s  (${num(plan.reserve.percent, 1)} % + ${num(plan.reserve.absolute, 1)} m/s)`);
  out.push(`margin     ${pad(num(b.margin, 1), 10, true)} m/s  ${marginHolds(result) ? 'HOLDS' : 'DOES NOT HOLD'}`);
  if (result.flags.length > 0) {
    out.push('');
    for (const f of result.flags) out.push(`${f.severity.padEnd(7)} ${f.code}: ${f.message}`);
  }
  const t = result.target;
  if (t) {
    out.push('');
    const name = system.bodies[t.body]?.name ?? String(t.body);
    const a = t.achieved;
    out.push(
      `target ${name}: ${t.reached ? 'reached' : 'not reached'}` +
        (a ? ` — periapsis ${num(a.periapsisAltitude / 1e3, 1)} km, e ${num(a.e, 4)}, i ${num(a.i * DEG, 2)} deg` : ''),
    );
  }
  return out.join('\n');
}

/** Registers the plan commands: `check` and `fly` (fly.ts). */
export function addPlanCommands(program: Command): void {
  addCheckCommand(program);
  addFlyCommand(program);
}

export function addCheckCommand(program: Command): void {
  program
    .command('check')
    .description('fly a plan and print its Δv budget; exit 0 if the margin holds, 1 if not, 2 for a bad file')
    .argument('<plan>', 'plan file (.plan.json)')
    .option('--json', 'machine-readable output')
    .action((planPath: string, o: { json?: boolean }) =>
      guard(!!o.json, async () => {
        const loaded = await loadPlanFile(planPath);
        const result = evaluate(loaded.system, loaded.plan);
        const holds = marginHolds(result);
        if (o.json) {
          printJson({
            plan: loaded.plan.name,
            system: loaded.system.name,
            holds,
            budget: result.budget,
            flags: result.flags,
            target: result.target,
            warnings: loaded.warnings,
          });
        } else {
          printWarnings(loaded.warnings);
          printText(budgetText(loaded.system, loaded.plan, result));
        }
        return holds ? EXIT_OK : EXIT_NO;
      }),
    );
}
