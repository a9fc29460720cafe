/**
 * `waymark gamestep PLAN [--integrator NAME] [--dt SECONDS] [--float32] [--rebase] [--sweep]
 *  [--tolerance KM] [--json]` — flies a plan file with a game's own physics and compares it with
 * the reference flight (core/gamestep/check.ts); with --sweep also the largest step per
 * integrator, the cheapest integrator and the float32 / floating-origin verdict
 * (core/gamestep/sweep.ts).
 *
 * Options (defaults shared with the app's Game step panel, core/io/defaults.ts): --integrator
 * takes an id or the slug of its name (verlet or velocity-verlet-leapfrog; default verlet);
 * --dt takes seconds, a fraction (1/60, the default) or a duration with a unit (10ms); --tolerance
 * is in km (or with a unit, 500m; default: the plan target's periapsis tolerance, else 10 km);
 * --gravity central|all, --burns impulsive|spread, --guidance resolve|open-loop,
 * --rebase-distance (default 10 km), --no-rebase-velocity, --coast-step (fly long coasts as a
 * long-step coast at this step instead of extrapolating them; --warp-dt is kept as another name
 * for it), --max-steps (game steps per span before a coast is flown at the coast step or
 * extrapolated), --energy-tolerance (relative drift per orbit), --dt-max (sweep).
 * Text: the physics, a table of spans (flown / long-step / extrapolated, step, errors, energy drift
 * per orbit), the arrival miss, the first time the tolerance is exceeded, the float32 spacings
 * at the mission's distances, the notes; `--json`: { plan, system, check, sweep } in SI with the
 * error series as arrays. Exit code: 0 the check passes (arrival miss and energy drift within
 * tolerance; when the path exceeds the tolerance on the way the verdict says "PASSES AT ARRIVAL
 * ONLY" with the largest error), 1 it does not, 2 bad input or file, 3 numerical failure.
 */
import { type Command, Option } from 'commander';
import { GAME_STEP_DEFAULTS, integratorChoices, integratorName, parseIntegrator, parseQuantity } from '../../../core/io/index.ts';
import { InputError } from '../../../core/math/index.ts';
import {
  DEFAULT_REBASE,
  GAME_INTEGRATORS,
  gameStepCheck,
  type GameIntegrator,
  type GamePhysicsInput,
  type GameStepResult,
} from '../../../core/gamestep/index.ts';
import { gameStepSweep, type SweepResult } from '../../../core/gamestep/index.ts';
import { formatCompactDate } from '../../../core/system/index.ts';
import type { StarSystem } from '../../../core/system/index.ts';
import { loadPlanFile } from '../../node/files.ts';
import { EXIT_NO, EXIT_OK, guard, num, printJson, printText, printWarnings } from '../output.ts';
import { GAMESTEP_FLAGS } from '../flags.ts';
import { createProgress, progressEnabled } from '../progress.ts';

/** The game-physics options `gamestep` and `handoff` share (addPhysicsOptions declares them). */
export interface PhysicsOptions {
  integrator: string;
  dt: string;
  float32?: boolean;
  rebase?: boolean;
  rebaseDistance: string;
  rebaseVelocity: boolean;
  gravity: string;
  burns: string;
  /** Not declared where the command flies open loop only (`handoff`). */
  guidance?: string;
}

interface GamestepOptions extends PhysicsOptions {
  sweep?: boolean;
  tolerance?: string;
  energyTolerance?: string;
  coastStep?: string;
  /** Another name for coastStep. */
  warpDt?: string;
  maxSteps?: string;
  dtMax?: string;
  json?: boolean;
}

/** A step: seconds, a fraction "1/60", or a duration with a unit. */
export function parseStep(field: string, text: string): number {
  const m = /^\s*(\d+(?:\.\d*)?)\s*\/\s*(\d+(?:\.\d*)?)\s*$/.exec(text);
  const v = m ? Number(m[1]) / Number(m[2]) : parseQuantity(field, text, 'time');
  if (!(v > 0) || !Number.isFinite(v)) throw new InputError(field, 'must be a step > 0 (s), e.g. 0.0166, 1/60 or 20ms', text);
  return v;
}

/** A length in km when written without a unit. */
export function parseKm(field: string, text: string): number {
  const v = /^\s*[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?\s*$/i.test(text) ? Number(text) * 1000 : parseQuantity(field, text, 'length');
  if (!(v > 0) || !Number.isFinite(v)) throw new InputError(field, 'must be a length > 0 (km, or with a unit)', text);
  return v;
}

function parsePositive(field: string, text: string, integer = false): number {
  const v = Number(text);
  if (!Number.isFinite(v) || !(v > 0) || (integer && !Number.isInteger(v))) {
    throw new InputError(field, integer ? 'must be a whole number > 0' : 'must be a number > 0', text);
  }
  return v;
}

function choice<T extends string>(field: string, text: string, allowed: readonly T[]): T {
  if (!(allowed as readonly string[]).includes(text)) throw new InputError(field, `must be one of: ${allowed.join(', ')}`, text);
  return text as T;
}

/** The physics the options describe (guidance open loop when the command has no --guidance). */
export function physicsFromOptions(o: PhysicsOptions): GamePhysicsInput {
  const integrator = parseIntegrator<GameIntegrator>('--integrator', o.integrator, GAME_INTEGRATORS);
  const dt = parseStep('--dt', o.dt);
  const rebase = o.rebase ? { distance: parseKm('--rebase-distance', o.rebaseDistance), velocity: o.rebaseVelocity !== false } : null;
  return {
    integrator,
    dt,
    precision: o.float32 ? 'float32' : 'float64',
    rebase,
    gravity: choice('--gravity', o.gravity, ['central', 'all'] as const),
    burns: choice('--burns', o.burns, ['impulsive', 'spread'] as const),
    guidance: choice('--guidance', o.guidance ?? 'open-loop', ['resolve', 'open-loop'] as const),
  };
}

function len(m: number): string {
  if (!Number.isFinite(m)) return '—';
  const a = Math.abs(m);
  if (a >= 1e6) return `${num(m / 1e3, 0)} km`;
  if (a >= 1e3) return `${num(m / 1e3, 2)} km`;
  if (a >= 1) return `${num(m, 2)} m`;
  return `${num(m * 1e3, 3)} mm`;
}

function dur(s: number): string {
  if (s >= 86400) return `${num(s / 86400, 2)} d`;
  if (s >= 3600) return `${num(s / 3600, 2)} h`;
  if (s >= 1) return `${num(s, 2)} s`;
  return `${num(s * 1e3, 3)} ms`;
}

function pad(s: string, n: number, right = false): string {
  return right ? s.padStart(n) : s.padEnd(n);
}

/** The text report of a check. */
export function checkText(system: StarSystem, planName: string, r: GameStepResult): string {
  const cal = system.calendar;
  const p = r.physics;
  const out: string[] = [];
  out.push(`game-step check — plan ${planName}, system ${system.name}`);
  out.push(
    `physics: ${integratorName(p.integrator)} (${p.integrator}), dt ${num(p.dt, 6)} s, ${p.precision}, ` +
      `${p.rebase ? `floating origin at ${len(p.rebase.distance)}${p.rebase.velocity ? ' (position and velocity)' : ' (position)'}` : 'no floating origin'}, ` +
      `${p.gravity === 'central' ? 'central-body gravity' : 'gravity of all bodies'}, ${p.burns} burns, ${p.guidance === 'resolve' ? 're-solved' : 'open-loop'} guidance`,
  );
  out.push(
    `reference: ${integratorName(r.reference.stats.method)} rtol ${r.reference.rtol} (${r.reference.stats.steps} steps); its own error ≈ ${len(r.reference.errorEstimate)} (errors below that are not resolved)`,
  );
  out.push('');
  out.push(
    [
      pad('span', 5),
      pad('about', 9),
      pad('from', 15),
      pad('length', 10, true),
      pad('mode', 13),
      pad('step', 11, true),
      pad('max Δr', 12, true),
      pad('end Δr', 12, true),
      pad('drift/orbit', 12, true),
    ].join(' '),
  );
  for (const s of r.spans) {
    const mode = s.mode === 'extrapolated' && s.extrapolation ? `extrap.(${s.extrapolation.method === 'step-scaling' ? 'step' : 'wind'})` : s.mode;
    out.push(
      [
        pad(String(s.index), 5),
        pad(system.bodies[s.central].name.slice(0, 9), 9),
        pad(formatCompactDate(cal, s.t0), 15),
        pad(dur(s.t1 - s.t0), 10, true),
        pad(mode === 'warp' ? 'long-step' : mode, 13),
        pad(s.region && s.mode === 'warp' ? dur(s.region.dt) : dur(s.dt), 11, true),
        pad(len(s.positionErrorMax), 12, true),
        pad(len(s.positionErrorEnd), 12, true),
        pad(s.driftPerOrbit === null ? '—' : s.driftPerOrbit.toExponential(1), 12, true),
      ].join(' '),
    );
  }
  out.push('');
  const a = r.arrival;
  if (a) {
    const where = a.body >= 0 ? `closest approach to ${system.bodies[a.body].name}` : 'end of plan';
    out.push(
      `arrival (${where}, ${formatCompactDate(cal, a.t)}): miss ${len(a.positionError)}, Δv ${num(a.velocityError, 4)} m/s — ${a.basis}${a.extrapolatedPart > 0 ? ` (extrapolated part ${len(a.extrapolatedPart)})` : ''}`,
    );
  } else {
    out.push('arrival: not reached');
  }
  if (r.end) out.push(`end of plan: miss ${len(r.end.positionError)} (${r.end.basis})`);
  out.push(
    r.firstExceed
      ? `tolerance ${len(r.tolerance)} first exceeded at ${formatCompactDate(cal, r.firstExceed.t)} (${r.firstExceed.basis}, ±${dur(r.firstExceed.resolution)})`
      : `tolerance ${len(r.tolerance)} never exceeded`,
  );
  out.push(
    `energy drift: largest ${r.maxDriftPerOrbit === null ? '—' : r.maxDriftPerOrbit.toExponential(2)} per orbit (tolerance ${r.energyTolerance.toExponential(1)})`,
  );
  out.push(
    `flown ${dur(r.stats.flownTime)}, long-step coast ${dur(r.stats.warpTime)}, extrapolated ${dur(r.stats.extrapolatedTime)}; ${r.stats.gameSteps} game steps (the whole mission at dt: ${r.stats.missionSteps})`,
  );
  // the exit code follows the arrival and the drift; a path beyond the tolerance on the way is said beside it
  let pathMax = 0;
  for (const x of r.series.positionError) if (Number.isFinite(x) && x > pathMax) pathMax = x;
  out.push(
    `verdict: ${
      r.status === 'diverged'
        ? 'DIVERGED'
        : !r.passes
          ? 'FAILS'
          : r.firstExceed
            ? `PASSES AT ARRIVAL ONLY (the path exceeds the tolerance on the way, up to ${len(pathMax)})`
            : 'PASSES'
    }`,
  );
  out.push('');
  out.push("float32 at the mission's distances (binary32 spacing):");
  out.push(
    [
      pad('span', 5),
      pad('distance', 12, true),
      pad('spacing', 11, true),
      pad('step move', 11, true),
      pad('move/spacing', 13, true),
      pad('speed spacing', 14, true),
      pad('kick/spacing', 13, true),
    ].join(' '),
  );
  for (const f of r.float32) {
    out.push(
      [
        pad(String(f.span), 5),
        pad(len(f.distance), 12, true),
        pad(len(f.spacing), 11, true),
        pad(len(f.stepMove), 11, true),
        pad(num(f.stepMoveToSpacing, 3), 13, true),
        pad(`${num(f.speedSpacing * 1e3, 3)} mm/s`, 14, true),
        pad(num(f.stepKickToSpacing, 3), 13, true),
      ].join(' '),
    );
  }
  if (r.physics.rebase) out.push(`with the floating origin the position spacing stays ≤ ${len(r.float32[0]?.rebasedSpacing ?? 0)}`);
  if (r.notes.length > 0) {
    out.push('');
    for (const n of r.notes) out.push(`note: ${n}`);
  }
  return out.join('\n');
}

/** The text report of a sweep. */
export function sweepText(s: SweepResult): string {
  const out: string[] = [];
  out.push(`time-step sweep (tolerance ${len(s.tolerance)}, energy drift ${s.energyTolerance.toExponential(1)} per orbit):`);
  out.push(
    [pad('integrator', 17), pad('step', 11, true), pad('arrival miss', 14, true), pad('drift/orbit', 12, true), pad('evals', 12, true), '  result'].join(' '),
  );
  for (const r of s.rows) {
    out.push(
      [
        pad(r.integrator, 17),
        pad(dur(r.dt), 11, true),
        pad(r.arrivalMiss === null ? '—' : len(r.arrivalMiss), 14, true),
        pad(r.maxDriftPerOrbit === null ? '—' : r.maxDriftPerOrbit.toExponential(1), 12, true),
        pad(String(r.missionEvals), 12, true),
        `  ${r.status === 'diverged' ? 'diverged' : r.passes ? 'passes' : 'fails'}${r.extrapolated ? ' (extrapolated)' : ''}`,
      ].join(' '),
    );
  }
  out.push('');
  for (const b of s.best) out.push(`largest step for ${b.integrator}: ${b.dt === null ? `none down to ${dur(s.ladder[0])}` : dur(b.dt)}`);
  out.push(
    s.cheapest
      ? `cheapest: ${s.cheapest.integrator} at ${dur(s.cheapest.dt)} (${s.cheapest.missionEvals} evaluations over the mission)`
      : 'cheapest: none passes',
  );
  if (s.precision) {
    const v = s.precision.verdict;
    out.push('');
    for (const r of s.precision.rows) {
      out.push(
        `  ${pad(r.precision + (r.rebase ? ` + origin at ${len(r.rebase.distance)}` : ''), 30)} miss ${pad(r.arrivalMiss === null ? '—' : len(r.arrivalMiss), 14, true)}  ${r.passes ? 'passes' : 'fails'}`,
      );
    }
    out.push(
      `precision at ${s.precision.integrator}, ${dur(s.precision.dt)}: ` +
        (v === 'float32'
          ? 'float32 suffices'
          : v === 'float32-rebase'
            ? 'float32 needs a floating origin'
            : v === 'float64'
              ? 'float64 is needed'
              : 'fails even in float64 at this step'),
    );
  }
  for (const n of s.notes) out.push(`note: ${n}`);
  return out.join('\n');
}

/** Declares the game-physics options (PhysicsOptions, read by physicsFromOptions) on a command, with the shared defaults. */
export function addPhysicsOptions(cmd: Command): Command {
  return cmd
    .option('--integrator <name>', `the game's integrator, by id or name: ${integratorChoices(GAME_INTEGRATORS)}`, GAME_STEP_DEFAULTS.integrator)
    .option('--dt <seconds>', 'fixed step: seconds, a fraction (1/60) or with a unit (20ms)', GAME_STEP_DEFAULTS.dt)
    .option('--float32', 'single-precision arithmetic (emulated)')
    .option('--rebase', 'floating origin: re-centre the craft when it strays beyond --rebase-distance')
    .option('--rebase-distance <km>', 'floating-origin threshold (km, or with a unit)', String(DEFAULT_REBASE.distance / 1000))
    .option('--no-rebase-velocity', 're-centre the position only, not the velocity')
    .option('--gravity <model>', 'central (patched conics) or all (every body)', GAME_STEP_DEFAULTS.gravity)
    .option('--burns <model>', 'impulsive (at the nearest step) or spread (over steps at the thrust)', GAME_STEP_DEFAULTS.burns);
}

export function addGamestepCommand(program: Command): void {
  const cmd = program
    .command('gamestep')
    .description("fly a plan with a game's fixed-step physics (integrator, step, float32, floating origin) and compare with the reference flight")
    .argument('<plan>', 'plan file (.plan.json)');
  addPhysicsOptions(cmd)
    .option('--guidance <g>', 'resolve (solved burns re-solved from the game state) or open-loop', GAME_STEP_DEFAULTS.guidance)
    .option('--sweep', 'also sweep the step per integrator and compare float64 / float32 / floating origin')
    .option('--tolerance <km>', 'position tolerance at arrival (km, or with a unit)')
    .option('--energy-tolerance <x>', 'relative energy drift per orbit allowed')
    .option('--coast-step <seconds>', 'fly long coasts as a long-step coast at this step (default: extrapolate them); also --warp-dt')
    .addOption(new Option('--warp-dt <seconds>', 'another name for --coast-step').hideHelp())
    .option('--max-steps <n>', 'game steps per span before a coast is flown at the coast step or extrapolated')
    .option('--dt-max <seconds>', 'largest step of the sweep')
    .option('--json', 'machine-readable output')
    .action((planPath: string, o: GamestepOptions) =>
      guard({ json: !!o.json, flags: GAMESTEP_FLAGS }, async () => {
        const physics = physicsFromOptions(o);
        const tolerance = o.tolerance !== undefined ? parseKm('--tolerance', o.tolerance) : undefined;
        const energyTolerance = o.energyTolerance !== undefined ? parsePositive('--energy-tolerance', o.energyTolerance) : undefined;
        const coastStep = o.coastStep ?? o.warpDt;
        const warpDt = coastStep !== undefined ? parseStep(o.coastStep !== undefined ? '--coast-step' : '--warp-dt', coastStep) : undefined;
        const maxStepsPerSpan = o.maxSteps !== undefined ? parsePositive('--max-steps', o.maxSteps, true) : undefined;
        const dtMax = o.dtMax !== undefined ? parseStep('--dt-max', o.dtMax) : undefined;
        const loaded = await loadPlanFile(planPath);
        const { system, plan } = loaded;
        const bar = createProgress(o.sweep ? 'game-step + sweep' : 'game-step', '‰', progressEnabled(!!o.json));
        let check: GameStepResult;
        let sweep: SweepResult | null = null;
        try {
          check = gameStepCheck(system, plan, {
            physics,
            tolerance,
            energyTolerance,
            warpDt,
            maxStepsPerSpan,
            onProgress: (f) => bar.update(Math.round(f * (o.sweep ? 200 : 1000)), 1000),
          });
          if (o.sweep) {
            sweep = gameStepSweep(system, plan, {
              physics,
              tolerance,
              energyTolerance,
              maxStepsPerSpan,
              dtMax,
              onProgress: (d, t) => bar.update(200 + Math.round((800 * d) / t), 1000),
            });
          }
        } finally {
          bar.stop();
        }
        if (o.json) {
          printJson({ plan: plan.name, system: system.name, check, sweep, warnings: loaded.warnings });
        } else {
          printWarnings(loaded.warnings);
          printText(checkText(system, plan.name, check));
          if (sweep) {
            printText('');
            printText(sweepText(sweep));
          }
        }
        return check.passes ? EXIT_OK : EXIT_NO;
      }),
    );
}
