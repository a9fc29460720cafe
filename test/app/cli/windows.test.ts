import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseTime } from '../../../app/cli/commands/windows.ts';
import { InputError } from '../../../core/math/errors.ts';
import { dateToSeconds } from '../../../core/system/calendar.ts';
import { demoSystem } from '../../core/search/fixtures.ts';

const ROOT = fileURLToPath(new URL('../../../', import.meta.url));
const TSX = join(ROOT, 'node_modules/tsx/dist/cli.mjs');

function cli(...args: string[]): { code: number | null; stdout: string; stderr: string } {
  // the timeout is a hang guard, not a speed check
  const r = spawnSync(process.execPath, [TSX, 'app/cli/main.ts', ...args], { cwd: ROOT, encoding: 'utf8', timeout: 240_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

const DEMO = ['--system', 'assets/systems/ilmar.system.json'];

describe('waymark windows', () => {
  it('--json prints the request, the grid minimum and the windows (demo system, Tessel to Ochre)', () => {
    const r = cli('windows', ...DEMO, '--from', 'tessel', '--to', 'ochre', '--grid', '60x40', '--json');
    expect(r.stderr).toBe(''); // no progress bar with --json
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.request.fromId).toBe('tessel');
    expect(out.request.toId).toBe('ochre');
    expect(out.grid.nDepart).toBe(60);
    expect(out.grid.nTof).toBe(40);
    expect(out.grid.unsolved).toBe(0);
    const min = out.grid.min;
    expect(min.dvTotal).toBeCloseTo(min.dvDepart + min.dvArrive, 6);
    expect(min.dvTotal).toBeGreaterThan(1000);
    expect(min.arrival - min.departure).toBeCloseTo(min.tof, 3);
    expect(out.windows.length).toBeGreaterThan(0);
    for (const w of out.windows) {
      expect(w.dvTotal).toBeLessThanOrEqual(w.grid.value + 1e-3); // refinement never ends above its grid cell
      expect(typeof w.departureDate).toBe('string');
      expect(w.tof).toBeGreaterThan(0);
      expect(Math.abs(w.c3 - w.vInfDepart ** 2)).toBeLessThan(4 * Number.EPSILON * w.c3); // C3 = v∞² to rounding (measured 1.2e-16 relative)
    }
    const best = Math.min(...out.windows.map((w: { dvTotal: number }) => w.dvTotal));
    expect(best).toBeLessThanOrEqual(min.dvTotal + 1e-6);
  });

  it('--csv lists the windows; text output is a table; --grid-out writes the grid', () => {
    const dir = mkdtempSync(join(tmpdir(), 'waymark-windows-'));
    const file = join(dir, 'grid.json');
    const csv = cli(
      'windows',
      ...DEMO,
      '--from',
      'tessel',
      '--to',
      'ochre',
      '--grid',
      '40x30',
      '--depart',
      '412-001..600d',
      '--tof',
      '100d..400d',
      '--csv',
      '--grid-out',
      file,
      '--workers',
      '2',
    );
    expect(csv.code).toBe(0);
    const lines = csv.stdout.trim().split('\n');
    expect(lines[0].split(',')).toContain('dv_total_m_s');
    expect(lines.length).toBeGreaterThan(1);
    const grid = JSON.parse(readFileSync(file, 'utf8'));
    expect(grid.planes.dvTotal.length).toBe(40 * 30);
    expect(grid.departTimes[0]).toBe(0);
    expect(grid.secondValues[29]).toBe(400 * 86400);
    const text = cli('windows', ...DEMO, '--from', 'tessel', '--to', 'ochre', '--grid', '40x30', '--top', '1');
    expect(text.code).toBe(0);
    expect(text.stdout).toMatch(/Tessel -> Ochre/);
    expect(text.stdout).toMatch(/dv total m\/s/);
    expect(
      text.stdout
        .trim()
        .split('\n')
        .filter((l) => /^1\*?\s/.test(l)).length,
    ).toBe(1);
  });

  it('a pair no single transfer covers searches the leg with the window and says so (Tessel to Skerry: Tessel to Moravel)', () => {
    const r = cli('windows', ...DEMO, '--from', 'tessel', '--to', 'skerry', '--grid', '12x10', '--json');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.request.fromId).toBe('tessel');
    expect(out.request.toId).toBe('moravel');
    expect(out.through).toBe('Skerry is reached through Moravel: the window shown is Tessel → Moravel');
    // the default capture is Moravel's, above its 1000 km safe altitude
    expect(out.request.arrivalAltitude).toBeGreaterThanOrEqual(1000e3);
  });

  it('bad input exits 2 with a typed error naming the option', () => {
    const r = cli('windows', ...DEMO, '--from', 'tessel', '--to', 'tessel', '--grid', '10x10', '--json');
    expect(r.code).toBe(2);
    const e = JSON.parse(r.stdout).error;
    expect(e.type).toBe('InputError');
    expect(e.field).toBe('--to');
    // Moravel's minimum safe altitude is 1000 km: a 400 km capture is refused, never carried
    const c = cli('windows', ...DEMO, '--from', 'tessel', '--to', 'moravel', '--capture', '400km', '--grid', '10x10', '--json');
    expect(c.code).toBe(2);
    expect(JSON.parse(c.stdout).error.field).toBe('--capture');
    const g = cli('windows', ...DEMO, '--from', 'tessel', '--to', 'ochre', '--grid', '10by10');
    expect(g.code).toBe(2);
    expect(g.stderr).toMatch(/--grid/);
  });

  it('reads times as calendar dates or durations from the epoch', () => {
    const sys = demoSystem();
    const cal = sys.calendar;
    expect(parseTime(cal, 't', '120d')).toBe(120 * 86400);
    expect(parseTime(cal, 't', '412-037')).toBe(dateToSeconds(cal, 412, 37));
    expect(parseTime(cal, 't', 'Year 413 TR, day 2, 06:00')).toBe(dateToSeconds(cal, 413, 2, 6 * 3600));
    expect(() => parseTime(cal, 't', 'soon')).toThrow(InputError);
  });
});
