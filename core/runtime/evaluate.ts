/**
 * Evaluation of runtime ephemeris data in memory (model.ts): the position and velocity of a track
 * at a time, relative to its centre or to the star. The arc holding t is the last one starting at
 * or before t (so at a shared boundary the later arc); in it, the piece is found by index (equal
 * pieces) or by bisection of the boundaries (listed pieces), clamped to the first and last; then
 * the piece's series is summed by chebyshev.ts. reader.ts, the standalone reader, does exactly the
 * same operations, so both give the same doubles. Allocation-free.
 */
import { InputError } from '../math/index.ts';
import { chebyshevPosition, chebyshevVelocity } from './chebyshev.ts';
import type { RuntimeArc, RuntimeEphemeris, RuntimeTrack } from './model.ts';

/** Index of the track named `name`, or −1. */
export function trackIndex(data: RuntimeEphemeris, name: string): number {
  return data.tracks.findIndex((t) => t.name === name);
}

function trackOf(data: RuntimeEphemeris, index: number): RuntimeTrack {
  if (!(Number.isInteger(index) && index >= 0 && index < data.tracks.length)) {
    throw new InputError('track', `must be a track index in [0, ${data.tracks.length - 1}]`, index);
  }
  return data.tracks[index];
}

/** The arc of `track` flown at t (t checked to lie in the track's span). */
function arcAt(track: RuntimeTrack, t: number): RuntimeArc {
  const arcs = track.arcs;
  const last = arcs.length - 1;
  if (!(t >= arcs[0].t0 && t <= arcs[last].t1)) {
    throw new InputError('t', `must lie in the span of track '${track.name}' [${arcs[0].t0}, ${arcs[last].t1}] s`, t);
  }
  let lo = 0;
  let hi = last;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (arcs[mid].t0 <= t) lo = mid;
    else hi = mid - 1;
  }
  return arcs[lo];
}

// The piece found by `pieceAt`: its ends and the offset of its coefficients.
let pieceA = 0;
let pieceB = 0;
let pieceOffset = 0;

function pieceAt(arc: RuntimeArc, degree: number, t: number): void {
  let k: number;
  if (arc.length !== null) {
    k = Math.floor((t - arc.t0) / arc.length);
    if (k < 0) k = 0;
    if (k > arc.count - 1) k = arc.count - 1;
    pieceA = arc.t0 + k * arc.length;
    pieceB = pieceA + arc.length;
  } else {
    const br = arc.breaks!;
    let lo = 0;
    let hi = arc.count - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (br[mid] <= t) lo = mid;
      else hi = mid - 1;
    }
    k = lo;
    pieceA = br[k];
    pieceB = br[k + 1];
  }
  pieceOffset = k * 3 * (degree + 1);
}

/** Position of track `index` relative to its centre at t, m, into out3. */
export function trackPosition(data: RuntimeEphemeris, index: number, t: number, out3: Float64Array | number[]): Float64Array | number[] {
  const track = trackOf(data, index);
  const arc = arcAt(track, t);
  pieceAt(arc, track.degree, t);
  return chebyshevPosition(arc.coefficients, pieceOffset, track.degree, pieceA, pieceB, t, out3);
}

/** Velocity of track `index` relative to its centre at t (the derivative of the position series), m/s, into out3. */
export function trackVelocity(data: RuntimeEphemeris, index: number, t: number, out3: Float64Array | number[]): Float64Array | number[] {
  const track = trackOf(data, index);
  const arc = arcAt(track, t);
  pieceAt(arc, track.degree, t);
  return chebyshevVelocity(arc.coefficients, pieceOffset, track.degree, pieceA, pieceB, t, out3);
}

/** Index of the centre of track `index` at t (−1: the star). */
export function trackCenter(data: RuntimeEphemeris, index: number, t: number): number {
  return arcAt(trackOf(data, index), t).centerIndex;
}

const part = new Float64Array(3);

/** Position of track `index` relative to the star at t: its own plus its centres' up the chain, m, into out3. */
export function trackAbsolutePosition(data: RuntimeEphemeris, index: number, t: number, out3: Float64Array | number[]): Float64Array | number[] {
  let x = 0;
  let y = 0;
  let z = 0;
  let j = index;
  for (let hops = 0; j >= 0; hops++) {
    if (hops > data.tracks.length) throw new InputError('tracks', 'centres must lead to the star without a loop', index);
    const center = trackCenter(data, j, t);
    trackPosition(data, j, t, part);
    x += part[0];
    y += part[1];
    z += part[2];
    j = center;
  }
  out3[0] = x;
  out3[1] = y;
  out3[2] = z;
  return out3;
}
