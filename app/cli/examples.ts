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

/**
 * The examples of each command, by its path of names (`calc kepler`). Every command has at least
 * one (tested); each is a command line as a user would type it on the demo files from the
 * repository's top folder.
 */
export const COMMAND_EXAMPLES: Readonly<Record<string, readonly string[]>> = {
  calc: ['waymark calc hohmann --system assets/systems/ilmar.system.json --body tessel --alt1 300km --alt2 20000km'],
  'calc kepler': [
    'waymark calc kepler --mu 3.986e14 --r 7000km,0,0 --v 0,7.5km/s,0 --dt 1h',
    'waymark calc kepler --system assets/systems/ilmar.system.json --body Tessel --r 6300km,0,0 --v 0,7km/s,0 --dt 30min',
  ],
  'calc elements': [
    'waymark calc elements --system assets/systems/ilmar.system.json --body tessel --a 6300km --e 0.01 --i 28.5 --nu 10',
    'waymark calc elements --mu 3.986e14 --r 7000km,0,0 --v 0,7.5km/s,1km/s',
  ],
  'calc lambert': ['waymark calc lambert --mu 3.986e14 --r1 5000km,10000km,2100km --r2=-14600km,2500km,7000km --tof 1h'],
  'calc hohmann': [
    'waymark calc hohmann --mu 3.986e14 --r1 6678km --r2 42164km',
    'waymark calc hohmann --system assets/systems/ilmar.system.json --body quill --alt1 100km --alt2 1000km',
  ],
  'calc bielliptic': ['waymark calc bielliptic --system assets/systems/ilmar.system.json --body tessel --alt1 300km --alt2 300000km --altb 600000km'],
  'calc soi': ['waymark calc soi --system assets/systems/ilmar.system.json --body ochre', 'waymark calc soi --a 149.6Gm --m 5.972e24 --M 1.989e30'],
  'calc rocket': ['waymark calc rocket --isp 320 --m0 12t --dv 3.2km/s --thrust 40kN'],
  check: ['waymark check assets/plans/tessel-to-ochre.plan.json', 'waymark check assets/plans/tessel-to-ochre.plan.json --model nbody --json'],
  fly: [
    'waymark fly assets/plans/tessel-to-ochre.plan.json --oem transfer.oem --burns burns.csv',
    'waymark fly assets/plans/tessel-to-ochre.plan.json --csv - --step 10min',
  ],
  windows: ['waymark windows --system assets/systems/ilmar.system.json --from Tessel --to ochre --depart 0d..400d --grid 100x100'],
  sequence: [
    'waymark sequence tessel moravel fennick --system assets/systems/ilmar.system.json --depart 412-001..413-001',
    'waymark sequence tessel moravel fennick --system assets/systems/ilmar.system.json --unpowered --flyby --keep 3 --json',
  ],
  gamestep: ['waymark gamestep assets/plans/tessel-to-ochre.plan.json --dt 1/60 --float32'],
  handoff: [
    'waymark handoff assets/plans/tessel-to-ochre.plan.json --integrator symplectic-euler --dt 1/60 --schedule burns.schedule.json',
    'waymark handoff assets/plans/tessel-to-ochre.plan.json --verify extrapolated --csv burns.schedule.csv --length km --time steps --axes y-up-left-handed',
  ],
  stability: ['waymark stability assets/systems/ilmar.system.json --years 10'],
  correct: ['waymark correct assets/plans/tessel-to-ochre.plan.json -o corrected.plan.json'],
  target: [
    'waymark target assets/plans/tessel-to-ochre.plan.json --model nbody -o targeted.plan.json',
    'waymark target assets/plans/tessel-to-ochre.plan.json --goal inclination:ochre=35 -o - --json',
  ],
  route: ['waymark route --system assets/systems/ilmar.system.json --from tessel:300km --to Skerry:500km --after 10d --before 200d -o route.plan.json'],
  disperse: ['waymark disperse assets/plans/tessel-to-ochre.plan.json --samples 200 --seed 7'],
  map: ['waymark map --system assets/systems/ilmar.system.json', 'waymark map --system assets/systems/ilmar.system.json --aero --json'],
  calendar: [
    'waymark calendar --system assets/systems/ilmar.system.json',
    'waymark calendar --system assets/systems/ilmar.system.json --years 5 --within 5 --pair tessel:ochre --pair ochre:tessel --csv',
  ],
};

/** The path of names of a command (`calc kepler`), without the program's name. */
export function commandPath(cmd: Command): string {
  const names: string[] = [];
  for (let c: Command | null = cmd; c?.parent; c = c.parent) names.unshift(c.name());
  return names.join(' ');
}

/** Every command under `program`, depth first (groups before their sub-commands; commander's own `help` left out). */
export function allCommands(program: Command): Command[] {
  return program.commands.flatMap((c) => [c, ...allCommands(c)]);
}

/** Adds each command's examples (COMMAND_EXAMPLES) to its help. */
export function addAllExamples(program: Command): void {
  for (const cmd of allCommands(program)) {
    const ex = COMMAND_EXAMPLES[commandPath(cmd)];
    if (ex) withExamples(cmd, ex);
  }
}

/** An example's words as the shell would pass them (single or double quotes group words), without the leading `waymark`. */
export function exampleArgs(example: string): string[] {
  const words: string[] = [];
  for (const m of example.matchAll(/"([^"]*)"|'([^']*)'|(\S+)/g)) words.push(m[1] ?? m[2] ?? m[3]);
  return words[0] === 'waymark' ? words.slice(1) : words;
}
