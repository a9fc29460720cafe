import { describe, expect, it } from 'vitest';
import { sequenceRequest, type SequenceOptions } from '../../../app/cli/commands/sequence.ts';
import { InputError } from '../../../core/math/errors.ts';
import { demoSystem } from '../../core/search/fixtures.ts';
import { runCli } from './runCli.ts';

const DEMO = ['--system', 'assets/systems/ilmar.system.json'];
const DAY = 86400;
const system = demoSystem();
const body = (id: string) => system.bodies[system.indexById[id]];
const opts = (o: Partial<SequenceOptions> = {}): SequenceOptions => ({ system: 'x', captureE: '0', keep: '5', ...o });

/** The InputError a call throws (fails the test when it throws nothing or something else). */
function inputError(f: () => unknown): InputError {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error('expected an InputError');
}

describe('sequenceRequest: the command line read into a request', () => {
  it('names in any case become ids in order; departures default to one synodic period of the first two bodies', () => {
    const r = sequenceRequest(system, ['Tessel', 'MORAVEL', 'fennick'], opts());
    expect(r.bodies).toEqual(['tessel', 'moravel', 'fennick']);
    expect(r.departFrom).toBe(0);
    // synodic period 1/|1/P1 − 1/P2| (Curtis, Orbital Mechanics for Engineering Students, eq. 8.10, from memory);
    // 1e-9 relative: two ways of rounding the same formula
    const P1 = body('tessel').derived.period;
    const P2 = body('moravel').derived.period;
    expect(Math.abs(r.departTo - 1 / Math.abs(1 / P1 - 1 / P2)) / r.departTo).toBeLessThan(1e-9);
    expect(r.powered).toBe(true);
    expect(r.keep).toBe(5);
    expect(r.arriveE).toBe(0);
    // default orbits 100 km above the safe altitudes (core/io/defaults.ts ALTITUDE_MARGIN)
    expect(r.departAltitude).toBe(body('tessel').safeAlt + 100e3);
    expect(r.arriveAltitude).toBe(body('fennick').safeAlt + 100e3);
    expect(r.legTof).toBeUndefined();
  });

  it('reads dates, per-leg flight times, --unpowered, --flyby and --keep', () => {
    const r = sequenceRequest(
      system,
      ['tessel', 'moravel', 'fennick'],
      opts({ depart: '412-011..412-111', tof: '300d..900d,1000d..3000d', unpowered: true, flyby: true, keep: '3', parking: '400km' }),
    );
    // day 11 of the epoch's year starts 10 calendar days (the home world's days) after day 1;
    // 1e-6 s: a product of the day length rounded once
    const dayLength = system.calendar.dayLength;
    expect(Math.abs(r.departFrom - 10 * dayLength)).toBeLessThan(1e-6);
    expect(Math.abs(r.departTo - 110 * dayLength)).toBeLessThan(1e-6);
    expect(r.legTof).toEqual([
      [300 * DAY, 900 * DAY],
      [1000 * DAY, 3000 * DAY],
    ]);
    expect(r.powered).toBe(false);
    expect(r.arriveE).toBeNull();
    expect(r.keep).toBe(3);
    expect(r.departAltitude).toBe(400e3);
  });

  it('refuses what cannot be searched, naming the argument or flag', () => {
    expect(inputError(() => sequenceRequest(system, ['tessel'], opts())).field).toBe('BODIES');
    const moon = inputError(() => sequenceRequest(system, ['tessel', 'skerry'], opts()));
    expect(moon.field).toBe('BODIES[2]');
    expect(moon.rule).toMatch(/same body as Tessel/);
    expect(inputError(() => sequenceRequest(system, ['tessel', 'nowhere'], opts())).field).toBe('BODIES[2]');
    expect(inputError(() => sequenceRequest(system, ['tessel', 'moravel', 'moravel'], opts())).field).toBe('BODIES[3]');
    expect(inputError(() => sequenceRequest(system, ['tessel', 'moravel', 'fennick'], opts({ tof: '100d..300d' }))).field).toBe('--tof');
    expect(inputError(() => sequenceRequest(system, ['tessel', 'fennick'], opts({ powered: true, unpowered: true }))).field).toBe('--unpowered');
    expect(inputError(() => sequenceRequest(system, ['tessel', 'fennick'], opts({ flyby: true, captureE: '0.5' }))).field).toBe('--capture-e');
    expect(inputError(() => sequenceRequest(system, ['tessel', 'fennick'], opts({ parking: '1km' }))).field).toBe('--parking');
    expect(inputError(() => sequenceRequest(system, ['tessel', 'fennick'], opts({ keep: '0' }))).field).toBe('--keep');
  });

  it('a resonant return (a body twice, not in a row) is a valid chain', () => {
    expect(sequenceRequest(system, ['tessel', 'ochre', 'tessel', 'moravel'], opts()).bodies).toEqual(['tessel', 'ochre', 'tessel', 'moravel']);
  });
});

interface LegJ {
  from: string;
  to: string;
  depart: number;
  arrive: number;
  tof: number;
  vInfDepart: number;
  vInfArrive: number;
}
interface FlybyJ {
  body: string;
  t: number;
  vInfIn: number;
  vInfOut: number;
  periapsisAltitude: number;
  turn: number;
  dv: number;
  limited: boolean;
}
interface SolutionJ {
  depart: number;
  arrive: number;
  departDate: string;
  legs: LegJ[];
  flybys: FlybyJ[];
  dvDepart: number;
  dvFlybys: number;
  dvCapture: number;
  dvTotal: number;
}

/** Δv from a circular orbit of radius r to a hyperbola of excess speed v∞ at its periapsis (or back): √(v∞² + 2μ/r) − √(μ/r) (Curtis, eq. 8.40, from memory). */
function circularToHyperbola(mu: number, r: number, vInf: number): number {
  return Math.sqrt(vInf * vInf + (2 * mu) / r) - Math.sqrt(mu / r);
}

describe('waymark sequence', () => {
  it('--json: Tessel -> Moravel -> Fennick, unpowered, the solutions consistent with the request and with textbook formulas', async () => {
    const r = await runCli(['sequence', 'tessel', 'moravel', 'fennick', ...DEMO, '--unpowered', '--keep', '3', '--json']);
    expect(r.stderr).toBe(''); // no progress bar with --json
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout) as {
      request: { departFrom: number; departTo: number };
      method: string;
      lambertSolves: number;
      solutions: SolutionJ[];
      direct: { dvTotal: number } | null;
    };
    expect(out.method.length).toBeGreaterThan(0);
    expect(out.lambertSolves).toBeGreaterThan(0);
    expect(out.solutions.length).toBeGreaterThan(0);
    expect(out.solutions.length).toBeLessThanOrEqual(3);
    const T = body('tessel');
    const M = body('moravel');
    const F = body('fennick');
    for (const s of out.solutions) {
      // parts add up to the total (1e-6 m/s: sums of a few numbers near 1e4 printed in full)
      expect(Math.abs(s.dvDepart + s.dvFlybys + s.dvCapture - s.dvTotal)).toBeLessThan(1e-6);
      expect(s.depart).toBeGreaterThanOrEqual(out.request.departFrom);
      expect(s.depart).toBeLessThanOrEqual(out.request.departTo);
      expect(s.legs.map((l) => [l.from, l.to])).toEqual([
        ['tessel', 'moravel'],
        ['moravel', 'fennick'],
      ]);
      // the legs join: arrival at the flyby body is the next leg's departure (1e-6 s: the same time carried twice)
      expect(Math.abs(s.legs[0].arrive - s.legs[1].depart)).toBeLessThan(1e-6);
      for (const l of s.legs) expect(Math.abs(l.arrive - l.depart - l.tof)).toBeLessThan(1e-6);
      expect(s.legs[0].depart).toBe(s.depart);
      expect(s.legs[1].arrive).toBe(s.arrive);
      // departure from the parking orbit and capture into the circular target orbit, from v∞ by the textbook formula;
      // 1e-6 relative: the same formula rounded in another order
      const dep = circularToHyperbola(T.mu, T.radius + T.safeAlt + 100e3, s.legs[0].vInfDepart);
      expect(Math.abs(s.dvDepart - dep) / dep).toBeLessThan(1e-6);
      const cap = circularToHyperbola(F.mu, F.radius + F.safeAlt + 100e3, s.legs[1].vInfArrive);
      expect(Math.abs(s.dvCapture - cap) / cap).toBeLessThan(1e-6);
      // the flyby: at Moravel, on the legs' v∞, periapsis not below the safe altitude, turn within the
      // hyperbola's reach δ = 2·asin(1/e), e = 1 + r_p·v∞²/μ (Curtis, eq. 8.56, from memory) at the lowest periapsis
      expect(s.flybys).toHaveLength(1);
      const f = s.flybys[0];
      expect(f.body).toBe('moravel');
      expect(Math.abs(f.vInfIn - s.legs[0].vInfArrive)).toBeLessThan(1e-6 * f.vInfIn);
      expect(Math.abs(f.vInfOut - s.legs[1].vInfDepart)).toBeLessThan(1e-6 * f.vInfOut);
      expect(f.periapsisAltitude).toBeGreaterThanOrEqual(M.safeAlt * (1 - 1e-9));
      const vIn = Math.min(f.vInfIn, f.vInfOut);
      const eMin = 1 + ((M.radius + M.safeAlt) * vIn * vIn) / M.mu;
      expect(f.turn).toBeLessThanOrEqual(2 * Math.asin(1 / eMin) + 1e-9);
      // unpowered: no burn but for the |v∞| mismatch, which is at least ||v∞ out| − |v∞ in||
      expect(f.dv).toBeGreaterThanOrEqual(Math.abs(f.vInfOut - f.vInfIn) - 1e-6);
    }
    for (let k = 1; k < out.solutions.length; k++) expect(out.solutions[k].dvTotal).toBeGreaterThanOrEqual(out.solutions[k - 1].dvTotal);
  });

  it('text output: the request, the direct transfer and each solution with its legs and flyby', async () => {
    const r = await runCli(['sequence', 'Tessel', 'Moravel', 'Fennick', ...DEMO, '--keep', '2', '--flyby']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('Tessel -> Moravel -> Fennick');
    expect(r.stdout).toMatch(/powered flybys/);
    expect(r.stdout).toMatch(/Lambert solves/);
    expect(r.stdout).toMatch(/^direct Tessel -> Fennick: |^direct transfer: none/m);
    expect(r.stdout).toMatch(/^#1$/m);
    expect(r.stdout).toMatch(/Tessel -> Moravel/);
    expect(r.stdout).toMatch(/^\s+Moravel\*?\s+\d{3}-\d{3}/m);
  });

  it('usage errors exit 2 in the command line words: text and --json', async () => {
    const one = await runCli(['sequence', 'tessel', ...DEMO]);
    expect(one.code).toBe(2);
    expect(one.stderr).toMatch(/BODIES must name at least two bodies/);
    const moon = await runCli(['sequence', 'tessel', 'skerry', ...DEMO, '--json']);
    expect(moon.code).toBe(2);
    const err = JSON.parse(moon.stdout).error;
    expect(err.field).toBe('BODIES[2]');
    expect(err.rule).toMatch(/same body as Tessel/);
    const dates = await runCli(['sequence', 'tessel', 'moravel', ...DEMO, '--depart', '412-100..412-050']);
    expect(dates.code).toBe(2);
    expect(dates.stderr).toMatch(/--depart/);
  });
});
