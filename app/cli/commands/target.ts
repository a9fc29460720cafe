/**
 * `waymark target PLAN -o NEW_PLAN [--model conic|finite|nbody] [--altitude-tolerance D]
 *  [--inclination-tolerance A] [--e-tolerance E] [--time-tolerance T] [--max-change DV]
 *  [--max-iterations N] [--max-flights N] [--free-arrival] [--vary KIND:EVENT]... [--partial]
 *  [--json]` — targets the plan in a model (core/target targetPlan): leg by leg, the burns' Δv
 * components (in each burn's own frame) are adjusted until the flight in that model meets the
 * leg's goals (an arrival's B-plane point, then the plan's target orbit). The goals default to
 * the plan's target and the arrivals its patched-conic flight aims at; the controls to the plan's
 * burns' Δv.
 *
 * - Each arrival's periapsis time is held as the patched-conic plan flies it; `--free-arrival` lets
 *   it come earlier or later (cheaper; in n-body the later schedule moves with it).
 * - `--vary KIND:EVENT` (repeatable) adds a timing control to the leg it acts on: `time:BURN` a
 *   burn's time, `arrival:BURN` a transfer burn's arrival time (patched-conic models only),
 *   `duration:COAST` a coast's duration.
 *
 * - `--model` (default: the plan's truth model, `conic` when it names none): `conic` patched
 *   conics as each burn's mode says, `finite` patched conics with every burn finite, `nbody` the
 *   restricted n-body model (the plan becomes a timed burn schedule).
 * - Tolerances are quantities with an optional unit (SI without one, as everywhere on the command
 *   line): `--altitude-tolerance 0.1km`, `--inclination-tolerance 0.001deg`, `--time-tolerance 10s`;
 *   unset, the core's defaults (DEFAULT_TARGET_TOLERANCES). `--max-change` bounds each Δv
 *   component's change from where it starts (m/s, or with a unit: 0.2km/s).
 * - NEW_PLAN is the targeted plan, its `truth_model` the model targeted in, so `waymark check
 *   NEW_PLAN` and `waymark fly NEW_PLAN` read it in that model. It is written only when every
 *   goal is met, unless `--partial` (then the closest plan found is written too, and the exit
 *   code is still 1). It is saved like `correct`'s output: atomically, the previous file kept as
 *   NEW_PLAN.bak, through the output guard of app/node/files.ts (checked before the work starts:
 *   never over the input plan or its system file, a system file, a plan a newer Waymark wrote, or
 *   a file that is not a Waymark plan); a system file named by a relative path is re-rooted at
 *   NEW_PLAN's folder. `-o -` writes the plan to standard output (its system by absolute path;
 *   not with `--json`; standard output then carries the plan alone, the summary goes nowhere and
 *   a plan not written is explained on standard error).
 * - A progress bar on a terminal's standard error: the leg, the flights flown and the residual
 *   (goal misses in tolerance units; every goal is met when each is within 1).
 *
 * Exit code: 0 every goal met (the plan written); 1 not every goal met (the report says which
 * goal and why; the plan written only with `--partial`); 2 a bad file or option, or an output
 * refused; 3 a numerical failure (a flight the integrator could not fly).
 * Text: per leg its goals (value, wanted ± tolerance, met), the burns' Δv components before →
 * after in the burn frame's axes, iterations, flights and residuals; then the plan's Δv and
 * margin before and after, and the verdict. `--json`: the core's report in SI.
 */
import type { Command } from 'commander';
import { parseQuantity, resolveBurnsForSave, serializePlanFile } from '../../../core/io/index.ts';
import { InputError } from '../../../core/math/index.ts';
import { planTruthModel, truthModelLabel, type TruthModel } from '../../../core/plan/index.ts';
import {
  DEFAULT_TARGET_TOLERANCES,
  targetPlan,
  type ArrivalGoal,
  type EventTimeControl,
  type FailureReason,
  type TargetResult,
  type TargetTolerances,
} from '../../../core/target/index.ts';
import { checkOutputs, loadPlanFile, STDOUT, writeOutput, type InputFile, type OutputTarget } from '../../node/files.ts';
import { parseAngle, TARGET_FLAGS } from '../flags.ts';
import { EXIT_NO, EXIT_OK, guard, printJson, printText, printWarnings, termSafe } from '../output.ts';
import { createProgress, progressEnabled } from '../progress.ts';
import { fixed, goalLines, parseModel } from '../truthText.ts';
import { systemRefFor } from './correct.ts';
import { parseTime } from './windows.ts';
import type { StarSystem, SystemCalendar } from '../../../core/system/index.ts';

const DEG = Math.PI / 180;

/** `--vary` words → the core's timing controls. */
export const VARY_KINDS: Readonly<Record<string, EventTimeControl['kind']>> = {
  time: 'burn-time',
  arrival: 'transfer-arrival',
  duration: 'coast-duration',
};

/** `--vary KIND:EVENT` values → timing controls; InputError naming `--vary` when a value is not of that form. */
export function parseVary(values: readonly string[]): { kind: EventTimeControl['kind']; eventId: string }[] {
  return values.map((v) => {
    const m = /^([a-z]+):(.+)$/.exec(v);
    const kind = m ? VARY_KINDS[m[1]] : undefined;
    if (!m || !kind) throw new InputError('--vary', `must be KIND:EVENT with KIND one of: ${Object.keys(VARY_KINDS).join(', ')} (e.g. time:mid-course)`, v);
    return { kind, eventId: m[2] };
  });
}

/** `--goal` words → the core's arrival goal kinds, with the dimension of their value. */
export const GOAL_KINDS: Readonly<Record<string, { kind: ArrivalGoal['kind']; dim: 'length' | 'angle' | 'date' }>> = {
  periapsis: { kind: 'periapsis-altitude', dim: 'length' },
  inclination: { kind: 'inclination', dim: 'angle' },
  entry: { kind: 'soi-entry-time', dim: 'date' },
};

/**
 * `--goal KIND:BODY=VALUE` values → arrival goals: `periapsis:ochre=600km` (altitude; a bare number
 * is metres), `inclination:ochre=35deg` (a bare number is degrees, `0.6rad` radians), `entry:ochre=413-120T06:00` (a
 * calendar date, or a time from the epoch such as 401d). InputError naming `--goal` otherwise.
 */
export function parseGoals(values: readonly string[], cal: SystemCalendar, system?: StarSystem): ArrivalGoal[] {
  return values.map((v) => {
    const m = /^([a-z]+):([^=]+)=(.+)$/.exec(v.trim());
    const k = m ? GOAL_KINDS[m[1]] : undefined;
    if (!m || !k) {
      throw new InputError('--goal', `must be KIND:BODY=VALUE with KIND one of: ${Object.keys(GOAL_KINDS).join(', ')} (e.g. periapsis:ochre=600km)`, v);
    }
    const wanted = k.dim === 'date' ? parseTime(cal, '--goal', m[3]) : k.dim === 'angle' ? parseAngle('--goal', m[3]) : parseQuantity('--goal', m[3], k.dim);
    // a body named in any case (Ochre, OCHRE) is the system's id; an unknown one is left for the plan's check to name
    const typed = m[2].trim().toLowerCase();
    const named = system?.bodies.find((b) => b.id.toLowerCase() === typed || b.name.toLowerCase() === typed);
    return { kind: k.kind, body: named ? named.id : m[2], wanted };
  });
}

function collect(value: string, previous: string[] = []): string[] {
  return [...previous, value];
}

interface TargetCliOptions {
  output: string;
  model?: string;
  altitudeTolerance?: string;
  inclinationTolerance?: string;
  eTolerance?: string;
  timeTolerance?: string;
  maxChange?: string;
  maxIterations?: string;
  maxFlights?: string;
  freeArrival?: boolean;
  vary?: string[];
  goal?: string[];
  partial?: boolean;
  json?: boolean;
}

function wholeNumber(flag: string, text: string): number {
  const n = Number(text);
  if (!Number.isInteger(n) || n < 1) throw new InputError(flag, 'must be a whole number >= 1', text);
  return n;
}

function positive(flag: string, text: string, dim: 'length' | 'angle' | 'none' | 'time' | 'speed'): number {
  const v = parseQuantity(flag, text, dim);
  if (!(v > 0)) throw new InputError(flag, 'must be > 0', text);
  return v;
}

/** The tolerances the options set (the rest stay the core's defaults). */
export function tolerancesFrom(o: TargetCliOptions): Partial<TargetTolerances> {
  const t: Partial<TargetTolerances> = {};
  if (o.altitudeTolerance !== undefined) t.altitude = positive('--altitude-tolerance', o.altitudeTolerance, 'length');
  if (o.inclinationTolerance !== undefined) {
    t.i = parseAngle('--inclination-tolerance', o.inclinationTolerance);
    if (!(t.i > 0)) throw new InputError('--inclination-tolerance', 'must be > 0', o.inclinationTolerance);
  }
  if (o.eTolerance !== undefined) t.e = positive('--e-tolerance', o.eTolerance, 'none');
  if (o.timeTolerance !== undefined) t.time = positive('--time-tolerance', o.timeTolerance, 'time');
  return t;
}

/** How far a leg has come, 0..1: the residual's fall on a log scale from its first value to 1 (every goal met). */
export function legFraction(first: number, residual: number): number {
  if (!(first > 1) || !(residual > 0)) return residual <= 1 ? 1 : 0;
  return Math.min(1, Math.max(0, Math.log(first / residual) / Math.log(first)));
}

/** Why a leg was not met, in a few words (the leg's message says more). */
const FAILURE_WORDS: Record<FailureReason, string> = {
  'no-sensitivity': 'no change of the burns moves the goals closer',
  bound: 'a burn is held at the largest change allowed',
  propellant: 'a burn is short of propellant',
  'no-arrival': 'the flight does not arrive where the goal is measured',
  iterations: 'the iteration or flight budget ran out',
};

/** Decimals of a control shown in units of `scale` SI: 1 mm/s for Δv, about 1 s for times in hours or days. */
function controlDecimals(scale: number): number {
  return scale >= 86400 ? 5 : scale >= 3600 ? 4 : 3;
}

/** The text report of `waymark target`. */
export function targetText(planName: string, truth: TruthModel, r: TargetResult): string {
  const out: string[] = [];
  const n = r.legs.length;
  const was = truth === r.model ? '' : `; the plan's truth model was ${truthModelLabel(truth)}`;
  out.push(`targeting ${planName} in ${truthModelLabel(r.model)} (${n} leg${n === 1 ? '' : 's'}${was})`);
  r.legs.forEach((leg, k) => {
    out.push('');
    const res = leg.residuals.length > 0 ? `; residual ${leg.residuals[0].toExponential(1)} → ${leg.residuals[leg.residuals.length - 1].toExponential(1)}` : '';
    const verdict = leg.status === 'converged' ? 'every goal met' : `NOT MET (${leg.failure ? FAILURE_WORDS[leg.failure] : leg.status})`;
    out.push(
      `leg ${k + 1}/${n} ${leg.name}: ${verdict} — ${leg.iterations} iteration${leg.iterations === 1 ? '' : 's'}, ${leg.flights} flight${leg.flights === 1 ? '' : 's'}${res}`,
    );
    const width = Math.max(0, ...leg.controls.map((c) => c.name.length), ...leg.goals.map((g) => g.name.length));
    out.push(...goalLines(leg.goals, '  ', width));
    for (const c of leg.controls) {
      const scale = c.unitScale || 1;
      const d = controlDecimals(scale);
      const change = (c.after - c.before) / scale;
      out.push(
        `  ${c.name.padEnd(width)}  ${fixed(c.before / scale, d).padStart(16)} → ${fixed(c.after / scale, d).padStart(9)} ${c.units}  change ${change >= 0 ? '+' : '−'}${fixed(Math.abs(change), d)}`,
      );
    }
    if (leg.shift !== 0)
      out.push(`  the later schedule moved ${leg.shift >= 0 ? 'later' : 'earlier'} by ${fixed(Math.abs(leg.shift) / 3600, 2)} h with this arrival`);
    if (leg.status !== 'converged') out.push(`  ${leg.message}`);
  });
  out.push('');
  out.push(`Δv      ${fixed(r.dv.before, 1)} → ${fixed(r.dv.after, 1)} m/s (added ${r.dv.added >= 0 ? '+' : '−'}${fixed(Math.abs(r.dv.added), 1)} m/s)`);
  out.push(`margin  ${fixed(r.margin.before, 1)} → ${fixed(r.margin.after, 1)} m/s`);
  const failed = r.legs.filter((l) => l.status !== 'converged').map((l) => l.name);
  out.push(r.status === 'met' ? r.message : `Not every goal met in ${truthModelLabel(r.model)}: ${failed.join(', ') || 'see above'}.`);
  return out.join('\n');
}

export function addTargetCommand(program: Command): void {
  const d = DEFAULT_TARGET_TOLERANCES;
  program
    .command('target')
    .description('adjust the burns until the plan meets its goals in a model (conic, finite, nbody); write the targeted plan')
    .argument('<plan>', 'plan file (.plan.json)')
    .requiredOption('-o, --output <file>', 'where to write the targeted plan (- for standard output)')
    .option('--model <model>', "conic, finite or nbody (default: the plan's truth model)")
    .option('--altitude-tolerance <d>', `how close altitudes must come (m, or with a unit: 0.1km; default ${d.altitude / 1e3}km)`)
    .option(
      '--inclination-tolerance <a>',
      `how close inclinations must come (degrees unless a unit says otherwise: 0.001, 1e-5rad; default ${Number((d.i / DEG).toPrecision(3))}deg)`,
    )
    .option('--e-tolerance <e>', `how close eccentricities must come (default ${d.e})`)
    .option('--time-tolerance <t>', `how close arrival times must come (s, min, h, d; default ${d.time}s)`)
    .option('--max-change <dv>', "largest change of any burn's Δv component (m/s, or with a unit; default unbounded)")
    .option('--max-iterations <n>', 'iterations per leg at most (default 30)')
    .option('--max-flights <n>', 'flights per leg at most (default 400)')
    .option('--free-arrival', "let each arrival come earlier or later than the patched-conic plan's (cheaper; the later schedule moves with it)")
    .option('--vary <kind:event>', "also vary an event's timing: time:BURN, arrival:BURN (a transfer's arrival) or duration:COAST (repeatable)", collect)
    .option(
      '--goal <kind:body=value>',
      "an arrival goal in place of the patched-conic plan's: periapsis:BODY=ALT (600km), inclination:BODY=ANGLE (35deg) or entry:BODY=DATE (SOI entry; 413-120T06:00) (repeatable)",
      collect,
    )
    .option('--partial', 'write the closest plan found even when not every goal is met (exit code still 1)')
    .option('--json', 'machine-readable output')
    .action((planPath: string, o: TargetCliOptions) =>
      guard({ json: !!o.json, flags: TARGET_FLAGS }, async () => {
        const model = o.model === undefined ? undefined : parseModel('--model', o.model);
        const tolerance = tolerancesFrom(o);
        const maxChange = o.maxChange === undefined ? undefined : positive('--max-change', o.maxChange, 'speed');
        const maxIterations = o.maxIterations === undefined ? undefined : wholeNumber('--max-iterations', o.maxIterations);
        const maxFlights = o.maxFlights === undefined ? undefined : wholeNumber('--max-flights', o.maxFlights);
        const timeControls = parseVary(o.vary ?? []);
        if (o.output === STDOUT && o.json) {
          throw new InputError('--output', 'cannot be - (standard output) together with --json: both would go to standard output', STDOUT);
        }
        const loaded = await loadPlanFile(planPath);
        const { system, plan } = loaded;
        const goals = parseGoals(o.goal ?? [], system.calendar, system);
        const inputs: InputFile[] = [{ path: planPath, what: 'the plan file being targeted' }];
        if (loaded.systemPath) inputs.push({ path: loaded.systemPath, what: "the plan's system file" });
        const target: OutputTarget = { flag: '--output', path: o.output, kind: 'plan' };
        await checkOutputs([target], { inputs }); // a refusal comes before the work, not after

        const bar = createProgress('target', '‰', progressEnabled(!!o.json));
        const first = new Map<number, number>();
        let r: TargetResult;
        try {
          r = targetPlan(system, plan, {
            model,
            tolerance,
            maxChange,
            maxIterations,
            maxFlights,
            arrivalTime: !o.freeArrival,
            timeControls,
            goals,
            onProgress: (p) => {
              if (!first.has(p.leg)) first.set(p.leg, p.residual);
              const done = (p.leg - 1 + legFraction(first.get(p.leg)!, p.residual)) / p.legs;
              bar.update(
                Math.round(1000 * done),
                1000,
                termSafe(`leg ${p.leg}/${p.legs} ${p.legName} · ${p.flights} flights · residual ${p.residual.toExponential(1)}`),
              );
            },
          });
        } finally {
          bar.stop();
        }
        const met = r.status === 'met';
        const write = met || !!o.partial;
        if (write) {
          const text = serializePlanFile(
            r.plan,
            systemRefFor(o.output, loaded.systemRef, loaded.systemPath),
            // the burns as solved, written beside their settings (derived; checked on open)
            resolveBurnsForSave(loaded.system, r.plan),
          );
          await writeOutput(target, text, { inputs }, { forTerminal: termSafe });
        }
        const notWritten = write ? null : `not written: not every goal is met (--partial writes the closest plan found to ${o.output})`;
        if (o.json) {
          printJson({
            plan: plan.name,
            model: r.model,
            label: truthModelLabel(r.model),
            truthModelBefore: planTruthModel(plan),
            status: r.status,
            met,
            legs: r.legs,
            iterations: r.iterations,
            flights: r.flights,
            dv: r.dv,
            margin: r.margin,
            message: r.message,
            file: write ? o.output : null,
            warnings: loaded.warnings,
          });
        } else if (o.output === STDOUT) {
          printWarnings(loaded.warnings); // standard output carries the plan alone
          if (notWritten) process.stderr.write(`${termSafe(`waymark: ${r.message}\nwaymark: ${notWritten}`)}\n`);
        } else {
          printWarnings(loaded.warnings);
          printText(targetText(plan.name, planTruthModel(plan), r));
          printText(notWritten ?? `wrote ${o.output} (truth model: ${truthModelLabel(r.model)})${met ? '' : ' — the closest plan found, not every goal met'}`);
        }
        return met ? EXIT_OK : EXIT_NO;
      }),
    );
}
