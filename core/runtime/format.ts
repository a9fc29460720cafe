/**
 * The runtime ephemeris file, in two forms carrying the same numbers: a JSON document (format
 * "waymark-runtime-ephemeris", version 1; its shape is core/io/runtimeFileShape.ts, its schema
 * assets/schema/runtime-ephemeris.schema.json) and a compact binary layout. Both decoders check
 * the data and name the first field that breaks a rule (InputError). JSON keeps every double
 * exactly (ECMAScript writes the shortest decimal that reads back as the same double), the binary
 * form stores the IEEE 754 bits, so both read back to identical numbers.
 *
 * Binary layout, version 1 (all little-endian; str = u16 byte count n, then n bytes of UTF-8):
 *   header   4 bytes  magic "WMRE" (0x57 0x4D 0x52 0x45)
 *            u16      version (1)
 *            u16      track count T
 *            f64 t0, f64 t1   span, s from the system's epoch
 *            str system name, str origin (the star's id), str epoch label
 *   T tracks str      name
 *            u8       kind (0 body, 1 ship)
 *            u8       degree N (N + 1 coefficients per axis)
 *            f64 tolerance, f64 maxError   (m)
 *            u32      fine window count F, then F × (f64 t0, f64 t1, f64 tolerance, f64 maxError)
 *            u32      arc count A, then A arcs:
 *   arc      str      centre name
 *            i32      centre's track index (−1: the star)
 *            u8       layout (0 equal pieces, 1 listed pieces)
 *            u32      piece count n
 *            f64 t0, f64 t1
 *            equal pieces: f64 length;  listed pieces: (n + 1) × f64 boundaries
 *            n × 3(N + 1) × f64 coefficients, piece after piece, each [x_0..x_N, y_0..y_N, z_0..z_N] (m)
 * Nothing follows the last track.
 */
import { InputError } from '../math/index.ts';
import { MAX_DEGREE } from './chebyshev.ts';
import type { FineWindow, RuntimeArc, RuntimeEphemeris, RuntimeTrack } from './model.ts';

export const RUNTIME_FORMAT = 'waymark-runtime-ephemeris';
export const RUNTIME_VERSION = 1;
/** The binary form's first four bytes: "WMRE". */
export const RUNTIME_MAGIC = [0x57, 0x4d, 0x52, 0x45] as const;

/** An arc of the JSON document: `length` for equal pieces, `breaks` for listed ones (exactly one of the two). */
export interface RuntimeFileArc {
  center: string;
  centerIndex: number;
  t0: number;
  t1: number;
  count: number;
  length?: number;
  breaks?: number[];
  coefficients: number[];
}

export interface RuntimeFileTrack {
  name: string;
  kind: 'body' | 'ship';
  degree: number;
  tolerance: number;
  maxError: number;
  fine: FineWindow[];
  arcs: RuntimeFileArc[];
}

/** The JSON document. */
export interface RuntimeFile {
  format: typeof RUNTIME_FORMAT;
  version: typeof RUNTIME_VERSION;
  system: string;
  origin: string;
  epoch: string;
  units: { length: 'm'; time: 's' };
  t0: number;
  t1: number;
  tracks: RuntimeFileTrack[];
}

/** The JSON document of `data` (JSON.stringify it to write the file). */
export function encodeRuntimeJson(data: RuntimeEphemeris): RuntimeFile {
  return {
    format: RUNTIME_FORMAT,
    version: RUNTIME_VERSION,
    system: data.system,
    origin: data.origin,
    epoch: data.epoch,
    units: { length: 'm', time: 's' },
    t0: data.t0,
    t1: data.t1,
    tracks: data.tracks.map((tr) => ({
      name: tr.name,
      kind: tr.kind,
      degree: tr.degree,
      tolerance: tr.tolerance,
      maxError: tr.maxError,
      fine: tr.fine.map((w) => ({ t0: w.t0, t1: w.t1, tolerance: w.tolerance, maxError: w.maxError })),
      arcs: tr.arcs.map((a) => ({
        center: a.center,
        centerIndex: a.centerIndex,
        t0: a.t0,
        t1: a.t1,
        count: a.count,
        ...(a.length !== null ? { length: a.length } : { breaks: Array.from(a.breaks!) }),
        coefficients: Array.from(a.coefficients),
      })),
    })),
  };
}

// ---- checks shared by both decoders ----------------------------------------------------------

type Json = Record<string, unknown>;

function isObject(x: unknown): x is Json {
  return typeof x === 'object' && x !== null && !Array.isArray(x);
}

function obj(x: unknown, field: string): Json {
  if (!isObject(x)) throw new InputError(field, 'must be an object', x);
  return x;
}

function num(x: unknown, field: string): number {
  if (typeof x !== 'number' || !Number.isFinite(x)) throw new InputError(field, 'must be a finite number', x);
  return x;
}

function str(x: unknown, field: string): string {
  if (typeof x !== 'string' || x.length === 0) throw new InputError(field, 'must be a non-empty string', x);
  return x;
}

function int(x: unknown, field: string, lo: number, hi: number): number {
  if (!(typeof x === 'number' && Number.isInteger(x) && x >= lo && x <= hi)) throw new InputError(field, `must be an integer in [${lo}, ${hi}]`, x);
  return x;
}

function arr(x: unknown, field: string): unknown[] {
  if (!Array.isArray(x)) throw new InputError(field, 'must be an array', x);
  return x;
}

function numbers(x: unknown, field: string, length: number): Float64Array {
  const a = arr(x, field);
  if (a.length !== length) throw new InputError(field, `must hold ${length} numbers`, `${a.length} numbers`);
  const out = new Float64Array(length);
  for (let i = 0; i < length; i++) out[i] = num(a[i], `${field}[${i}]`);
  return out;
}

/** Most tracks, arcs per track, pieces per arc and fine windows per track a file may hold (sanity bounds). */
const MAX_TRACKS = 0xffff;
const MAX_COUNT = 10_000_000;

/** Checks a decoded document's rules and returns it in memory (the JSON decoder's core, also run on the binary form). */
function checkDocument(doc: Json): RuntimeEphemeris {
  if (doc.format !== RUNTIME_FORMAT) throw new InputError('format', `must be "${RUNTIME_FORMAT}"`, doc.format);
  if (doc.version !== RUNTIME_VERSION) throw new InputError('version', `must be ${RUNTIME_VERSION} (the version this reader knows)`, doc.version);
  const units = obj(doc.units, 'units');
  if (units.length !== 'm' || units.time !== 's') throw new InputError('units', 'must be {"length": "m", "time": "s"}', units);
  const t0 = num(doc.t0, 't0');
  const t1 = num(doc.t1, 't1');
  if (!(t1 > t0)) throw new InputError('t1', `must be later than t0 (${t0})`, t1);
  const origin = str(doc.origin, 'origin');
  const rawTracks = arr(doc.tracks, 'tracks');
  if (rawTracks.length < 1 || rawTracks.length > MAX_TRACKS) throw new InputError('tracks', `must hold 1 to ${MAX_TRACKS} tracks`, rawTracks.length);
  const names = rawTracks.map((t, k) => str(obj(t, `tracks[${k}]`).name, `tracks[${k}].name`));
  const tracks: RuntimeTrack[] = rawTracks.map((raw, k) => {
    const at = `tracks[${k}]`;
    const t = raw as Json;
    if (names.indexOf(names[k]) !== k) throw new InputError(`${at}.name`, 'must differ from every other track name', names[k]);
    if (t.kind !== 'body' && t.kind !== 'ship') throw new InputError(`${at}.kind`, 'must be "body" or "ship"', t.kind);
    const degree = int(t.degree, `${at}.degree`, 1, MAX_DEGREE);
    const tolerance = num(t.tolerance, `${at}.tolerance`);
    if (!(tolerance > 0)) throw new InputError(`${at}.tolerance`, 'must be > 0', tolerance);
    const maxError = num(t.maxError, `${at}.maxError`);
    if (!(maxError >= 0)) throw new InputError(`${at}.maxError`, 'must be >= 0', maxError);
    const fine = arr(t.fine, `${at}.fine`).map((w, i) => {
      const f = obj(w, `${at}.fine[${i}]`);
      const win = {
        t0: num(f.t0, `${at}.fine[${i}].t0`),
        t1: num(f.t1, `${at}.fine[${i}].t1`),
        tolerance: num(f.tolerance, `${at}.fine[${i}].tolerance`),
        maxError: num(f.maxError, `${at}.fine[${i}].maxError`),
      };
      if (!(win.t1 > win.t0)) throw new InputError(`${at}.fine[${i}].t1`, `must be later than t0 (${win.t0})`, win.t1);
      if (!(win.tolerance > 0)) throw new InputError(`${at}.fine[${i}].tolerance`, 'must be > 0', win.tolerance);
      if (!(win.maxError >= 0)) throw new InputError(`${at}.fine[${i}].maxError`, 'must be >= 0', win.maxError);
      return win;
    });
    const rawArcs = arr(t.arcs, `${at}.arcs`);
    if (rawArcs.length < 1) throw new InputError(`${at}.arcs`, 'must hold at least one arc', rawArcs.length);
    const stride = 3 * (degree + 1);
    const arcs: RuntimeArc[] = rawArcs.map((rawArc, i) => {
      const ap = `${at}.arcs[${i}]`;
      const a = obj(rawArc, ap);
      const centerIndex = int(a.centerIndex, `${ap}.centerIndex`, -1, rawTracks.length - 1);
      if (centerIndex === k) throw new InputError(`${ap}.centerIndex`, 'must not be the track itself', centerIndex);
      const center = str(a.center, `${ap}.center`);
      const expected = centerIndex < 0 ? origin : names[centerIndex];
      if (center !== expected) throw new InputError(`${ap}.center`, `must be the name of centre ${centerIndex} ("${expected}")`, center);
      const a0 = num(a.t0, `${ap}.t0`);
      const a1 = num(a.t1, `${ap}.t1`);
      if (!(a1 > a0)) throw new InputError(`${ap}.t1`, `must be later than t0 (${a0})`, a1);
      if (i > 0 && a0 !== (rawArcs[i - 1] as Json).t1) throw new InputError(`${ap}.t0`, "must equal the previous arc's t1", a0);
      if (a0 < t0 || a1 > t1) throw new InputError(ap, `must lie within the file's span [${t0}, ${t1}] s`, [a0, a1]);
      const count = int(a.count, `${ap}.count`, 1, MAX_COUNT);
      let length: number | null = null;
      let breaks: Float64Array | null = null;
      if ((a.length === undefined) === (a.breaks === undefined))
        throw new InputError(ap, 'must have exactly one of "length" (equal pieces) and "breaks" (listed pieces)');
      if (a.length !== undefined) {
        length = num(a.length, `${ap}.length`);
        if (!(length > 0)) throw new InputError(`${ap}.length`, 'must be > 0', length);
        // the pieces cover [t0, t1] up to the rounding of length = (t1 − t0)/count
        const end = a0 + count * length;
        if (!(Math.abs(end - a1) <= 1e-9 * (a1 - a0))) throw new InputError(`${ap}.length`, `must be (t1 − t0)/count (${(a1 - a0) / count})`, length);
      } else {
        breaks = numbers(a.breaks, `${ap}.breaks`, count + 1);
        if (breaks[0] !== a0 || breaks[count] !== a1) throw new InputError(`${ap}.breaks`, 'must start at t0 and end at t1', [breaks[0], breaks[count]]);
        for (let p = 1; p <= count; p++) {
          if (!(breaks[p] > breaks[p - 1])) throw new InputError(`${ap}.breaks[${p}]`, 'must be later than the previous boundary', breaks[p]);
        }
      }
      const coefficients = numbers(a.coefficients, `${ap}.coefficients`, count * stride);
      return { center, centerIndex, t0: a0, t1: a1, count, length, breaks, coefficients };
    });
    return { name: names[k], kind: t.kind, degree, tolerance, maxError, fine, arcs };
  });
  // every chain of centres ends at the star
  tracks.forEach((tr, k) => {
    for (const arc of tr.arcs) {
      let j = arc.centerIndex;
      for (let hops = 0; j >= 0; hops++) {
        if (hops >= tracks.length) throw new InputError(`tracks[${k}].arcs`, 'centres must lead to the star without a loop', tr.name);
        j = tracks[j].arcs[0].centerIndex;
      }
    }
  });
  if (typeof doc.epoch !== 'string') throw new InputError('epoch', "must be a string (the label of the system's time zero)", doc.epoch);
  return { system: str(doc.system, 'system'), origin, epoch: doc.epoch, t0, t1, tracks };
}

/** Reads the JSON document (already parsed) into memory, checking every rule. */
export function decodeRuntimeJson(doc: unknown): RuntimeEphemeris {
  return checkDocument(obj(doc, 'document'));
}

// ---- binary -------------------------------------------------------------------------------------

const utf8 = new TextEncoder();

/** The binary form of `data` (layout in the file comment). */
export function encodeRuntimeBinary(data: RuntimeEphemeris): ArrayBuffer {
  const strings = new Map<string, Uint8Array>();
  const bytesOf = (s: string): Uint8Array => {
    let b = strings.get(s);
    if (!b) {
      b = utf8.encode(s);
      if (b.length > 0xffff) throw new InputError('string', 'must be at most 65,535 bytes of UTF-8', s.slice(0, 40));
      strings.set(s, b);
    }
    return b;
  };
  const strSize = (s: string): number => 2 + bytesOf(s).length;
  if (data.tracks.length > MAX_TRACKS) throw new InputError('tracks', `must hold at most ${MAX_TRACKS} tracks`, data.tracks.length);
  let size = 4 + 2 + 2 + 16 + strSize(data.system) + strSize(data.origin) + strSize(data.epoch);
  for (const tr of data.tracks) {
    size += strSize(tr.name) + 2 + 16 + 4 + 32 * tr.fine.length + 4;
    for (const a of tr.arcs) size += strSize(a.center) + 4 + 1 + 4 + 16 + (a.length !== null ? 8 : 8 * (a.count + 1)) + 8 * a.coefficients.length;
  }
  const buf = new ArrayBuffer(size);
  const v = new DataView(buf);
  const bytes = new Uint8Array(buf);
  let o = 0;
  const u8 = (x: number) => {
    v.setUint8(o, x);
    o += 1;
  };
  const u16 = (x: number) => {
    v.setUint16(o, x, true);
    o += 2;
  };
  const u32 = (x: number) => {
    v.setUint32(o, x, true);
    o += 4;
  };
  const i32 = (x: number) => {
    v.setInt32(o, x, true);
    o += 4;
  };
  const f64 = (x: number) => {
    v.setFloat64(o, x, true);
    o += 8;
  };
  const text = (s: string) => {
    const b = bytesOf(s);
    u16(b.length);
    bytes.set(b, o);
    o += b.length;
  };
  for (const m of RUNTIME_MAGIC) u8(m);
  u16(RUNTIME_VERSION);
  u16(data.tracks.length);
  f64(data.t0);
  f64(data.t1);
  text(data.system);
  text(data.origin);
  text(data.epoch);
  for (const tr of data.tracks) {
    text(tr.name);
    u8(tr.kind === 'body' ? 0 : 1);
    u8(tr.degree);
    f64(tr.tolerance);
    f64(tr.maxError);
    u32(tr.fine.length);
    for (const w of tr.fine) {
      f64(w.t0);
      f64(w.t1);
      f64(w.tolerance);
      f64(w.maxError);
    }
    u32(tr.arcs.length);
    for (const a of tr.arcs) {
      text(a.center);
      i32(a.centerIndex);
      u8(a.length !== null ? 0 : 1);
      u32(a.count);
      f64(a.t0);
      f64(a.t1);
      if (a.length !== null) f64(a.length);
      else for (const t of a.breaks!) f64(t);
      for (const c of a.coefficients) f64(c);
    }
  }
  return buf;
}

const strictUtf8 = new TextDecoder('utf-8', { fatal: true });

/** Reads the binary form into memory, checking its layout and then the same rules as the JSON form. */
export function decodeRuntimeBinary(buffer: ArrayBuffer): RuntimeEphemeris {
  if (!(buffer instanceof ArrayBuffer)) throw new InputError('buffer', 'must be an ArrayBuffer', typeof buffer);
  const v = new DataView(buffer);
  const bytes = new Uint8Array(buffer);
  let o = 0;
  const need = (n: number, field: string) => {
    if (o + n > buffer.byteLength) throw new InputError(field, `is cut short: the file ends at byte ${buffer.byteLength}, ${n} bytes needed at byte ${o}`);
  };
  const u8 = (field: string) => {
    need(1, field);
    return v.getUint8(o++);
  };
  const u16 = (field: string) => {
    need(2, field);
    o += 2;
    return v.getUint16(o - 2, true);
  };
  const u32 = (field: string) => {
    need(4, field);
    o += 4;
    return v.getUint32(o - 4, true);
  };
  const i32 = (field: string) => {
    need(4, field);
    o += 4;
    return v.getInt32(o - 4, true);
  };
  const f64 = (field: string) => {
    need(8, field);
    o += 8;
    return v.getFloat64(o - 8, true);
  };
  const f64s = (n: number, field: string): number[] => {
    need(8 * n, field);
    const out = new Array<number>(n);
    for (let i = 0; i < n; i++) out[i] = v.getFloat64(o + 8 * i, true);
    o += 8 * n;
    return out;
  };
  const text = (field: string) => {
    const n = u16(field);
    need(n, field);
    o += n;
    try {
      return strictUtf8.decode(bytes.subarray(o - n, o));
    } catch {
      throw new InputError(field, 'must be valid UTF-8');
    }
  };
  need(4, 'magic');
  for (let i = 0; i < 4; i++) if (bytes[i] !== RUNTIME_MAGIC[i]) throw new InputError('magic', 'must be "WMRE" (not a Waymark runtime ephemeris file)');
  o = 4;
  const version = u16('version');
  if (version !== RUNTIME_VERSION) throw new InputError('version', `must be ${RUNTIME_VERSION} (the version this reader knows)`, version);
  const trackCount = u16('tracks');
  const doc: Json = { format: RUNTIME_FORMAT, version, units: { length: 'm', time: 's' } };
  doc.t0 = f64('t0');
  doc.t1 = f64('t1');
  doc.system = text('system');
  doc.origin = text('origin');
  doc.epoch = text('epoch');
  const tracks: Json[] = [];
  for (let k = 0; k < trackCount; k++) {
    const at = `tracks[${k}]`;
    const name = text(`${at}.name`);
    const kind = u8(`${at}.kind`);
    const degree = u8(`${at}.degree`);
    const tolerance = f64(`${at}.tolerance`);
    const maxError = f64(`${at}.maxError`);
    const fineCount = u32(`${at}.fine`);
    need(32 * fineCount, `${at}.fine`);
    const fine: Json[] = [];
    for (let i = 0; i < fineCount; i++) {
      const [w0, w1, tol, err] = f64s(4, `${at}.fine[${i}]`);
      fine.push({ t0: w0, t1: w1, tolerance: tol, maxError: err });
    }
    const arcCount = u32(`${at}.arcs`);
    const arcs: Json[] = [];
    for (let i = 0; i < arcCount; i++) {
      const ap = `${at}.arcs[${i}]`;
      const center = text(`${ap}.center`);
      const centerIndex = i32(`${ap}.centerIndex`);
      const layout = u8(`${ap}.layout`);
      if (layout > 1) throw new InputError(`${ap}.layout`, 'must be 0 (equal pieces) or 1 (listed pieces)', layout);
      const count = u32(`${ap}.count`);
      if (count < 1 || count > MAX_COUNT) throw new InputError(`${ap}.count`, `must be an integer in [1, ${MAX_COUNT}]`, count);
      const a0 = f64(`${ap}.t0`);
      const a1 = f64(`${ap}.t1`);
      const arc: Json = { center, centerIndex, t0: a0, t1: a1, count };
      if (layout === 0) arc.length = f64(`${ap}.length`);
      else arc.breaks = f64s(count + 1, `${ap}.breaks`);
      arc.coefficients = f64s(count * 3 * (degree + 1), `${ap}.coefficients`);
      arcs.push(arc);
    }
    tracks.push({ name, kind: kind === 0 ? 'body' : kind === 1 ? 'ship' : kind, degree, tolerance, maxError, fine, arcs });
  }
  if (o !== buffer.byteLength) throw new InputError('file', `must end after the last track (byte ${o}), not at byte ${buffer.byteLength}`);
  doc.tracks = tracks;
  return checkDocument(doc);
}
