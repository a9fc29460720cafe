/**
 * The command line speaks of flags, the core of fields: a porkchop request refuses `depart.n`
 * or `maxRevs`, a game-step check `physics.dt`, a dispersion `options.samples`. Each command
 * lists which flag sets which field (a `FlagNames` map) and hands it to `guard`, which rethrows
 * an InputError about a listed field as the same rule about the flag ("--revs must be an integer
 * from 0 to 50", "--grid departures must be ..."); field names quoted inside the rule
 * ("raise maxSteps") become the flag too, and an end of a START..END flag is named so
 * ("--depart START must be a calendar date ..."). Fields not listed (a file's own paths such as
 * `events[2].dv`) pass unchanged.
 */
import { parseQuantity } from '../../core/io/index.ts';
import { InputError } from '../../core/math/index.ts';
import type { StarSystem } from '../../core/system/index.ts';

/**
 * An angle typed on the command line, in radians: degrees unless a unit says otherwise
 * (`30` and `30deg` are 30°, `0.5rad` is 0.5 rad). Output that prints angles says `deg`.
 */
export function parseAngle(flag: string, text: string): number {
  const t = text.trim();
  return /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/.test(t) ? parseQuantity(flag, `${t}deg`, 'angle') : parseQuantity(flag, t, 'angle');
}

/**
 * The index of the body a flag names: its id or its name, letters in any case (`tessel`,
 * `Tessel`, `TESSEL`). InputError naming the flag and listing the bodies as the system names them.
 */
export function bodyIndexNamed(system: StarSystem, flag: string, text: string): number {
  const want = text.trim().toLowerCase();
  const k = system.bodies.findIndex((b) => b.id.toLowerCase() === want || b.name.toLowerCase() === want);
  if (k < 0) {
    throw new InputError(
      flag,
      `must name a body of ${system.name} (one of: ${system.bodies.map((b) => (b.name.toLowerCase() === b.id.toLowerCase() ? b.name : `${b.name} (${b.id})`)).join(', ')})`,
      text,
    );
  }
  return k;
}

/** Field → flag, or [flag, what of it] for a flag that sets several fields (`--grid` sets both axes' sample counts). */
export type FlagNames = Readonly<Record<string, string | readonly [flag: string, part: string]>>;

/** The map of options named like their fields (`calc`: field `mu` is `--mu`). */
export function sameNamedFlags(...names: string[]): FlagNames {
  return Object.fromEntries(names.map((n) => [n, `--${n}`]));
}

const flagOf = (v: string | readonly [string, string]): string => (typeof v === 'string' ? v : v[0]);

/** Field names written like code (camelCase or dotted) that may be quoted inside a rule. */
const CODE_LIKE = /[A-Z.]/;

function escapeRegExp(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
}

/**
 * The error in the command line's words: an InputError whose field is listed (exactly, or with
 * a trailing index like `r[1]`) becomes an InputError about the flag, with the same rule and value.
 * Anything else comes back as it was.
 */
export function inFlagWords(err: unknown, flags: FlagNames): unknown {
  if (!(err instanceof InputError)) return err;
  // an end of a START..END flag (core/io parseRange names them `<flag>.start` / `<flag>.end`)
  const end = /^(--[\w-]+)\.(start|end)$/.exec(err.field);
  if (end) return new InputError(end[1], `${end[2].toUpperCase()} ${err.rule}`, err.value);
  const m = /^(.*?)((?:\[\d+\])*)$/.exec(err.field)!;
  const base = m[1];
  const entry = Object.hasOwn(flags, base) ? flags[base] : undefined;
  let rule = err.rule;
  for (const [field, v] of Object.entries(flags)) {
    if (CODE_LIKE.test(field)) rule = rule.replace(new RegExp(`(?<![\\w.-])${escapeRegExp(field)}(?!\\w|\\.\\w)`, 'g'), flagOf(v));
  }
  if (entry === undefined) return rule === err.rule ? err : new InputError(err.field, rule, err.value);
  const [flag, part] = typeof entry === 'string' ? [entry, ''] : entry;
  return new InputError(`${flag}${m[2]}`, part ? `${part} ${rule}` : rule, err.value);
}

// ---- which flag sets which field, per command ----

/** `calc ...`: the calculators' options are named like the core's arguments. */
export const CALC_FLAGS: FlagNames = {
  ...sameNamedFlags('mu', 'r', 'v', 'dt', 'r1', 'r2', 'tof', 'rb', 'a', 'p', 'e', 'i', 'raan', 'argp', 'nu', 'm', 'M', 'isp', 'm0', 'mf', 'dv', 'thrust'),
  'state[0..2]': '--r',
  'options.revs': '--revs',
  'options.retrograde': '--retrograde',
};

/** `windows`: the porkchop request's fields (core/search/request.ts) and the window search's. */
export function windowsFlags(secondAxis: 'tof' | 'arrival'): FlagNames {
  const second = secondAxis === 'arrival' ? '--arrive' : '--tof';
  return {
    from: '--from',
    to: '--to',
    depart: '--depart',
    'depart.start': '--depart',
    'depart.end': '--depart',
    'depart.n': ['--grid', 'departures'],
    second,
    'second.start': second,
    'second.end': second,
    'second.n': ['--grid', secondAxis === 'arrival' ? 'arrival times' : 'flight times'],
    parkingAltitude: '--parking',
    parkingEccentricity: '--parking-e',
    arrivalAltitude: '--capture',
    arrivalEccentricity: '--capture-e',
    maxRevs: '--revs',
    retrograde: '--retrograde',
    metric: '--metric',
    count: '--top',
  };
}

/** `gamestep`: the game physics and the check's options (core/gamestep). */
export const GAMESTEP_FLAGS: FlagNames = {
  'physics.integrator': '--integrator',
  'physics.dt': '--dt',
  'physics.precision': '--float32',
  'physics.rebase': '--rebase',
  'physics.rebase.distance': '--rebase-distance',
  'rebase.distance': '--rebase-distance',
  'physics.rebase.velocity': '--no-rebase-velocity',
  'physics.gravity': '--gravity',
  'physics.burns': '--burns',
  'physics.guidance': '--guidance',
  tolerance: '--tolerance',
  energyTolerance: '--energy-tolerance',
  warpDt: '--coast-step',
  maxStepsPerSpan: '--max-steps',
  dtMax: '--dt-max',
};

/** `stability`: core/checks/stability.ts options. */
export const STABILITY_FLAGS: FlagNames = {
  years: '--years',
  span: '--years',
  method: '--method',
  mergeMoons: '--merge-moons',
  stepsPerOrbit: '--steps-per-orbit',
  maxSteps: '--max-steps',
  samples: '--samples',
};

/** `disperse`: core/nbody/disperse.ts options. */
export const DISPERSE_FLAGS: FlagNames = {
  'options.samples': '--samples',
  'options.seed': '--seed',
  'options.magnitudeSigma': '--mag-sigma',
  'options.pointingSigma': '--point-sigma',
  'options.resolve': '--resolve',
};

/** `correct`: core/nbody/correct.ts options. */
export const CORRECT_FLAGS: FlagNames = {
  'options.burns': '--burn',
  'options.time': '--time',
  'options.maxIterations': '--max-iterations',
};

/** `fly`: the n-body flight's and the exports' sampling step. */
export const FLY_FLAGS: FlagNames = {
  step: '--step',
  'options.step': '--step',
};

/** `target`: core/target targetPlan options. */
export const TARGET_FLAGS: FlagNames = {
  model: '--model',
  'tolerance.altitude': '--altitude-tolerance',
  'tolerance.i': '--inclination-tolerance',
  'tolerance.e': '--e-tolerance',
  'tolerance.time': '--time-tolerance',
  maxIterations: '--max-iterations',
  maxFlights: '--max-flights',
  maxChange: '--max-change',
  timeControls: '--vary',
  eventId: '--vary',
  goals: '--goal',
};

/** `handoff`: the game physics (as `gamestep`), retargeting's tolerances and the schedule's units (core/handoff, core/io gameSchedule.ts). */
export const HANDOFF_FLAGS: FlagNames = {
  ...GAMESTEP_FLAGS,
  'tolerance.altitude': '--tolerance-altitude',
  'tolerance.i': '--tolerance-inclination',
  'tolerance.time': '--tolerance-time',
  verify: '--verify',
  'options.length': '--length',
  'options.time': '--time',
  'options.axes': '--axes',
};
