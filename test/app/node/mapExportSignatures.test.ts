/**
 * The output guard knows the Δv map's exports by their start, as their writers write them:
 * core/io deltaVMapSvg (SVG), the map as JSON (the panel's export and `waymark map --json`),
 * core/io deltaVMapCsv, and a PNG (signature of ISO/IEC 15948 §5.2).
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { deltaVMapCsv, deltaVMapSvg } from '../../../core/io/index.ts';
import { identifyFile } from '../../../app/node/files.ts';
import { fixtureMap } from '../../core/io/deltaVMapFixture.ts';

describe('output guard: the Δv map exports', () => {
  it('identifies each export by what its writer writes, and nothing else as one', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'wm-map-sig-'));
    const file = (name: string, data: string | Uint8Array) => {
      const p = join(dir, name);
      writeFileSync(p, data);
      return p;
    };
    const map = fixtureMap();
    expect((await identifyFile(file('a.svg', deltaVMapSvg(map)))).kind).toBe('map-svg');
    expect((await identifyFile(file('a.json', `${JSON.stringify(map, null, 2)}\n`))).kind).toBe('map-json');
    expect((await identifyFile(file('b.json', `${JSON.stringify({ ...map, warnings: [] }, null, 2)}\n`))).kind).toBe('map-json');
    expect((await identifyFile(file('a.csv', deltaVMapCsv(map)))).kind).toBe('map-csv');
    const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]);
    expect((await identifyFile(file('a.png', png))).kind).toBe('map-png');
    // another SVG, another JSON object: not a map
    expect((await identifyFile(file('c.svg', '<svg xmlns="http://www.w3.org/2000/svg" width="1" height="1"></svg>\n'))).kind).toBe('unknown');
    expect((await identifyFile(file('c.json', '{"system": "x", "other": 1}\n'))).kind).toBe('json');
  });
});
