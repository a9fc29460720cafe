/**
 * Errors at the command line name the flag the user typed, not the core's field: `--grid`,
 * not `depart.n`; `--revs`, not `maxRevs`; `--dt`, not `physics.dt`. And `--dt 20ms` reads.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { bodyIndexNamed, CALC_FLAGS, DISPERSE_FLAGS, GAMESTEP_FLAGS, parseAngle, STABILITY_FLAGS, inFlagWords, windowsFlags } from '../../../app/cli/flags.ts';
import { parseSystemFile } from '../../../core/io/systemFile.ts';
import { parseStep } from '../../../app/cli/commands/gamestep.ts';
import { InputError, SolverError } from '../../../core/math/errors.ts';
import { ROOT, runCli } from './runCli.ts';

const SYSTEM = 'assets/systems/ilmar.system.json';
const PLAN = 'assets/plans/tessel-to-ochre.plan.json';

describe('core fields in the command line words', () => {
  it('renames a listed field to its flag, keeping the rule and the value', () => {
    const e = inFlagWords(new InputError('maxRevs', 'must be an integer from 0 to 50', 1000), windowsFlags('tof')) as InputError;
    expect(e).toBeInstanceOf(InputError);
    expect([e.field, e.rule, e.value]).toEqual(['--revs', 'must be an integer from 0 to 50', 1000]);
    expect(e.message).toBe('--revs must be an integer from 0 to 50 (got 1000)');
  });

  it('says which part of a flag that sets several fields (--grid: departures, flight or arrival times)', () => {
    const n = new InputError('second.n', 'must be an integer from 1 to 20000', 30000);
    expect((inFlagWords(n, windowsFlags('tof')) as Error).message).toBe('--grid flight times must be an integer from 1 to 20000 (got 30000)');
    expect((inFlagWords(n, windowsFlags('arrival')) as Error).message).toBe('--grid arrival times must be an integer from 1 to 20000 (got 30000)');
    expect((inFlagWords(new InputError('second.start', 'must be a time of flight > 0', -1), windowsFlags('tof')) as Error).message).toMatch(/^--tof /);
  });

  it('renames code-like field names quoted inside the rule, and leaves plain words alone', () => {
    const e = inFlagWords(new InputError('span', 'needs 9 steps (more than maxSteps = 5); shorten the span or raise maxSteps.', 1), STABILITY_FLAGS) as Error;
    expect(e.message).toBe('--years needs 9 steps (more than --max-steps = 5); shorten the span or raise --max-steps. (got 1)');
    const g = inFlagWords(
      new InputError('physics.dt', 'needs about 1e9 game steps; take a longer step or lower maxStepsPerSpan', 1e-6),
      GAMESTEP_FLAGS,
    ) as Error;
    expect(g.message).toBe('--dt needs about 1e9 game steps; take a longer step or lower --max-steps (got 0.000001)');
    // "to" is a flag of windows and an English word: only code-like names are replaced inside rules
    expect((inFlagWords(new InputError('depart.n', 'must be an integer from 1 to 20000', 0), windowsFlags('tof')) as Error).message).toBe(
      '--grid departures must be an integer from 1 to 20000 (got 0)',
    );
  });

  it('names the end of a START..END flag that is wrong', () => {
    const e = inFlagWords(new InputError('--depart.start', 'must be a calendar date like "412-037"', 'foo'), windowsFlags('tof')) as InputError;
    expect([e.field, e.message]).toEqual(['--depart', '--depart START must be a calendar date like "412-037" (got "foo")']);
    expect((inFlagWords(new InputError('--tof.end', 'is too large'), windowsFlags('tof')) as Error).message).toBe('--tof END is too large');
  });

  it('keeps a trailing index, and passes unlisted fields and other errors unchanged', () => {
    expect((inFlagWords(new InputError('r[1]', 'must be finite', 'x'), CALC_FLAGS) as InputError).field).toBe('--r[1]');
    const fileField = new InputError('events[2].dv', 'must be finite');
    expect(inFlagWords(fileField, DISPERSE_FLAGS)).toBe(fileField);
    const solver = new SolverError('kepler', 'no-convergence', 'did not converge');
    expect(inFlagWords(solver, CALC_FLAGS)).toBe(solver);
  });

  it('gamestep --dt reads milliseconds (20ms = 0.02 s) beside seconds, fractions and minutes', () => {
    expect(parseStep('--dt', '20ms')).toBeCloseTo(0.02, 17);
    expect(parseStep('--dt', '1/50')).toBe(0.02);
    expect(parseStep('--dt', '0.5min')).toBe(30);
    expect(() => parseStep('--dt', '20parsecs')).toThrow(/--dt has unknown unit "parsecs" \(use one of: ms, s, min, h, d\)/);
  });
});

describe.concurrent('the command line names flags in its errors', () => {
  const windows = (...args: string[]) => runCli(['windows', '--system', SYSTEM, '--from', 'tessel', '--to', 'ochre', ...args]);

  it('windows: --grid, --revs, --parking, --capture-e instead of depart.n, maxRevs, parkingAltitude, arrivalEccentricity', async () => {
    const cases: [string[], string][] = [
      [['--grid', '100000x10'], 'waymark: --grid departures must be an integer from 1 to 20000 (got 100000)'],
      [['--revs', '1000'], 'waymark: --revs must be an integer from 0 to 50 (got 1000)'],
      [['--parking', '-5km'], "waymark: --parking must be at least Tessel's minimum safe altitude, 90 km (got -5000)"],
      [['--capture-e', '2'], 'waymark: --capture-e must be < 1 (closed orbit) (got 2)'],
    ];
    const runs = await Promise.all(cases.map(([args]) => windows(...args)));
    runs.forEach((r, k) => {
      expect(r.code).toBe(2);
      expect(r.stderr.trim()).toBe(cases[k][1]);
    });
  });

  it('windows --json: the error field is the flag', async () => {
    const r = await windows('--revs', '99', '--json');
    expect(r.code).toBe(2);
    expect(JSON.parse(r.stdout).error).toMatchObject({ type: 'InputError', field: '--revs' });
  });

  it('gamestep: --dt, not physics.dt', async () => {
    const r = await runCli(['gamestep', PLAN, '--integrator', 'rk4', '--dt', '1e-46', '--float32']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^waymark: --dt must be representable in float32/);
  });

  it('disperse: --samples, not options.samples', async () => {
    const r = await runCli(['disperse', PLAN, '--samples', '1e9', '--workers', '1']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^waymark: --samples /);
    expect(r.stderr).not.toContain('options.');
  });
});

describe('angles and body names as typed', () => {
  it('parseAngle: a bare number is degrees, a unit says otherwise', () => {
    // exact conversions (π/180 is the definition of the degree); toBe: the same double the unit table gives
    expect(parseAngle('--i', '30')).toBe(parseAngle('--i', '30deg'));
    expect(parseAngle('--i', '30')).toBeCloseTo(Math.PI / 6, 15);
    expect(parseAngle('--i', '-1.5e1')).toBeCloseTo(-Math.PI / 12, 15);
    expect(parseAngle('--i', '0.5rad')).toBe(0.5);
    expect(() => parseAngle('--i', '30grad')).toThrow(/--i has unknown unit "grad"/);
  });

  it('bodyIndexNamed: id or name in any case; none matching lists the names as the system has them', () => {
    const { system } = parseSystemFile(readFileSync(join(ROOT, SYSTEM), 'utf8'));
    const k = system.indexById.tessel;
    for (const t of ['tessel', 'Tessel', 'TESSEL', ' tEsSeL ']) expect(bodyIndexNamed(system, '--from', t)).toBe(k);
    let err: unknown = null;
    try {
      bodyIndexNamed(system, '--from', 'Tesel');
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).field).toBe('--from');
    for (const b of system.bodies) expect((err as InputError).rule).toContain(b.name);
  });
});
