/**
 * The `waymark` command line. From a checkout: `npm run -s cli -- <command> ...`; installed:
 * `waymark <command> ...`. Every command takes `--json` for machine-readable output.
 *
 * Exit codes: 0 done, 1 "the answer is no", 2 a usage error (unknown option or command, missing
 * required option or argument, bad option value) or a bad file, 3 a numerical failure. Commander's
 * own usage errors are caught here (exitOverride) and mapped to 2, with commander's message,
 * which names the option and what is wrong with it.
 */
import { Command, CommanderError } from 'commander';
import { addCalcCommands } from './commands/calc.ts';
import { addPlanCommands } from './commands/check.ts';
import { addGamestepCommand } from './commands/gamestep.ts';
import { addHandoffCommand } from './commands/handoff.ts';
import { addStabilityCommand } from './commands/stability.ts';
import { addCorrectCommand } from './commands/correct.ts';
import { addDisperseCommand } from './commands/disperse.ts';
import { addRouteCommand } from './commands/route.ts';
import { addSequenceCommand } from './commands/sequence.ts';
import { addTargetCommand } from './commands/target.ts';
import { addWindowsCommand } from './commands/windows.ts';
import { addMapCommand } from './commands/map.ts';
import { addCalendarCommand } from './commands/calendar.ts';
import { EXIT_BAD_INPUT, EXIT_OK, termSafe } from './output.ts';
import { addAllExamples } from './examples.ts';

export function buildProgram(): Command {
  const program = new Command();
  program
    .name('waymark')
    .description('Mission planning for invented star systems (fictional and educational use only).')
    .version('0.1.0')
    .showHelpAfterError('(add --help for usage and an example)')
    .configureOutput({ writeErr: (s) => process.stderr.write(termSafe(s)) })
    // inherited by every sub-command added below: usage errors throw instead of exiting (see runProgram)
    .exitOverride();
  addCalcCommands(program);
  addPlanCommands(program);
  addWindowsCommand(program);
  addSequenceCommand(program);
  addGamestepCommand(program);
  addHandoffCommand(program);
  addStabilityCommand(program);
  addCorrectCommand(program);
  addTargetCommand(program);
  addRouteCommand(program);
  addDisperseCommand(program);
  addMapCommand(program);
  addCalendarCommand(program);
  addAllExamples(program);
  return program;
}

/**
 * The exit code of a commander stop: 0 for --help and --version, 2 for every usage error
 * (commander.unknownOption, unknownCommand, missingMandatoryOptionValue, optionMissingArgument,
 * missingArgument, excessArguments, invalidArgument, and a command group called without a
 * sub-command, which commander reports as help shown as an error).
 */
export function usageExitCode(err: CommanderError): number {
  return err.exitCode === 0 ? EXIT_OK : EXIT_BAD_INPUT;
}

/** Parses argv and runs the command; commander's usage errors set exit code 2 (its message is already on stderr). */
export async function runProgram(argv: readonly string[], program: Command = buildProgram()): Promise<void> {
  try {
    await program.parseAsync(argv as string[]);
  } catch (err) {
    if (!(err instanceof CommanderError)) throw err;
    process.exitCode = usageExitCode(err);
  }
}

const isMain = import.meta.url === `file://${process.argv[1]}` || /app[\\/]cli[\\/](main\.ts|bin\.js)$/.test(process.argv[1] ?? '');
if (isMain) {
  await runProgram(process.argv);
}
