/**
 * Reader of Waymark runtime ephemeris files: copy this one file into a game. It imports nothing.
 *
 * The algorithm, for a port to another language:
 *  1. A file holds tracks (planets, moons, ships); a track is a run of arcs, each an interval
 *     [t0, t1] (seconds from the system's epoch) with a centre (another track, or −1: the star at
 *     the origin) and its pieces, each a Chebyshev series of degree N per axis (metres).
 *  2. Arc at t: the last arc whose t0 ≤ t (so at a shared boundary, the later one).
 *  3. Piece at t: equal pieces: k = floor((t − t0)/length) clamped to [0, count − 1], ends
 *     a = t0 + k·length, b = a + length; listed pieces: the last k with breaks[k] ≤ t (clamped), ends breaks[k], breaks[k+1].
 *  4. s = 2(t − a)/(b − a) − 1. Coefficients of piece k start at k·3(N + 1): x_0..x_N, y_0..y_N, z_0..z_N.
 *  5. Position, per axis (Clenshaw): b1 = b2 = 0; for j = N..1: (b1, b2) = (2s·b1 − b2 + c_j, b1); x = s·b1 − b2 + c_0.
 *  6. Velocity, per axis: d1 = d2 = 0; for m = N−1..0: (d1, d2) = ((m + 1)·c_{m+1} + 2s·d1 − d2, d1); v = d1 · 2/(b − a).
 *  7. Position relative to the star: add the centre's position at the same t, and its centre's, up to −1.
 * Binary form: little-endian, layout in core/runtime/format.ts (and the JSON Schema's description).
 */

/** An open runtime ephemeris file. `track` is a track's name or index; out receives [x, y, z]. */
export interface RuntimeEphemerisReader {
  /** System name, the star's id (origin of the axes), the epoch's label (t = 0), the span (s). */
  readonly system: string;
  readonly origin: string;
  readonly epoch: string;
  readonly t0: number;
  readonly t1: number;
  /** Track names in file order (index = position in this list). */
  readonly names: readonly string[];
  /** Index of a track by name (throws on an unknown name). */
  trackIndex(name: string): number;
  /** Position relative to the track's centre at t, m. */
  position<T extends { [i: number]: number }>(track: string | number, t: number, out: T): T;
  /** Velocity relative to the track's centre at t, m/s. */
  velocity<T extends { [i: number]: number }>(track: string | number, t: number, out: T): T;
  /** Position relative to the star at t, m. */
  absolutePosition<T extends { [i: number]: number }>(track: string | number, t: number, out: T): T;
  /** Index of the track's centre at t (−1: the star). */
  center(track: string | number, t: number): number;
}

interface Arc {
  t0: number;
  t1: number;
  center: number;
  count: number;
  /** Equal pieces' length, or 0 when the pieces are listed. */
  length: number;
  breaks: Float64Array | null;
  coef: Float64Array;
}

interface Track {
  name: string;
  degree: number;
  arcs: Arc[];
}

function fail(field: string, rule: string): never {
  throw new Error(`runtime ephemeris: ${field} ${rule}`);
}

/** The JSON document's fields the reader uses. */
interface JsonArc {
  centerIndex: number;
  t0: number;
  t1: number;
  count: number;
  length?: number;
  breaks?: number[];
  coefficients: number[];
}
interface JsonTrack {
  name: string;
  degree: number;
  arcs: JsonArc[];
}
interface Head {
  system: string;
  origin: string;
  epoch: string;
  t0: number;
  t1: number;
}

const isCount = (n: unknown): n is number => typeof n === 'number' && Number.isInteger(n) && n >= 1;

function fromJson(input: object): { head: Head; tracks: Track[] } {
  const doc = input as Partial<Head & { format: string; version: number; tracks: JsonTrack[] }>;
  if (doc.format !== 'waymark-runtime-ephemeris') fail('format', 'must be "waymark-runtime-ephemeris"');
  if (doc.version !== 1) fail('version', `must be 1 (got ${doc.version})`);
  if (!Array.isArray(doc.tracks)) fail('tracks', 'must be an array');
  const tracks = doc.tracks.map((t, k): Track => {
    if (!t || !Array.isArray(t.arcs) || t.arcs.length === 0) fail(`tracks[${k}].arcs`, 'must be a non-empty array');
    if (!isCount(t.degree)) fail(`tracks[${k}].degree`, 'must be an integer >= 1');
    return {
      name: String(t.name),
      degree: t.degree,
      arcs: t.arcs.map((a, i): Arc => {
        const at = `tracks[${k}].arcs[${i}]`;
        if (!isCount(a.count)) fail(`${at}.count`, 'must be an integer >= 1');
        const n = a.count * 3 * (t.degree + 1);
        if (!Array.isArray(a.coefficients) || a.coefficients.length !== n) fail(`${at}.coefficients`, `must hold ${n} numbers`);
        const listed = a.length === undefined;
        if (listed && (!Array.isArray(a.breaks) || a.breaks.length !== a.count + 1)) fail(`${at}.breaks`, `must hold ${a.count + 1} numbers`);
        return {
          t0: a.t0,
          t1: a.t1,
          center: a.centerIndex,
          count: a.count,
          length: listed ? 0 : (a.length as number),
          breaks: listed ? Float64Array.from(a.breaks as number[]) : null,
          coef: Float64Array.from(a.coefficients),
        };
      }),
    };
  });
  return { head: doc as Head, tracks };
}

function fromBinary(buf: ArrayBuffer): { head: Head; tracks: Track[] } {
  const v = new DataView(buf);
  let o = 0;
  /** Offset of the next n bytes (and moves past them), or an error naming the field when the file ends first. */
  const take = (n: number, field: string): number => {
    if (o + n > buf.byteLength) fail(field, `is cut short (the file ends at byte ${buf.byteLength}, ${n} bytes needed at byte ${o})`);
    o += n;
    return o - n;
  };
  const u8 = (f: string) => v.getUint8(take(1, f));
  const u16 = (f: string) => v.getUint16(take(2, f), true);
  const u32 = (f: string) => v.getUint32(take(4, f), true);
  const i32 = (f: string) => v.getInt32(take(4, f), true);
  const f64 = (f: string) => v.getFloat64(take(8, f), true);
  const f64s = (n: number, f: string) => {
    const at = take(8 * n, f);
    const a = new Float64Array(n);
    for (let i = 0; i < n; i++) a[i] = v.getFloat64(at + 8 * i, true);
    return a;
  };
  const text = (f: string) => {
    const n = u16(f);
    return new TextDecoder().decode(new Uint8Array(buf, take(n, f), n));
  };
  if (u32('magic') !== 0x45524d57) fail('magic', 'must be "WMRE" (not a Waymark runtime ephemeris file)');
  const version = u16('version');
  if (version !== 1) fail('version', `must be 1 (got ${version})`);
  const count = u16('track count');
  const head: Head = { t0: f64('t0'), t1: f64('t1'), system: text('system'), origin: text('origin'), epoch: text('epoch') };
  const tracks: Track[] = [];
  for (let k = 0; k < count; k++) {
    const at = `tracks[${k}]`;
    const name = text(`${at}.name`);
    u8(`${at}.kind`);
    const degree = u8(`${at}.degree`);
    if (degree < 1) fail(`${at}.degree`, 'must be at least 1');
    take(16, `${at}.tolerance`); // tolerance, maxError: not needed to evaluate
    take(32 * u32(`${at}.fine`), `${at}.fine`);
    const arcs: Arc[] = [];
    const arcCount = u32(`${at}.arcs`);
    if (arcCount < 1) fail(`${at}.arcs`, 'must hold at least one arc');
    for (let i = 0; i < arcCount; i++) {
      const ap = `${at}.arcs[${i}]`;
      text(`${ap}.center`);
      const center = i32(`${ap}.centerIndex`);
      const listed = u8(`${ap}.layout`) === 1;
      const n = u32(`${ap}.count`);
      if (n < 1) fail(`${ap}.count`, 'must be at least 1');
      const t0 = f64(`${ap}.t0`);
      const t1 = f64(`${ap}.t1`);
      const length = listed ? 0 : f64(`${ap}.length`);
      const breaks = listed ? f64s(n + 1, `${ap}.breaks`) : null;
      arcs.push({ t0, t1, center, count: n, length, breaks, coef: f64s(n * 3 * (degree + 1), `${ap}.coefficients`) });
    }
    tracks.push({ name, degree, arcs });
  }
  if (o !== buf.byteLength) fail('file', `has ${buf.byteLength - o} bytes after the last track`);
  return { head, tracks };
}

/** Opens a runtime ephemeris file: the parsed JSON document, or the bytes of the binary form. */
export function openRuntimeEphemeris(data: object | ArrayBuffer): RuntimeEphemerisReader {
  if (data === null || typeof data !== 'object') fail('data', 'must be the parsed JSON document or an ArrayBuffer of the binary form');
  const { head, tracks } = data instanceof ArrayBuffer ? fromBinary(data) : fromJson(data);
  const byName = new Map<string, number>();
  tracks.forEach((t, k) => byName.set(t.name, k));
  // the piece found by `find`
  let arc: Arc = tracks[0]?.arcs[0];
  let a = 0;
  let b = 0;
  let off = 0;
  let deg = 0;

  const indexOf = (track: string | number): number => {
    if (typeof track === 'number') {
      if (!(track >= 0 && track < tracks.length && Math.floor(track) === track)) fail('track', `index ${track} is not in [0, ${tracks.length - 1}]`);
      return track;
    }
    const k = byName.get(track);
    if (k === undefined) fail('track', `"${track}" is not in the file (tracks: ${[...byName.keys()].join(', ')})`);
    return k;
  };

  const find = (k: number, t: number): void => {
    const tr = tracks[k];
    const arcs = tr.arcs;
    const last = arcs.length - 1;
    if (!(t >= arcs[0].t0 && t <= arcs[last].t1)) fail('t', `${t} is outside track "${tr.name}"'s span [${arcs[0].t0}, ${arcs[last].t1}] s`);
    let lo = 0;
    let hi = last;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (arcs[mid].t0 <= t) lo = mid;
      else hi = mid - 1;
    }
    arc = arcs[lo];
    let p: number;
    if (arc.breaks === null) {
      p = Math.floor((t - arc.t0) / arc.length);
      if (p < 0) p = 0;
      if (p > arc.count - 1) p = arc.count - 1;
      a = arc.t0 + p * arc.length;
      b = a + arc.length;
    } else {
      const br = arc.breaks;
      lo = 0;
      hi = arc.count - 1;
      while (lo < hi) {
        const mid = (lo + hi + 1) >> 1;
        if (br[mid] <= t) lo = mid;
        else hi = mid - 1;
      }
      p = lo;
      a = br[p];
      b = br[p + 1];
    }
    deg = tr.degree;
    off = p * 3 * (deg + 1);
  };

  const positionAt = (k: number, t: number, out: { [i: number]: number }): void => {
    find(k, t);
    const c = arc.coef;
    const s = (2 * (t - a)) / (b - a) - 1;
    const s2 = 2 * s;
    const ox = off;
    const oy = off + deg + 1;
    const oz = off + 2 * (deg + 1);
    // the three axes side by side (independent recurrences, so the processor overlaps them)
    let x1 = 0;
    let x2 = 0;
    let y1 = 0;
    let y2 = 0;
    let z1 = 0;
    let z2 = 0;
    for (let j = deg; j >= 1; j--) {
      const x0 = s2 * x1 - x2 + c[ox + j];
      const y0 = s2 * y1 - y2 + c[oy + j];
      const z0 = s2 * z1 - z2 + c[oz + j];
      x2 = x1;
      x1 = x0;
      y2 = y1;
      y1 = y0;
      z2 = z1;
      z1 = z0;
    }
    out[0] = s * x1 - x2 + c[ox];
    out[1] = s * y1 - y2 + c[oy];
    out[2] = s * z1 - z2 + c[oz];
  };

  const part = [0, 0, 0];
  return {
    system: head.system,
    origin: head.origin,
    epoch: head.epoch,
    t0: head.t0,
    t1: head.t1,
    names: tracks.map((t) => t.name),
    trackIndex: indexOf,
    position(track, t, out) {
      positionAt(indexOf(track), t, out);
      return out;
    },
    velocity(track, t, out) {
      find(indexOf(track), t);
      const c = arc.coef;
      const s = (2 * (t - a)) / (b - a) - 1;
      const s2 = 2 * s;
      const dsdt = 2 / (b - a);
      const ox = off;
      const oy = off + deg + 1;
      const oz = off + 2 * (deg + 1);
      let x1 = 0;
      let x2 = 0;
      let y1 = 0;
      let y2 = 0;
      let z1 = 0;
      let z2 = 0;
      for (let m = deg - 1; m >= 0; m--) {
        const w = m + 1;
        const x0 = w * c[ox + w] + s2 * x1 - x2;
        const y0 = w * c[oy + w] + s2 * y1 - y2;
        const z0 = w * c[oz + w] + s2 * z1 - z2;
        x2 = x1;
        x1 = x0;
        y2 = y1;
        y1 = y0;
        z2 = z1;
        z1 = z0;
      }
      out[0] = x1 * dsdt;
      out[1] = y1 * dsdt;
      out[2] = z1 * dsdt;
      return out;
    },
    absolutePosition(track, t, out) {
      let x = 0;
      let y = 0;
      let z = 0;
      let k = indexOf(track);
      for (let hops = 0; k >= 0; hops++) {
        if (hops > tracks.length) fail('centres', 'loop without reaching the star');
        positionAt(k, t, part);
        x += part[0];
        y += part[1];
        z += part[2];
        k = arc.center;
      }
      out[0] = x;
      out[1] = y;
      out[2] = z;
      return out;
    },
    center(track, t) {
      find(indexOf(track), t);
      return arc.center;
    },
  };
}
