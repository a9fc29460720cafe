import { describe, expect, it } from 'vitest';
import { runCli } from './runCli.ts';

const DEMO = 'assets/systems/ilmar.system.json';

describe.concurrent('waymark stability', () => {
  it('runs the demo system for a few decades and prints JSON (no flags: exit 0)', async () => {
    const r = await runCli(['stability', DEMO, '--years', '30', '--samples', '50', '--method', 'yoshida4', '--json']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.system).toBe('Ilmar');
    expect(out.years).toBeCloseTo(30, 6);
    expect(out.flags).toEqual([]);
    expect(out.mergedMoons).toBe(false);
    expect(out.bodies.length).toBe(8);
    expect(out.t.length).toBe(50);
    expect(out.bodies[0].history.a.length).toBe(50);
    expect(out.energy.maxRelativeError).toBeLessThan(2e-12); // Yoshida 4 over 30 years: measured 2.6e-13
  });

  it('text output with moons merged on request (the default method, Wisdom–Holman)', async () => {
    const r = await runCli(['stability', DEMO, '--years', '100', '--merge-moons']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^stability of Ilmar: 100\.0 years \(Wisdom–Holman map/);
    expect(r.stdout).toMatch(/moons merged into their planets on request/);
    expect(r.stdout).toMatch(/Moravel–Fennick/);
    expect(r.stdout).toMatch(/no flags/);
  });

  it('bad input exits 2', async () => {
    const r = await runCli(['stability', DEMO, '--years', 'many', '--json']);
    expect(r.code).toBe(2);
    expect(JSON.parse(r.stdout).error.field).toBe('--years');
    const f = await runCli(['stability', 'no/such/file.json']);
    expect(f.code).toBe(2);
  });
});
