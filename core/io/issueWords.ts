/**
 * A plan problem in the user's words. A validation issue or plan check carries a field path
 * (`events[0].solve.arrive_s`) and a rule that may quote other paths and raw SI values
 * ("must be later than events[0].t_s (24184348.87 s)"). Here the subject is named as the
 * Plan screen's cards name it — the event's kind, its number counted from 1 as on the card and
 * its name ("burn 1 'Departure'"), "stage 2 'Cruise stage'", "start", "target orbit" — quoted
 * paths become names too, absolute times become calendar dates of the system
 * (formatCompactDate), durations carry units, and lengths, masses, forces and speeds are
 * written in the units the editor's fields show (km, t, kN, m/s). The raw field path is kept for
 * a details line ("plan field: events[0].solve.arrive_s").
 *
 * Reads both the plan file's field names (`vehicle.stages[1].dry_kg`) and the in-memory ones
 * (`vehicle.stages[1].dryMass`), and a plan in either form (only events' `type` and `name` and
 * stages' `name` are read, defensively, so a document the schema refused works too).
 */
import type { ValidationIssue } from '../math/index.ts';
import type { StarSystem } from '../system/index.ts';
import { formatCompactDate } from '../system/index.ts';

/** What a leaf field holds, for writing its values. */
type Kind = 'date' | 'duration' | 'length' | 'mass' | 'speed' | 'force' | 'deg' | 'rad' | 'plain';

interface Leaf {
  words: string;
  kind: Kind;
}

// Leaf names, file form and in-memory form, in the words of the editor's field labels.
const LEAVES: Record<string, Leaf> = {
  epoch_s: { words: 'epoch', kind: 'date' },
  epoch: { words: 'epoch', kind: 'date' },
  t_s: { words: 'time', kind: 'date' },
  t: { words: 'time', kind: 'date' },
  arrive_s: { words: 'arrival', kind: 'date' },
  arrive: { words: 'arrival', kind: 'date' },
  end_s: { words: 'end of the plan', kind: 'date' },
  end: { words: 'end of the plan', kind: 'date' },
  dt_s: { words: 'duration', kind: 'duration' },
  dt: { words: 'duration', kind: 'duration' },
  periapsis_altitude_m: { words: 'periapsis altitude', kind: 'length' },
  periapsisAltitude: { words: 'periapsis altitude', kind: 'length' },
  apoapsis_altitude_m: { words: 'apoapsis altitude', kind: 'length' },
  apoapsisAltitude: { words: 'apoapsis altitude', kind: 'length' },
  altitude_m: { words: 'altitude', kind: 'length' },
  altitude: { words: 'altitude', kind: 'length' },
  r_m: { words: 'position', kind: 'length' },
  r: { words: 'position', kind: 'length' },
  v_mps: { words: 'velocity', kind: 'speed' },
  v: { words: 'velocity', kind: 'speed' },
  dv_mps: { words: 'Δv', kind: 'speed' },
  dv: { words: 'Δv', kind: 'speed' },
  absolute_mps: { words: 'plus absolute', kind: 'speed' },
  absolute: { words: 'plus absolute', kind: 'speed' },
  percent: { words: 'percent of planned Δv', kind: 'plain' },
  payload_kg: { words: 'payload', kind: 'mass' },
  payloadMass: { words: 'payload', kind: 'mass' },
  dry_kg: { words: 'dry mass', kind: 'mass' },
  dryMass: { words: 'dry mass', kind: 'mass' },
  propellant_kg: { words: 'propellant', kind: 'mass' },
  propellantMass: { words: 'propellant', kind: 'mass' },
  thrust_N: { words: 'thrust', kind: 'force' },
  thrust: { words: 'thrust', kind: 'force' },
  isp_s: { words: 'Isp', kind: 'plain' },
  isp: { words: 'Isp', kind: 'plain' },
  e: { words: 'eccentricity', kind: 'plain' },
  i_deg: { words: 'inclination', kind: 'deg' },
  i: { words: 'inclination', kind: 'rad' },
  raan_deg: { words: 'ascending node', kind: 'deg' },
  raan: { words: 'ascending node', kind: 'rad' },
  argp_deg: { words: 'argument of periapsis', kind: 'deg' },
  argp: { words: 'argument of periapsis', kind: 'rad' },
  nu_deg: { words: 'true anomaly', kind: 'deg' },
  nu: { words: 'true anomaly', kind: 'rad' },
  to: { words: 'destination', kind: 'plain' },
  body: { words: 'body', kind: 'plain' },
  revs: { words: 'revolutions', kind: 'plain' },
  // a burn's derived block (resolvedBurns.ts): the figures Waymark saved, recomputed on open
  resolved: { words: 'figures saved with the plan', kind: 'plain' },
};

// Leaves whose card label differs inside a burn's solve block.
const SOLVE_LEAVES: Record<string, string> = {
  periapsisAltitude: 'aim periapsis',
  periapsis_altitude_m: 'aim periapsis',
  altitude: 'opposite apsis altitude',
  altitude_m: 'opposite apsis altitude',
  e: 'eccentricity after',
};

const EVENT_WORD: Record<string, string> = { burn: 'burn', coast: 'coast', stage: 'staging' };

type Loose = Record<string, unknown>;
const record = (x: unknown): Loose | null => (typeof x === 'object' && x !== null && !Array.isArray(x) ? (x as Loose) : null);
const item = (x: unknown, k: number): Loose | null => (Array.isArray(x) ? record(x[k]) : null);

/** An issue in words: `text` is the whole sentence, `detail` the raw path for a details line. */
export interface IssueWords {
  /** "burn 1 'Departure'", "stage 2 'Cruise stage'", "target orbit", "" for the document. */
  subject: string;
  /** The field within the subject, in the card's words: "arrival", "dry mass", "" for the whole subject. */
  field: string;
  /** The rule with quoted paths named and values in display units: "must be later than the burn (412-149T22:16)". */
  rule: string;
  /** "Burn 1 'Departure': arrival must be later than the burn (412-149T22:16)". */
  text: string;
  /** "plan field: events[0].solve.arrive_s" ("" for the document itself). */
  detail: string;
}

interface Named {
  subject: string;
  /** events[k] or vehicle.stages[k] or the first path part: what "the same subject" means. */
  key: string;
  field: string;
  kind: Kind;
  /** The event kind word when the subject is an event ("burn"). */
  eventWord: string | null;
}

const PATH_PART = /([A-Za-z_]+)|\[(\d+)\]/g;

function nameOf(x: Loose | null): string {
  return x && typeof x.name === 'string' && x.name.trim() !== '' ? ` '${x.name.trim()}'` : '';
}

/** The subject and field words of a path. */
function namePath(path: string, plan: unknown): Named {
  const parts: (string | number)[] = [];
  for (const m of path.matchAll(PATH_PART)) parts.push(m[1] ?? Number(m[2]));
  const doc = record(plan);
  let subject = '';
  let key = '';
  let eventWord: string | null = null;
  let rest: (string | number)[] = parts;
  if (parts[0] === 'events' && typeof parts[1] === 'number') {
    const ev = item(doc?.events, parts[1]);
    eventWord = (typeof ev?.type === 'string' && EVENT_WORD[ev.type]) || 'event';
    subject = `${eventWord} ${parts[1] + 1}${nameOf(ev)}`;
    key = `events[${parts[1]}]`;
    rest = parts.slice(2);
  } else if (parts[0] === 'vehicle' && parts[1] === 'stages' && typeof parts[2] === 'number') {
    subject = `stage ${parts[2] + 1}${nameOf(item(record(doc?.vehicle)?.stages, parts[2]))}`;
    key = `vehicle.stages[${parts[2]}]`;
    rest = parts.slice(3);
  } else if (parts[0] === 'target') {
    subject = 'target orbit';
    key = 'target';
    rest = parts.slice(1);
  } else if (parts[0] === 'start' || parts[0] === 'vehicle' || parts[0] === 'reserve' || parts[0] === 'system') {
    subject = parts[0] as string;
    key = subject;
    rest = parts.slice(1);
  } else if (parts.length > 0) {
    key = String(parts[0]);
  }
  // The field: the last named part in the card's words, a component number from 1, a tolerance named so.
  const inSolve = rest[0] === 'solve';
  const tolerance = rest[0] === 'tolerance';
  let leaf: Leaf | null = null;
  let leafName = '';
  let component: number | null = null;
  for (const p of rest) {
    if (typeof p === 'number') component = p;
    else if (p !== 'solve' && p !== 'until' && p !== 'tolerance') {
      leafName = p;
      leaf = LEAVES[p] ?? { words: p.replace(/_/g, ' '), kind: 'plain' };
      component = null;
    }
  }
  let field = leaf ? (inSolve && SOLVE_LEAVES[leafName]) || leaf.words : '';
  if (field && component !== null) field += ` component ${component + 1}`;
  if (field && tolerance) field += ' tolerance';
  if (!subject && field === '' && key) field = key;
  return { subject, key, field, kind: leaf?.kind ?? 'plain', eventWord };
}

const NNBSP = '\u202f';

/** Digits grouped in threes, true minus sign, at most `decimals` decimals (no trailing zeros). */
function grouped(x: number, decimals: number): string {
  if (!Number.isFinite(x)) return String(x);
  if (Math.abs(x) >= 1e15) return x.toExponential(3).replace('-', '−');
  const fixed = Math.abs(x).toFixed(decimals);
  const [int, frac] = fixed.split('.');
  const g = int.replace(/\B(?=(\d{3})+(?!\d))/g, NNBSP);
  const f = frac?.replace(/0+$/, '');
  return `${x < 0 && Number(fixed) !== 0 ? '−' : ''}${g}${f ? `.${f}` : ''}`;
}

/** A duration with units: "3 h 05 min 12 s", "2 d 04 h 00 min" (d = 86 400 s). */
function durationWords(s: number): string {
  const a = Math.abs(s);
  const sign = s < 0 ? '−' : '';
  if (a < 60) return `${sign}${grouped(a, 3)} s`;
  const whole = Math.round(a);
  const d = Math.floor(whole / 86400);
  const h = Math.floor((whole % 86400) / 3600);
  const m = Math.floor((whole % 3600) / 60);
  const sec = whole % 60;
  const pad = (n: number): string => String(n).padStart(2, '0');
  if (d > 0) return `${sign}${d} d ${pad(h)} h ${pad(m)} min`;
  if (h > 0) return `${sign}${h} h ${pad(m)} min ${pad(sec)} s`;
  return `${sign}${m} min ${pad(sec)} s`;
}

/** A value of a field written as that field shows it. */
function valueWords(x: number, kind: Kind, system: StarSystem | null): string {
  switch (kind) {
    case 'date':
      if (system) {
        try {
          const withSeconds = Math.abs(x - Math.round(x / 60) * 60) > 1e-3;
          return formatCompactDate(system.calendar, x, { seconds: withSeconds });
        } catch {
          // outside what the calendar can write: the seconds below
        }
      }
      return `${grouped(x, 3)} s from the epoch`;
    case 'duration':
      return durationWords(x);
    case 'length':
      return `${grouped(x / 1000, 3)} km`;
    case 'mass':
      return `${grouped(x / 1000, 3)} t`;
    case 'force':
      return `${grouped(x / 1000, 3)} kN`;
    case 'speed':
      return `${grouped(x, 3)} m/s`;
    case 'deg':
      return `${grouped(x, 4)}°`;
    case 'rad':
      return `${grouped((x * 180) / Math.PI, 4)}°`;
    default:
      return grouped(x, 6);
  }
}

const NUMBER = String.raw`[-−]?(?:\d+(?:\.\d*)?|\.\d+)(?:e[+-]?\d+)?`;
// A quoted field path, with the value that follows it in parentheses when there is one.
const QUOTED_PATH = new RegExp(
  String.raw`\b((?:events\[\d+\]|vehicle\.stages\[\d+\]|vehicle|start|target|reserve)(?:\.[A-Za-z_]+|\[\d+\])+|events\[\d+\]|end_s)(?: \((${NUMBER})(?: (?:s|m|kg|m/s|N))?\))?`,
  'g',
);
// An SI value with its unit standing alone in the rule ("must be > -600000 m").
const SI_VALUE = new RegExp(String.raw`(^|[\s(>=<])(${NUMBER}) (m/s|m|kg|N)(?=$|[\s),;.])`, 'g');

function ruleWords(rule: string, own: Named, plan: unknown, system: StarSystem | null): string {
  const quoted = rule.replace(QUOTED_PATH, (_m, path: string, value: string | undefined) => {
    const ref = namePath(path, plan);
    let words: string;
    if (ref.key === own.key && own.subject) {
      // the subject's own field: "the burn" for its time, "its dry mass" otherwise
      words = ref.kind === 'date' && ref.field === 'time' && own.eventWord ? `the ${own.eventWord}` : ref.field ? `its ${ref.field}` : `this ${own.subject}`;
    } else if (ref.subject) words = ref.field ? `the ${ref.field} of ${ref.subject}` : ref.subject;
    else words = ref.field || path;
    if (value === undefined) return words;
    return `${words} (${valueWords(Number(value.replace('−', '-')), ref.kind, system)})`;
  });
  const units = quoted.replace(SI_VALUE, (_m, lead: string, value: string, unit: string) => {
    const x = Number(value.replace('−', '-'));
    const kind: Kind = unit === 'm' ? 'length' : unit === 'kg' ? 'mass' : unit === 'N' ? 'force' : 'speed';
    return `${lead}${valueWords(x, kind, system)}`;
  });
  return units.replace(/>=/g, '≥').replace(/<=/g, '≤');
}

/**
 * `issue` in words, naming its subject from `plan` (a plan in memory or a plan file's document,
 * read defensively) and writing dates with `system`'s calendar (null: dates as seconds from the
 * epoch). `issue.value`, when given (an InputError's), is shown in the field's unit.
 */
export function issueInWords(issue: Pick<ValidationIssue, 'path' | 'rule'> & { value?: unknown }, plan: unknown, system: StarSystem | null): IssueWords {
  if (!issue.path) {
    return { subject: '', field: '', rule: issue.rule, text: issue.rule, detail: '' };
  }
  const named = namePath(issue.path, plan);
  let rule = ruleWords(issue.rule, named, plan, system);
  if (typeof issue.value === 'number' && Number.isFinite(issue.value)) rule += ` (got ${valueWords(issue.value, named.kind, system)})`;
  else if (typeof issue.value === 'string') rule += ` (got "${issue.value}")`;
  const head = named.subject ? (named.field ? `${named.subject}: ${named.field}` : named.subject) : named.field;
  const sentence = `${head} ${rule}`;
  return {
    subject: named.subject,
    field: named.field,
    rule,
    text: sentence.charAt(0).toUpperCase() + sentence.slice(1),
    detail: `plan field: ${issue.path}`,
  };
}

/** Every issue of a list with its words (`words` set; the path and rule kept for machines). */
export function issuesInWords<T extends Pick<ValidationIssue, 'path' | 'rule'>>(
  issues: readonly T[],
  plan: unknown,
  system: StarSystem | null,
): (T & { words: string })[] {
  return issues.map((i) =>
    i.path === '' || (i as { more?: number }).more !== undefined ? { ...i, words: i.rule } : { ...i, words: issueInWords(i, plan, system).text },
  );
}
