/**
 * `waymark calc ...` — quick calculators for practitioners. Inputs are SI unless a unit suffix
 * is given (km, km/s, d, deg, km3/s2 ...); vectors are comma-separated components.
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
import { CALC_FLAGS } from '../flags.ts';
import { guard, num, printJson, vecText } from '../output.ts';

const DEG = 180 / Math.PI;

function need(opts: Record<string, unknown>, name: string): string {
  const v = opts[name];
  if (typeof v !== 'string' || v === '') throw new InputError(`--${name}`, 'is required');
  return v;
}

export function addCalcCommands(program: Command): void {
  const calc = program.command('calc').description('quick astrodynamics calculators (SI, or values with unit suffixes)');

  calc
    .command('kepler')
    .description('propagate a two-body state by dt (universal-variable Kepler)')
    .requiredOption('--mu <mu>', 'gravitational parameter (m3/s2 or km3/s2)')
    .requiredOption('--r <x,y,z>', 'position (m or km per component)')
    .requiredOption('--v <x,y,z>', 'velocity (m/s or km/s per component)')
    .requiredOption('--dt <t>', 'time step, may be negative (s, min, h, d)')
    .option('--json', 'machine-readable output')
    .action((o) =>
      guard({ json: !!o.json, flags: CALC_FLAGS }, () => {
        const mu = parseQuantity('--mu', o.mu, 'mu');
        const r = parseVector('--r', o.r, 'length');
        const v = parseVector('--v', o.v, 'speed');
        const dt = parseQuantity('--dt', o.dt, 'time');
        const s = propagateKepler(mu, [...r, ...v], dt);
        const out = { r: Array.from(s.slice(0, 3)), v: Array.from(s.slice(3, 6)), dt };
        if (o.json) printJson(out);
        else console.log(`after ${num(dt, 1)} s\n  r = ${vecText(out.r, 1e3)} km\n  v = ${vecText(out.v, 1e3)} km/s`);
      }),
    );

  calc
    .command('elements')
    .description('state vector -> classical elements, or elements -> state vector')
    .requiredOption('--mu <mu>', 'gravitational parameter')
    .option('--r <x,y,z>', 'position')
    .option('--v <x,y,z>', 'velocity')
    .option('--a <a>', 'semi-major axis (negative for a hyperbola)')
    .option('--p <p>', 'semi-latus rectum (instead of a; required for a parabola)')
    .option('--e <e>', 'eccentricity')
    .option('--i <i>', 'inclination (rad or deg)')
    .option('--raan <raan>', 'longitude of the ascending node')
    .option('--argp <argp>', 'argument of periapsis')
    .option('--nu <nu>', 'true anomaly')
    .option('--json', 'machine-readable output')
    .action((o) =>
      guard({ json: !!o.json, flags: CALC_FLAGS }, () => {
        const mu = parseQuantity('--mu', o.mu, 'mu');
        if (o.r || o.v) {
          const r = parseVector('--r', need(o, 'r'), 'length');
          const v = parseVector('--v', need(o, 'v'), 'speed');
          const el = stateToElements(mu, r, v);
          if (o.json) printJson(el);
          else
            console.log(
              [
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
            i: parseQuantity('--i', o.i ?? '0', 'angle'),
            raan: parseQuantity('--raan', o.raan ?? '0', 'angle'),
            argp: parseQuantity('--argp', o.argp ?? '0', 'angle'),
            nu: parseQuantity('--nu', o.nu ?? '0', 'angle'),
          };
          if (el.a === undefined && el.p === undefined) throw new InputError('--a', 'or --p is required');
          const s = elementsToState(mu, el);
          const out = { r: Array.from(s.slice(0, 3)), v: Array.from(s.slice(3, 6)) };
          if (o.json) printJson(out);
          else console.log(`r = ${vecText(out.r, 1e3)} km\nv = ${vecText(out.v, 1e3)} km/s`);
        }
      }),
    );

  calc
    .command('lambert')
    .description("solve Lambert's problem: all solutions from r1 to r2 in the time of flight")
    .requiredOption('--mu <mu>', 'gravitational parameter')
    .requiredOption('--r1 <x,y,z>', 'departure position')
    .requiredOption('--r2 <x,y,z>', 'arrival position')
    .requiredOption('--tof <t>', 'time of flight')
    .option('--revs <n>', 'largest number of full revolutions to consider', '0')
    .option('--retrograde', 'retrograde transfer (clockwise about +z)')
    .option('--json', 'machine-readable output')
    .action((o) =>
      guard({ json: !!o.json, flags: CALC_FLAGS }, () => {
        const mu = parseQuantity('--mu', o.mu, 'mu');
        const r1 = parseVector('--r1', o.r1, 'length');
        const r2 = parseVector('--r2', o.r2, 'length');
        const tof = parseQuantity('--tof', o.tof, 'time');
        const revs = parseQuantity('--revs', o.revs, 'none');
        if (!Number.isInteger(revs) || revs < 0) throw new InputError('--revs', 'must be a whole number >= 0', o.revs);
        const sols = solveLambert(mu, r1, r2, tof, { revs, retrograde: !!o.retrograde });
        const out = sols.map((s) => ({ revs: s.revs, branch: s.branch, v1: Array.from(s.v1), v2: Array.from(s.v2), iterations: s.iterations }));
        if (o.json) printJson({ solutions: out });
        else for (const s of out) console.log(`revs ${s.revs} ${s.branch.padEnd(6)}  v1 = ${vecText(s.v1, 1e3)} km/s  v2 = ${vecText(s.v2, 1e3)} km/s`);
      }),
    );

  calc
    .command('hohmann')
    .description('Hohmann transfer between coplanar circular orbits')
    .requiredOption('--mu <mu>', 'gravitational parameter')
    .requiredOption('--r1 <r>', 'initial orbit radius')
    .requiredOption('--r2 <r>', 'final orbit radius')
    .option('--json', 'machine-readable output')
    .action((o) =>
      guard({ json: !!o.json, flags: CALC_FLAGS }, () => {
        const h = hohmann(parseQuantity('--mu', o.mu, 'mu'), parseQuantity('--r1', o.r1, 'length'), parseQuantity('--r2', o.r2, 'length'));
        if (o.json) printJson(h);
        else console.log(`dv1 = ${num(h.dv1, 2)} m/s\ndv2 = ${num(h.dv2, 2)} m/s\ntotal = ${num(h.dvTotal, 2)} m/s\nflight time = ${num(h.tof / 86400, 4)} d`);
      }),
    );

  calc
    .command('bielliptic')
    .description('bi-elliptic transfer between coplanar circular orbits through an intermediate apoapsis rb')
    .requiredOption('--mu <mu>', 'gravitational parameter')
    .requiredOption('--r1 <r>', 'initial orbit radius')
    .requiredOption('--r2 <r>', 'final orbit radius')
    .requiredOption('--rb <r>', 'intermediate apoapsis radius')
    .option('--json', 'machine-readable output')
    .action((o) =>
      guard({ json: !!o.json, flags: CALC_FLAGS }, () => {
        const b = bielliptic(
          parseQuantity('--mu', o.mu, 'mu'),
          parseQuantity('--r1', o.r1, 'length'),
          parseQuantity('--r2', o.r2, 'length'),
          parseQuantity('--rb', o.rb, 'length'),
        );
        if (o.json) printJson(b);
        else
          console.log(
            `dv1 = ${num(b.dv1, 2)} m/s\ndv2 = ${num(b.dv2, 2)} m/s\ndv3 = ${num(b.dv3, 2)} m/s\ntotal = ${num(b.dvTotal, 2)} m/s\nflight time = ${num(b.tof / 86400, 4)} d`,
          );
      }),
    );

  calc
    .command('soi')
    .description('sphere of influence (Laplace) and Hill radius of a body of mass m orbiting a primary of mass M')
    .requiredOption('--a <a>', 'semi-major axis of the body')
    .requiredOption('--m <m>', 'mass of the body (kg) or its μ (with --mu-ratio)')
    .requiredOption('--M <M>', 'mass of the primary (same unit as --m)')
    .option('--e <e>', 'eccentricity (Hill radius at periapsis)', '0')
    .option('--json', 'machine-readable output')
    .action((o) =>
      guard({ json: !!o.json, flags: CALC_FLAGS }, () => {
        const a = parseQuantity('--a', o.a, 'length');
        const m = parseQuantity('--m', o.m, 'mass');
        const M = parseQuantity('--M', o.M, 'mass');
        const e = parseQuantity('--e', o.e, 'none');
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
