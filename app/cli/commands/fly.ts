/**
 * `waymark fly PLAN [--model conic|nbody] [--oem FILE] [--csv FILE] [--burns FILE]
 *  [--report FILE] [--step T] [--json]` — flies a plan file and exports what it flew.
 *
 * - `--model conic` (default): patched conics (core/conic/evaluate.ts). `--model nbody`: the
 *   same burns flown through the restricted n-body model (core/nbody/verify.ts, RK45 through
 *   the propagation front door); prints the arrival difference from the patched-conic plan and
 *   which method flew each span, and exports the n-body states.
 * - `--step T` (default 1 h): the fixed step of the exported ephemeris (a duration with a unit,
 *   e.g. 600, 10min, 1h); samples come from each segment's exact conic
 *   (core/conic/ephemerisSampler.ts).
 * - `--oem FILE`: CCSDS OEM (KVN), one metadata block per central-body span (core/io/oem.ts);
 *   `--csv FILE`: ephemeris CSV; `--burns FILE`: burn-table CSV; `--report FILE`: Markdown
 *   budget report. Every file is saved atomically, the previous version kept as FILE.bak,
 *   through the output guard of app/node/files.ts (never over the plan or its system file, a
 *   folder, FIFO or device, or a file that is not a previous export of the same kind). FILE `-`
 *   writes that export to standard output instead (one export at most, not with `--json`;
 *   standard output then carries the export alone, without the text summary), so exports can
 *   be piped: `waymark fly demo.plan.json --csv - | …`.
 * Text output: the flown span, the trajectory events and the margin; `--json`: { model, t0, t1,
 * events, budget, flags, target, files } in SI. Exit code 0 when flown (the margin verdict is
 * `waymark check`'s), 2 for a bad file or option, 3 for a numerical failure.
 */
import type { Command } from 'commander';
import { burnTableCsv, ephemerisCsv } from '../../../core/io/index.ts';
import { writeOem } from '../../../core/io/index.ts';
import { budgetReport } from '../../../core/io/index.ts';
import { parseQuantity } from '../../../core/io/index.ts';
import { InputError } from '../../../core/math/index.ts';
import { sampleEphemeris } from '../../../core/conic/index.ts';
import { evaluate } from '../../../core/conic/index.ts';
import { verifyNBody, type NBodyResult } from '../../../core/nbody/index.ts';
import { nbodyStatesToEphemeris } from '../../../core/nbody/index.ts';
import type { PlanResult } from '../../../core/plan/index.ts';
import { formatCompactDate } from '../../../core/system/index.ts';
import { checkOutputs, loadPlanFile, STDOUT, writeOutput, type InputFile, type OutputTarget } from '../../node/files.ts';
import { EXIT_OK, guard, num, printJson, printText, printWarnings, termSafe } from '../output.ts';
import { FLY_FLAGS } from '../flags.ts';

export const MODELS = ['conic', 'nbody'] as const;
/** Default export step, s. */
export const DEFAULT_STEP = 3600;

/** Burns inside each span, as OEM comments (impulsive burns make the velocity jump there). */
function burnComments(result: PlanResult, spans: { t: Float64Array }[]): string[][] {
  return spans.map((span) => {
    const t0 = span.t[0];
    const t1 = span.t[span.t.length - 1];
    return result.budget.rows
      .filter((r) => r.t >= t0 && r.t <= t1)
      .map((r) => `burn ${r.planEventId} (${r.name}) at t = ${r.t} s, dv ${num(r.dv, 3)} m/s; do not interpolate across it`);
  });
}

export function addFlyCommand(program: Command): void {
  program
    .command('fly')
    .description('fly a plan (patched conics) and export its ephemeris (CCSDS OEM, CSV), burn table and report')
    .argument('<plan>', 'plan file (.plan.json)')
    .option('--model <model>', 'conic (patched conics) or nbody', 'conic')
    .option('--oem <file>', 'write the ephemeris as a CCSDS OEM (KVN)')
    .option('--csv <file>', 'write the ephemeris as CSV')
    .option('--burns <file>', 'write the burn table as CSV')
    .option('--report <file>', 'write the Markdown budget report')
    .option('--step <t>', 'ephemeris step (s, min, h, d)', String(DEFAULT_STEP))
    .option('--json', 'machine-readable output')
    .action((planPath: string, o: { model: string; oem?: string; csv?: string; burns?: string; report?: string; step: string; json?: boolean }) =>
      guard({ json: !!o.json, flags: FLY_FLAGS }, async () => {
        if (!(MODELS as readonly string[]).includes(o.model)) throw new InputError('--model', `must be one of: ${MODELS.join(', ')}`, o.model);
        const step = parseQuantity('--step', o.step, 'time');
        if (!(step > 0)) throw new InputError('--step', 'must be > 0', o.step);
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
        const result = evaluate(system, plan);
        const nbody: NBodyResult | null = o.model === 'nbody' ? verifyNBody(system, plan, result, { samples: false, step }) : null;

        const files: Record<string, string> = {};
        if (o.oem || o.csv) {
          const eph = nbody?.states ? nbodyStatesToEphemeris(nbody.states, result, step) : sampleEphemeris(system, result, { step });
          if (o.oem) {
            const text = writeOem(system, eph, {
              objectName: plan.vehicle.name,
              creationDate: new Date().toISOString().slice(0, 19),
              comments: [`Plan: ${plan.name}; ${nbody ? 'restricted n-body model (RK45)' : 'patched-conic model'}; step ${step} s.`],
              spanComments: burnComments(result, eph.spans),
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
          await save('--burns', o.burns, 'burns-csv', burnTableCsv(result.budget));
          files.burns = o.burns;
        }
        if (o.report) {
          await save('--report', o.report, 'report', budgetReport(system, plan, result));
          files.report = o.report;
        }

        if (o.json) {
          printJson({
            model: nbody ? 'nbody' : result.model,
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
          printText(`flew ${plan.name} (patched conics) from ${formatCompactDate(cal, result.t0)} to ${formatCompactDate(cal, result.t1)}`);
          for (const e of result.events) printText(`  ${formatCompactDate(cal, e.t, { seconds: true })}  ${e.label}`);
          printText(`margin ${num(result.budget.margin, 1)} m/s`);
          if (nbody)
            printNBody(
              system.bodies.map((b) => b.name),
              nbody,
            );
          for (const [kind, path] of Object.entries(files)) printText(`wrote ${kind}: ${path}`);
        }
        return EXIT_OK;
      }),
    );
}

function printNBody(names: string[], nb: NBodyResult): void {
  printText(`\nn-body verification: ${nb.status}${nb.impact ? ` (impact on ${names[nb.impact.body]})` : ''}`);
  for (const s of nb.spans) printText(`  ${s.method.padEnd(16)} ${num(s.t0, 0)} .. ${num(s.t1, 0)} s  ${s.reason}`);
  const a = nb.arrival;
  if (a) {
    const deg = 180 / Math.PI;
    printText(`  arrival at ${names[a.target]}: patched conic vs n-body`);
    printText(`    periapsis altitude  ${num(a.conic.altitude / 1e3, 1)} km  vs ${num(a.nbody.altitude / 1e3, 1)} km`);
    printText(`    inclination         ${num(a.conic.i * deg, 3)} deg vs ${num(a.nbody.i * deg, 3)} deg`);
    printText(`    periapsis time      difference ${num(a.difference.t, 1)} s`);
    printText(`    miss distance       ${num(a.missDistance / 1e3, 1)} km`);
  }
  for (const n of nb.notes) printText(`  note: ${n}`);
}
