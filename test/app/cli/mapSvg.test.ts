import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { deltaVMapSvg, mapLayoutBodies, parseSystemFile } from '../../../core/io/index.ts';
import { deltaVMap } from '../../../core/survey/index.ts';
import { ROOT, runCli } from './runCli.ts';

const DEMO = 'assets/systems/ilmar.system.json';
const system = parseSystemFile(readFileSync(join(ROOT, DEMO), 'utf8')).system;

describe.concurrent('waymark map --svg', () => {
  it('writes the diagram (paper theme) of the same map the core computes, beside the text report', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'wm-map-svg-'));
    const out = join(dir, 'ilmar.dv-map.svg');
    const r = await runCli(['map', '--system', DEMO, '--samples', '20', '--aero', '--svg', out]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^Δv map of Ilmar: /);
    const svg = readFileSync(out, 'utf8');
    expect(svg).toBe(deltaVMapSvg(deltaVMap(system, { samples: 20 }), { theme: 'paper', aero: true, bodies: mapLayoutBodies(system) }));
    // an earlier diagram is written over (a backup kept)
    const again = await runCli(['map', '--system', DEMO, '--samples', '20', '--svg', out]);
    expect(again.code).toBe(0);
    expect(readFileSync(out, 'utf8')).not.toBe(svg);
  });

  it('- writes the diagram to standard output instead of the text', async () => {
    const r = await runCli(['map', '--system', DEMO, '--samples', '20', '--svg', '-']);
    expect(r.code).toBe(0);
    expect(r.stdout.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
    expect(r.stdout.trimEnd().endsWith('</svg>')).toBe(true);
  });

  it('refuses to write over the system file read, a file Waymark cannot tell for a map diagram, or standard output twice', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'wm-map-svg-'));
    const sys = join(dir, 'ilmar.system.json');
    writeFileSync(sys, readFileSync(join(ROOT, DEMO)));
    const notes = join(dir, 'notes.svg');
    writeFileSync(notes, 'my own drawing\n');
    const [a, b, c] = await Promise.all([
      runCli(['map', '--system', sys, '--samples', '20', '--svg', sys]),
      runCli(['map', '--system', sys, '--samples', '20', '--svg', notes]),
      runCli(['map', '--system', sys, '--samples', '20', '--json', '--svg', '-']),
    ]);
    for (const x of [a, b, c]) expect(x.code).toBe(2);
    expect(a.stderr).toMatch(/--svg/);
    expect(b.stderr).toMatch(/--svg/);
    // with --json the refusal is written as JSON on standard output
    expect(`${c.stdout}${c.stderr}`).toMatch(/standard output/);
    expect(readFileSync(sys, 'utf8')).toBe(readFileSync(join(ROOT, DEMO), 'utf8'));
    expect(readFileSync(notes, 'utf8')).toBe('my own drawing\n');
  });
});
