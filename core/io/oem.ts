/**
 * CCSDS Orbit Ephemeris Message (OEM) in KVN (keyword = value notation) form, after CCSDS
 * 502.0-B-2, Orbit Data Messages, Blue Book (2009), section 5 (OEM) and section 7 (KVN rules).
 *
 * Written structure:
 *   header    CCSDS_OEM_VERS = 2.0, COMMENT lines, CREATION_DATE, ORIGINATOR
 *   per span  META_START, COMMENT lines, OBJECT_NAME, OBJECT_ID, CENTER_NAME, REF_FRAME,
 *             TIME_SYSTEM, START_TIME, USEABLE_START_TIME, USEABLE_STOP_TIME, STOP_TIME,
 *             META_STOP, then data lines "epoch x y z x_dot y_dot z_dot" (km, km/s).
 * One metadata block (the standard's "segment") per central-body span of the sampled
 * ephemeris (core/conic/ephemerisSampler.ts), since the centre is a metadata item.
 *
 * Choices for invented star systems (they have no UTC, no Earth and no ICRF):
 * - TIME_SYSTEM = TDB. The system clock is a uniform coordinate time with no leap seconds,
 *   which is what TDB is for the real solar system, and the standard requires a calendar
 *   epoch. Epochs are written as calendar dates counted from a NOMINAL origin: system time
 *   t = 0 is written 2000-01-01T00:00:00 (`OEM_EPOCH_ORIGIN`), one day = 86 400 s, no leap
 *   seconds. A header COMMENT says so, with the system's own epoch label. The dates mean
 *   nothing on Earth. (MET, also in the standard's list, would need the mission start as an
 *   outside reference that many readers demand; the nominal-date mapping needs none.)
 * - REF_FRAME = ICRF, the standard's quasi-inertial frame with no Earth rotation in it, as the
 *   closest fit for the system's single inertial frame (x-y = the system's reference plane,
 *   x = its reference direction). A COMMENT in each block says the axes are the system's.
 * - CENTER_NAME = the body's name in capitals (the standard's natural-body names are of real
 *   bodies; the name of an invented body is the only sensible value). A COMMENT gives its id.
 * - OBJECT_ID: the standard recommends an international designator for catalogued objects;
 *   an invented vehicle has none, so its name as an upper-case slug is written.
 * - Epochs with 6 decimals of a second (1 µs); positions in km with 6 decimals (1 mm);
 *   velocities in km/s with 9 decimals (1 µm/s). `parseOem` gives back the sampled states
 *   within half of these units.
 *
 * `parseOem` reads the same subset: header, metadata blocks, data lines with 6 (or 9, with
 * accelerations, which are read and dropped) numbers, COMMENT lines where the standard allows
 * them; covariance sections are not read (an error says so). Epochs in either calendar form
 * (YYYY-MM-DDThh:mm:ss[.d…]) or day-of-year form (YYYY-DDDThh:mm:ss[.d…]), optional trailing Z,
 * are turned back into system seconds with the same nominal origin, assuming no leap seconds.
 */

import { InputError, ValidationError, type ValidationIssue } from '../math/index.ts';
import type { SampledEphemeris } from '../conic/index.ts';
import type { StarSystem } from '../system/index.ts';

export const OEM_VERSION = '2.0';
/** Calendar date written for system time t = 0 (nominal; no Earth time is implied). */
export const OEM_EPOCH_ORIGIN = '2000-01-01T00:00:00';
export const OEM_TIME_SYSTEM = 'TDB';
export const OEM_REF_FRAME = 'ICRF';
/** Decimals written: seconds of epochs, km, km/s. */
export const OEM_DIGITS = { epoch: 6, position: 6, velocity: 9 } as const;

const DAY = 86400;

// Proleptic Gregorian calendar <-> day count, after H. Hinnant, "chrono-Compatible Low-Level
// Date Algorithms" (days_from_civil / civil_from_days); pure integer arithmetic, any year.
function daysFromCivil(y: number, m: number, d: number): number {
  const yy = m <= 2 ? y - 1 : y;
  const era = Math.floor(yy / 400);
  const yoe = yy - era * 400;
  const doy = Math.floor((153 * (m + (m > 2 ? -3 : 9)) + 2) / 5) + d - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

function civilFromDays(z0: number): [number, number, number] {
  const z = z0 + 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const d = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const m = mp < 10 ? mp + 3 : mp - 9;
  return [yoe + era * 400 + (m <= 2 ? 1 : 0), m, d];
}

/** Day number of the origin date 2000-01-01 (days since 1970-01-01). */
const ORIGIN_DAY = daysFromCivil(2000, 1, 1);
// Range written: years 0001 to 9999.
const T_MIN = (daysFromCivil(1, 1, 1) - ORIGIN_DAY) * DAY;
const T_MAX = (daysFromCivil(10000, 1, 1) - ORIGIN_DAY) * DAY - 1;

export interface OemWriteOptions {
  /** OBJECT_NAME: the vehicle's name. */
  objectName: string;
  /** OBJECT_ID; default the object name as an upper-case slug. */
  objectId?: string;
  /** CREATION_DATE, a UTC date "YYYY-MM-DDThh:mm:ss" (the caller's clock; core reads no clock). */
  creationDate: string;
  /** ORIGINATOR (default "WAYMARK"). */
  originator?: string;
  /** Extra header comments (one per line). */
  comments?: string[];
  /** Extra comments per span, by span index (e.g. the burns inside it). */
  spanComments?: string[][];
}

/** Seconds from the system epoch as an OEM epoch "YYYY-MM-DDThh:mm:ss.ffffff" (nominal origin). */
export function formatOemEpoch(t: number): string {
  if (!Number.isFinite(t) || t < T_MIN || t > T_MAX) {
    throw new InputError('t', `must be between ${T_MIN} and ${T_MAX} s to be written as an OEM epoch (years 1 to 9999)`, t);
  }
  let whole = Math.floor(t);
  let micro = Math.round((t - whole) * 1e6);
  if (micro >= 1e6) {
    whole += 1;
    micro -= 1e6;
  }
  const days = Math.floor(whole / DAY);
  const sod = whole - days * DAY;
  const [y, mo, dd] = civilFromDays(ORIGIN_DAY + days);
  const hh = Math.floor(sod / 3600);
  const mm = Math.floor((sod - hh * 3600) / 60);
  const ss = sod - hh * 3600 - mm * 60;
  return `${String(y).padStart(4, '0')}-${pad2(mo)}-${pad2(dd)}` + `T${pad2(hh)}:${pad2(mm)}:${pad2(ss)}.${String(micro).padStart(6, '0')}`;
}

function isLeap(y: number): boolean {
  return (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;
}

function daysInMonth(y: number, m: number): number {
  return m === 2 ? (isLeap(y) ? 29 : 28) : [31, 0, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31][m - 1];
}

function pad2(x: number): string {
  return String(x).padStart(2, '0');
}

const EPOCH_CAL = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2}):(\d{2})(\.\d+)?Z?$/;
const EPOCH_DOY = /^(\d{4})-(\d{3})T(\d{2}):(\d{2}):(\d{2})(\.\d+)?Z?$/;

/** An OEM epoch back to seconds from the system epoch (nominal origin, no leap seconds); null if malformed. */
export function parseOemEpoch(text: string): number | null {
  let days: number;
  let h: string, mi: string, s: string, frac: string | undefined;
  const cal = EPOCH_CAL.exec(text);
  const ord = cal ? null : EPOCH_DOY.exec(text);
  if (cal) {
    const Y = Number(cal[1]),
      M = Number(cal[2]),
      D = Number(cal[3]);
    [h, mi, s, frac] = [cal[4], cal[5], cal[6], cal[7]];
    if (M < 1 || M > 12 || D < 1 || D > daysInMonth(Y, M)) return null;
    days = daysFromCivil(Y, M, D) - ORIGIN_DAY;
  } else if (ord) {
    const Y = Number(ord[1]);
    const doy = Number(ord[2]);
    [h, mi, s, frac] = [ord[3], ord[4], ord[5], ord[6]];
    if (doy < 1 || doy > (isLeap(Y) ? 366 : 365)) return null;
    days = daysFromCivil(Y, 1, 1) - ORIGIN_DAY + doy - 1;
  } else return null;
  const H = Number(h),
    MI = Number(mi),
    S = Number(s);
  // Second 60 is allowed by the standard for a leap second; read as the next second.
  if (H > 23 || MI > 59 || S > 60) return null;
  const f = frac ? Number(`0${frac}`) : 0;
  return days * DAY + H * 3600 + MI * 60 + S + f;
}

function slug(name: string): string {
  const s = name
    .toUpperCase()
    .replace(/[^A-Z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '');
  return s === '' ? 'UNNAMED' : s;
}

function kvn(key: string, value: string): string {
  return `${key.padEnd(20)} = ${value}`;
}

function oneLine(s: string): string {
  return s.replace(/[\r\n]+/g, ' ');
}

function fixed(x: number, digits: number): string {
  const s = x.toFixed(digits);
  return s === `-${(0).toFixed(digits)}` ? (0).toFixed(digits) : s;
}

/**
 * The OEM text of a sampled ephemeris (one metadata block per span). States in the input are
 * SI (m, m/s); the file has km and km/s.
 */
export function writeOem(system: StarSystem, eph: SampledEphemeris, options: OemWriteOptions): string {
  if (!options.objectName) throw new InputError('objectName', 'must not be empty');
  if (!/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d+)?$/.test(options.creationDate)) {
    throw new InputError('creationDate', 'must be a UTC date written YYYY-MM-DDThh:mm:ss', options.creationDate);
  }
  const spans = eph.spans.filter((s) => s.t.length > 0);
  if (spans.length === 0) throw new InputError('ephemeris', 'has no samples to write');
  const lines: string[] = [];
  lines.push(kvn('CCSDS_OEM_VERS', OEM_VERSION));
  lines.push(`COMMENT Waymark ephemeris of an invented star system (${oneLine(system.name)}); fictional, not for real flight.`);
  lines.push(
    `COMMENT Epochs: system time t = 0 (${oneLine(system.epoch.label)}) is written ${OEM_EPOCH_ORIGIN}; ` +
      'days of 86400 s, no leap seconds; the dates have no relation to Earth time.',
  );
  lines.push(`COMMENT Frame: REF_FRAME ${OEM_REF_FRAME} stands for the system's inertial axes (x-y its reference plane).`);
  for (const c of options.comments ?? []) lines.push(`COMMENT ${oneLine(c)}`);
  lines.push(kvn('CREATION_DATE', options.creationDate));
  lines.push(kvn('ORIGINATOR', options.originator ?? 'WAYMARK'));

  const objectId = options.objectId ?? slug(options.objectName);
  eph.spans.forEach((span, k) => {
    if (span.t.length === 0) return;
    const body = system.bodies[span.center];
    if (!body) throw new InputError(`ephemeris.spans[${k}].center`, 'must be a body index of the system', span.center);
    const start = formatOemEpoch(span.t[0]);
    const stop = formatOemEpoch(span.t[span.t.length - 1]);
    lines.push('');
    lines.push('META_START');
    lines.push(`COMMENT Centre: ${oneLine(body.name)} (body id "${body.id}") of system ${oneLine(system.name)}.`);
    for (const c of options.spanComments?.[k] ?? []) lines.push(`COMMENT ${oneLine(c)}`);
    lines.push(kvn('OBJECT_NAME', oneLine(options.objectName)));
    lines.push(kvn('OBJECT_ID', objectId));
    lines.push(kvn('CENTER_NAME', body.name.toUpperCase()));
    lines.push(kvn('REF_FRAME', OEM_REF_FRAME));
    lines.push(kvn('TIME_SYSTEM', OEM_TIME_SYSTEM));
    lines.push(kvn('START_TIME', start));
    lines.push(kvn('USEABLE_START_TIME', start));
    lines.push(kvn('USEABLE_STOP_TIME', stop));
    lines.push(kvn('STOP_TIME', stop));
    lines.push('META_STOP');
    lines.push('');
    const s = span.states;
    for (let j = 0; j < span.t.length; j++) {
      const o = 6 * j;
      lines.push(
        [
          formatOemEpoch(span.t[j]),
          fixed(s[o] / 1e3, OEM_DIGITS.position),
          fixed(s[o + 1] / 1e3, OEM_DIGITS.position),
          fixed(s[o + 2] / 1e3, OEM_DIGITS.position),
          fixed(s[o + 3] / 1e3, OEM_DIGITS.velocity),
          fixed(s[o + 4] / 1e3, OEM_DIGITS.velocity),
          fixed(s[o + 5] / 1e3, OEM_DIGITS.velocity),
        ].join(' '),
      );
    }
  });
  return `${lines.join('\n')}\n`;
}

// ---------------------------------------------------------------------------------------------
// Reading

export interface OemSegment {
  /** Metadata keywords and values as written (COMMENT lines excluded). */
  metadata: Record<string, string>;
  /** COMMENT lines of the metadata and data sections, text only. */
  comments: string[];
  /** Epochs as written. */
  epochs: string[];
  /** Epochs as seconds from the system epoch (nominal origin). */
  t: Float64Array;
  /** States, 6 per line, SI (m, m/s). */
  states: Float64Array;
}

export interface OemMessage {
  version: string;
  creationDate: string;
  originator: string;
  /** Header comments. */
  comments: string[];
  segments: OemSegment[];
}

const WHAT = 'OEM file';
const REQUIRED_META = ['OBJECT_NAME', 'OBJECT_ID', 'CENTER_NAME', 'REF_FRAME', 'TIME_SYSTEM', 'START_TIME', 'STOP_TIME'];
const OPTIONAL_META = ['REF_FRAME_EPOCH', 'USEABLE_START_TIME', 'USEABLE_STOP_TIME', 'INTERPOLATION', 'INTERPOLATION_DEGREE'];
const EPOCH_META = ['START_TIME', 'STOP_TIME', 'USEABLE_START_TIME', 'USEABLE_STOP_TIME', 'REF_FRAME_EPOCH'];
const NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * Reads an OEM in KVN form (the subset described in the file comment). Throws
 * ValidationError('OEM file', issues) with paths "line N" listing every problem found.
 */
export function parseOem(text: string): OemMessage {
  const issues: ValidationIssue[] = [];
  const bad = (line: number, rule: string): void => {
    issues.push({ path: `line ${line}`, rule, severity: 'error' });
  };
  const lines = text.split(/\r?\n/);
  const msg: OemMessage = { version: '', creationDate: '', originator: '', comments: [], segments: [] };
  type State = 'start' | 'header' | 'meta' | 'data';
  let state: State = 'start';
  let seg: (OemSegment & { tt: number[]; ss: number[]; lineOf: Record<string, number> }) | null = null;
  let metaLine = 0;

  const closeSegment = (): void => {
    if (!seg) return;
    msg.segments.push({ metadata: seg.metadata, comments: seg.comments, epochs: seg.epochs, t: Float64Array.from(seg.tt), states: Float64Array.from(seg.ss) });
    seg = null;
  };

  for (let n = 0; n < lines.length; n++) {
    const lineNo = n + 1;
    const line = lines[n].trim();
    if (line === '') continue;
    if (line === 'COMMENT' || line.startsWith('COMMENT ')) {
      const c = line.slice(7).trim();
      if (state === 'header' || state === 'start') {
        if (state === 'start') bad(lineNo, 'must be CCSDS_OEM_VERS = ... (the first line of an OEM)');
        else msg.comments.push(c);
      } else if (state === 'meta') seg!.comments.push(c);
      else if (state === 'data') {
        if (seg!.epochs.length > 0) bad(lineNo, 'COMMENT is allowed only before the first data line of a segment');
        else seg!.comments.push(c);
      }
      continue;
    }
    const kv = /^([A-Z_][A-Z0-9_]*)\s*=\s*(.*)$/.exec(line);
    if (state === 'start') {
      if (kv?.[1] !== 'CCSDS_OEM_VERS') {
        bad(lineNo, 'must be CCSDS_OEM_VERS = ... (the first line of an OEM)');
        break;
      }
      msg.version = kv[2].trim();
      if (!/^\d+\.\d+$/.test(msg.version)) bad(lineNo, `CCSDS_OEM_VERS must be a version like 2.0 (got "${msg.version}")`);
      state = 'header';
      continue;
    }
    if (line === 'META_START') {
      if (state === 'meta') bad(lineNo, 'META_START inside a metadata block (META_STOP missing)');
      if (state === 'header') {
        if (!msg.creationDate) bad(lineNo, 'the header needs CREATION_DATE before the first META_START');
        if (!msg.originator) bad(lineNo, 'the header needs ORIGINATOR before the first META_START');
      }
      closeSegment();
      seg = { metadata: {}, comments: [], epochs: [], t: new Float64Array(0), states: new Float64Array(0), tt: [], ss: [], lineOf: {} };
      metaLine = lineNo;
      state = 'meta';
      continue;
    }
    if (line === 'META_STOP') {
      if (state !== 'meta') {
        bad(lineNo, 'META_STOP without META_START');
        continue;
      }
      const md = seg!.metadata;
      for (const k of REQUIRED_META) if (!(k in md)) bad(metaLine, `the metadata block needs ${k}`);
      for (const k of EPOCH_META) {
        if (k in md && parseOemEpoch(md[k]) === null)
          bad(seg!.lineOf[k], `${k} must be an epoch YYYY-MM-DDThh:mm:ss[.d] or YYYY-DDDThh:mm:ss[.d] (got "${md[k]}")`);
      }
      state = 'data';
      continue;
    }
    if (line === 'COVARIANCE_START') {
      bad(lineNo, 'covariance sections are not supported by this reader');
      break;
    }
    if (state === 'header') {
      if (!kv) {
        bad(lineNo, 'must be KEYWORD = value in the header');
        continue;
      }
      if (kv[1] === 'CREATION_DATE') {
        msg.creationDate = kv[2].trim();
        if (parseOemEpoch(msg.creationDate) === null) bad(lineNo, `CREATION_DATE must be a date YYYY-MM-DDThh:mm:ss (got "${msg.creationDate}")`);
      } else if (kv[1] === 'ORIGINATOR') msg.originator = kv[2].trim();
      else bad(lineNo, `unknown header keyword ${kv[1]}`);
      continue;
    }
    if (state === 'meta') {
      if (!kv) {
        bad(lineNo, 'must be KEYWORD = value in a metadata block');
        continue;
      }
      const key = kv[1];
      if (!REQUIRED_META.includes(key) && !OPTIONAL_META.includes(key)) bad(lineNo, `unknown metadata keyword ${key}`);
      else if (key in seg!.metadata) bad(lineNo, `${key} is given twice`);
      seg!.metadata[key] = kv[2].trim();
      seg!.lineOf[key] = lineNo;
      continue;
    }
    // Data line.
    const parts = line.split(/\s+/);
    if (parts.length !== 7 && parts.length !== 10) {
      bad(lineNo, `a data line must have an epoch and 6 numbers (or 9 with accelerations), got ${parts.length - 1}`);
      continue;
    }
    const t = parseOemEpoch(parts[0]);
    if (t === null) {
      bad(lineNo, `the epoch must be YYYY-MM-DDThh:mm:ss[.d] or YYYY-DDDThh:mm:ss[.d] (got "${parts[0]}")`);
      continue;
    }
    const values: number[] = [];
    for (let c = 1; c < 7; c++) {
      if (!NUMBER.test(parts[c])) {
        bad(lineNo, `value ${c} must be a number (got "${parts[c]}")`);
        break;
      }
      values.push(Number(parts[c]) * 1e3);
    }
    if (values.length !== 6) continue;
    for (let c = 7; c < parts.length; c++) if (!NUMBER.test(parts[c])) bad(lineNo, `value ${c} must be a number (got "${parts[c]}")`);
    const s = seg!;
    if (s.tt.length > 0 && !(t > s.tt[s.tt.length - 1])) bad(lineNo, 'epochs must increase within a segment');
    s.epochs.push(parts[0]);
    s.tt.push(t);
    s.ss.push(...values);
  }
  if (state === 'start' && issues.length === 0) bad(1, 'must be CCSDS_OEM_VERS = ... (the first line of an OEM)');
  if (state === 'header' && issues.length === 0) bad(lines.length, 'the OEM has no metadata block (META_START)');
  if (state === 'meta') bad(metaLine, 'the metadata block is not closed (META_STOP missing)');
  closeSegment();
  for (const [k, s] of msg.segments.entries()) {
    if (s.t.length === 0) issues.push({ path: `segment ${k + 1}`, rule: 'has no data lines', severity: 'error' });
    else {
      const t0 = parseOemEpoch(s.metadata.START_TIME ?? '');
      const t1 = parseOemEpoch(s.metadata.STOP_TIME ?? '');
      // Half a microsecond of slack: epochs are written to 1 µs.
      if (t0 !== null && s.t[0] < t0 - 5e-7) issues.push({ path: `segment ${k + 1}`, rule: 'has data before START_TIME', severity: 'error' });
      if (t1 !== null && s.t[s.t.length - 1] > t1 + 5e-7) issues.push({ path: `segment ${k + 1}`, rule: 'has data after STOP_TIME', severity: 'error' });
    }
  }
  if (issues.length > 0) throw new ValidationError(WHAT, issues);
  return msg;
}
