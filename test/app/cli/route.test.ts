/**
 * `waymark route` on the demo system: the moon demo's route from a few choices, written as a plan
 * that `check` accepts, and bad options refused with exit code 2 naming the flag.
 */
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { parseBodyAltitude } from '../../../app/cli/commands/route.ts';
import { loadPlanFile } from '../../../app/node/files.ts';
import { evaluate } from '../../../core/conic/evaluate.ts';
import { runCli } from './runCli.ts';

const SYSTEM = 'assets/systems/ilmar.system.json';
const work = mkdtempSync(join(tmpdir(), 'waymark-route-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

describe('waymark route', () => {
  it('Tessel 300 km to a 500 km orbit of Skerry: writes a plan that check accepts and that reaches the orbit', async () => {
    const out = join(work, 'skerry.plan.json');
    const r = await runCli([
      'route',
      '--system',
      SYSTEM,
      '--from',
      'tessel:300km',
      '--to',
      'skerry:500km',
      '--after',
      '0d',
      '--before',
      '400d',
      '--vehicle-from',
      'assets/plans/tessel-to-skerry.plan.json',
      '-o',
      out,
      '--json',
    ]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect([doc.status, doc.met, doc.file]).toEqual(['met', true, out]);
    expect(doc.hops.map((h: { kind: string }) => h.kind)).toEqual(['siblings', 'to-moon']);
    const check = await runCli(['check', out]);
    expect(check.code).toBe(0);
    expect(check.stdout).toMatch(/HOLDS/);
    // read back: the plan's own evaluation ends in the target orbit (10 km is the plan's tolerance;
    // the orbit is met to the targeter's 100 m)
    const saved = await loadPlanFile(out);
    expect(saved.plan.target?.body).toBe('skerry');
    const res = evaluate(saved.system, saved.plan, { samplesPerSegment: 0 });
    expect(res.target?.reached).toBe(true);
    expect(Math.abs((res.target?.achieved?.periapsisAltitude ?? Number.NaN) - 500e3)).toBeLessThan(100);
  });

  it('bad options exit 2 with a message naming the flag, and nothing is written', async () => {
    const out = join(work, 'bad.plan.json');
    const base = ['route', '--system', SYSTEM, '-o', out];
    // two refusals in parallel child processes (the core's own refusals are tested in test/core/route)
    const [low, empty] = await Promise.all([
      runCli([...base, '--from', 'tessel:30km', '--to', 'skerry:500km', '--after', '0d', '--before', '400d']),
      runCli([...base, '--from', 'tessel', '--to', 'quill', '--after', '40d', '--before', '10d']),
    ]);
    expect(low.code).toBe(2);
    expect(low.stderr).toMatch(/--from must be at least Tessel's safe altitude 90 km/);
    expect(empty.code).toBe(2);
    expect(empty.stderr).toMatch(/--before must be after the earliest departure/);
    expect(existsSync(out)).toBe(false);
  });

  it('BODY[:ALT] reads the body and the altitude with its unit', () => {
    expect(parseBodyAltitude('--from', 'Tessel:300km')).toEqual({ body: 'tessel', altitude: 300e3 });
    expect(parseBodyAltitude('--to', 'skerry')).toEqual({ body: 'skerry', altitude: undefined });
    expect(() => parseBodyAltitude('--from', 'tessel:300parsecs')).toThrow(/--from/);
  });
});
