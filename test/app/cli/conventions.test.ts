/**
 * Command-line conventions end to end (the program in a child process, as a pipeline runs it):
 * usage errors exit 2 naming the option, angles are degrees unless a unit says otherwise, body
 * names match in any case, and `calc --system F --body B` gives what typing the body's μ and
 * radius from the file gives.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT, runCli } from './runCli.ts';

const SYSTEM = 'assets/systems/ilmar.system.json';
const DEMO = 'assets/plans/tessel-to-ochre.plan.json';
const file = JSON.parse(readFileSync(join(ROOT, SYSTEM), 'utf8')) as {
  name: string;
  star: { id: string; name: string; mu_m3_s2: number };
  bodies: { id: string; name: string; parent: string; mu_m3_s2: number; radius_m: number; orbit: { a_m: number; e: number } }[];
};
const body = (id: string) => file.bodies.find((b) => b.id === id)!;
const muOf = (id: string) => (id === file.star.id ? file.star.mu_m3_s2 : body(id).mu_m3_s2);

describe('exit codes of usage errors', () => {
  // [what, arguments, exit code, what stderr names]
  const table: [string, string[], number, RegExp][] = [
    ['unknown option', ['calc', 'rocket', '--isp', '300', '--m0', '1t', '--dv', '1km/s', '--bogus'], 2, /unknown option '--bogus'/],
    ['unknown command', ['nosuch'], 2, /unknown command 'nosuch'/],
    ['unknown sub-command', ['calc', 'nosuch'], 2, /unknown command 'nosuch'/],
    ['command group without a sub-command', ['calc'], 2, /Usage: waymark calc/],
    ['missing required option', ['calc', 'kepler', '--mu', '1', '--r', '1,0,0', '--v', '0,1,0'], 2, /required option '--dt <t>' not specified/],
    ['missing required option of a plan command', ['correct', DEMO], 2, /required option '-o, --output <file>' not specified/],
    ['missing argument', ['check'], 2, /missing required argument 'plan'/],
    ['option without its value', ['fly', DEMO, '--step'], 2, /option '--step <t>' argument missing/],
    ['too many arguments', ['check', DEMO, 'extra'], 2, /too many arguments/],
    ['bad option value', ['calc', 'hohmann', '--mu', 'abc', '--r1', '7000km', '--r2', '8000km'], 2, /--mu must be a number/],
    ['bad option value of a file command', ['fly', DEMO, '--step', '0'], 2, /--step must be > 0/],
    ['μ neither typed nor from a system', ['calc', 'hohmann', '--r1', '7000km', '--r2', '8000km'], 2, /--mu is required \(or --system FILE --body BODY\)/],
  ];
  it.each(table)('%s exits %i', async (_what, args, code, words) => {
    const r = await runCli(args);
    expect(r.stderr).toMatch(words);
    expect(r.code).toBe(code);
    expect(r.stdout).toBe('');
  });

  it('--help and --version exit 0', async () => {
    const [a, b, c] = await Promise.all([runCli(['--help']), runCli(['calc', 'kepler', '--help']), runCli(['--version'])]);
    expect([a.code, b.code, c.code]).toEqual([0, 0, 0]);
    expect(b.stdout).toMatch(/\nExamples?:\n {2}\$ waymark calc kepler /);
  });
});

describe('angles: degrees unless a unit says otherwise', () => {
  // a circular orbit at the node (raan = argp = nu = 0): v = sqrt(mu/a)·(0, cos i, sin i) (analytic)
  const mu = 3.986004418e14;
  const a = 7000e3;
  const run = (i: string) => runCli(['calc', 'elements', `--mu=${mu}`, `--a=${a}`, '--e=0', `--i=${i}`, '--json']);

  it('--i=30 is 30°, as --i=30deg; --i=0.5rad is radians', async () => {
    const [bare, deg, rad] = await Promise.all([run('30'), run('30deg'), run('0.5rad')]);
    const vc = Math.sqrt(mu / a);
    for (const [r, i] of [
      [bare, (30 * Math.PI) / 180],
      [deg, (30 * Math.PI) / 180],
      [rad, 0.5],
    ] as const) {
      expect(r.code).toBe(0);
      const v = JSON.parse(r.stdout).v as number[];
      // a few ulps of 7.5 km/s from sqrt and the rotations: 1e-6 m/s is far below any misread angle (30 rad vs 30° differ by km/s)
      expect(Math.abs(v[1] - vc * Math.cos(i))).toBeLessThan(1e-6);
      expect(Math.abs(v[2] - vc * Math.sin(i))).toBeLessThan(1e-6);
    }
  });

  it('the text output says the angles were read in degrees', async () => {
    const r = await runCli(['calc', 'elements', `--mu=${mu}`, `--a=${a}`, '--e=0', '--i=30']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/i = 30\.0000 deg.*\(angles without a unit are degrees\)/);
  });
});

describe('body names in any case', () => {
  const windows = (from: string, to: string) =>
    runCli(['windows', '--system', SYSTEM, '--from', from, '--to', to, '--grid', '12x12', '--workers', '0', '--top', '1', '--json']);

  it('windows --from Tessel / TESSEL / tessel give the same windows', async () => {
    const runs = await Promise.all([windows('tessel', 'ochre'), windows('Tessel', 'OCHRE'), windows('TESSEL', 'Ochre')]);
    for (const r of runs) expect(r.code).toBe(0);
    const windowsOf = (s: string) => JSON.stringify(JSON.parse(s).windows);
    expect(windowsOf(runs[1].stdout)).toBe(windowsOf(runs[0].stdout));
    expect(windowsOf(runs[2].stdout)).toBe(windowsOf(runs[0].stdout));
  });

  it('a name that matches no body exits 2 listing the bodies as the system names them', async () => {
    const r = await windows('Nowhere', 'ochre');
    expect(r.code).toBe(2);
    expect(r.stdout).toContain('--from');
    for (const b of file.bodies) expect(r.stdout).toContain(b.name);
  });

  it('calc --body matches any case too', async () => {
    const [lower, upper] = await Promise.all([
      runCli(['calc', 'hohmann', '--system', SYSTEM, '--body', 'quill', '--alt1', '100km', '--alt2', '900km', '--json']),
      runCli(['calc', 'hohmann', '--system', SYSTEM, '--body', 'QUILL', '--alt1', '100km', '--alt2', '900km', '--json']),
    ]);
    expect(lower.code).toBe(0);
    expect(upper.stdout).toBe(lower.stdout);
  });
});

describe('calc --system F --body B: μ and radius from the file', () => {
  // the same calculation with μ and radius typed from the JSON file, read here: the results must be identical
  it('hohmann: --alt1/--alt2 above the body equal --r1/--r2 typed as radius + altitude', async () => {
    const t = body('tessel');
    const [named, typed] = await Promise.all([
      runCli(['calc', 'hohmann', '--system', SYSTEM, '--body', 'Tessel', '--alt1', '300km', '--alt2', '35000km', '--json']),
      runCli(['calc', 'hohmann', `--mu=${t.mu_m3_s2}`, `--r1=${t.radius_m + 300e3}`, `--r2=${t.radius_m + 35000e3}`, '--json']),
    ]);
    expect(named.code).toBe(0);
    expect(typed.code).toBe(0);
    expect(JSON.parse(named.stdout)).toEqual(JSON.parse(typed.stdout));
  });

  it('kepler, lambert, elements and bielliptic take μ from the body', async () => {
    const q = body('quill');
    const cases = [
      ['kepler', '--r=2000km,0,0', '--v=0,1km/s,0', '--dt=2h'],
      ['lambert', '--r1=2000km,0,0', '--r2=0,3000km,100km', '--tof=3h'],
      ['elements', '--r=2000km,0,0', '--v=0,1km/s,0.1km/s'],
      ['bielliptic', `--r1=${q.radius_m + 100e3}`, `--r2=${q.radius_m + 5000e3}`, `--rb=${q.radius_m + 9000e3}`],
    ];
    const runs = await Promise.all(
      cases.flatMap(([cmd, ...rest]) => [
        runCli(['calc', cmd, '--system', SYSTEM, '--body', 'quill', ...rest, '--json']),
        runCli(['calc', cmd, `--mu=${q.mu_m3_s2}`, ...rest, '--json']),
      ]),
    );
    for (let k = 0; k < runs.length; k += 2) {
      expect(runs[k].code).toBe(0);
      expect(JSON.parse(runs[k].stdout)).toEqual(JSON.parse(runs[k + 1].stdout));
    }
  });

  it("soi: the body's orbit and its parent's μ from the file (μ ratio = mass ratio)", async () => {
    const o = body('ochre');
    const [named, typed] = await Promise.all([
      runCli(['calc', 'soi', '--system', SYSTEM, '--body', 'ochre', '--json']),
      runCli(['calc', 'soi', `--a=${o.orbit.a_m}`, `--e=${o.orbit.e}`, `--m=${o.mu_m3_s2}`, `--M=${muOf(o.parent)}`, '--json']),
    ]);
    expect(named.code).toBe(0);
    expect(JSON.parse(named.stdout)).toEqual(JSON.parse(typed.stdout));
  });

  it('--mu with --body, or --body without --system, is a usage error (exit 2)', async () => {
    const [both, alone] = await Promise.all([
      runCli(['calc', 'kepler', '--system', SYSTEM, '--body', 'quill', '--mu', '1', '--r=1,0,0', '--v=0,1,0', '--dt=1']),
      runCli(['calc', 'kepler', '--body', 'quill', '--r=1,0,0', '--v=0,1,0', '--dt=1']),
    ]);
    expect(both.code).toBe(2);
    expect(both.stderr).toContain('--mu cannot be given with --body');
    expect(alone.code).toBe(2);
    expect(alone.stderr).toContain('--system is required with --body');
  });
});
