/**
 * The runtime ephemeris file's JSON Schema (assets/schema/runtime-ephemeris.schema.json, emitted
 * from core/io/runtimeFileShape.ts) against what the encoder writes: ajv accepts the demo file and
 * refuses broken ones, the schema's document type and core/runtime's `RuntimeFile` are the same
 * type, and every field the schema declares is written.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { compileFileSchema } from '../../../core/io/fileValidator.ts';
import type { RuntimeFileDocument } from '../../../core/io/runtimeFileShape.ts';
import { encodeRuntimeJson, runtimeEphemeris } from '../../../core/runtime/index.ts';
import type { RuntimeFile } from '../../../core/runtime/index.ts';
import { demoFlight, demoShipInput, ilmar } from '../runtime/demoShip.ts';

// The declaration and the encoder's type are one type: each assignable to the other.
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
const sameType: Same<RuntimeFileDocument, RuntimeFile> = true;

const schema = JSON.parse(readFileSync(new URL('../../../assets/schema/runtime-ephemeris.schema.json', import.meta.url), 'utf8')) as Record<string, unknown>;
const validate = compileFileSchema(schema);
const system = ilmar();
const flight = demoFlight(system);
const t0 = flight.segments[0].t0;
const t1 = flight.segments[flight.segments.length - 1].t1;
const text = JSON.stringify(encodeRuntimeJson(runtimeEphemeris(system, { t0, t1, ships: [demoShipInput(flight)] })));

describe('runtime ephemeris JSON Schema', () => {
  it('accepts the demo file (bodies with equal pieces, the ship with listed pieces and fine windows)', () => {
    expect(sameType).toBe(true);
    expect(validate(JSON.parse(text)), JSON.stringify(validate.errors?.slice(0, 3))).toBe(true);
  });

  it('refuses an arc with both layouts or neither, an unknown field, a bad unit, a degree of 0', () => {
    const edits: ((d: RuntimeFileDocument) => void)[] = [
      (d) => (d.tracks[8].arcs[0].length = 5),
      (d) => delete d.tracks[0].arcs[0].length,
      (d) => ((d as Record<string, unknown>).extra = 1),
      (d) => ((d.units as { length: string }).length = 'km'),
      (d) => (d.tracks[0].degree = 0),
    ];
    for (const edit of edits) {
      const d = JSON.parse(text) as RuntimeFileDocument;
      edit(d);
      expect(validate(d)).toBe(false);
    }
  });

  it('every property the schema declares is written in the demo file', () => {
    const declared = new Set<string>();
    const walk = (n: unknown): void => {
      if (Array.isArray(n)) n.forEach(walk);
      else if (n && typeof n === 'object') {
        for (const [k, v] of Object.entries(n)) {
          if (k === 'properties') for (const name of Object.keys(v as object)) declared.add(name);
          walk(v);
        }
      }
    };
    walk(schema);
    const written = new Set<string>();
    const keys = (n: unknown): void => {
      if (Array.isArray(n)) n.forEach(keys);
      else if (n && typeof n === 'object') {
        for (const [k, v] of Object.entries(n)) {
          written.add(k);
          keys(v);
        }
      }
    };
    keys(JSON.parse(text));
    expect(declared.size).toBeGreaterThan(20);
    expect([...declared].filter((k) => !written.has(k))).toEqual([]);
  });

  it('the description documents the binary form (magic, version, little-endian)', () => {
    expect(schema.description).toMatch(/magic "WMRE", u16 version 1/);
    expect(schema.description).toMatch(/little-endian/);
  });
});
