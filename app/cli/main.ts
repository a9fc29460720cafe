/**
 * The `waymark` command line. From a checkout: `npm run -s cli -- <command> ...`; installed:
 * `waymark <command> ...`. Every command takes `--json` for machine-readable output.
 */
import { Command } from 'commander';
import { addCalcCommands } from './commands/calc.ts';
import { addPlanCommands } from './commands/check.ts';
import { addGamestepCommand } from './commands/gamestep.ts';
import { addStabilityCommand } from './commands/stability.ts';
import { addCorrectCommand } from './commands/correct.ts';
import { addDisperseCommand } from './commands/disperse.ts';
import { addRouteCommand } from './commands/route.ts';
import { addTargetCommand } from './commands/target.ts';
import { addWindowsCommand } from './commands/windows.ts';
import { termSafe } from './output.ts';

export function buildProgram(): Command {
  const program = new Command();
  program
    .name('waymark')
    .description('Mission planning for invented star systems (fictional and educational use only).')
    .version('0.1.0')
    .showHelpAfterError()
    .configureOutput({ writeErr: (s) => process.stderr.write(termSafe(s)) });
  addCalcCommands(program);
  addPlanCommands(program);
  addWindowsCommand(program);
  addGamestepCommand(program);
  addStabilityCommand(program);
  addCorrectCommand(program);
  addTargetCommand(program);
  addRouteCommand(program);
  addDisperseCommand(program);
  return program;
}

const isMain = import.meta.url === `file://${process.argv[1]}` || /app[\\/]cli[\\/](main\.ts|bin\.js)$/.test(process.argv[1] ?? '');
if (isMain) {
  await buildProgram().parseAsync(process.argv);
}
