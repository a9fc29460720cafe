/**
 * `waymark correct PLAN -o NEW_PLAN [--burn ID]... [--time] [--max-iterations N] [--json]` —
 * differential correction in the n-body model (core/nbody/correct.ts): adjusts the chosen
 * burns (default: the mid-course burn) until the n-body flight reaches the patched-conic arrival
 * (periapsis altitude, inclination and time at the target), then writes the corrected plan with
 * the atomic save of app/node/files.ts (the previous NEW_PLAN kept as NEW_PLAN.bak), through its
 * output guard: never over the input plan or its system file (also through a link), a system
 * file, a plan a newer Waymark wrote, or a file that is not a Waymark plan. A plan that names
 * its system file by a relative path gets the path rewritten relative to NEW_PLAN's folder.
 * `-o -` writes the corrected plan to standard output (naming its system file by its absolute
 * path, since the plan may land anywhere; not with `--json`; standard output then carries the
 * plan alone, without the text summary).
 *
 * Exit code: 0 when the correction converged and the plan was written; 3 when it did not
 * converge (the message gives the last residual; nothing is written); 2 for a bad file or option.
 * Text: the iterations, the correction Δv per burn, the arrival reached and the margin before and
 * after; `--json`: the same in SI.
 */
import { dirname, relative, resolve } from 'node:path';
import type { Command } from 'commander';
import { InputError } from '../../../core/math/index.ts';
import { correctPlan } from '../../../core/nbody/index.ts';
import { resolveBurnsForSave, serializePlanFile, type PlanSystemRef } from '../../../core/io/index.ts';
import { checkOutputs, loadPlanFile, STDOUT, writeOutput, type InputFile, type OutputTarget } from '../../node/files.ts';
import { EXIT_OK, guard, num, printJson, printText, printWarnings, termSafe, vecText } from '../output.ts';
import { CORRECT_FLAGS } from '../flags.ts';

const DEG = 180 / Math.PI;

/** The system reference to write beside `out`: relative paths re-rooted at out's folder. */
export function systemRefFor(out: string, ref: PlanSystemRef, systemPath: string | null): PlanSystemRef {
  if (ref.kind !== 'path' || systemPath === null) return ref;
  if (out === STDOUT) return { kind: 'path', path: resolve(systemPath) };
  const rel = relative(dirname(resolve(out)), systemPath)
    .split('\\')
    .join('/');
  return { kind: 'path', path: rel };
}

function collect(value: string, previous: string[] = []): string[] {
  return [...previous, value];
}

export function addCorrectCommand(program: Command): void {
  program
    .command('correct')
    .description('correct burns in the n-body model so the arrival matches the patched-conic plan; write the corrected plan')
    .argument('<plan>', 'plan file (.plan.json)')
    .requiredOption('-o, --output <file>', 'where to write the corrected plan')
    .option('--burn <id>', 'burn to correct (repeatable; default: the mid-course burn)', collect)
    .option('--time', "also correct the (first) burn's time")
    .option('--max-iterations <n>', 'Newton iterations at most', '15')
    .option('--json', 'machine-readable output')
    .action((planPath: string, o: { output: string; burn?: string[]; time?: boolean; maxIterations: string; json?: boolean }) =>
      guard({ json: !!o.json, flags: CORRECT_FLAGS }, async () => {
        const maxIterations = Number(o.maxIterations);
        if (!Number.isInteger(maxIterations) || maxIterations < 1) throw new InputError('--max-iterations', 'must be a whole number >= 1', o.maxIterations);
        if (o.output === STDOUT && o.json) {
          throw new InputError('--output', 'cannot be - (standard output) together with --json: both would go to standard output', STDOUT);
        }
        const loaded = await loadPlanFile(planPath);
        const { system } = loaded;
        const inputs: InputFile[] = [{ path: planPath, what: 'the plan file being corrected' }];
        if (loaded.systemPath) inputs.push({ path: loaded.systemPath, what: "the plan's system file" });
        const target: OutputTarget = { flag: '--output', path: o.output, kind: 'plan' };
        await checkOutputs([target], { inputs });
        const c = correctPlan(system, loaded.plan, { burns: o.burn, time: !!o.time, maxIterations });
        const text = serializePlanFile(
          c.plan,
          systemRefFor(o.output, loaded.systemRef, loaded.systemPath),
          // the burns as solved, written beside their settings (derived; checked on open)
          resolveBurnsForSave(system, c.plan),
        );
        await writeOutput(target, text, { inputs }, { forTerminal: termSafe });
        if (o.json) {
          printJson({
            plan: loaded.plan.name,
            converged: true,
            iterations: c.iterations,
            flights: c.flights,
            history: c.history,
            burns: c.burns,
            correctionDv: c.correctionDv,
            margin: c.margin,
            desired: c.desired,
            achieved: c.achieved,
            notes: c.notes,
            file: o.output,
          });
        } else if (o.output === STDOUT) {
          printWarnings(loaded.warnings); // standard output carries the plan alone
        } else {
          printWarnings(loaded.warnings);
          const out: string[] = [];
          out.push(
            `correction of ${loaded.plan.name} in the n-body model: converged in ${c.iterations} iteration${c.iterations === 1 ? '' : 's'} (${c.flights} n-body flights)`,
          );
          out.push('  iter   Δ periapsis km   Δ incl deg   Δ time s');
          for (const h of c.history)
            out.push(
              `  ${String(h.iteration).padStart(4)}   ${num(h.altitude / 1e3, 4).padStart(14)}   ${num(h.i * DEG, 6).padStart(10)}   ${num(h.t, 3).padStart(8)}`,
            );
          for (const b of c.burns) {
            out.push(
              `burn ${b.planEventId}: Δv ${vecText(b.dvBefore, 1, 3)} → ${vecText(b.dvAfter, 1, 3)} m/s (inertial), change ${num(b.changeMagnitude, 3)} m/s`,
            );
          }
          const tb = c.plan.target ? system.bodies[system.indexById[c.plan.target.body]] : null;
          out.push(
            `arrival${tb ? ` at ${tb.name}` : ''}: periapsis ${num(c.achieved.altitude / 1e3, 3)} km (wanted ${num(c.desired.altitude / 1e3, 3)}), ` +
              `inclination ${num(c.achieved.i * DEG, 4)}° (wanted ${num(c.desired.i * DEG, 4)})`,
          );
          out.push(`correction Δv ${num(c.correctionDv, 3)} m/s; margin ${num(c.margin.before, 1)} → ${num(c.margin.after, 1)} m/s`);
          for (const n of c.notes) out.push(`note: ${n}`);
          out.push(`wrote ${o.output}`);
          printText(out.join('\n'));
        }
        return EXIT_OK;
      }),
    );
}
