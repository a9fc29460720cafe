/**
 * Examples at the end of every command's `--help`. `withExamples` adds them as commander help
 * text after the options and keeps them, so a test can run each one through the program's
 * parser (test/app/cli/help.test.ts) and check that every command has at least one.
 */
import type { Command } from 'commander';

const EXAMPLES = new WeakMap<Command, readonly string[]>();

/** Adds `Examples:` lines (each a whole command line starting with `waymark`) after the command's help. */
export function withExamples(cmd: Command, examples: readonly string[]): Command {
  EXAMPLES.set(cmd, examples);
  cmd.addHelpText('after', `\nExample${examples.length === 1 ? '' : 's'}:\n${examples.map((e) => `  $ ${e}`).join('\n')}\n`);
  return cmd;
}

/** The examples a command's help ends with (empty when it has none). */
export function examplesOf(cmd: Command): readonly string[] {
  return EXAMPLES.get(cmd) ?? [];
}

/** An example's words as the shell would pass them (single or double quotes group words), without the leading `waymark`. */
export function exampleArgs(example: string): string[] {
  const words: string[] = [];
  for (const m of example.matchAll(/"([^"]*)"|'([^']*)'|(\S+)/g)) words.push(m[1] ?? m[2] ?? m[3]);
  return words[0] === 'waymark' ? words.slice(1) : words;
}
