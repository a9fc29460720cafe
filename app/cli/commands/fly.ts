/**
 * `waymark fly PLAN [--model conic|finite|nbody] [--oem FILE] [--csv FILE] [--burns FILE]
 *  [--report FILE] [--step T] [--json]` — flies a plan file and exports what it flew.
 *
 * - `--model` (default: the plan's truth model, `conic` when it names none), read through
 *   core/target truthReport: `conic` patched conics (core/conic/evaluate.ts), `finite` patched
 *   conics with every burn finite, `nbody` the plan's burns as a timed schedule flown through
 *   the restricted n-body model (core/nbody/verify.ts, through the propagation front door: DOP853 at its default rtol);
 *   n-body prints which method flew each span and the arrival difference from the patched-conic
 *   flight of the same burns, and exports the n-body states. Every model prints the target's
 *   goals as that model reaches them (value, wanted ± tolerance, met).
 * - `--step T`: the fixed step of the exported ephemeris (a duration with a unit, e.g. 600, 10min,
 *   1h); samples come from each segment's exact conic (core/conic/ephemerisSampler.ts). Without
 *   it, each span gets its own step (app/cli/exportStep.ts): its shortest osculating period / 64,
 *   or for a hyperbolic span its duration / 64, so every orbit has at least 64 points; the n-body
 *   model flies one grid at the smallest of those steps and each span keeps the samples its own
 *   step needs.
 * - `--oem FILE`: CCSDS OEM (KVN), one metadata block per central-body span (core/io/oem.ts);
 *   `--csv FILE`: ephemeris CSV; `--burns FILE`: burn-table CSV; `--report FILE`: Markdown
 *   budget report. Every file is saved atomically, the previous version kept as FILE.bak,
 *   through the output guard of app/node/files.ts (never over the plan or its system file, a
 *   folder, FIFO or device, or a file that is not a previous export of the same kind). FILE `-`
 *   writes that export to standard output instead (one export at most, not with `--json`;
 *   standard output then carries the export alone, without the text summary), so exports can
 *   be piped: `waymark fly demo.plan.json --csv - | …`.
 * Text output: the flown span, the trajectory events, the margin and the target's goals;
 * `--json`: { model, label, truthModel, reached, goals, achieved, t0, t1, events, budget, flags,
 * target, nbody, files } in SI. Exit code 0 when flown and the plan's target is reached in the
 * model flown (or the plan has no target); 1 when it is not (the exports are still written: they
 * are what was flown; the margin verdict is `waymark check`'s); 2 for a bad file or option; 3
 * for a numerical failure.
 */
import type { Command } from 'commander';
import { burnTableCsv, ephemerisCsv } from '../../../core/io/index.ts';
import { writeOem } from '../../../core/io/index.ts';
import { budgetReport } from '../../../core/io/index.ts';
import { integratorName, parseQuantity } from '../../../core/io/index.ts';
import { InputError } from '../../../core/math/index.ts';
import { evaluate, sampleEphemeris } from '../../../core/conic/index.ts';
import type { NBodyResult } from '../../../core/nbody/index.ts';
import { nbodyStatesToEphemeris } from '../../../core/nbody/index.ts';
import type { Plan, PlanResult } from '../../../core/plan/index.ts';
import { planTruthModel, TRUTH_MODELS, truthModelLabel } from '../../../core/plan/index.ts';
import { formatCompactDate } from '../../../core/system/index.ts';
import { checkOutputs, loadPlanFile, STDOUT, writeOutput, type InputFile, type OutputTarget } from '../../node/files.ts';
import { EXIT_NO, EXIT_OK, guard, num, printJson, printText, printWarnings, termSafe } from '../output.ts';
import { FLY_FLAGS } from '../flags.ts';
import { defaultSpanSteps, POINTS_PER_ORBIT, sampleBySpan, thinToSpanSteps, type SpanStep } from '../exportStep.ts';
import { modelWords, parseModel, readInModel, targetText } from '../truthText.ts';

/** The models `--model` takes. */
export const MODELS = TRUTH_MODELS;
/** Burns inside each span, as OEM comments (impulsive burns make the velocity jump there), named as on the plan's cards: number and name. */
function burnComments(result: PlanResult, plan: Plan, spans: { t: Float64Array }[]): string[][] {
  return spans.map((span) => {
    const t0 = span.t[0];
    const t1 = span.t[span.t.length - 1];
    return result.budget.rows
      .filter((r) => r.t >= t0 && r.t <= t1)
      .map(
        (r) =>
          `burn ${plan.events.findIndex((e) => e.id === r.planEventId) + 1} ${r.name} at t = ${r.t} s, dv ${num(r.dv, 3)} m/s; do not interpolate across it`,
      );
  });
}

/** The step words of the OEM header comment. */
function stepWords(step: number | null, spans: readonly SpanStep[]): string {
  if (step !== null) return `step ${step} s`;
  return `step per span (its shortest orbital period / ${POINTS_PER_ORBIT}, or a hyperbolic span's duration / ${POINTS_PER_ORBIT}): ${spans.map((s) => `${num(s.step, 1)} s`).join(', ')}`;
}

export function addFlyCommand(program: Command): void {
  program
    .command('fly')
    .description('fly a plan in its truth model (or --model) and export its ephemeris (CCSDS OEM, CSV), burn table and report')
    .argument('<plan>', 'plan file (.plan.json)')
    .option('--model <model>', "conic (patched conics), finite (every burn finite) or nbody (default: the plan's truth model)")
    .option('--oem <file>', 'write the ephemeris as a CCSDS OEM (KVN)')
    .option('--csv <file>', 'write the ephemeris as CSV')
    .option('--burns <file>', 'write the burn table as CSV')
    .option('--report <file>', 'write the Markdown budget report')
    .option(
      '--step <t>',
      `ephemeris step (s, min, h, d); default per span: its orbital period / ${POINTS_PER_ORBIT} (a hyperbolic span: its duration / ${POINTS_PER_ORBIT})`,
    )
    .option('--json', 'machine-readable output')
    .action((planPath: string, o: { model?: string; oem?: string; csv?: string; burns?: string; report?: string; step?: string; json?: boolean }) =>
      guard({ json: !!o.json, flags: FLY_FLAGS }, async () => {
        const asked = o.model === undefined ? undefined : parseModel('--model', o.model);
        const step = o.step === undefined ? null : parseQuantity('--step', o.step, 'time');
        if (step !== null && !(step > 0)) throw new InputError('--step', 'must be > 0', o.step);
        const outputs: OutputTarget[] = (
          [
            ['--oem', o.oem, 'oem'],
            ['--csv', o.csv, 'csv'],
            ['--burns', o.burns, 'burns-csv'],
            ['--report', o.report, 'report'],
          ] as const
        ).flatMap(([flag, path, kind]) => (path === undefined ? [] : [{ flag, path, kind }]));
        const toStdout = outputs.find((t) => t.path === STDOUT);
        if (toStdout && o.json) {
          throw new InputError(toStdout.flag, 'cannot be - (standard output) together with --json: both would go to standard output', STDOUT);
        }
        const loaded = await loadPlanFile(planPath);
        const { system, plan } = loaded;
        const inputs: InputFile[] = [{ path: planPath, what: 'the plan file being flown' }];
        if (loaded.systemPath) inputs.push({ path: loaded.systemPath, what: "the plan's system file" });
        await checkOutputs(outputs, { inputs });
        // Standard output at a terminal shows control characters escaped (names come from files).
        const save = (flag: string, path: string, kind: OutputTarget['kind'], text: string) =>
          writeOutput({ flag, path, kind }, text, { inputs }, { forTerminal: termSafe });
        const truth = planTruthModel(plan);
        const model = asked ?? truth;
        // without --step the n-body flight's one grid takes the smallest span step of the patched-conic flight
        const nbodyStep =
          step ?? (model === 'nbody' && (o.oem || o.csv) ? Math.min(...defaultSpanSteps(evaluate(system, plan)).map((s) => s.step)) : undefined);
        const report = readInModel(system, plan, model, !!o.json || toStdout !== undefined, nbodyStep);
        // the patched-conic flight with the budget in the model flown (n-body: the schedule's, every burn counted)
        const result = { ...report.conic, budget: report.budget };
        const nbody: NBodyResult | null = report.nbody;
        const flown = report.plan;

        const files: Record<string, string> = {};
        if (o.oem || o.csv) {
          const spanSteps = defaultSpanSteps(result);
          const eph = nbody?.states
            ? step !== null
              ? nbodyStatesToEphemeris(nbody.states, result, step)
              : thinToSpanSteps(nbodyStatesToEphemeris(nbody.states, result, nbodyStep as number), nbodyStep as number, spanSteps)
            : step !== null
              ? sampleEphemeris(system, result, { step })
              : sampleBySpan(system, result, spanSteps);
          if (o.oem) {
            const text = writeOem(system, eph, {
              objectName: plan.vehicle.name,
              creationDate: new Date().toISOString().slice(0, 19),
              comments: [
                `Plan: ${plan.name}; ${nbody ? `restricted n-body model (${[...new Set(nbody.spans.map((s) => integratorName(s.method)))].join(', ')})` : `patched-conic model${model === 'finite' ? ', every burn finite' : ''}`}; ${nbody && step !== null ? `step ${step} s` : stepWords(step, spanSteps)}.`,
              ],
              spanComments: burnComments(result, plan, eph.spans),
            });
            await save('--oem', o.oem, 'oem', text);
            files.oem = o.oem;
          }
          if (o.csv) {
            await save('--csv', o.csv, 'csv', ephemerisCsv(system, eph));
            files.csv = o.csv;
          }
        }
        if (o.burns) {
          await save('--burns', o.burns, 'burns-csv', burnTableCsv(result.budget, plan));
          files.burns = o.burns;
        }
        if (o.report) {
          await save('--report', o.report, 'report', budgetReport(system, flown, result));
          files.report = o.report;
        }

        if (o.json) {
          printJson({
            model,
            label: truthModelLabel(model),
            truthModel: truth,
            reached: report.reached,
            goals: report.goals,
            achieved: report.achieved,
            truthNotes: report.notes,
            nbody: nbody
              ? {
                  status: nbody.status,
                  impact: nbody.impact,
                  spans: nbody.spans,
                  stats: nbody.stats,
                  arrival: nbody.arrival,
                  final: nbody.final,
                  notes: nbody.notes,
                }
              : undefined,
            t0: result.t0,
            t1: result.t1,
            events: result.events,
            budget: result.budget,
            flags: result.flags,
            target: result.target,
            warnings: loaded.warnings,
            files,
          });
        } else if (toStdout) {
          printWarnings(loaded.warnings); // standard output carries the export alone
        } else {
          printWarnings(loaded.warnings);
          const cal = system.calendar;
          printText(`flew ${plan.name} in ${modelWords(model, truth)} from ${formatCompactDate(cal, result.t0)} to ${formatCompactDate(cal, result.t1)}`);
          if (nbody) printText('  events of the same burns in patched conics (a comparison; the n-body flight follows):');
          for (const e of result.events) printText(`  ${formatCompactDate(cal, e.t, { seconds: true })}  ${e.label}`);
          printText(`margin ${num(result.budget.margin, 1)} m/s`);
          if (nbody)
            printNBody(
              system.bodies.map((b) => b.name),
              nbody,
            );
          const target = targetText(system, report);
          if (target.length > 0) printText(`\n${target.join('\n')}`);
          for (const n of report.notes) printText(`note: ${n}`);
          for (const [kind, path] of Object.entries(files)) printText(`wrote ${kind}: ${path}`);
        }
        return plan.target && !report.reached ? EXIT_NO : EXIT_OK;
      }),
    );
}

function printNBody(names: string[], nb: NBodyResult): void {
  printText(`\nn-body verification: ${nb.status}${nb.impact ? ` (impact on ${names[nb.impact.body]})` : ''}`);
  for (const s of nb.spans) printText(`  ${integratorName(s.method).padEnd(28)} ${num(s.t0, 0)} .. ${num(s.t1, 0)} s  ${s.reason}`);
  const a = nb.arrival;
  if (a) {
    const deg = 180 / Math.PI;
    printText(`  arrival at ${names[a.target]}: patched conic vs n-body`);
    printText(`    periapsis altitude  ${num(a.conic.altitude / 1e3, 1)} km  vs ${num(a.nbody.altitude / 1e3, 1)} km`);
    printText(`    inclination         ${num(a.conic.i * deg, 3)} deg vs ${num(a.nbody.i * deg, 3)} deg`);
    printText(`    periapsis time      difference ${num(a.difference.t, 1)} s`);
    printText(`    miss distance       ${num(a.missDistance / 1e3, 1)} km`);
  }
}
