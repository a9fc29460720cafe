/**
 * `waymark calc ...` — quick calculators for practitioners. Inputs are SI unless a unit suffix
 * is given (km, km/s, d, deg, km3/s2 ...); vectors are comma-separated components. Angles are
 * the exception: degrees unless a unit says otherwise (`--i=30` is 30°, `--i=0.5rad` radians),
 * and the text output prints them in degrees.
 *
 * `--system FILE --body BODY` takes μ (and, for hohmann and bielliptic, the radius the
 * `--alt1/--alt2/--altb` altitudes are measured from; for soi, the body's orbit and its parent)
 * from a system file instead of typing them; BODY is an id or a name in any case.
 */
import type { Command } from 'commander';
import { parseQuantity, parseVector } from '../../../core/io/index.ts';
import { InputError } from '../../../core/math/index.ts';
import { burnDuration, propellantForDeltaV, rocketDeltaV } from '../../../core/plan/index.ts';
import { propagateKepler } from '../../../core/orbit/index.ts';
import { elementsToState, stateToElements } from '../../../core/orbit/index.ts';
import { solveLambert } from '../../../core/orbit/index.ts';
import { hohmann } from '../../../core/orbit/index.ts';
import { bielliptic } from '../../../core/orbit/index.ts';
import { hillRadius, sphereOfInfluence } from '../../../core/orbit/index.ts';
import type { Body, StarSystem } from '../../../core/system/index.ts';
import { loadSystemFile } from '../../node/files.ts';
import { bodyIndexNamed, CALC_FLAGS, parseAngle } from '../flags.ts';
import { guard, num, printJson, printWarnings, vecText } from '../output.ts';

const DEG = 180 / Math.PI;

function need(opts: Record<string, unknown>, name: string): string {
  const v = opts[name];
  if (typeof v !== 'string' || v === '') throw new InputError(`--${name}`, 'is required');
  return v;
}

/** The body `--system FILE --body BODY` name, or null when neither is given; InputError when only one is. */
async function namedBody(o: { system?: string; body?: string; json?: boolean }): Promise<{ system: StarSystem; body: Body } | null> {
  if (o.system === undefined && o.body === undefined) return null;
  if (o.system === undefined) throw new InputError('--system', 'is required with --body (the system file the body is read from)');
  if (o.body === undefined) throw new InputError('--body', 'is required with --system (the body whose μ and radius are used)');
  const loaded = await loadSystemFile(o.system);
  if (!o.json) printWarnings(loaded.warnings);
  return { system: loaded.system, body: loaded.system.bodies[bodyIndexNamed(loaded.system, '--body', o.body)] };
}

/** μ from `--mu`, or from the body `--system/--body` name (not both). */
function muFrom(o: { mu?: string }, named: { body: Body } | null): number {
  if (named) {
    if (o.mu !== undefined) throw new InputError('--mu', 'cannot be given with --body (the body gives μ)', o.mu);
    return named.body.mu;
  }
  if (o.mu === undefined) throw new InputError('--mu', 'is required (or --system FILE --body BODY)');
  return parseQuantity('--mu', o.mu, 'mu');
}

/** A radius: `--rN` as typed, or the body's radius plus `--altN` (one of the two). */
function radiusFrom(o: Record<string, string | undefined>, r: string, alt: string, named: { body: Body } | null): number {
  const rText = o[r];
  const altText = o[alt];
  if (rText !== undefined && altText !== undefined) throw new InputError(`--${alt}`, `cannot be given with --${r}`, altText);
  if (altText !== undefined) {
    if (!named) throw new InputError(`--${alt}`, 'needs --system FILE --body BODY (the radius it is measured from)', altText);
    return named.body.radius + parseQuantity(`--${alt}`, altText, 'length');
  }
  if (rText === undefined) throw new InputError(`--${r}`, `is required (or --${alt} with --system and --body)`);
  return parseQuantity(`--${r}`, rText, 'length');
}

/** The line that says where μ came from (text output). */
function muLine(named: { body: Body } | null, mu: number): string[] {
  return named ? [`μ = ${mu.toExponential(6)} m3/s2 (${named.body.name}, from --system)`] : [];
}

/** The --system/--body/--mu options of a calculator that takes μ. */
function muOptions(cmd: Command): Command {
  return cmd
    .option('--mu <mu>', 'gravitational parameter (m3/s2 or km3/s2), or --system and --body')
    .option('--system <file>', 'system file to take μ (and radius) from, with --body')
    .option('--body <body>', 'body of --system whose μ (and radius) to use: an id or a name, any case');
}

export function addCalcCommands(program: Command): void {
  const calc = program.command('calc').description('quick astrodynamics calculators (SI, or values with unit suffixes)');

  muOptions(calc.command('kepler').description('propagate a two-body state by dt (universal-variable Kepler)'))
    .requiredOption('--r <x,y,z>', 'position (m or km per component)')
    .requiredOption('--v <x,y,z>', 'velocity (m/s or km/s per component)')
    .requiredOption('--dt <t>', 'time step, may be negative (s, min, h, d)')
    .option('--json', 'machine-readable output')
    .action((o) =>
      guard({ json: !!o.json, flags: CALC_FLAGS }, async () => {
        const named = await namedBody(o);
        const mu = muFrom(o, named);
        const r = parseVector('--r', o.r, 'length');
        const v = parseVector('--v', o.v, 'speed');
        const dt = parseQuantity('--dt', o.dt, 'time');
        const s = propagateKepler(mu, [...r, ...v], dt);
        const out = { r: Array.from(s.slice(0, 3)), v: Array.from(s.slice(3, 6)), dt };
        if (o.json) printJson(out);
        else console.log(`${[...muLine(named, mu), `after ${num(dt, 1)} s`].join('\n')}\n  r = ${vecText(out.r, 1e3)} km\n  v = ${vecText(out.v, 1e3)} km/s`);
      }),
    );

  muOptions(calc.command('elements').description('state vector -> classical elements, or elements -> state vector'))
    .option('--r <x,y,z>', 'position')
    .option('--v <x,y,z>', 'velocity')
    .option('--a <a>', 'semi-major axis (negative for a hyperbola)')
    .option('--p <p>', 'semi-latus rectum (instead of a; required for a parabola)')
    .option('--e <e>', 'eccentricity')
    .option('--i <i>', 'inclination: degrees unless a unit says otherwise (30, 30deg, 0.5rad)')
    .option('--raan <raan>', 'longitude of the ascending node (degrees unless a unit says otherwise)')
    .option('--argp <argp>', 'argument of periapsis (degrees unless a unit says otherwise)')
    .option('--nu <nu>', 'true anomaly (degrees unless a unit says otherwise)')
    .option('--json', 'machine-readable output (SI: angles in radians)')
    .action((o) =>
      guard({ json: !!o.json, flags: CALC_FLAGS }, async () => {
        const named = await namedBody(o);
        const mu = muFrom(o, named);
        if (o.r || o.v) {
          const r = parseVector('--r', need(o, 'r'), 'length');
          const v = parseVector('--v', need(o, 'v'), 'speed');
          const el = stateToElements(mu, r, v);
          if (o.json) printJson(el);
          else
            console.log(
              [
                ...muLine(named, mu),
                `a    = ${num(el.a / 1e3, 3)} km`,
                `e    = ${num(el.e, 6)}`,
                `i    = ${num(el.i * DEG, 4)} deg`,
                `raan = ${num(el.raan * DEG, 4)} deg`,
                `argp = ${num(el.argp * DEG, 4)} deg`,
                `nu   = ${num(el.nu * DEG, 4)} deg`,
                `p    = ${num(el.p / 1e3, 3)} km`,
              ].join('\n'),
            );
        } else {
          const el = {
            a: o.a !== undefined ? parseQuantity('--a', o.a, 'length') : undefined,
            p: o.p !== undefined ? parseQuantity('--p', o.p, 'length') : undefined,
            e: parseQuantity('--e', need(o, 'e'), 'none'),
            i: parseAngle('--i', o.i ?? '0'),
            raan: parseAngle('--raan', o.raan ?? '0'),
            argp: parseAngle('--argp', o.argp ?? '0'),
            nu: parseAngle('--nu', o.nu ?? '0'),
          };
          if (el.a === undefined && el.p === undefined) throw new InputError('--a', 'or --p is required');
          const s = elementsToState(mu, el);
          const out = { r: Array.from(s.slice(0, 3)), v: Array.from(s.slice(3, 6)) };
          if (o.json) printJson(out);
          else {
            const deg = (x: number) => `${num(x * DEG, 4)} deg`;
            console.log(
              [
                ...muLine(named, mu),
                `from i = ${deg(el.i)}, raan = ${deg(el.raan)}, argp = ${deg(el.argp)}, nu = ${deg(el.nu)} (angles without a unit are degrees)`,
                `r = ${vecText(out.r, 1e3)} km`,
                `v = ${vecText(out.v, 1e3)} km/s`,
              ].join('\n'),
            );
          }
        }
      }),
    );

  muOptions(calc.command('lambert').description("solve Lambert's problem: all solutions from r1 to r2 in the time of flight"))
    .requiredOption('--r1 <x,y,z>', 'departure position')
    .requiredOption('--r2 <x,y,z>', 'arrival position')
    .requiredOption('--tof <t>', 'time of flight')
    .option('--revs <n>', 'largest number of full revolutions to consider', '0')
    .option('--retrograde', 'retrograde transfer (clockwise about +z)')
    .option('--json', 'machine-readable output')
    .action((o) =>
      guard({ json: !!o.json, flags: CALC_FLAGS }, async () => {
        const named = await namedBody(o);
        const mu = muFrom(o, named);
        const r1 = parseVector('--r1', o.r1, 'length');
        const r2 = parseVector('--r2', o.r2, 'length');
        const tof = parseQuantity('--tof', o.tof, 'time');
        const revs = parseQuantity('--revs', o.revs, 'none');
        if (!Number.isInteger(revs) || revs < 0) throw new InputError('--revs', 'must be a whole number >= 0', o.revs);
        const sols = solveLambert(mu, r1, r2, tof, { revs, retrograde: !!o.retrograde });
        const out = sols.map((s) => ({ revs: s.revs, branch: s.branch, v1: Array.from(s.v1), v2: Array.from(s.v2), iterations: s.iterations }));
        if (o.json) printJson({ solutions: out });
        else
          for (const line of [
            ...muLine(named, mu),
            ...out.map((s) => `revs ${s.revs} ${s.branch.padEnd(6)}  v1 = ${vecText(s.v1, 1e3)} km/s  v2 = ${vecText(s.v2, 1e3)} km/s`),
          ])
            console.log(line);
      }),
    );

  muOptions(calc.command('hohmann').description('Hohmann transfer between coplanar circular orbits'))
    .option('--r1 <r>', 'initial orbit radius')
    .option('--r2 <r>', 'final orbit radius')
    .option('--alt1 <h>', 'initial orbit altitude above the --body radius (instead of --r1)')
    .option('--alt2 <h>', 'final orbit altitude above the --body radius (instead of --r2)')
    .option('--json', 'machine-readable output')
    .action((o) =>
      guard({ json: !!o.json, flags: CALC_FLAGS }, async () => {
        const named = await namedBody(o);
        const mu = muFrom(o, named);
        const h = hohmann(mu, radiusFrom(o, 'r1', 'alt1', named), radiusFrom(o, 'r2', 'alt2', named));
        if (o.json) printJson(h);
        else
          console.log(
            [...muLine(named, mu), ''].join('\n') +
              `dv1 = ${num(h.dv1, 2)} m/s\ndv2 = ${num(h.dv2, 2)} m/s\ntotal = ${num(h.dvTotal, 2)} m/s\nflight time = ${num(h.tof / 86400, 4)} d`,
          );
      }),
    );

  muOptions(calc.command('bielliptic').description('bi-elliptic transfer between coplanar circular orbits through an intermediate apoapsis rb'))
    .option('--r1 <r>', 'initial orbit radius')
    .option('--r2 <r>', 'final orbit radius')
    .option('--rb <r>', 'intermediate apoapsis radius')
    .option('--alt1 <h>', 'initial orbit altitude above the --body radius (instead of --r1)')
    .option('--alt2 <h>', 'final orbit altitude above the --body radius (instead of --r2)')
    .option('--altb <h>', 'intermediate apoapsis altitude above the --body radius (instead of --rb)')
    .option('--json', 'machine-readable output')
    .action((o) =>
      guard({ json: !!o.json, flags: CALC_FLAGS }, async () => {
        const named = await namedBody(o);
        const mu = muFrom(o, named);
        const b = bielliptic(mu, radiusFrom(o, 'r1', 'alt1', named), radiusFrom(o, 'r2', 'alt2', named), radiusFrom(o, 'rb', 'altb', named));
        if (o.json) printJson(b);
        else
          console.log(
            [...muLine(named, mu), ''].join('\n') +
              `dv1 = ${num(b.dv1, 2)} m/s\ndv2 = ${num(b.dv2, 2)} m/s\ndv3 = ${num(b.dv3, 2)} m/s\ntotal = ${num(b.dvTotal, 2)} m/s\nflight time = ${num(b.tof / 86400, 4)} d`,
          );
      }),
    );

  calc
    .command('soi')
    .description('sphere of influence (Laplace) and Hill radius of a body of mass m orbiting a primary of mass M')
    .option('--a <a>', 'semi-major axis of the body')
    .option('--m <m>', 'mass of the body (kg, t)')
    .option('--M <M>', 'mass of the primary (same unit as --m)')
    .option('--e <e>', 'eccentricity (Hill radius at periapsis; default 0)')
    .option('--system <file>', 'system file to take the body, its orbit and its parent from, with --body (in place of --a, --m, --M, --e)')
    .option('--body <body>', 'body of --system (an id or a name, any case); μ stands for the masses, the ratio being the same')
    .option('--json', 'machine-readable output')
    .action((o) =>
      guard({ json: !!o.json, flags: CALC_FLAGS }, async () => {
        const named = await namedBody(o);
        let a: number;
        let m: number;
        let M: number;
        let e: number;
        if (named) {
          const typed = (['a', 'm', 'M', 'e'] as const).find((k) => o[k] !== undefined);
          if (typed) throw new InputError(`--${typed}`, 'cannot be given with --body (the system gives it)', o[typed]);
          const { body, system } = named;
          if (!body.elements) throw new InputError('--body', `must orbit a parent (${body.name} is the star)`, o.body);
          a = body.elements.a;
          e = body.elements.e;
          m = body.mu;
          M = system.bodies[body.parentIndex].mu;
        } else {
          for (const k of ['a', 'm', 'M'] as const) if (o[k] === undefined) throw new InputError(`--${k}`, 'is required (or --system FILE --body BODY)');
          a = parseQuantity('--a', o.a, 'length');
          m = parseQuantity('--m', o.m, 'mass');
          M = parseQuantity('--M', o.M, 'mass');
          e = parseQuantity('--e', o.e ?? '0', 'none');
        }
        const out = { soi: sphereOfInfluence(a, m, M), hill: hillRadius(a, e, m, M) };
        if (o.json) printJson(out);
        else console.log(`sphere of influence = ${num(out.soi / 1e3, 1)} km\nHill radius = ${num(out.hill / 1e3, 1)} km`);
      }),
    );

  calc
    .command('rocket')
    .description('rocket equation: Δv from masses, or propellant and burn time for a Δv')
    .requiredOption('--isp <s>', 'vacuum specific impulse (s)')
    .requiredOption('--m0 <m>', 'initial mass (kg or t)')
    .option('--mf <m>', 'final mass: prints the Δv')
    .option('--dv <v>', 'Δv: prints the propellant used and final mass')
    .option('--thrust <F>', 'thrust (N, kN): also prints the burn duration')
    .option('--json', 'machine-readable output')
    .action((o) =>
      guard({ json: !!o.json, flags: CALC_FLAGS }, () => {
        const isp = parseQuantity('--isp', o.isp, 'time');
        const m0 = parseQuantity('--m0', o.m0, 'mass');
        let dv: number;
        let mf: number;
        if (o.mf !== undefined) {
          mf = parseQuantity('--mf', o.mf, 'mass');
          dv = rocketDeltaV(isp, m0, mf);
        } else if (o.dv !== undefined) {
          dv = parseQuantity('--dv', o.dv, 'speed');
          mf = m0 - propellantForDeltaV(isp, m0, dv);
        } else throw new InputError('--mf', 'or --dv is required');
        const out: Record<string, number> = { dv, m0, mf, propellant: m0 - mf };
        if (o.thrust !== undefined) out.burnDuration = burnDuration(parseQuantity('--thrust', o.thrust, 'force'), isp, m0, dv);
        if (o.json) printJson(out);
        else
          console.log(
            `Δv = ${num(dv, 2)} m/s\npropellant = ${num(out.propellant, 2)} kg\nfinal mass = ${num(mf, 2)} kg` +
              (out.burnDuration !== undefined ? `\nburn duration = ${num(out.burnDuration, 2)} s` : ''),
          );
      }),
    );
}
