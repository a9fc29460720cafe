/**
 * The standalone reader (core/runtime/reader.ts): it imports nothing, and it gives exactly the
 * fit's own evaluation (core/runtime/evaluate.ts) from both file forms. Exactly, not within a
 * tolerance: both forms carry the same doubles (JSON writes the shortest decimal that reads back
 * as the same double, the binary form the IEEE 754 bits), and the reader does the same floating
 * point operations in the same order as the evaluation (piece ends t0 + k·length, s, Clenshaw,
 * the chain of centres added from the track up), so every result is bit-identical.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { stream } from '../../../core/math/index.ts';
import {
  encodeRuntimeBinary,
  encodeRuntimeJson,
  openRuntimeEphemeris,
  runtimeEphemeris,
  trackAbsolutePosition,
  trackCenter,
  trackPosition,
  trackVelocity,
} from '../../../core/runtime/index.ts';
import { demoFlight, demoShipInput, ilmar } from './demoShip.ts';

const system = ilmar();
const flight = demoFlight(system);
const t0 = flight.segments[0].t0;
const t1 = flight.segments[flight.segments.length - 1].t1;
const data = runtimeEphemeris(system, { t0, t1, ships: [demoShipInput(flight)] });
const fromJson = openRuntimeEphemeris(JSON.parse(JSON.stringify(encodeRuntimeJson(data))));
const fromBinary = openRuntimeEphemeris(encodeRuntimeBinary(data));

/** Times to compare at: random ones, every piece boundary of every track (both sides), the span's ends. */
function times(): number[] {
  const rng = stream(2026, 0);
  const out = [t0, t1];
  for (let i = 0; i < 3000; i++) out.push(rng.uniform(t0, t1));
  for (const tr of data.tracks) {
    for (const a of tr.arcs) {
      for (let k = 0; k <= a.count; k++) {
        const tb = a.length !== null ? a.t0 + k * a.length : a.breaks![k];
        for (const t of [tb, tb - 1e-3, tb + 1e-3]) if (t >= t0 && t <= t1) out.push(t);
      }
    }
  }
  return out;
}

describe('reader.ts', () => {
  it('imports nothing (a game copies the one file)', () => {
    const text = readFileSync(new URL('../../../core/runtime/reader.ts', import.meta.url), 'utf8');
    expect(text).not.toMatch(/^\s*(import|export)\s[^;]*\sfrom\s/m);
    expect(text).not.toMatch(/\bimport\s*\(|\brequire\s*\(/);
    expect(text).toMatch(/export function openRuntimeEphemeris/); // the scan reads the right file
  });

  it('gives exactly the fit’s positions, velocities, centres and star-relative positions, from JSON and from binary, at random times and every piece boundary', () => {
    const want = new Float64Array(3);
    const got = [0, 0, 0];
    const ts = times();
    expect(ts.length).toBeGreaterThan(3500);
    const mismatches: string[] = [];
    let compared = 0;
    const same = (what: string, k: number, t: number) => {
      compared++;
      // Object.is: bit-identical, +0 and −0 told apart
      if (!(Object.is(got[0], want[0]) && Object.is(got[1], want[1]) && Object.is(got[2], want[2]))) mismatches.push(`${what} track ${k} t ${t}`);
    };
    for (const reader of [fromJson, fromBinary]) {
      for (let k = 0; k < data.tracks.length; k++) {
        const tr = data.tracks[k];
        const lo = tr.arcs[0].t0;
        const hi = tr.arcs[tr.arcs.length - 1].t1;
        for (const t of ts) {
          if (t < lo || t > hi) continue;
          trackPosition(data, k, t, want);
          reader.position(k, t, got);
          same('position', k, t);
          trackVelocity(data, k, t, want);
          reader.velocity(tr.name, t, got);
          same('velocity', k, t);
          trackAbsolutePosition(data, k, t, want);
          reader.absolutePosition(k, t, got);
          same('absolute position', k, t);
          if (reader.center(k, t) !== trackCenter(data, k, t)) mismatches.push(`centre track ${k} t ${t}`);
        }
      }
    }
    expect(mismatches.slice(0, 10)).toEqual([]);
    expect(compared).toBeGreaterThan(100_000);
  });

  it('carries the header and the track names; a name and its index read the same track', () => {
    for (const reader of [fromJson, fromBinary]) {
      expect(reader.system).toBe('Ilmar');
      expect(reader.origin).toBe('ilmar');
      expect(reader.epoch).toBe(system.epoch.label);
      expect([reader.t0, reader.t1]).toEqual([t0, t1]);
      expect(reader.names).toEqual(data.tracks.map((t) => t.name));
      expect(reader.trackIndex('quill')).toBe(system.indexById.quill - 1);
      const t = 0.5 * (t0 + t1);
      expect(reader.position('quill', t, [0, 0, 0])).toEqual(reader.position(system.indexById.quill - 1, t, [0, 0, 0]));
    }
  });

  it('refuses an unknown track, a time outside the span, a cut-short or foreign binary file and a foreign JSON document, with a message naming them', () => {
    expect(() => fromJson.position('venus', t0, [0, 0, 0])).toThrow(/track "venus" is not in the file/);
    expect(() => fromBinary.velocity(99, t0, [0, 0, 0])).toThrow(/track index 99 is not in \[0, 8\]/);
    expect(() => fromJson.position('tessel', t1 + 1, [0, 0, 0])).toThrow(/t .* is outside track "tessel"'s span/);
    const bin = encodeRuntimeBinary(data);
    expect(() => openRuntimeEphemeris(bin.slice(0, bin.byteLength - 1))).toThrow(/tracks\[8\]\.arcs\[2\]\.coefficients is cut short/);
    expect(() => openRuntimeEphemeris(bin.slice(0, 3))).toThrow(/magic is cut short/);
    expect(() => openRuntimeEphemeris(new TextEncoder().encode('{"format":1}').buffer as ArrayBuffer)).toThrow(/magic must be "WMRE"/);
    expect(() => openRuntimeEphemeris({ format: 'waymark-plan', version: 1 })).toThrow(/format must be "waymark-runtime-ephemeris"/);
    const doc = encodeRuntimeJson(data);
    doc.tracks[4].arcs[0].coefficients.pop();
    expect(() => openRuntimeEphemeris(doc)).toThrow(/tracks\[4\]\.arcs\[0\]\.coefficients must hold \d+ numbers/);
  });
});
