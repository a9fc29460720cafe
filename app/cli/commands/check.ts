/**
 * `waymark check PLAN [--model conic|finite|nbody] [--json]` — flies a plan file in its truth
 * model (core/target truthReport: `conic` patched conics, `finite` patched conics with every
 * burn finite, `nbody` n-body gravity; the plan file's `truth_model`, `conic` when it names
 * none) and prints its Δv budget, its margin and its target judged in that model. `--model`
 * judges it in another model instead, as a comparison (labelled so; the verdict and exit code
 * are then that model's). Exit code (for content pipelines that gate on it):
 *   0  the plan holds in the model judged: margin >= 0, the target reached (when the plan has
 *      one) and no error flag (impact, stage out of propellant, a burn that failed to solve ...;
 *      a failed solve also marks the margin NOT VALID, since its burn's Δv is not counted);
 *   1  it does not — every failing condition is named ("margin −54.2 m/s is below zero",
 *      "periapsis altitude about Ochre is 2000.250 km, wanted 400.000 km ± 10.000 km");
 *   2  the plan file (or its system file) cannot be read or is invalid — the message names
 *      the file and every field at fault, e.g. `events[2].dv_mps[0] must be a number` — or an
 *      option is wrong;
 *   3  a numerical method failed.
 * Text: a table of burns (time in the system calendar, Δv, duration, propellant, mass after,
 * Δv left, flags), then capacity, total, reserve and margin, the flags, the target's goals
 * (value, wanted ± tolerance, met) and the verdict with the model it was judged in; file
 * warnings go to stderr. An n-body check shows a progress bar on a terminal's stderr. `--json`:
 * { plan, system, model, label, truthModel, comparison, holds, failures, budget, flags, target,
 * truth, warnings, sky } in SI (`target` is the patched-conic readout, null when judged in n-body;
 * `truth` the goals, the orbit reached and the notes of the model judged).
 * After the target lines, the author's readouts (core/sky, skyReadout): one line per shadow pass
 * (body, umbra or penumbra, from – to in the system calendar, duration; conical shadow model) and
 * the one-way light time to the home body (the calendar's home world, else the plan's start
 * body), min – max over the flight; read off the patched-conic flight of the model judged
 * (`conic`, `finite`), or of the burn schedule when judged in n-body (the command line keeps no
 * n-body samples), labelled with the model read. `--json`: `sky: { model, shadowModel, passes,
 * eclipses, inShadow, light: { body, min, max } }` in s.
 */
import type { Command } from 'commander';
import type { Flag, Plan, PlanResult } from '../../../core/plan/index.ts';
import { planTruthModel, truthModelLabel, type TruthModel } from '../../../core/plan/index.ts';
import { shipStateAt } from '../../../core/conic/index.ts';
import { lightTimeAt, type ShadowPass, shadowPasses } from '../../../core/sky/index.ts';
import { bodyState, findBodyIndex, formatCompactDate, formatElapsed } from '../../../core/system/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import type { TruthReport } from '../../../core/target/index.ts';
import { loadPlanFile } from '../../node/files.ts';
import { addFlyCommand } from './fly.ts';
import { EXIT_NO, EXIT_OK, guard, num, printJson, printText, printWarnings } from '../output.ts';
import { modelWords, parseModel, readInModel, targetText } from '../truthText.ts';

/** Patched-conic flags that speak of the patched-conic path, not of the budget: not the n-body flight's (its own impact and arrival are judged instead). */
const CONIC_PATH_FLAGS = new Set(['target-missed', 'impact']);

/** The flags that apply to the plan read in `report.model`: every flag for the patched-conic models, the budget's and the burns' for n-body. */
export function modelFlags(report: TruthReport): Flag[] {
  if (report.model !== 'nbody') return report.conic.flags;
  // the schedule's burns the patched-conic reading never reached (it ended early) flag from the schedule's budget
  const flown = new Set(report.conic.budget.rows.map((r) => r.planEventId));
  const later = report.budget.rows.filter((r) => !flown.has(r.planEventId)).flatMap((r) => r.flags);
  return [...report.conic.flags.filter((f) => !CONIC_PATH_FLAGS.has(f.code)), ...later];
}

/** The verdict in the model judged: every failing condition in words (empty: the plan holds). */
export function failingConditions(system: StarSystem, report: TruthReport): string[] {
  const failures = [...report.failures];
  // the margin and the target are in report.failures already; other errors (impact, out of propellant ...) come from the flags
  for (const f of modelFlags(report)) {
    // report.failures already names the flight's error flags in the core's words: not twice
    if (f.severity === 'error' && f.code !== 'negative-margin' && f.code !== 'target-missed' && !report.failures.includes(f.message))
      failures.push(`${f.code}: ${f.message}`);
  }
  const nb = report.nbody;
  if (nb?.impact && !report.plan.target)
    failures.push(`impact: the ship hits ${system.bodies[nb.impact.body]?.name ?? nb.impact.body} at t = ${nb.impact.t.toFixed(0)} s`);
  return failures;
}

function pad(s: string, n: number, right = false): string {
  return right ? s.padStart(n) : s.padEnd(n);
}

/** The text budget table of `waymark check`: burns, capacity, total, reserve, margin and the flags shown (the result's by default). */
export function budgetText(system: StarSystem, plan: Plan, result: PlanResult, flags: readonly Flag[] = result.flags): string {
  const cal = system.calendar;
  const b = result.budget;
  const out: string[] = [];
  out.push(`plan ${plan.name} — vehicle ${plan.vehicle.name}, system ${system.name}`);
  out.push('');
  // finite burns: the Δv lost to gravity against the impulsive burn (energy-based, see the README)
  const finite = b.rows.some((r) => r.gravityLoss !== null);
  const head = [
    pad('burn', 22),
    pad('time', 17),
    pad('Δv m/s', 9, true),
    pad('dur s', 9, true),
    pad('prop kg', 10, true),
    pad('mass kg', 10, true),
    pad('left m/s', 10, true),
    ...(finite ? [pad('g-loss m/s', 10, true)] : []),
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
        ...(finite ? [pad(r.gravityLoss === null ? '—' : num(r.gravityLoss, 1), 10, true)] : []),
        `  ${r.flags.map((f) => f.code).join(', ')}`,
      ].join(' '),
    );
  }
  if (b.rows.length === 0) out.push('(no burns)');
  if (finite)
    out.push('g-loss: Δv the finite burn put into no orbital energy (energy-based: large for a burn that mostly turns the velocity, e.g. a plane change)');
  out.push('');
  out.push(`capacity   ${pad(num(b.capacity, 1), 10, true)} m/s`);
  out.push(`planned    ${pad(num(b.total, 1), 10, true)} m/s`);
  out.push(`left       ${pad(num(b.dvLeft, 1), 10, true)} m/s`);
  out.push(`reserve    ${pad(num(b.reserve, 1), 10, true)} m/s  (${num(plan.reserve.percent, 1)} % + ${num(plan.reserve.absolute, 1)} m/s)`);
  const failed = b.failedBurns.map((f) => `${f.name || f.planEventId} (row ${f.row})`);
  out.push(
    `margin     ${pad(num(b.margin, 1), 10, true)} m/s  ${
      failed.length > 0
        ? `NOT VALID: ${failed.join(', ')} failed to solve, so ${failed.length > 1 ? 'their' : 'its'} Δv is not counted`
        : b.margin >= 0
          ? 'HOLDS'
          : 'DOES NOT HOLD'
    }`,
  );
  // flybys: the heliocentric Δv each pass gives for free, beside the burns (not part of the planned total)
  for (const f of result.flybys ?? []) {
    const body = system.bodies[f.body]?.name ?? f.name;
    out.push(
      `flyby      ${pad(f.freeDv === null ? '—' : num(f.freeDv, 1), 10, true)} m/s  free at ${body} (${f.name || f.planEventId}): periapsis ${num(f.periapsisAltitude / 1000, 0)} km on ${formatCompactDate(cal, f.tPeriapsis)}${
        f.turn === null ? '' : `, turn ${num((f.turn * 180) / Math.PI, 2)}°`
      }${f.dvBurned > 0 ? `, ${num(f.dvBurned, 1)} m/s burned in the pass` : ''}`,
    );
  }
  if (flags.length > 0) {
    out.push('');
    for (const f of flags) out.push(`${f.severity.padEnd(7)} ${f.code}: ${f.message}`);
  }
  return out.join('\n');
}

/** The author's readouts of a plan read in a model (see the module comment). */
export interface SkyReadout {
  /** Words of the flight read ("patched conics", "finite burns"). */
  model: string;
  shadowModel: 'conical';
  passes: ShadowPass[];
  eclipses: number;
  /** Time in shadow, s. */
  inShadow: number;
  light: { body: string; min: number; max: number; samples: number };
}

/** Light-time samples over the flight for its range. */
const LIGHT_SAMPLES = 400;

/** Shadow passes and the light-time range of the flight the report reads in patched conics (see the module comment). */
export function skyReadout(system: StarSystem, report: TruthReport): SkyReadout | null {
  const r = report.conic;
  if (r.segments.length === 0 || !(r.t1 >= r.t0)) return null;
  const s6 = new Float64Array(6);
  const c6 = new Float64Array(6);
  const shipAt = (t: number, out: Float64Array) => {
    const k = shipStateAt(r, t, s6);
    bodyState(system, r.segments[k].central, t, c6, 0);
    for (let j = 0; j < 6; j++) out[j] = s6[j] + c6[j];
  };
  const shadow = shadowPasses(system, shipAt, r.t0, r.t1, { model: 'conical' });
  const home = system.calendar.homeIndex;
  const start = findBodyIndex(system, report.plan.start.body);
  const body = home >= 0 ? home : Math.max(0, start);
  let min = Infinity;
  let max = -Infinity;
  const p = new Float64Array(6);
  for (let k = 0; k < LIGHT_SAMPLES; k++) {
    const t = r.t0 + ((r.t1 - r.t0) * k) / (LIGHT_SAMPLES - 1);
    shipAt(t, p);
    const tau = lightTimeAt(system, body, t, p[0], p[1], p[2]);
    min = Math.min(min, tau);
    max = Math.max(max, tau);
  }
  return {
    model: report.model === 'finite' ? 'finite burns' : 'patched conics',
    shadowModel: 'conical',
    passes: shadow.passes,
    eclipses: shadow.eclipses,
    inShadow: shadow.inShadow,
    light: { body: system.bodies[body].name, min, max, samples: LIGHT_SAMPLES },
  };
}

/** A duration in words: "0.02 s", "13 min 52 s", "2 h 05 min" (longer: the calendar's elapsed time). */
function span(system: StarSystem, s: number): string {
  if (s < 60) return `${s.toFixed(s < 10 ? 2 : 1)} s`;
  if (s < 3600) return `${Math.floor(s / 60)} min ${String(Math.floor(s % 60)).padStart(2, '0')} s`;
  if (s < 86400) return `${Math.floor(s / 3600)} h ${String(Math.floor((s % 3600) / 60)).padStart(2, '0')} min`;
  return formatElapsed(system.calendar, s);
}

/** The readouts' text lines: one per shadow pass, then the light-time range. */
export function skyText(system: StarSystem, sky: SkyReadout, judged: TruthModel): string[] {
  const cal = system.calendar;
  const read = judged === 'nbody' ? `${sky.model}: the burn schedule's flight, the n-body flight keeps no samples here` : sky.model;
  const out = [`sky (${read}; ${sky.shadowModel} shadow model):`];
  for (const p of sky.passes)
    out.push(
      `  shadow  ${pad(`${p.bodyName} ${p.kind}`, 20)} ${formatCompactDate(cal, p.t0, { seconds: true })} – ${formatCompactDate(cal, p.t1, { seconds: true })}  ${span(system, p.t1 - p.t0)}`,
    );
  out.push(
    `  ${sky.eclipses === 0 ? 'no shadow: sunlight all the flight' : `${sky.eclipses} eclipse${sky.eclipses === 1 ? '' : 's'}, ${span(system, sky.inShadow)} in shadow`}`,
  );
  out.push(
    `  light time to ${sky.light.body}  ${span(system, sky.light.min)} – ${span(system, sky.light.max)}  (one way; min – max of ${sky.light.samples} times)`,
  );
  return out;
}

/** The verdict line and the failing conditions. */
export function verdictText(report: TruthReport, truth: TruthModel, failures: readonly string[]): string[] {
  const head = `judged in ${modelWords(report.model, truth)}: ${failures.length === 0 ? 'HOLDS' : 'DOES NOT HOLD'}`;
  return [head, ...failures.map((f) => `  - ${f}`)];
}

/** Registers the plan commands: `check` and `fly` (fly.ts). */
export function addPlanCommands(program: Command): void {
  addCheckCommand(program);
  addFlyCommand(program);
}

export function addCheckCommand(program: Command): void {
  program
    .command('check')
    .description('fly a plan in its truth model and print its Δv budget and target; exit 0 if it holds, 1 if not, 2 for a bad file')
    .argument('<plan>', 'plan file (.plan.json)')
    .option('--model <model>', "judge in this model instead, as a comparison: conic, finite or nbody (default: the plan's truth model)")
    .option('--json', 'machine-readable output')
    .action((planPath: string, o: { model?: string; json?: boolean }) =>
      guard(!!o.json, async () => {
        const asked = o.model === undefined ? undefined : parseModel('--model', o.model);
        const loaded = await loadPlanFile(planPath);
        const { system, plan } = loaded;
        const truth = planTruthModel(plan);
        const model = asked ?? truth;
        const report = readInModel(system, plan, model, !!o.json);
        const failures = failingConditions(system, report);
        const holds = failures.length === 0;
        const sky = skyReadout(system, report);
        if (o.json) {
          printJson({
            plan: plan.name,
            system: system.name,
            model,
            label: truthModelLabel(model),
            truthModel: truth,
            comparison: model !== truth,
            holds,
            failures,
            budget: report.budget,
            flags: modelFlags(report),
            flybys: report.flybys,
            target: model === 'nbody' ? null : report.conic.target,
            truth: { reached: report.reached, marginHolds: report.marginHolds, achieved: report.achieved, goals: report.goals, notes: report.notes },
            warnings: loaded.warnings,
            sky,
          });
        } else {
          printWarnings(loaded.warnings);
          // the budget and the flyby passes in the model judged (n-body: the schedule's, every burn counted; the passes measured from the n-body flight)
          const out = [budgetText(system, plan, { ...report.conic, budget: report.budget, flybys: report.flybys }, modelFlags(report))];
          const target = targetText(system, report);
          if (target.length > 0) out.push('', ...target);
          if (sky) out.push('', ...skyText(system, sky, model));
          for (const n of report.notes) out.push(`note: ${n}`);
          out.push('', ...verdictText(report, truth, failures));
          printText(out.join('\n'));
        }
        return holds ? EXIT_OK : EXIT_NO;
      }),
    );
}
