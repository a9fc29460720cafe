/**
 * `waymark handoff PLAN [game physics as gamestep] [--tolerance-altitude KM]
 *  [--tolerance-inclination DEG] [--tolerance-time S] [--verify every-step|extrapolated]
 *  [--schedule FILE.json] [--csv FILE.csv] [--length m|km] [--time s|steps] [--axes NAME]
 *  [--runtime FILE.json|FILE.bin] [--partial] [--json]` — retargets the plan's burns for a game's own physics
 * (core/handoff retargetForGame): the burns snapped to whole steps of the game's fixed step and
 * their Δv adjusted until the game's own simulation reaches the plan's goals, then the schedule
 * verified by flying it with the game's physics from the start; writes the burn schedule a game
 * script reads (core/io gameSchedule.ts) as JSON and/or CSV in the game's units and axes, and
 * the runtime ephemeris of the bodies and the ship's path (core/handoff gameRuntimeData,
 * core/runtime format.ts: JSON, or binary when the file name ends in .bin; SI, Waymark's axes).
 *
 * - Physics flags are `gamestep`'s (addPhysicsOptions, physicsFromOptions): --integrator, --dt,
 *   --float32, --rebase [--rebase-distance KM] [--no-rebase-velocity], --gravity, --burns. A
 *   schedule is flown open loop, so there is no --guidance.
 * - Tolerances: --tolerance-altitude in km unless a unit says otherwise (500m),
 *   --tolerance-inclination in degrees unless a unit says otherwise, --tolerance-time in seconds
 *   (or with a unit: 2min); unset, the core's GAME_TOLERANCES (1 km, 0.01°, 60 s).
 * - --verify: the final flight of the schedule at every game step (the default: on the demo at
 *   1/60 s about 1.3e9 steps, a minute or more) or with long coasts extrapolated by the check's
 *   measured-order step scaling (seconds).
 * - Outputs are written only when every goal is met, unless --partial (the exit code is then
 *   still 1); each through the output guard of app/node/files.ts, checked before the work starts
 *   (never over the input plan or its system, nor over a file that is not a schedule of the
 *   same kind), atomically with the previous file kept as FILE.bak. `-` writes to standard
 *   output (not with --json).
 * Text: the physics and tolerances, the verdict, the goals (wanted / flying the plan's own burns
 * in the game / retargeted / tolerance, km, °, calendar dates), the burns (step, calendar time,
 * Δv in the VNB frame, change from the plan), the verification, the recommendation and notes;
 * progress on standard error (a terminal only). `--json`: { plan, system, retarget (the core's
 * result in SI, without the error curves), written }.
 * Exit code: 0 every goal met; 1 not met (the verdict says why and what step or precision
 * would work); 2 a bad option or file, or an output refused; 3 a numerical failure.
 */
import type { Command } from 'commander';
import {
  GAME_AXES_NAMES,
  GAME_SCHEDULE_DEFAULTS,
  gameScheduleCsv,
  gameScheduleJson,
  gameScheduleOptions,
  integratorName,
  parseQuantity,
  type GameScheduleOptions,
} from '../../../core/io/index.ts';
import { GAME_TOLERANCES, gameRuntimeData, retargetForGame, type RetargetGoal, type RetargetResult } from '../../../core/handoff/index.ts';
import { encodeRuntimeBinary, encodeRuntimeJson, type RuntimeEphemeris } from '../../../core/runtime/index.ts';
import type { TargetTolerances } from '../../../core/target/index.ts';
import { InputError } from '../../../core/math/index.ts';
import { formatCompactDate, type StarSystem } from '../../../core/system/index.ts';
import { checkOutputs, loadPlanFile, STDOUT, writeOutput, type InputFile, type OutputTarget } from '../../node/files.ts';
import { HANDOFF_FLAGS, parseAngle } from '../flags.ts';
import { EXIT_NO, EXIT_OK, guard, jsonText, num, printJson, printText, printWarnings, termSafe } from '../output.ts';
import { createProgress, progressEnabled } from '../progress.ts';
import { decimalsFor, fixed } from '../truthText.ts';
import { addPhysicsOptions, parseKm, physicsFromOptions, type PhysicsOptions } from './gamestep.ts';

const DEG = Math.PI / 180;

export const VERIFY_MODES = ['every-step', 'extrapolated'] as const;

interface HandoffOptions extends PhysicsOptions {
  toleranceAltitude?: string;
  toleranceInclination?: string;
  toleranceTime?: string;
  verify: string;
  schedule?: string;
  csv?: string;
  runtime?: string;
  length: string;
  time: string;
  axes: string;
  partial?: boolean;
  json?: boolean;
}

/** The tolerances the options set (the rest stay GAME_TOLERANCES). */
export function handoffTolerances(o: Pick<HandoffOptions, 'toleranceAltitude' | 'toleranceInclination' | 'toleranceTime'>): Partial<TargetTolerances> {
  const t: Partial<TargetTolerances> = {};
  if (o.toleranceAltitude !== undefined) t.altitude = parseKm('--tolerance-altitude', o.toleranceAltitude);
  if (o.toleranceInclination !== undefined) {
    t.i = parseAngle('--tolerance-inclination', o.toleranceInclination);
    if (!(t.i > 0)) throw new InputError('--tolerance-inclination', 'must be an angle > 0 (degrees, or with a unit)', o.toleranceInclination);
  }
  if (o.toleranceTime !== undefined) {
    t.time = parseQuantity('--tolerance-time', o.toleranceTime, 'time');
    if (!(t.time > 0)) throw new InputError('--tolerance-time', 'must be a time > 0 (s, or with a unit)', o.toleranceTime);
  }
  return t;
}

/** --verify's word, or InputError naming the flag. */
export function parseVerify(text: string): (typeof VERIFY_MODES)[number] {
  if (!(VERIFY_MODES as readonly string[]).includes(text)) throw new InputError('--verify', `must be one of: ${VERIFY_MODES.join(', ')}`, text);
  return text as (typeof VERIFY_MODES)[number];
}

/** A time goal (its units are days): shown as calendar dates. */
function isTimeGoal(g: RetargetGoal): boolean {
  return g.units === 'days';
}

/** A goal's value in its display units: a calendar date to the second for times, else `value unit` with the decimals its tolerance needs. */
export function goalValueText(cal: StarSystem['calendar'], g: RetargetGoal, v: number | null): string {
  if (v === null || !Number.isFinite(v)) return '—';
  if (isTimeGoal(g)) return formatCompactDate(cal, v, { seconds: true });
  const scale = g.unitScale ?? 1;
  const units = g.units ?? '';
  return `${fixed(v / scale, decimalsFor(g.tolerance / scale))}${units === '°' || units === '' ? '' : ' '}${units}`;
}

/** A goal's tolerance in display units: seconds for times. */
export function goalToleranceText(g: RetargetGoal): string {
  if (isTimeGoal(g)) return `± ${Number(g.tolerance.toPrecision(3))} s`;
  const scale = g.unitScale ?? 1;
  const units = g.units ?? '';
  return `± ${Number((g.tolerance / scale).toPrecision(3))}${units === '°' || units === '' ? '' : ' '}${units}`;
}

function stepText(dt: number): string {
  const hz = 1 / dt;
  return Math.abs(hz - Math.round(hz)) < 1e-9 && hz >= 1 ? `1/${Math.round(hz)} s` : `${num(dt, 6)} s`;
}

function table(rows: string[][], right: readonly boolean[]): string[] {
  const widths = rows[0].map((_, j) => Math.max(...rows.map((r) => [...r[j]].length)));
  return rows.map((r) =>
    r
      .map((c, j) => {
        const pad = ' '.repeat(widths[j] - [...c].length);
        return right[j] ? pad + c : c + pad;
      })
      .join('  ')
      .trimEnd(),
  );
}

/** The text report of `waymark handoff`. */
export function handoffText(system: StarSystem, planName: string, r: RetargetResult): string {
  const cal = system.calendar;
  const p = r.physics;
  const out: string[] = [];
  out.push(`retargeting for the game — plan ${planName}, system ${system.name}`);
  out.push(
    `physics: ${integratorName(p.integrator)} (${p.integrator}), dt ${stepText(p.dt)}, ${p.precision}, ` +
      `${p.rebase ? `floating origin at ${num(p.rebase.distance / 1000, 1)} km` : 'no floating origin'}, ` +
      `${p.gravity === 'central' ? 'central-body gravity' : 'gravity of all bodies'}, ${p.burns} burns, open loop`,
  );
  out.push(
    `tolerance: altitude ${Number((r.tolerance.altitude / 1000).toPrecision(3))} km, inclination ${Number((r.tolerance.i / DEG).toPrecision(3))}°, ` +
      `time ${Number(r.tolerance.time.toPrecision(3))} s`,
  );
  out.push('');
  out.push(`verdict: ${r.status === 'met' ? 'MET' : 'NOT MET'} — ${r.message}`);
  out.push('');
  out.push('goals');
  const rows: string[][] = [['', 'wanted', "plan's burns in the game", 'retargeted', 'tolerance', '']];
  let leg = '';
  for (const g of r.goals) {
    if (g.leg !== leg) {
      leg = g.leg;
      rows.push([g.leg, '', '', '', '', '']);
    }
    rows.push([
      `  ${g.name}`,
      goalValueText(cal, g, g.wanted),
      goalValueText(cal, g, g.before),
      goalValueText(cal, g, g.after),
      goalToleranceText(g),
      g.met ? '✓' : '✗ not met',
    ]);
  }
  out.push(...table(rows, [false, true, true, true, false, false]).map((l) => `  ${l}`));
  out.push('');
  out.push(`burns (step ${stepText(p.dt)} from step 0 at ${formatCompactDate(cal, r.schedule.t0, { seconds: true })}; Δv in the VNB frame, m/s)`);
  const br: string[][] = [['', 'burn', 'step', 'time', 'Δv V', 'Δv N', 'Δv B', '|Δv|', 'change from plan']];
  r.schedule.burns.forEach((b, k) => {
    const change = Math.hypot(b.change[0], b.change[1], b.change[2]);
    br.push([
      String(k + 1),
      b.name,
      String(b.step),
      formatCompactDate(cal, b.t, { seconds: true }),
      fixed(b.dvBurnFrame[0], 3),
      fixed(b.dvBurnFrame[1], 3),
      fixed(b.dvBurnFrame[2], 3),
      fixed(b.dvMag, 3),
      `${fixed(change, 3)} m/s`,
    ]);
  });
  out.push(...table(br, [true, false, true, false, true, true, true, true, true]).map((l) => `  ${l}`));
  out.push('');
  const v = r.verification;
  const scaled = v.regions.filter((x) => x.how === 'scaled');
  const span = scaled.reduce((s, x) => s + (x.t1 - x.t0), 0);
  out.push(
    `verification: ${v.mode === 'every-step' ? 'every step flown' : 'long coasts extrapolated'}; ${v.steps.toLocaleString('en')} game steps flown` +
      (scaled.length > 0
        ? `, ${scaled.length} region${scaled.length === 1 ? '' : 's'} (${num(span / 86400, 1)} d) extrapolated by step scaling`
        : ', nothing extrapolated'),
  );
  for (const x of v.regions) {
    out.push(
      `  ${formatCompactDate(cal, x.t0)} … ${formatCompactDate(cal, x.t1)}: ${x.how === 'scaled' ? `extrapolated, generated error ${num(x.generatedPosition, 1)} m` : 'flown at every step (the measured order did not hold)'}`,
    );
  }
  if (v.impact) out.push(`  the ship hits ${v.impact.body} at ${formatCompactDate(cal, v.impact.t)}`);
  if (v.divergedAt !== null) out.push(`  the flight diverged at ${formatCompactDate(cal, v.divergedAt)}`);
  if (r.recommendation) out.push(`recommendation: ${r.recommendation.text}`);
  out.push(
    `work: ${r.stats.gameFlights} game flights (${r.stats.gameSteps.toLocaleString('en')} steps, ${r.stats.coarseSteps.toLocaleString('en')} coarse), ${r.stats.referenceFlights} reference flights`,
  );
  for (const n of r.notes) out.push(`note: ${n}`);
  return out.join('\n');
}

/** The outputs the options name, as the output guard sees them. */
function outputsOf(o: HandoffOptions): OutputTarget[] {
  const out: OutputTarget[] = [];
  if (o.schedule !== undefined) out.push({ flag: '--schedule', path: o.schedule, kind: 'schedule-json' });
  if (o.csv !== undefined) out.push({ flag: '--csv', path: o.csv, kind: 'schedule-csv' });
  if (o.runtime !== undefined) out.push({ flag: '--runtime', path: o.runtime, kind: isBinaryPath(o.runtime) ? 'runtime-bin' : 'runtime-json' });
  return out;
}

/** A runtime file in the binary form: its name ends in .bin (standard output gets JSON). */
export function isBinaryPath(path: string): boolean {
  return /\.bin$/i.test(path);
}

/** Each track's fit in one line: the bodies together, then each ship. */
export function runtimeText(data: RuntimeEphemeris): string {
  const bodies = data.tracks.filter((t) => t.kind === 'body');
  const worst = bodies.reduce((m, t) => Math.max(m, t.maxError), 0);
  const tol = bodies.reduce((m, t) => Math.max(m, t.tolerance), 0);
  const parts = [`${bodies.length} bodies (largest fit error ${num(worst, 3)} m, tolerance ${num(tol, 1)} m)`];
  for (const t of data.tracks.filter((x) => x.kind === 'ship')) {
    const fine = t.fine.reduce((m, w) => Math.max(m, w.maxError), 0);
    parts.push(
      `the ship's path "${t.name}" (fit error ${num(t.maxError, 3)} m, tolerance ${num(t.tolerance, 1)} m${t.fine.length ? `; ${num(fine, 3)} m near burns and periapses` : ''})`,
    );
  }
  return `runtime data: ${parts.join(', ')}`;
}

/** The schedule options the flags set, in the core's words (its InputError names the flag through HANDOFF_FLAGS). */
export function scheduleOptionsOf(o: Pick<HandoffOptions, 'length' | 'time' | 'axes'>): GameScheduleOptions {
  return gameScheduleOptions({ length: o.length, time: o.time, axes: o.axes } as Partial<GameScheduleOptions>);
}

/** The result without its error curves (typed arrays of 1,500 samples each: the app draws them, a script has the schedule). */
function withoutCurves(r: RetargetResult): Omit<RetargetResult, 'curves'> {
  const { curves: _curves, ...rest } = r;
  return rest;
}

export function addHandoffCommand(program: Command): void {
  const g = GAME_TOLERANCES;
  const cmd = program
    .command('handoff')
    .description("retarget the plan's burns for a game's own fixed-step physics and write the burn schedule the game flies (JSON, CSV)")
    .argument('<plan>', 'plan file (.plan.json)');
  addPhysicsOptions(cmd)
    .option('--tolerance-altitude <km>', `how close periapsis and apoapsis altitudes must come (km, or with a unit; default ${g.altitude / 1000})`)
    .option('--tolerance-inclination <deg>', `how close inclinations must come (degrees, or with a unit; default ${Number((g.i / DEG).toPrecision(3))})`)
    .option('--tolerance-time <s>', `how close arrival times must come (s, or with a unit; default ${g.time})`)
    .option(
      '--verify <mode>',
      'the final flight of the schedule: every-step (every game step; slow) or extrapolated (long coasts by step scaling)',
      'every-step',
    )
    .option('--schedule <file.json>', 'write the burn schedule as JSON (- for standard output)')
    .option('--csv <file.csv>', 'write the burn schedule as a CSV table (- for standard output)')
    .option('--length <unit>', "the schedule's length unit: m or km", GAME_SCHEDULE_DEFAULTS.length)
    .option('--time <unit>', "the schedule's time unit: s, or steps (times as step counts, velocities per step)", GAME_SCHEDULE_DEFAULTS.time)
    .option('--axes <name>', `the game's axes: ${GAME_AXES_NAMES.join(', ')}`, GAME_SCHEDULE_DEFAULTS.axes)
    .option('--runtime <file>', "write the runtime ephemeris (bodies and the ship's path, Chebyshev pieces): JSON, or binary for a .bin name")
    .option('--partial', 'write the schedule even when not every goal is met (exit code still 1)')
    .option('--json', 'machine-readable output')
    .addHelpText(
      'after',
      '\nExit code: 0 every goal met, 1 not met (the schedule is written only with --partial), 2 a bad option or file, 3 a numerical failure.',
    )
    .action((planPath: string, o: HandoffOptions) =>
      guard({ json: !!o.json, flags: HANDOFF_FLAGS }, async () => {
        const physics = physicsFromOptions(o);
        const tolerance = handoffTolerances(o);
        const verify = parseVerify(o.verify);
        const scheduleOptions = scheduleOptionsOf(o);
        const outputs = outputsOf(o);
        if (o.json && outputs.some((t) => t.path === STDOUT)) {
          const t = outputs.find((x) => x.path === STDOUT)!;
          throw new InputError(t.flag, 'cannot be - (standard output) together with --json: both would go to standard output', STDOUT);
        }
        const loaded = await loadPlanFile(planPath);
        const { system, plan } = loaded;
        const inputs: InputFile[] = [{ path: planPath, what: 'the plan file being retargeted' }];
        if (loaded.systemPath) inputs.push({ path: loaded.systemPath, what: "the plan's system file" });
        await checkOutputs(outputs, { inputs });
        const toStdout = outputs.some((t) => t.path === STDOUT);
        const bar = createProgress('handoff', '‰', progressEnabled(!!o.json || toStdout));
        let r: RetargetResult;
        try {
          r = retargetForGame(system, plan, {
            physics,
            tolerance,
            verify,
            onProgress: (p) => bar.update(p.fraction === null ? 0 : Math.round(p.fraction * 1000), 1000, p.message),
          });
        } finally {
          bar.stop();
        }
        const write = r.status === 'met' || !!o.partial;
        const written: string[] = [];
        const runtime = write && o.runtime !== undefined ? gameRuntimeData(system, plan, r.schedule) : null;
        if (write) {
          for (const t of outputs) {
            const data =
              t.kind === 'schedule-json'
                ? `${jsonText(gameScheduleJson(r.schedule, scheduleOptions))}\n`
                : t.kind === 'schedule-csv'
                  ? gameScheduleCsv(r.schedule, scheduleOptions)
                  : t.kind === 'runtime-bin'
                    ? new Uint8Array(encodeRuntimeBinary(runtime!))
                    : `${JSON.stringify(encodeRuntimeJson(runtime!))}\n`;
            await writeOutput(t, data, { inputs }, { forTerminal: termSafe });
            if (t.path !== STDOUT) written.push(t.path);
          }
        }
        const fits = runtime?.tracks.map((t) => ({ name: t.name, kind: t.kind, tolerance: t.tolerance, maxError: t.maxError })) ?? null;
        if (o.json) {
          printJson({ plan: plan.name, system: system.name, retarget: withoutCurves(r), written, runtime: fits, warnings: loaded.warnings });
        } else if (!toStdout) {
          printWarnings(loaded.warnings);
          printText(handoffText(system, plan.name, r));
          if (runtime) printText(runtimeText(runtime));
          if (written.length > 0) printText(`written: ${written.join(', ')}`);
          else if (outputs.length > 0 && !write) printText('not written: not every goal is met (--partial writes the schedule anyway)');
        } else {
          printWarnings(loaded.warnings);
          if (!write) process.stderr.write(`${termSafe(`waymark: not written: ${r.message} (--partial writes the schedule anyway)`)}\n`);
        }
        return r.status === 'met' ? EXIT_OK : EXIT_NO;
      }),
    );
}
