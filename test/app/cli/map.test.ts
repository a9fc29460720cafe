import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseSystemFile } from '../../../core/io/index.ts';
import { deltaVMap } from '../../../core/survey/index.ts';
import { ROOT, runCli } from './runCli.ts';

const DEMO = 'assets/systems/ilmar.system.json';

describe.concurrent('waymark map', () => {
  it('prints the demo map as JSON: the same map the core computes for the same samples', async () => {
    const r = await runCli(['map', '--system', DEMO, '--samples', '20', '--json']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    const system = parseSystemFile(readFileSync(join(ROOT, DEMO), 'utf8')).system;
    const map = deltaVMap(system, { samples: 20 });
    expect(out.system).toBe('Ilmar');
    expect(out.nodes).toEqual(map.nodes);
    expect(out.edges).toEqual(JSON.parse(JSON.stringify(map.edges)));
    expect(out.rules).toEqual(map.rules);
    expect(out.warnings).toEqual([]);
  });

  it('prints a table per body, the transfers with their window dates, and the rules as footnotes', async () => {
    const r = await runCli(['map', '--system', DEMO, '--samples', '20']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^Δv map of Ilmar: 23 places, 58 moves\n/);
    expect(r.stdout).toMatch(
      /\nTessel \(air 90 km\)\n {2}surface → low orbit 100 km +[\d ]+ m\/s\n {2}low orbit 100 km → surface +[\d ]+ m\/s {3}aerobraked [\d ]+ m\/s/,
    );
    expect(r.stdout).toMatch(/\nMoravel \(air 1 000 km\) \(no surface\)\n {2}low orbit 1 010 km → SOI edge/);
    expect(r.stdout).toMatch(/\nTessel +Ochre +[\d ]+ m\/s +[\d ]+ m\/s +41\d-\d{3}T\d\d:\d\d +[\d.]+ d +[\d ]+–[\d ]+–[\d ]+ m\/s +[\d ]+ m\/s\n/);
    expect(r.stdout).toMatch(/\n\[1\] Low orbit: circular at the body's minimum safe altitude \+ 10 km\./);
    expect(r.stdout).not.toMatch(/NaN|undefined|Infinity/);
  });

  it('--aero puts the aerobraked figures first, marked', async () => {
    const r = await runCli(['map', '--system', DEMO, '--samples', '20', '--aero']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/low orbit 100 km → surface +[\d ]+ m\/s\* {3}powered [\d ]+ m\/s/);
  });

  it("bad input exits 2 in the user's words", async () => {
    const [a, b, c] = await Promise.all([
      runCli(['map', '--system', DEMO, '--samples', 'lots', '--json']),
      runCli(['map', '--system', 'no/such/file.json']),
      runCli(['map']),
    ]);
    expect(a.code).toBe(2);
    expect(JSON.parse(a.stdout).error.field).toBe('--samples');
    expect(b.code).toBe(2);
    expect(b.stderr).toMatch(/does not exist/);
    expect(c.code).toBe(2);
    expect(c.stderr).toMatch(/required option '--system <file>' not specified/);
  });
});
