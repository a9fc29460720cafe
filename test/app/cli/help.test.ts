/**
 * Every command's --help ends with at least one example, and every example is a command line the
 * program accepts: it is run through the program's own parser up to the action, which a
 * preAction hook stops (a dry run: nothing is computed or written).
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import type { Command } from 'commander';
import { describe, expect, it } from 'vitest';
import { allCommands, commandPath, exampleArgs, examplesOf } from '../../../app/cli/examples.ts';
import { buildProgram } from '../../../app/cli/main.ts';
import { ROOT } from './runCli.ts';

class DryRun extends Error {
  constructor(readonly command: Command) {
    super('dry run');
  }
}

/** A program whose output goes nowhere and whose actions never run (the preAction hook throws). */
function dryProgram(): Command {
  const program = buildProgram();
  for (const c of [program, ...allCommands(program)]) c.configureOutput({ writeOut: () => {}, writeErr: () => {} });
  program.hook('preAction', (_root, action) => {
    throw new DryRun(action);
  });
  return program;
}

/** The help text a command prints, the text added after the options included. */
function helpOf(cmd: Command): string {
  let out = '';
  cmd.configureOutput({ writeOut: (s) => (out += s), writeErr: (s) => (out += s) });
  cmd.outputHelp();
  return out;
}

describe('--help examples', () => {
  const commands = allCommands(buildProgram());

  it('the program has the commands the README lists (so the checks below cover something)', () => {
    const paths = commands.map(commandPath);
    for (const p of ['calc kepler', 'calc elements', 'check', 'fly', 'windows', 'route', 'target', 'disperse', 'stability', 'gamestep', 'correct'])
      expect(paths).toContain(p);
  });

  it.each(commands.map((c) => [commandPath(c), c] as const))('%s: --help ends with at least one example', (_path, cmd) => {
    const examples = examplesOf(cmd);
    expect(examples.length).toBeGreaterThan(0);
    const help = helpOf(cmd).trimEnd();
    expect(help).toMatch(/\nExamples?:\n/);
    expect(help.endsWith(`$ ${examples[examples.length - 1]}`)).toBe(true);
  });

  const all = commands.flatMap((c) => examplesOf(c).map((e) => [commandPath(c), e] as const));
  it.each(all)('%s: example parses and reaches the action: %s', async (path, example) => {
    const args = exampleArgs(example);
    expect(args.slice(0, path.split(' ').length).join(' ')).toBe(path);
    let reached: Command | null = null;
    try {
      await dryProgram().parseAsync(['node', 'waymark', ...args]);
    } catch (err) {
      if (!(err instanceof DryRun)) throw err;
      reached = err.command;
    }
    expect(reached).not.toBeNull();
    // a group's example runs one of its sub-commands
    expect(commandPath(reached!).startsWith(path)).toBe(true);
    // the files it reads are the repository's demo files
    for (const a of args.filter((w) => w.startsWith('assets/'))) expect(existsSync(join(ROOT, a))).toBe(true);
  });

  it('an unknown option stops the dry parser (the check above can fail)', async () => {
    await expect(dryProgram().parseAsync(['node', 'waymark', 'calc', 'rocket', '--isp', '300', '--m0', '1t', '--nope'])).rejects.toMatchObject({
      code: 'commander.unknownOption',
    });
  });
});
