/**
 * The runtime ephemeris file (core/runtime/format.ts): both forms read back to the very data
 * written, the binary bytes follow the layout the module comment documents, and broken files are
 * refused with the field named.
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../core/math/index.ts';
import {
  RUNTIME_FORMAT,
  decodeRuntimeBinary,
  decodeRuntimeJson,
  encodeRuntimeBinary,
  encodeRuntimeJson,
  runtimeEphemeris,
} from '../../../core/runtime/index.ts';
import type { RuntimeFile } from '../../../core/runtime/index.ts';
import { demoFlight, demoShipInput, ilmar } from './demoShip.ts';

const system = ilmar();
const flight = demoFlight(system);
const t0 = flight.segments[0].t0;
const t1 = flight.segments[flight.segments.length - 1].t1;
const data = runtimeEphemeris(system, { t0, t1, ships: [demoShipInput(flight)] });
const jsonText = JSON.stringify(encodeRuntimeJson(data));
const binary = encodeRuntimeBinary(data);
const doc = (): RuntimeFile => JSON.parse(jsonText) as RuntimeFile;

describe('round trips', () => {
  it('JSON (stringified and parsed) reads back to the same data, every double identical', () => {
    expect(decodeRuntimeJson(JSON.parse(jsonText))).toEqual(data);
    expect(doc().format).toBe(RUNTIME_FORMAT);
    expect(doc().units).toEqual({ length: 'm', time: 's' });
  });

  it('binary reads back to the same data', () => {
    expect(decodeRuntimeBinary(binary)).toEqual(data);
    expect(decodeRuntimeBinary(encodeRuntimeBinary(decodeRuntimeBinary(binary)))).toEqual(data);
  });
});

describe('the binary layout is the documented one', () => {
  const utf8 = (s: string) => new TextEncoder().encode(s).length;
  it('header: magic "WMRE", u16 version, u16 track count, f64 t0, f64 t1, then the system name as u16 length + UTF-8', () => {
    const v = new DataView(binary);
    expect(String.fromCharCode(...new Uint8Array(binary, 0, 4))).toBe('WMRE');
    expect(v.getUint16(4, true)).toBe(1);
    expect(v.getUint16(6, true)).toBe(data.tracks.length);
    expect(v.getFloat64(8, true)).toBe(t0);
    expect(v.getFloat64(16, true)).toBe(t1);
    expect(v.getUint16(24, true)).toBe(5);
    expect(new TextDecoder().decode(new Uint8Array(binary, 26, 5))).toBe('Ilmar');
  });

  it('the size is the sum of the documented fields', () => {
    let size = 4 + 2 + 2 + 8 + 8 + (2 + utf8(data.system)) + (2 + utf8(data.origin)) + (2 + utf8(data.epoch));
    for (const tr of data.tracks) {
      size += 2 + utf8(tr.name) + 1 + 1 + 8 + 8 + 4 + 32 * tr.fine.length + 4;
      for (const a of tr.arcs) {
        size += 2 + utf8(a.center) + 4 + 1 + 4 + 8 + 8 + (a.length !== null ? 8 : 8 * (a.count + 1)) + 8 * a.count * 3 * (tr.degree + 1);
      }
    }
    expect(binary.byteLength).toBe(size);
  });
});

describe('broken files are refused, the field named', () => {
  it('binary: cut short anywhere, a wrong magic, another version, bytes after the last track', () => {
    expect(() => decodeRuntimeBinary(binary.slice(0, 30))).toThrow(/^system is cut short/);
    expect(() => decodeRuntimeBinary(binary.slice(0, binary.byteLength - 8))).toThrow(/^tracks\[8\]\.arcs\[2\]\.coefficients is cut short/);
    expect(() => decodeRuntimeBinary(binary.slice(0, 2))).toThrow(/^magic is cut short/);
    for (const cut of [4, 7, 23, 100, 1000, 20_000]) expect(() => decodeRuntimeBinary(binary.slice(0, cut))).toThrow(InputError);
    const magic = binary.slice(0);
    new Uint8Array(magic)[0] = 0x58;
    expect(() => decodeRuntimeBinary(magic)).toThrow(/^magic must be "WMRE"/);
    const version = binary.slice(0);
    new DataView(version).setUint16(4, 2, true);
    expect(() => decodeRuntimeBinary(version)).toThrow(/^version must be 1/);
    const longer = new Uint8Array(binary.byteLength + 1);
    longer.set(new Uint8Array(binary));
    expect(() => decodeRuntimeBinary(longer.buffer)).toThrow(/^file must end after the last track/);
  });

  it('JSON: wrong format or version, coefficients of the wrong length, a bad centre, arcs not contiguous, a non-number, unequal pieces', () => {
    const cases: [string, (d: RuntimeFile) => void, RegExp][] = [
      ['format', (d) => ((d as { format: string }).format = 'other'), /^format must be "waymark-runtime-ephemeris"/],
      ['version', (d) => ((d as { version: number }).version = 2), /^version must be 1/],
      ['coefficients', (d) => d.tracks[0].arcs[0].coefficients.pop(), /^tracks\[0\]\.arcs\[0\]\.coefficients must hold \d+ numbers/],
      ['centre index', (d) => (d.tracks[2].arcs[0].centerIndex = 2), /^tracks\[2\]\.arcs\[0\]\.centerIndex must not be the track itself/],
      ['centre name', (d) => (d.tracks[2].arcs[0].center = 'ochre'), /^tracks\[2\]\.arcs\[0\]\.center must be the name of centre 1 \("tessel"\)/],
      ['contiguity', (d) => (d.tracks[8].arcs[1].t0 += 1), /^tracks\[8\]\.arcs\[1\]\.t0 must equal the previous arc's t1/],
      ['a null', (d) => ((d.tracks[3].arcs[0].coefficients as unknown[])[5] = null), /^tracks\[3\]\.arcs\[0\]\.coefficients\[5\] must be a finite number/],
      ['length', (d) => (d.tracks[1].arcs[0].length! *= 1.01), /^tracks\[1\]\.arcs\[0\]\.length must be \(t1 − t0\)\/count/],
      ['breaks order', (d) => (d.tracks[8].arcs[0].breaks![2] = d.tracks[8].arcs[0].breaks![1]), /^tracks\[8\]\.arcs\[0\]\.breaks\[2\] must be later/],
      ['both layouts', (d) => (d.tracks[8].arcs[0].length = 5), /^tracks\[8\]\.arcs\[0\] must have exactly one of "length"/],
      ['degree', (d) => (d.tracks[0].degree = 0), /^tracks\[0\]\.degree must be an integer in \[1, 40\]/],
      ['tolerance', (d) => (d.tracks[0].tolerance = 0), /^tracks\[0\]\.tolerance must be > 0/],
      ['units', (d) => ((d.units as { length: string }).length = 'km'), /^units must be/],
    ];
    for (const [what, edit, message] of cases) {
      const d = doc();
      edit(d);
      expect(() => decodeRuntimeJson(d), what).toThrow(message);
      expect(() => decodeRuntimeJson(d), what).toThrow(InputError);
    }
    expect(() => decodeRuntimeJson('text')).toThrow(/^document must be an object/);
  });
});
